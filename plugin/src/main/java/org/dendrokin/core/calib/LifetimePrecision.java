package org.dendrokin.core.calib;

/**
 * The photon-count-limited precision of a mean fluorescence lifetime. For a single-exponential decay with lifetime
 * tau, photon arrival times are exponentially distributed with mean and SD tau, so the mean of N arrival times has
 * SD tau / sqrt(N) (Kollner &amp; Wolfrum 1992, Chem Phys Lett 200:199, "How many photons are necessary for
 * fluorescence-lifetime measurements?", the ideal case with figure of merit F = 1). Real detectors, a finite
 * time window and background photons give F &gt; 1, so this SD is a lower bound; for a mixture of lifetimes it is
 * the usual working approximation.
 */
public final class LifetimePrecision {
    private LifetimePrecision() {
    }

    /**
     * SD of a mean lifetime, tau / sqrt(N).
     *
     * @param lifetimeNs mean lifetime, ns
     * @param photons    photons behind it, N (need not be a whole number after band averaging)
     * @return the SD in ns; NaN when the lifetime is not positive or N is not positive
     */
    public static double sdNs(double lifetimeNs, double photons) {
        if (!(lifetimeNs > 0) || !(photons > 0)) {
            return Double.NaN;
        }
        return lifetimeNs / Math.sqrt(photons);
    }
}
