package org.dendrokin.core.calib;

import java.util.LinkedHashMap;
import java.util.Locale;
import java.util.Map;

import org.dendrokin.core.Checks;

/**
 * A Hill curve fitted to standards ({@link StandardsFit}), with the covariance of its four parameters on
 * the scale they were fitted on: (Fmin, Fmax, ln K, ln n). The covariance feeds both the per-sample
 * concentration SD (through dc/dtheta) and the confidence band of the fitted curve (through dF/dtheta).
 */
public final class FittedHill extends HillBacked {
    private final double[][] covariance;

    /**
     * @param curve      fitted curve; a = intensity at zero concentration, b = intensity at saturation
     * @param covariance 4 x 4 covariance of (a, b, ln K, ln n), or null when unknown. Not modified.
     */
    public FittedHill(HillCurve curve, double[][] covariance) {
        super(curve, covariance);
        if (covariance != null) {
            Checks.require(covariance.length == 4 && covariance[0].length == 4,
                    "the covariance of a fitted Hill curve is 4 x 4");
        }
        this.covariance = Uncertainty.copy(covariance);
    }

    /** The covariance of (Fmin, Fmax, ln K, ln n), or null. */
    public double[][] covariance() {
        return Uncertainty.copy(covariance);
    }

    @Override
    double[] constantGradient(double signal) {
        double[] g = curve.gradient(signal);
        return new double[] {g[0], g[1], g[2] * curve.kHalfMicromolar(), g[3] * curve.n()};
    }

    /** Delta-method SD of the fitted curve's intensity at a concentration (uM): sqrt(h^T C h), h = dF/dtheta. */
    public double signalSd(double concentrationMicromolar) {
        double[] g = curve.forwardGradient(concentrationMicromolar);
        double[] h = {g[0], g[1], g[2] * curve.kHalfMicromolar(), g[3] * curve.n()};
        return Uncertainty.sd(h, covariance);
    }

    @Override
    public String method() {
        return "standards";
    }

    @Override
    public SignalKind input() {
        return SignalKind.INTENSITY;
    }

    @Override
    public Map<String, Double> constants() {
        Map<String, Double> m = new LinkedHashMap<>();
        m.put("k_half_uM", curve.kHalfMicromolar());
        m.put("n", curve.n());
        m.put("f_min", curve.a());
        m.put("f_max", curve.b());
        return m;
    }

    @Override
    public String description() {
        return String.format(Locale.ROOT, "standards calibration, Hill form fitted by Levenberg-Marquardt: "
                + "c = K ((F - Fmin) / (Fmax - F))^(1/n) with K = %s uM, n = %s, Fmin = %s, Fmax = %s",
                fmt(curve.kHalfMicromolar()), fmt(curve.n()), fmt(curve.a()), fmt(curve.b()));
    }
}
