package org.dendrokin.core.model;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;

import org.dendrokin.core.Progress;
import org.dendrokin.core.model.TreeGeometry.Branch;
import org.dendrokin.core.model.TreeGeometry.BranchEnd;
import org.dendrokin.core.model.TreeGeometry.End;
import org.dendrokin.core.model.TreeGeometry.Junction;
import org.junit.jupiter.api.Test;

/** Reaction networks on a tree, deterministic and stochastic. */
class TreeNetworkTest {
    private static double[] range(double first, double step, int count) {
        double[] v = new double[count];
        for (int i = 0; i < count; i++) {
            v[i] = first + i * step;
        }
        return v;
    }

    /** A + B &lt;-&gt; C with three diffusion coefficients, A resting at 0.2 and B at 1. */
    private static ReactionNetwork binding() {
        List<String> names = List.of("A", "B", "C");
        List<ReactionNetwork.Reaction> reactions = new ArrayList<>();
        reactions.add(new ReactionNetwork.Reaction("bind", ReactionNetwork.stoichiometry(names, "A", -1, "B", -1,
                "C", 1), ReactionNetwork.massAction(new double[] {1, 1, 0}, new double[3], 2, 0), 2));
        reactions.add(new ReactionNetwork.Reaction("unbind", ReactionNetwork.stoichiometry(names, "A", 1, "B", 1,
                "C", -1), ReactionNetwork.massAction(new double[] {0, 0, 1}, new double[3], 0.5, 0), 0.5));
        return new ReactionNetwork(names, new double[] {1, 0.1, 0.3}, new double[] {0.2, 1, 0}, reactions);
    }

    @Test
    void aNetworkOnTwoBranchesInSeriesIsTheNetworkOnOneCable() {
        TreeGeometry tree = TreeGeometry.of(List.of(Branch.of("first", 10), Branch.of("second", 15)),
                List.of(Junction.of(new BranchEnd("first", End.END), new BranchEnd("second", End.START))))
                .withBoundary(new BranchEnd("second", End.END), Boundary.FIXED)
                .withBoundary(new BranchEnd("first", End.START), Boundary.FIXED);
        double[] times = range(0, 0.5, 21);
        Map<String, double[]> positions = new LinkedHashMap<>();
        positions.put("first", range(0, 0.25, 41));
        positions.put("second", range(0.25, 0.25, 60));
        List<Stimulus> protocol = List.of(Stimulus.pulse(0, 6, 1.0, 1.0), Stimulus.injection(1, 2, 14, 1.0, 0.5));
        TreeNetworkRun run = TreeNetworkRun.prepare(binding(), new TreeDomain(tree, 0.25), times, positions,
                List.of(new TreeStimulus("first", protocol.get(0)), new TreeStimulus("second",
                        protocol.get(1).shiftedBy(-10))), SolverSettings.DEFAULT, "A");
        double[][] out = new double[3][times.length * run.positionCount()];
        run.solve(out);
        NetworkRun cable = NetworkRun.prepare(binding(), new Domain(25, 0.25, Boundary.FIXED), times,
                range(0, 0.25, 101), protocol, SolverSettings.DEFAULT, "A");
        double[][] expected = new double[3][times.length * 101];
        cable.solve(expected);
        double err = 0;
        for (int s = 0; s < 3; s++) {
            for (int i = 0; i < expected[s].length; i++) {
                err = Math.max(err, Math.abs(out[s][i] - expected[s][i]));
            }
        }
        // Identity: a junction of two equal branches is an inner node, an open end the cable's fixed end.
        assertTrue(err < 1e-12, "largest difference from the cable: " + err);
    }

    @Test
    void bindingOnABranchedTreeKeepsEachConservedTotal() {
        TreeGeometry tree = TreeRunTest.fiveBranches();
        TreeDomain domain = new TreeDomain(tree, 0.25);
        Map<String, double[]> positions = TreeRun.nodePositions(domain);
        double[] times = range(0, 1, 11);
        TreeNetworkRun run = TreeNetworkRun.prepare(binding(), domain, times, positions,
                List.of(new TreeStimulus("trunk", Stimulus.pulse(0, 25, 1.5, 2.0)),
                        new TreeStimulus("c", Stimulus.pulse(0, 5, 1.0, 1.0).onSpecies("B"))),
                SolverSettings.DEFAULT, "A");
        double[][] out = new double[3][times.length * run.positionCount()];
        run.solve(out);
        double[] aPlusC = new double[times.length];
        double[] bPlusC = new double[times.length];
        for (int f = 0; f < times.length; f++) {
            for (int b = 0; b < tree.branchCount(); b++) {
                Branch branch = tree.branches().get(b);
                double[] x = positions.get(branch.name());
                for (int q = 0; q < x.length; q++) {
                    double v = branch.areaUm2() * domain.spacingUm(b) * (q == 0 || q == x.length - 1 ? 0.5 : 1);
                    int g = f * run.positionCount() + run.offset(b) + q;
                    aPlusC[f] += v * (out[0][g] + out[2][g]);
                    bPlusC[f] += v * (out[1][g] + out[2][g]);
                }
            }
        }
        for (int f = 1; f < times.length; f++) {
            // Identity derived here: binding turns A + B into C and back, diffusion with sealed ends moves each species
            // without loss (V^T L = 0, V^T B = V^T on the tree), so A + C and B + C keep their amounts.
            assertEquals(aPlusC[0], aPlusC[f], 1e-10 * aPlusC[0], "amount of A + C at frame " + f);
            assertEquals(bPlusC[0], bPlusC[f], 1e-10 * bPlusC[0], "amount of B + C at frame " + f);
        }
    }

    @Test
    void ensembleMeanOfStochasticDiffusionOnATreeMatchesTheDeterministicTree() {
        ReactionNetwork net = new ReactionNetwork(List.of("X"), new double[] {1.0}, new double[] {0}, List.of());
        TreeGeometry tree = TreeGeometry.of(List.of(new Branch("trunk", 10, 1.0), new Branch("a", 8, 0.6),
                new Branch("b", 6, 0.8)), List.of(Junction.of(new BranchEnd("trunk", End.END),
                        new BranchEnd("a", End.START), new BranchEnd("b", End.START))))
                .withBoundary(new BranchEnd("a", End.END), Boundary.FIXED);
        TreeDomain domain = new TreeDomain(tree, 0.5);
        Map<String, double[]> positions = TreeRun.nodePositions(domain);
        double[] times = {1.5};
        List<TreeStimulus> pulse = List.of(new TreeStimulus("trunk", Stimulus.pulse(0, 8, 1.5, 40)));
        int runs = 300;
        StochasticEnsemble.Summary s = StochasticEnsemble.runOnTree(net, domain, times, positions, pulse, "X",
                new StochasticSettings(runs, 5, 2, 1.0), Progress.NONE);
        TreeNetworkRun det = TreeNetworkRun.prepare(net, domain, times, positions, pulse,
                SolverSettings.DEFAULT.withFixedStepS(1e-3).withSmoothing(false).withSpatialOrder(2), "X");
        double[][] out = {new double[det.positionCount()]};
        det.solve(out);
        TreeGrid grid = new TreeGrid(domain, 2);
        int outside = 0;
        int points = 0;
        for (int b = 0; b < tree.branchCount(); b++) {
            double[] x = positions.get(tree.branches().get(b).name());
            for (int q = 0; q < x.length; q++) {
                int g = det.offset(b) + q;
                double volume = grid.volume[grid.node(b, q)];
                // Independent walkers: a count's variance is at most its mean, so (mean / volume) bounds the
                // variance of the concentration where every run saw nothing.
                double variance = Math.max(s.sd()[g] * s.sd()[g], out[0][g] / volume);
                double se = Math.sqrt(variance / runs);
                if (Math.abs(s.mean()[g] - out[0][g]) > 4.5 * se) {
                    outside++;
                }
                points++;
            }
        }
        // REF: next-subvolume jump rates D x (Laplacian coefficient) make the mean obey the discretised diffusion
        // equation [published: Elf & Ehrenberg 2004, from memory: fairly sure]; sheet s7.3. 4.5 standard errors.
        assertEquals(0, outside, "points (of " + points + ") where the ensemble mean is over 4.5 standard errors off");
        assertTrue(s.events() > 0, "events happened");
    }
}
