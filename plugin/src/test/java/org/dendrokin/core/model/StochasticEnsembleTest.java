package org.dendrokin.core.model;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.List;

import org.dendrokin.core.Progress;
import org.junit.jupiter.api.Test;

class StochasticEnsembleTest {
    @Test
    void birthDeathIsPoissonWithMeanAndVarianceKbOverKd() {
        double kb = 10;
        double kd = 1;
        List<String> names = List.of("X");
        ReactionNetwork net = new ReactionNetwork(names, new double[] {0}, new double[] {0}, List.of(
                new ReactionNetwork.Reaction("birth", new double[] {1}, Expression.constant(kb), 0),
                new ReactionNetwork.Reaction("death", new double[] {-1},
                        ReactionNetwork.massAction(new double[] {1}, new double[1], kd, 0), kd)));
        // 1 molecule per unit per um^3 and dx = 1 um: every inner voxel holds 1 um^3, so counts = values.
        Domain domain = new Domain(100, 1, Boundary.NO_FLUX);
        double[] x = MasterEquation.nodes(domain);
        double[] times = new double[11];
        for (int f = 0; f < times.length; f++) {
            times[f] = 10 + 3 * f;
        }
        int runs = 2;
        StochasticSettings settings = new StochasticSettings(runs, 77, 2, 1.0);
        // Keep every run: the ensemble mean alone would hide the distribution.
        double sum = 0;
        double sumSq = 0;
        int count = 0;
        for (int r = 0; r < runs; r++) {
            StochasticEnsemble.Voxels v = new StochasticEnsemble.Voxels(net, domain, times, x, List.of(), "X", 1.0,
                    StochasticEnsemble.seedOf(settings.seed(), r));
            double[] out = v.simulate(Progress.NONE);
            for (int f = 0; f < times.length; f++) {
                for (int i = 1; i < x.length - 1; i++) {
                    double c = out[f * x.length + i];
                    assertEquals(Math.rint(c), c, 1e-12, "whole molecules");
                    sum += c;
                    sumSq += c * c;
                    count++;
                }
            }
        }
        double mean = sum / count;
        double var = (sumSq - count * mean * mean) / (count - 1);
        // Frames 3 s apart: correlation exp(-3) = 0.05, so the samples are nearly independent.
        double seMean = Math.sqrt(kb / kd / count);
        // Poisson: var(sample variance) ~ (mu4 - sigma^4)/N with mu4 = lambda + 3 lambda^2.
        double seVar = Math.sqrt((kb / kd + 2 * Math.pow(kb / kd, 2)) / count);
        // REF: Gillespie 1977; immigration-death stationary law Poisson(kb/kd), mean = 10 [published]; sheet s7.2
        assertEquals(10.0, mean, 4.5 * seMean, "stationary mean count");
        // REF: as above, variance = kb/kd = 10 [published]; sheet s7.2
        assertEquals(10.0, var, 4.5 * seVar, "stationary variance of the count");
    }

    @Test
    void dimerisationCountsMoleculePairsAsTheMasterEquationDoes() {
        double k = 0.01;
        int n0 = 10;
        ReactionNetwork net = new ReactionNetwork(List.of("A"), new double[] {0}, new double[] {n0}, List.of(
                new ReactionNetwork.Reaction("dimerisation", new double[] {-2},
                        ReactionNetwork.massAction(new double[] {2}, new double[1], k, 0), 2 * k * n0)));
        double[] times = {1, 3, 6, 12, 25, 50};
        int states = n0 / 2 + 1;
        double[] pairs = new double[states];
        double[] squares = new double[states];
        double[] count = new double[states];
        for (int j = 0; j < states; j++) {
            int n = n0 - 2 * j;
            count[j] = n;
            // omega = 1 molecule per uM in a 1 um^3 voxel, so k n (n - 1) / omega = k n (n - 1)
            pairs[j] = k * n * (n - 1);
            squares[j] = k * n * n;
        }
        // REF: Gillespie 1977, propensity c n (n - 1) / 2 with c = 2 k / omega for 2A -> [published];
        // mean from the chemical master equation integrated with Commons Math DormandPrince853 [common practice]
        double[][] exact = MasterEquation.chain(pairs, count, times);
        double[][] wrong = MasterEquation.chain(squares, count, times);
        // the check can tell the two propensities apart: n^2 would sit many standard errors away
        double se = Math.sqrt(exact[1][3] / (20 * 99.0));
        assertTrue(Math.abs(wrong[0][3] - exact[0][3]) > 10 * se, "n^2 and n (n - 1) differ detectably");
        MasterEquation.assertMeanMatches(net, "A", times, exact, "mean count of A under 2A -> 0");
    }

    @Test
    void heterodimerisationCountsProductsOfTheTwoCounts() {
        double k = 0.02;
        int a0 = 8;
        int b0 = 5;
        List<String> names = List.of("A", "B", "C");
        ReactionNetwork net = new ReactionNetwork(names, new double[3], new double[] {a0, b0, 0}, List.of(
                new ReactionNetwork.Reaction("binding", ReactionNetwork.stoichiometry(names, "A", -1, "B", -1, "C", 1),
                        ReactionNetwork.massAction(new double[] {1, 1, 0}, new double[3], k, 0), k * a0)));
        double[] times = {1, 3, 6, 12, 25};
        int states = b0 + 1;
        double[] rate = new double[states];
        double[] count = new double[states];
        for (int j = 0; j < states; j++) {
            count[j] = a0 - j;
            rate[j] = k * (a0 - j) * (b0 - j);
        }
        // REF: Gillespie 1977, propensity c nA nB with c = k / omega for A + B -> C [published];
        // mean from the chemical master equation integrated with Commons Math DormandPrince853 [common practice]
        double[][] exact = MasterEquation.chain(rate, count, times);
        MasterEquation.assertMeanMatches(net, "A", times, exact, "mean count of A under A + B -> C");
    }

    @Test
    void fractionalStoichiometryIsRefusedWithTheReactionNamed() {
        // half a molecule per firing, as an SBML reaction between compartments of sizes 1 and 2 gives
        ReactionNetwork net = new ReactionNetwork(List.of("A", "B"), new double[2], new double[] {1, 0}, List.of(
                new ReactionNetwork.Reaction("transport", new double[] {-1, 0.5},
                        ReactionNetwork.massAction(new double[] {1, 0}, new double[2], 1, 0), 1)));
        Domain domain = new Domain(2, 1, Boundary.NO_FLUX);
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class, () -> StochasticEnsemble.run(net,
                domain, new double[] {1}, MasterEquation.nodes(domain), List.of(), "A",
                new StochasticSettings(1, 1, 1, 1.0), Progress.NONE));
        assertTrue(e.getMessage().contains("transport") && e.getMessage().contains("whole molecules"), e.getMessage());
    }

    @Test
    void ensembleMeanOfStochasticDiffusionMatchesTheDeterministicProfile() {
        List<String> names = List.of("X");
        ReactionNetwork net = new ReactionNetwork(names, new double[] {1.0}, new double[] {0}, List.of());
        Domain domain = new Domain(20, 0.5, Boundary.NO_FLUX);
        double[] x = MasterEquation.nodes(domain);
        double[] times = {1.5};
        List<Stimulus> pulse = List.of(Stimulus.pulse(0, 10, 1.5, 40));
        int runs = 300;
        StochasticEnsemble.Summary s = StochasticEnsemble.run(net, domain, times, x, pulse, "X",
                new StochasticSettings(runs, 5, 2, 1.0), Progress.NONE);
        NetworkRun det = NetworkRun.prepare(net, domain, times, x, pulse,
                SolverSettings.DEFAULT.withFixedStepS(1e-3).withSmoothing(false).withSpatialOrder(2), "X");
        double[][] out = {new double[x.length]};
        det.solve(out);
        int outside = 0;
        for (int i = 0; i < x.length; i++) {
            // Independent walkers give a count with variance at most its mean (Poisson-binomial); where every run
            // saw nothing the sample sd is 0, so the expected variance (count / voxel volume^2) bounds it instead.
            double volume = (i == 0 || i == x.length - 1) ? 0.25 : 0.5;
            double variance = Math.max(s.sd()[i] * s.sd()[i], out[0][i] / volume);
            double se = Math.sqrt(variance / runs);
            if (Math.abs(s.mean()[i] - out[0][i]) > 4.5 * se) {
                outside++;
            }
        }
        // REF: the next-subvolume jump rates D/h^2 make the mean obey the discretised diffusion equation
        // [published: Elf & Ehrenberg 2004, from memory: fairly sure]; sheet s7.3. 4.5 standard errors per point.
        assertEquals(0, outside, "points where the ensemble mean is more than 4.5 standard errors off");
    }

    @Test
    void theSameSeedGivesTheSameEnsembleWhateverTheThreads() {
        List<String> names = List.of("X");
        ReactionNetwork net = new ReactionNetwork(names, new double[] {0.5}, new double[] {0}, List.of(
                new ReactionNetwork.Reaction("death", new double[] {-1},
                        ReactionNetwork.massAction(new double[] {1}, new double[1], 0.3, 0), 0.3)));
        Domain domain = new Domain(10, 0.5, Boundary.FIXED);
        double[] x = MasterEquation.nodes(domain);
        double[] times = {0, 1, 2};
        List<Stimulus> pulse = List.of(Stimulus.pulse(0, 5, 1, 20));
        StochasticEnsemble.Summary one = StochasticEnsemble.run(net, domain, times, x, pulse, "X",
                new StochasticSettings(6, 11, 1, 1.0), Progress.NONE);
        StochasticEnsemble.Summary two = StochasticEnsemble.run(net, domain, times, x, pulse, "X",
                new StochasticSettings(6, 11, 2, 1.0), Progress.NONE);
        assertArrayEquals(one.mean(), two.mean(), 0, "mean with 1 and 2 threads");
        assertTrue(one.events() > 0, "events happened");
    }

    @Test
    void bufferedCalciumRunsStochasticallyAndKeepsTheBufferTotal() {
        ReactionNetwork net = ReactionNetwork.bufferedDiffusion(50, 0, 20, 1, 10, 5);
        Domain domain = new Domain(10, 0.5, Boundary.NO_FLUX);
        double[] x = MasterEquation.nodes(domain);
        double[] times = {0.05, 0.2};
        List<Stimulus> pulse = List.of(Stimulus.pulse(0, 5, 1, 5).onSpecies("Ca"));
        // 20 uM buffer in a 0.5 um^3 voxel is about 6000 molecules: the run is short but real
        StochasticEnsemble.Voxels v = new StochasticEnsemble.Voxels(net, domain, times, x, pulse, "B",
                StochasticSettings.MICROMOLAR_PER_UM3, 3);
        double[] free = v.simulate(Progress.NONE);
        StochasticEnsemble.Voxels w = new StochasticEnsemble.Voxels(net, domain, times, x, pulse, "CaB",
                StochasticSettings.MICROMOLAR_PER_UM3, 3);
        double[] bound = w.simulate(Progress.NONE);
        for (int i = 0; i < free.length; i++) {
            // Identity: the immobile buffer is either free or bound, molecule by molecule (same seed, same run)
            assertEquals(20.0, free[i] + bound[i], 0.01,
                    "B + CaB at sample " + i + " (uM; rest level rounded to whole molecules)");
        }
        assertTrue(bound[x.length / 2] > 0.5, "calcium was bound at the pulse site");
    }
}
