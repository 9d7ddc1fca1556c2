package org.dendrokin.core.calib;

import java.util.LinkedHashMap;
import java.util.Locale;
import java.util.Map;

import org.dendrokin.core.Checks;

/**
 * Single-wavelength indicator with 1:1 binding (Grynkiewicz, Poenie &amp; Tsien 1985, J Biol Chem 260:3440):
 * c = Kd (F - Fmin) / (Fmax - F), forward F = Fmin + (Fmax - Fmin) c / (c + Kd). F, Fmin and Fmax are
 * background-subtracted intensities in the movie's units; Kd in uM. Optional standard deviations of Kd,
 * Fmin and Fmax (independent) are propagated to the concentration. Reference sheet s1.1.
 */
public final class SingleWavelength extends HillBacked {
    private final double kdSdMicromolar;
    private final double fMinSd;
    private final double fMaxSd;

    /**
     * @param kdMicromolar   dissociation constant, uM, &gt; 0
     * @param fMin           intensity at zero calcium (background subtracted)
     * @param fMax           intensity at saturation, &gt; fMin
     * @param kdSdMicromolar standard deviation of Kd, uM, &gt;= 0 (0: exact)
     * @param fMinSd         standard deviation of Fmin, &gt;= 0
     * @param fMaxSd         standard deviation of Fmax, &gt;= 0
     */
    public SingleWavelength(double kdMicromolar, double fMin, double fMax,
                            double kdSdMicromolar, double fMinSd, double fMaxSd) {
        super(curve(kdMicromolar, fMin, fMax), Uncertainty.diagonal(
                Checks.nonNegativeFinite(fMinSd, "f_min_sd"), Checks.nonNegativeFinite(fMaxSd, "f_max_sd"),
                Checks.nonNegativeFinite(kdSdMicromolar, "kd_uM_sd"), 0));
        this.kdSdMicromolar = kdSdMicromolar;
        this.fMinSd = fMinSd;
        this.fMaxSd = fMaxSd;
    }

    public SingleWavelength(double kdMicromolar, double fMin, double fMax) {
        this(kdMicromolar, fMin, fMax, 0, 0, 0);
    }

    private static HillCurve curve(double kdMicromolar, double fMin, double fMax) {
        Checks.positiveFinite(kdMicromolar, "kd_uM");
        Checks.finite(fMin, "f_min");
        Checks.finite(fMax, "f_max");
        Checks.require(fMax > fMin, "f_max (" + fmt(fMax) + ") must be greater than f_min (" + fmt(fMin) + ")");
        return new HillCurve(fMin, fMax, kdMicromolar, 1.0);
    }

    @Override
    public String method() {
        return "single-wavelength";
    }

    @Override
    public SignalKind input() {
        return SignalKind.INTENSITY;
    }

    @Override
    public Map<String, Double> constants() {
        Map<String, Double> m = new LinkedHashMap<>();
        m.put("kd_uM", curve.kHalfMicromolar());
        m.put("f_min", curve.a());
        m.put("f_max", curve.b());
        m.put("kd_uM_sd", kdSdMicromolar);
        m.put("f_min_sd", fMinSd);
        m.put("f_max_sd", fMaxSd);
        return m;
    }

    @Override
    public String description() {
        return String.format(Locale.ROOT, "single-wavelength calibration (Grynkiewicz, Poenie & Tsien 1985): "
                + "c = Kd (F - Fmin) / (Fmax - F) with Kd = %s uM, Fmin = %s, Fmax = %s",
                fmt(curve.kHalfMicromolar()), fmt(curve.a()), fmt(curve.b()));
    }
}
