package org.dendrokin.core.fit;

import org.dendrokin.core.Checks;

/**
 * AIC, AICc and BIC for least squares with Gaussian errors whose overall scale is estimated:
 * AIC = n ln(chi^2 / n) + 2K, AICc = AIC + 2K(K + 1) / (n - K - 1), BIC = n ln(chi^2 / n) + K ln n, with
 * K = p + 1 (the noise scale counts as a parameter; Burnham and Anderson 2002) and the constant
 * n (1 + ln 2 pi) left out because it cancels between models fitted to the same data. References: Akaike 1974,
 * Hurvich and Tsai 1989, Schwarz 1978; sheet s8.3.
 */
public final class InformationCriteria {
    private InformationCriteria() {
    }

    /** @param chiSquare weighted residual sum of squares; n points; p fitted parameters */
    public static double aic(double chiSquare, int n, int p) {
        int k = p + 1;
        return n * Math.log(chiSquare / n) + 2.0 * k;
    }

    public static double aicc(double chiSquare, int n, int p) {
        int k = p + 1;
        if (n - k - 1 <= 0) {
            return Double.NaN;
        }
        return aic(chiSquare, n, p) + 2.0 * k * (k + 1) / (n - k - 1);
    }

    public static double bic(double chiSquare, int n, int p) {
        int k = p + 1;
        return n * Math.log(chiSquare / n) + k * Math.log(n);
    }

    /**
     * Akaike weights w_i = exp(-delta_i / 2) / sum_j exp(-delta_j / 2), delta_i = c_i - min c. NaN criteria
     * (fits that did not converge) get weight 0.
     */
    public static double[] weights(double[] criteria) {
        Checks.require(criteria.length > 0, "need at least one criterion value");
        double min = Double.POSITIVE_INFINITY;
        for (double c : criteria) {
            if (Double.isFinite(c)) {
                min = Math.min(min, c);
            }
        }
        double[] w = new double[criteria.length];
        double sum = 0;
        for (int i = 0; i < w.length; i++) {
            w[i] = Double.isFinite(criteria[i]) ? Math.exp(-(criteria[i] - min) / 2) : 0;
            sum += w[i];
        }
        for (int i = 0; i < w.length; i++) {
            w[i] = sum > 0 ? w[i] / sum : Double.NaN;
        }
        return w;
    }
}
