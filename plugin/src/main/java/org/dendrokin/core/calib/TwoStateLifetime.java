package org.dendrokin.core.calib;

import java.util.LinkedHashMap;
import java.util.Locale;
import java.util.Map;

import org.dendrokin.core.Checks;
import org.dendrokin.core.units.Unit;

/**
 * The fraction of a lifetime sensor in its bound (active, FRET) state from the mean lifetime, by the two-state
 * model used for FLIM-FRET reporters of kinase activity (Yasuda et al. 2006, Nat Neurosci 9:283): the donor decays
 * with lifetime tau_free when the sensor is free and tau_bound &lt; tau_free when bound. With amplitudes
 * a_bound = P and a_free = 1 - P (the fractions of molecules), the mean (intensity-weighted) lifetime, which is the
 * mean photon arrival time, is
 *
 * <pre>
 *     tau_m = (a_free tau_free^2 + a_bound tau_bound^2) / (a_free tau_free + a_bound tau_bound)
 * </pre>
 *
 * and solved for P:
 *
 * <pre>
 *     P = tau_free (tau_free - tau_m) / ((tau_free - tau_bound) (tau_free + tau_bound - tau_m))
 * </pre>
 *
 * Lifetimes in ns; P dimensionless (unit "fraction bound"). P = 0 at tau_m = tau_free and 1 at tau_bound; it is
 * finite for 0 &lt; tau_m &lt; tau_free + tau_bound and NaN elsewhere. Values a little below 0 or above 1 are noise
 * around a real value and are kept, not clipped, so that averages over a baseline stay unbiased. The relation
 * needs the mean lifetime of the whole decay (not an amplitude-weighted mean, and not a one-exponential fit to a
 * two-exponential decay) and equal brightness per molecule of the two states apart from the quenching that sets
 * their lifetimes. Optional independent SDs of tau_free and tau_bound are propagated to first order (delta method).
 */
public final class TwoStateLifetime implements Calibration {
    private final double tauFreeNs;
    private final double tauBoundNs;
    private final double tauFreeSdNs;
    private final double tauBoundSdNs;

    /**
     * @param tauFreeNs    lifetime of the free (inactive) sensor, ns, &gt; 0
     * @param tauBoundNs   lifetime of the bound (active) sensor, ns, 0 &lt; tauBoundNs &lt; tauFreeNs
     * @param tauFreeSdNs  SD of tauFreeNs, ns, &gt;= 0 (0: exact)
     * @param tauBoundSdNs SD of tauBoundNs, ns, &gt;= 0 (0: exact)
     */
    public TwoStateLifetime(double tauFreeNs, double tauBoundNs, double tauFreeSdNs, double tauBoundSdNs) {
        Checks.positiveFinite(tauFreeNs, "tau_free_ns");
        Checks.positiveFinite(tauBoundNs, "tau_bound_ns");
        if (!(tauBoundNs < tauFreeNs)) {
            throw new IllegalArgumentException("tau_bound_ns (" + Format.number(tauBoundNs)
                    + ") must be shorter than tau_free_ns (" + Format.number(tauFreeNs) + ")");
        }
        Checks.nonNegativeFinite(tauFreeSdNs, "tau_free_ns_sd");
        Checks.nonNegativeFinite(tauBoundSdNs, "tau_bound_ns_sd");
        this.tauFreeNs = tauFreeNs;
        this.tauBoundNs = tauBoundNs;
        this.tauFreeSdNs = tauFreeSdNs;
        this.tauBoundSdNs = tauBoundSdNs;
    }

    /** Exact reference lifetimes. */
    public TwoStateLifetime(double tauFreeNs, double tauBoundNs) {
        this(tauFreeNs, tauBoundNs, 0, 0);
    }

    public double tauFreeNs() {
        return tauFreeNs;
    }

    public double tauBoundNs() {
        return tauBoundNs;
    }

    @Override
    public String method() {
        return "lifetime";
    }

    @Override
    public SignalKind input() {
        return SignalKind.LIFETIME;
    }

    @Override
    public Unit outputUnit() {
        return Unit.FRACTION_BOUND;
    }

    private boolean inDomain(double tauMNs) {
        return tauMNs > 0 && tauMNs < tauFreeNs + tauBoundNs;
    }

    /** The fraction bound P for a mean lifetime (ns); NaN outside 0 &lt; tau_m &lt; tau_free + tau_bound. */
    @Override
    public double concentrationMicromolar(double tauMNs) {
        if (!inDomain(tauMNs)) {
            return Double.NaN;
        }
        return fraction(tauMNs, tauFreeNs, tauBoundNs);
    }

    private static double fraction(double tauM, double tauF, double tauB) {
        return tauF * (tauF - tauM) / ((tauF - tauB) * (tauF + tauB - tauM));
    }

    /** The mean lifetime (ns) of a mixture with fraction bound P, by the definition in the class comment. */
    @Override
    public double signal(double fractionBound) {
        double aFree = 1 - fractionBound;
        return (aFree * tauFreeNs * tauFreeNs + fractionBound * tauBoundNs * tauBoundNs)
                / (aFree * tauFreeNs + fractionBound * tauBoundNs);
    }

    /** dP/dtau_m = -tau_free tau_bound / ((tau_free - tau_bound) (tau_free + tau_bound - tau_m)^2), 1/ns. */
    @Override
    public double derivative(double tauMNs) {
        if (!inDomain(tauMNs)) {
            return Double.NaN;
        }
        double d2 = tauFreeNs + tauBoundNs - tauMNs;
        return -tauFreeNs * tauBoundNs / ((tauFreeNs - tauBoundNs) * d2 * d2);
    }

    /** The fraction bound itself (0 at tau_free, 1 at tau_bound). */
    @Override
    public double saturation(double tauMNs) {
        return concentrationMicromolar(tauMNs);
    }

    /**
     * First-order SD of P (dimensionless) from the SDs of the two reference lifetimes, with
     * dP/dtau_free = ((2 tau_f - tau_m) D1 D2 - N (D1 + D2)) / (D1 D2)^2 and
     * dP/dtau_bound = -N (D1 - D2) / (D1 D2)^2, where N = tau_f (tau_f - tau_m), D1 = tau_f - tau_b and
     * D2 = tau_f + tau_b - tau_m. Zero when neither SD was given; NaN outside the domain.
     */
    @Override
    public double concentrationSdMicromolar(double tauMNs) {
        if (!inDomain(tauMNs)) {
            return Double.NaN;
        }
        double n = tauFreeNs * (tauFreeNs - tauMNs);
        double d1 = tauFreeNs - tauBoundNs;
        double d2 = tauFreeNs + tauBoundNs - tauMNs;
        double den = d1 * d2;
        double dFree = ((2 * tauFreeNs - tauMNs) * den - n * (d1 + d2)) / (den * den);
        double dBound = -n * (d1 - d2) / (den * den);
        return Math.hypot(dFree * tauFreeSdNs, dBound * tauBoundSdNs);
    }

    /** Lifetime of the free sensor (P = 0). */
    @Override
    public double rangeStart() {
        return tauFreeNs;
    }

    /** Lifetime of the bound sensor (P = 1). */
    @Override
    public double rangeEnd() {
        return tauBoundNs;
    }

    @Override
    public String[] rangeNames() {
        return new String[] {"tau_free", "tau_bound"};
    }

    @Override
    public boolean saturates() {
        return false;
    }

    @Override
    public double hillCoefficient() {
        return Double.NaN;
    }

    @Override
    public Map<String, Double> constants() {
        Map<String, Double> m = new LinkedHashMap<>();
        m.put("tau_free_ns", tauFreeNs);
        m.put("tau_bound_ns", tauBoundNs);
        m.put("tau_free_ns_sd", tauFreeSdNs);
        m.put("tau_bound_ns_sd", tauBoundSdNs);
        return m;
    }

    @Override
    public String description() {
        return String.format(Locale.ROOT, "fraction of bound sensor from the mean lifetime by the two-state model "
                + "(Yasuda et al. 2006): P = tau_free (tau_free - tau_m) / ((tau_free - tau_bound) (tau_free + "
                + "tau_bound - tau_m)) with tau_free = %s ns and tau_bound = %s ns", Format.number(tauFreeNs),
                Format.number(tauBoundNs));
    }
}
