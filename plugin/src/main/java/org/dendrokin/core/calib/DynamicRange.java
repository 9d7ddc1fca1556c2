package org.dendrokin.core.calib;

import java.util.LinkedHashMap;
import java.util.Locale;
import java.util.Map;

import org.dendrokin.core.Checks;

/**
 * Concentration from dF/F0 for an indicator whose Fmin cannot be measured in the cell, using its dynamic
 * range Rf = Fmax/Fmin and a known resting concentration c0 (Maravall, Mainen, Sabatini &amp; Svoboda 2000,
 * Biophys J 78:2655; relations derived in reference sheet s1.4). With x = F/Fmin:
 * <pre>
 *   x0 = F0/Fmin = 1 + (Rf - 1) c0^n / (c0^n + Kd^n)
 *   x  = (1 + dF/F0) x0
 *   c  = Kd ((x - 1) / (Rf - x))^(1/n)
 * </pre>
 * n = 1 (the default) is 1:1 binding. The signal is dF/F0 (dimensionless); Kd and c0 in uM. Independent
 * standard deviations of (Kd, Rf, c0, n) are propagated to c by the chain rule through x0.
 */
public final class DynamicRange implements Calibration {
    private final double kdMicromolar;
    private final double rf;
    private final double restingMicromolar;
    private final double n;
    private final double[] sds;
    private final double[][] covariance;
    private final HillCurve curve;
    private final double x0;
    private final double s0;

    /**
     * @param kdMicromolar      dissociation constant, uM, &gt; 0
     * @param rf                dynamic range Fmax/Fmin, &gt; 1
     * @param restingMicromolar resting concentration c0 at F0, uM, &gt; 0
     * @param n                 Hill coefficient, &gt; 0 (1 for 1:1 binding)
     * @param sds               standard deviations of (Kd, Rf, c0, n), each &gt;= 0; none given means exact
     */
    public DynamicRange(double kdMicromolar, double rf, double restingMicromolar, double n, double... sds) {
        this.kdMicromolar = Checks.positiveFinite(kdMicromolar, "kd_uM");
        Checks.finite(rf, "rf");
        Checks.require(rf > 1, "rf (" + Format.number(rf) + ") must be greater than 1, since it is Fmax/Fmin and "
                + "Fmax must exceed Fmin");
        this.rf = rf;
        this.restingMicromolar = Checks.positiveFinite(restingMicromolar, "resting_uM");
        this.n = Checks.positiveFinite(n, "n");
        if (sds.length == 0) {
            this.sds = new double[4];
            this.covariance = null;
        } else {
            Checks.require(sds.length == 4, "give the standard deviations of kd_uM, rf, resting_uM and n");
            String[] names = {"kd_uM_sd", "rf_sd", "resting_uM_sd", "n_sd"};
            for (int i = 0; i < 4; i++) {
                Checks.nonNegativeFinite(sds[i], names[i]);
            }
            this.sds = sds.clone();
            this.covariance = Uncertainty.diagonal(sds);
        }
        this.curve = new HillCurve(1.0, rf, kdMicromolar, n);
        this.s0 = curve.bound(restingMicromolar);
        this.x0 = 1 + (rf - 1) * s0;
    }

    public DynamicRange(double kdMicromolar, double rf, double restingMicromolar) {
        this(kdMicromolar, rf, restingMicromolar, 1.0);
    }

    /** F0/Fmin implied by the resting concentration (dimensionless). */
    public double restingOverMinimum() {
        return x0;
    }

    @Override
    public String method() {
        return "dynamic-range";
    }

    @Override
    public SignalKind input() {
        return SignalKind.DF_F0;
    }

    @Override
    public double concentrationMicromolar(double signal) {
        if (!inRange(signal)) {
            return Double.NaN;
        }
        return curve.concentration((1 + signal) * x0);
    }

    @Override
    public double signal(double concentrationMicromolar) {
        return curve.signal(concentrationMicromolar) / x0 - 1;
    }

    @Override
    public double derivative(double signal) {
        if (!inRange(signal)) {
            return Double.NaN;
        }
        return curve.derivative((1 + signal) * x0) * x0;
    }

    /** The ends are compared in dF/F0 itself, so that rounding in (1 + dF/F0) x0 cannot move them. */
    private boolean inRange(double signal) {
        return signal > rangeStart() && signal < rangeEnd();
    }

    @Override
    public double saturation(double signal) {
        return curve.fraction((1 + signal) * x0);
    }

    @Override
    public double concentrationSdMicromolar(double signal) {
        if (!inRange(signal)) {
            return Double.NaN;
        }
        double x = (1 + signal) * x0;
        double[] g = curve.gradient(x);  // with respect to (1, Rf, Kd, n) of the curve in x
        double dcdx = curve.derivative(x);
        double ds0 = s0 * (1 - s0);
        double dx0dKd = -(rf - 1) * n * ds0 / kdMicromolar;
        double dx0dRf = s0;
        double dx0dC0 = (rf - 1) * n * ds0 / restingMicromolar;
        double dx0dN = (rf - 1) * ds0 * Math.log(restingMicromolar / kdMicromolar);
        double k = dcdx * (1 + signal);
        double[] gradient = {
            g[2] + k * dx0dKd,
            g[1] + k * dx0dRf,
            k * dx0dC0,
            g[3] + k * dx0dN};
        return Uncertainty.sd(gradient, covariance);
    }

    @Override
    public double rangeStart() {
        return 1 / x0 - 1;
    }

    @Override
    public double rangeEnd() {
        return rf / x0 - 1;
    }

    @Override
    public String[] rangeNames() {
        return new String[] {"the dF/F0 of zero calcium", "the dF/F0 of saturation (dF/F0max)"};
    }

    @Override
    public double hillCoefficient() {
        return n;
    }

    @Override
    public Map<String, Double> constants() {
        Map<String, Double> m = new LinkedHashMap<>();
        m.put("kd_uM", kdMicromolar);
        m.put("rf", rf);
        m.put("resting_uM", restingMicromolar);
        m.put("n", n);
        m.put("kd_uM_sd", sds[0]);
        m.put("rf_sd", sds[1]);
        m.put("resting_uM_sd", sds[2]);
        m.put("n_sd", sds[3]);
        return m;
    }

    @Override
    public String description() {
        return String.format(Locale.ROOT, "dynamic-range calibration (Maravall et al. 2000): dF/F0 to "
                + "concentration with Kd = %s uM, Rf = Fmax/Fmin = %s, resting concentration %s uM, n = %s "
                + "(implied F0/Fmin = %s, saturation at dF/F0 = %s)",
                Format.number(kdMicromolar), Format.number(rf), Format.number(restingMicromolar),
                Format.number(n), Format.number(x0), Format.number(rangeEnd()));
    }
}
