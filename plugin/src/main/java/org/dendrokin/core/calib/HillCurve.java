package org.dendrokin.core.calib;

import org.dendrokin.core.Checks;

/**
 * The Hill binding curve shared by most calibration methods:
 * <pre>
 *   F = a + (b - a) s,   s = c^n / (c^n + K^n)                (forward)
 *   c = K u^(1/n),       u = (F - a) / (b - F) = s / (1 - s)   (inverse)
 * </pre>
 * with a the signal at zero concentration, b the signal at saturation, K the half-saturating concentration
 * (uM) and n the Hill coefficient (dimensionless). n = 1 is 1:1 binding, the form of Grynkiewicz, Poenie &amp;
 * Tsien 1985 (J Biol Chem 260:3440). b may be below a (an indicator that dims on binding). Inverse values
 * exist only for F strictly between a and b; elsewhere this class returns NaN. Reference: reference sheet
 * sections 1.1 and 1.3; the derivatives are derived from the inverse above.
 *
 * @param a                signal at zero concentration (signal units), finite
 * @param b                signal at saturation (signal units), finite, different from a
 * @param kHalfMicromolar  half-saturating concentration K, uM, positive
 * @param n                Hill coefficient, positive, dimensionless
 */
public record HillCurve(double a, double b, double kHalfMicromolar, double n) {
    public HillCurve {
        Checks.finite(a, "the signal at zero concentration");
        Checks.finite(b, "the signal at saturation");
        Checks.require(a != b, "the signal at saturation must differ from the signal at zero concentration");
        Checks.positiveFinite(kHalfMicromolar, "the half-saturating concentration (uM)");
        Checks.positiveFinite(n, "the Hill coefficient n");
    }

    /** Fractional saturation s = (F - a) / (b - a); inside (0, 1) on the valid range. */
    public double fraction(double signal) {
        return (signal - a) / (b - a);
    }

    /** True when the signal lies strictly between a and b. */
    public boolean inRange(double signal) {
        double s = fraction(signal);
        return s > 0 && s < 1;
    }

    /** c = K ((F - a) / (b - F))^(1/n), uM; NaN unless a &lt; F &lt; b (or b &lt; F &lt; a). */
    public double concentration(double signal) {
        if (!inRange(signal)) {
            return Double.NaN;
        }
        double u = (signal - a) / (b - signal);
        return kHalfMicromolar * (n == 1.0 ? u : Math.pow(u, 1.0 / n));
    }

    /** Fraction bound s = c^n / (c^n + K^n) for c >= 0 (uM), computed without overflow. */
    public double bound(double concentrationMicromolar) {
        Checks.require(concentrationMicromolar >= 0, "a concentration must be zero or positive, got "
                + concentrationMicromolar);
        if (concentrationMicromolar == 0) {
            return 0;
        }
        double q = Math.pow(kHalfMicromolar / concentrationMicromolar, n);
        return 1.0 / (1.0 + q);
    }

    /** F = a + (b - a) s(c); c in uM, >= 0 (infinity gives b). */
    public double signal(double concentrationMicromolar) {
        return a + (b - a) * bound(concentrationMicromolar);
    }

    /** dc/dF = c (b - a) / (n (F - a) (b - F)); NaN outside the range. */
    public double derivative(double signal) {
        double c = concentration(signal);
        return c * (b - a) / (n * (signal - a) * (b - signal));
    }

    /**
     * Gradient of the inverse c(F) with respect to (a, b, K, n):
     * dc/da = -c / (n (F - a)), dc/db = -c / (n (b - F)), dc/dK = c / K, dc/dn = -c ln(u) / n^2.
     * All NaN outside the range.
     */
    public double[] gradient(double signal) {
        double c = concentration(signal);
        if (Double.isNaN(c)) {
            return new double[] {Double.NaN, Double.NaN, Double.NaN, Double.NaN};
        }
        double u = (signal - a) / (b - signal);
        return new double[] {
            -c / (n * (signal - a)),
            -c / (n * (b - signal)),
            c / kHalfMicromolar,
            -c * Math.log(u) / (n * n)};
    }

    /**
     * Gradient of the forward model F(c) with respect to (a, b, K, n), for the standards fit and its
     * confidence band: dF/da = 1 - s, dF/db = s, dF/dK = -(b - a) n s (1 - s) / K,
     * dF/dn = (b - a) s (1 - s) ln(c / K); the last is 0 at c = 0.
     */
    public double[] forwardGradient(double concentrationMicromolar) {
        double s = bound(concentrationMicromolar);
        double span = b - a;
        double dn = concentrationMicromolar == 0 ? 0
                : span * s * (1 - s) * Math.log(concentrationMicromolar / kHalfMicromolar);
        return new double[] {1 - s, s, -span * n * s * (1 - s) / kHalfMicromolar, dn};
    }
}
