package org.dendrokin.core.calib;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.apache.commons.math3.distribution.ExponentialDistribution;
import org.apache.commons.math3.random.MersenneTwister;
import org.apache.commons.math3.stat.descriptive.moment.StandardDeviation;
import org.junit.jupiter.api.Test;

class LifetimePrecisionTest {
    @Test
    void meanOfNPhotonArrivalTimesHasSdTauOverRootN() {
        double tau = 2.5;
        ExponentialDistribution arrival = new ExponentialDistribution(new MersenneTwister(20261213L), tau);
        for (int photons : new int[] {50, 400}) {
            int repeats = 20_000;
            double[] means = new double[repeats];
            for (int r = 0; r < repeats; r++) {
                double sum = 0;
                for (int i = 0; i < photons; i++) {
                    sum += arrival.sample();
                }
                means[r] = sum / photons;
            }
            double simulated = new StandardDeviation().evaluate(means);
            // REF: Kollner & Wolfrum 1992 Chem Phys Lett 200:199, ideal single-exponential case, F = 1
            // [from memory: Kollner & Wolfrum 1992; fairly sure]; checked by Monte Carlo of exponential arrivals,
            // 2e4 seeded repeats: 2% covers the sampling error of the SD (0.5%)
            assertEquals(simulated, LifetimePrecision.sdNs(tau, photons), 0.02 * simulated, "SD (ns) with "
                    + photons + " photons");
        }
        assertTrue(Double.isNaN(LifetimePrecision.sdNs(tau, 0)), "no photons, no precision");
        assertTrue(Double.isNaN(LifetimePrecision.sdNs(-1, 100)), "no precision for a negative lifetime");
    }
}
