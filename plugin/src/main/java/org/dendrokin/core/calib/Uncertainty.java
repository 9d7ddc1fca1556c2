package org.dendrokin.core.calib;

import org.dendrokin.core.Checks;

/** First-order (delta-method) error propagation: sd = sqrt(g^T C g). */
final class Uncertainty {
    private Uncertainty() {
    }

    /**
     * @param gradient   g, derivatives of the result with respect to each constant. Not modified.
     * @param covariance C, symmetric p x p covariance of the constants, or null for "no uncertainty". Not modified.
     * @return sqrt(g^T C g) in the unit of the result; 0 when covariance is null; NaN when g has a NaN
     */
    static double sd(double[] gradient, double[][] covariance) {
        if (covariance == null) {
            for (double g : gradient) {
                if (Double.isNaN(g)) {
                    return Double.NaN;
                }
            }
            return 0;
        }
        Checks.require(covariance.length == gradient.length, "covariance and gradient sizes differ");
        double sum = 0;
        for (int i = 0; i < gradient.length; i++) {
            for (int j = 0; j < gradient.length; j++) {
                if (covariance[i][j] != 0) {
                    sum += gradient[i] * covariance[i][j] * gradient[j];
                }
            }
        }
        return Math.sqrt(Math.max(0, sum));
    }

    /** A diagonal covariance from standard deviations; null when every SD is zero (nothing given). */
    static double[][] diagonal(double... sds) {
        boolean any = false;
        double[][] c = new double[sds.length][sds.length];
        for (int i = 0; i < sds.length; i++) {
            Checks.nonNegativeFinite(sds[i], "a standard deviation");
            c[i][i] = sds[i] * sds[i];
            any |= sds[i] > 0;
        }
        return any ? c : null;
    }

    static double[][] copy(double[][] m) {
        if (m == null) {
            return null;
        }
        double[][] out = new double[m.length][];
        for (int i = 0; i < m.length; i++) {
            out[i] = m[i].clone();
        }
        return out;
    }
}
