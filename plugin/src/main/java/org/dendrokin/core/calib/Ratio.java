package org.dendrokin.core.calib;

import java.util.LinkedHashMap;
import java.util.Locale;
import java.util.Map;

import org.dendrokin.core.Checks;

/**
 * Two-wavelength ratiometric indicator (Grynkiewicz, Poenie &amp; Tsien 1985, J Biol Chem 260:3440):
 * c = Kd beta (R - Rmin) / (Rmax - R), with R the ratio of the background-subtracted numerator and
 * denominator channels, Rmin and Rmax the ratios at zero and saturating calcium, and beta the denominator
 * channel's intensity at zero calcium over its intensity at saturation (Sf2/Sb2). Forward:
 * R = Rmin + (Rmax - Rmin) c / (c + Kd beta). Kd in uM; R, Rmin, Rmax, beta dimensionless. Optional
 * independent standard deviations of Kd, Rmin, Rmax and beta are propagated. Reference sheet s1.2.
 */
public final class Ratio extends HillBacked {
    private final double kdMicromolar;
    private final double beta;
    private final double[] sds;

    /**
     * @param kdMicromolar dissociation constant, uM, &gt; 0
     * @param rMin         ratio at zero calcium, &gt;= 0
     * @param rMax         ratio at saturation, &gt; rMin
     * @param beta         Sf2/Sb2 of the denominator channel, &gt; 0
     * @param sds          standard deviations of (Kd, Rmin, Rmax, beta), each &gt;= 0; none given means exact
     */
    public Ratio(double kdMicromolar, double rMin, double rMax, double beta, double... sds) {
        super(curve(kdMicromolar, rMin, rMax, beta), covariance(sds));
        this.kdMicromolar = kdMicromolar;
        this.beta = beta;
        this.sds = sds.length == 0 ? new double[4] : sds.clone();
    }

    private static HillCurve curve(double kdMicromolar, double rMin, double rMax, double beta) {
        Checks.positiveFinite(kdMicromolar, "kd_uM");
        Checks.nonNegativeFinite(rMin, "r_min");
        Checks.finite(rMax, "r_max");
        Checks.require(rMax > rMin, "r_max (" + fmt(rMax) + ") must be greater than r_min (" + fmt(rMin) + ")");
        Checks.positiveFinite(beta, "beta");
        return new HillCurve(rMin, rMax, kdMicromolar * beta, 1.0);
    }

    private static double[][] covariance(double[] sds) {
        if (sds.length == 0) {
            return null;
        }
        Checks.require(sds.length == 4, "give the standard deviations of kd_uM, r_min, r_max and beta");
        String[] names = {"kd_uM_sd", "r_min_sd", "r_max_sd", "beta_sd"};
        for (int i = 0; i < 4; i++) {
            Checks.nonNegativeFinite(sds[i], names[i]);
        }
        return Uncertainty.diagonal(sds);
    }

    /** Gradient with respect to (Kd, Rmin, Rmax, beta): the curve's K is Kd beta. */
    @Override
    double[] constantGradient(double signal) {
        double[] g = curve.gradient(signal);
        return new double[] {g[2] * beta, g[0], g[1], g[2] * kdMicromolar};
    }

    @Override
    public String method() {
        return "ratio";
    }

    @Override
    public SignalKind input() {
        return SignalKind.RATIO;
    }

    @Override
    public String[] rangeNames() {
        return new String[] {"Rmin", "Rmax"};
    }

    @Override
    public Map<String, Double> constants() {
        Map<String, Double> m = new LinkedHashMap<>();
        m.put("kd_uM", kdMicromolar);
        m.put("r_min", curve.a());
        m.put("r_max", curve.b());
        m.put("beta", beta);
        m.put("kd_uM_sd", sds[0]);
        m.put("r_min_sd", sds[1]);
        m.put("r_max_sd", sds[2]);
        m.put("beta_sd", sds[3]);
        return m;
    }

    @Override
    public String description() {
        return String.format(Locale.ROOT, "ratio calibration (Grynkiewicz, Poenie & Tsien 1985): "
                + "c = Kd beta (R - Rmin) / (Rmax - R) with Kd = %s uM, beta = %s, Rmin = %s, Rmax = %s",
                fmt(kdMicromolar), fmt(beta), fmt(curve.a()), fmt(curve.b()));
    }
}
