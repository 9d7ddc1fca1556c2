package org.dendrokin.core.model;

import static org.junit.jupiter.api.Assertions.assertEquals;

import java.util.List;

import org.apache.commons.math3.ode.FirstOrderDifferentialEquations;
import org.apache.commons.math3.ode.nonstiff.DormandPrince853Integrator;
import org.dendrokin.core.Progress;

/**
 * Test helper: the chemical master equation of a one-way chain of states, integrated with Commons Math, and a
 * check of the stochastic mode's mean count in well-mixed voxels against it. Shared by the stochastic tests of
 * networks built in Java and read from SBML.
 */
public final class MasterEquation {
    private MasterEquation() {
    }

    /** Node positions of a domain, um. */
    public static double[] nodes(Domain d) {
        double[] x = new double[d.nodeCount()];
        for (int i = 0; i < x.length; i++) {
            x[i] = d.nodeUm(i);
        }
        return x;
    }

    /**
     * Mean and variance of a count over time for a chain where the only event takes state j (j firings so far) to
     * j + 1 at rate a[j], from the chemical master equation dp_j/dt = a[j-1] p_(j-1) - a[j] p_j, integrated by
     * Commons Math. count[j] is the observed count in state j. Returns {mean[t], variance[t]}.
     */
    public static double[][] chain(double[] a, double[] count, double[] times) {
        int states = a.length;
        FirstOrderDifferentialEquations cme = new FirstOrderDifferentialEquations() {
            @Override
            public int getDimension() {
                return states;
            }

            @Override
            public void computeDerivatives(double t, double[] p, double[] dp) {
                for (int j = 0; j < states; j++) {
                    dp[j] = -a[j] * p[j] + (j > 0 ? a[j - 1] * p[j - 1] : 0);
                }
            }
        };
        double[] p = new double[states];
        p[0] = 1;
        double[][] out = new double[2][times.length];
        double t = 0;
        DormandPrince853Integrator integrator = new DormandPrince853Integrator(1e-10, 10, 1e-14, 1e-12);
        for (int f = 0; f < times.length; f++) {
            if (times[f] > t) {
                integrator.integrate(cme, t, p, times[f], p);
                t = times[f];
            }
            double mean = 0;
            double second = 0;
            for (int j = 0; j < states; j++) {
                mean += p[j] * count[j];
                second += p[j] * count[j] * count[j];
            }
            out[0][f] = mean;
            out[1][f] = second - mean * mean;
        }
        return out;
    }

    /**
     * Runs independent well-mixed voxels (no diffusion, 1 um^3 each, one molecule per concentration unit) and
     * checks the mean count of {@code observed} over all inner voxels and 20 runs against the exact mean, within
     * 4.5 standard errors from the exact variance.
     */
    public static void assertMeanMatches(ReactionNetwork net, String observed, double[] times, double[][] exact,
            String what) {
        Domain domain = new Domain(100, 1, Boundary.NO_FLUX);
        double[] x = nodes(domain);
        int runs = 20;
        double[] sum = new double[times.length];
        int samples = 0;
        for (int r = 0; r < runs; r++) {
            StochasticEnsemble.Voxels v = new StochasticEnsemble.Voxels(net, domain, times, x, List.of(), observed,
                    1.0, StochasticEnsemble.seedOf(2024, r));
            double[] out = v.simulate(Progress.NONE);
            for (int i = 1; i < x.length - 1; i++) {
                for (int f = 0; f < times.length; f++) {
                    sum[f] += out[f * x.length + i];
                }
            }
            samples += x.length - 2;
        }
        for (int f = 0; f < times.length; f++) {
            double se = Math.sqrt(exact[1][f] / samples);
            assertEquals(exact[0][f], sum[f] / samples, 4.5 * se, what + " at t = " + times[f] + " s");
        }
    }
}
