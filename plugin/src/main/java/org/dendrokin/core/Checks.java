package org.dendrokin.core;

/**
 * Argument checks for programming errors and for values already parsed from user input. Each throws
 * {@link IllegalArgumentException} with a message a user can read, naming the quantity; the I/O layer
 * adds the file name when the value came from a file.
 */
public final class Checks {
    private Checks() {
    }

    public static double positiveFinite(double value, String name) {
        if (!(value > 0) || !Double.isFinite(value)) {
            throw new IllegalArgumentException(name + " must be a positive finite number, got " + value);
        }
        return value;
    }

    public static double nonNegativeFinite(double value, String name) {
        if (!(value >= 0) || !Double.isFinite(value)) {
            throw new IllegalArgumentException(name + " must be zero or positive, got " + value);
        }
        return value;
    }

    public static double finite(double value, String name) {
        if (!Double.isFinite(value)) {
            throw new IllegalArgumentException(name + " must be a finite number, got " + value);
        }
        return value;
    }

    public static int positive(int value, String name) {
        if (value <= 0) {
            throw new IllegalArgumentException(name + " must be positive, got " + value);
        }
        return value;
    }

    public static void sameLength(int n, double[]... arrays) {
        for (double[] a : arrays) {
            if (a.length != n) {
                throw new IllegalArgumentException("array length " + a.length + " differs from " + n);
            }
        }
    }

    public static void require(boolean condition, String message) {
        if (!condition) {
            throw new IllegalArgumentException(message);
        }
    }
}
