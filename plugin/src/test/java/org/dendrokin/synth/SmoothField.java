package org.dendrokin.synth;

import java.util.Random;

/**
 * A smooth random function of one variable with zero mean and unit standard deviation over its ensemble:
 * f(s) = sqrt(2 / n) sum_i cos(2 pi s / L_i + phi_i), with n = 8 wavelengths L_i drawn uniformly between 2 and 6
 * correlation lengths and phases phi_i uniform. A random-phase sum of cosines is the usual cheap stand-in for a
 * stationary Gaussian field [common practice].
 */
final class SmoothField {
    private static final int TERMS = 8;
    private final double[] wavenumber;
    private final double[] phase;

    SmoothField(Random random, double correlationLength) {
        wavenumber = new double[TERMS];
        phase = new double[TERMS];
        for (int i = 0; i < TERMS; i++) {
            wavenumber[i] = 2 * Math.PI / (correlationLength * (2 + 4 * random.nextDouble()));
            phase[i] = 2 * Math.PI * random.nextDouble();
        }
    }

    double value(double s) {
        double sum = 0;
        for (int i = 0; i < TERMS; i++) {
            sum += Math.cos(wavenumber[i] * s + phase[i]);
        }
        return sum * Math.sqrt(2.0 / TERMS);
    }
}
