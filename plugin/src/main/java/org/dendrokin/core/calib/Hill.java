package org.dendrokin.core.calib;

import java.util.LinkedHashMap;
import java.util.Locale;
import java.util.Map;

import org.dendrokin.core.Checks;

/**
 * Indicator with cooperative binding (Hill form, reference sheet s1.3), e.g. a genetically encoded one:
 * F = Fmin + (Fmax - Fmin) c^n / (c^n + K^n), inverted as c = K ((F - Fmin) / (Fmax - F))^(1/n).
 * Intensities background subtracted, in the movie's units; K in uM; n dimensionless. Optional independent
 * standard deviations of K, n, Fmin and Fmax are propagated to the concentration.
 */
public final class Hill extends HillBacked {
    private final double[] sds;

    /**
     * @param kHalfMicromolar half-saturating concentration K, uM, &gt; 0
     * @param n               Hill coefficient, &gt; 0
     * @param fMin            intensity at zero concentration
     * @param fMax            intensity at saturation, &gt; fMin
     * @param sds             standard deviations of (K, n, Fmin, Fmax), each &gt;= 0; none given means exact
     */
    public Hill(double kHalfMicromolar, double n, double fMin, double fMax, double... sds) {
        super(curve(kHalfMicromolar, n, fMin, fMax), covariance(sds));
        this.sds = sds.length == 0 ? new double[4] : sds.clone();
    }

    private static HillCurve curve(double kHalfMicromolar, double n, double fMin, double fMax) {
        Checks.positiveFinite(kHalfMicromolar, "k_half_uM");
        Checks.positiveFinite(n, "n");
        Checks.finite(fMin, "f_min");
        Checks.finite(fMax, "f_max");
        Checks.require(fMax > fMin, "f_max (" + fmt(fMax) + ") must be greater than f_min (" + fmt(fMin) + ")");
        return new HillCurve(fMin, fMax, kHalfMicromolar, n);
    }

    private static double[][] covariance(double[] sds) {
        if (sds.length == 0) {
            return null;
        }
        Checks.require(sds.length == 4, "give the standard deviations of k_half_uM, n, f_min and f_max");
        String[] names = {"k_half_uM_sd", "n_sd", "f_min_sd", "f_max_sd"};
        for (int i = 0; i < 4; i++) {
            Checks.nonNegativeFinite(sds[i], names[i]);
        }
        // curve gradient order is (a, b, K, n)
        return Uncertainty.diagonal(sds[2], sds[3], sds[0], sds[1]);
    }

    @Override
    public String method() {
        return "hill";
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
        m.put("k_half_uM_sd", sds[0]);
        m.put("n_sd", sds[1]);
        m.put("f_min_sd", sds[2]);
        m.put("f_max_sd", sds[3]);
        return m;
    }

    @Override
    public String description() {
        return String.format(Locale.ROOT, "Hill calibration: c = K ((F - Fmin) / (Fmax - F))^(1/n) with "
                + "K = %s uM, n = %s, Fmin = %s, Fmax = %s",
                fmt(curve.kHalfMicromolar()), fmt(curve.n()), fmt(curve.a()), fmt(curve.b()));
    }
}
