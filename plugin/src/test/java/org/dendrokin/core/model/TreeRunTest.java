package org.dendrokin.core.model;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;

import org.dendrokin.core.model.TreeGeometry.Branch;
import org.dendrokin.core.model.TreeGeometry.BranchEnd;
import org.dendrokin.core.model.TreeGeometry.End;
import org.dendrokin.core.model.TreeGeometry.Junction;
import org.junit.jupiter.api.Test;

class TreeRunTest {
    private static BranchEnd start(String b) {
        return new BranchEnd(b, End.START);
    }

    private static BranchEnd end(String b) {
        return new BranchEnd(b, End.END);
    }

    private static double[] range(double first, double step, int count) {
        double[] v = new double[count];
        for (int i = 0; i < count; i++) {
            v[i] = first + i * step;
        }
        return v;
    }

    /** The 1D heat kernel G(y, t) = exp(-y^2 / (4 D t)) / sqrt(4 pi D t) (Crank 1975, plane source). */
    private static double heatKernel(double y, double d, double t) {
        return Math.exp(-y * y / (4 * d * t)) / Math.sqrt(4 * Math.PI * d * t);
    }

    @Test
    void twoBranchesInSeriesAreOneCable() {
        // A junction of two equal branches is an ordinary inner node: same volume, same faces, same mass-matrix row.
        TreeGeometry tree = TreeGeometry.of(List.of(Branch.of("first", 20), Branch.of("second", 30)),
                List.of(Junction.of(end("first"), start("second"))));
        double dx = 0.25;
        double[] times = range(0, 0.5, 41);
        Map<String, double[]> positions = new LinkedHashMap<>();
        positions.put("first", range(0, dx, 81));
        positions.put("second", range(0, dx, 121));
        Domain cable = new Domain(50, dx, Boundary.NO_FLUX);
        double[] cablePositions = range(0, dx, 201);
        List<Stimulus> protocol = List.of(Stimulus.pulse(0, 15, 1.5, 1.0), Stimulus.injection(2, 3, 28, 1.0, 0.7));
        List<TreeStimulus> treeProtocol = List.of(new TreeStimulus("first", protocol.get(0)),
                new TreeStimulus("second", protocol.get(1).shiftedBy(-20)));
        String[] models = {"diffusion-decay", "nagumo", "fisher-kpp"};
        double[][] params = {{0.8, 0.3}, {1.2, 2.0, 0.2}, {0.7, 0.9}};
        for (int order : new int[] {2, 4}) {
            for (int m = 0; m < models.length; m++) {
                SolverSettings settings = SolverSettings.DEFAULT.withSpatialOrder(order);
                TreeRun run = TreeRun.prepare(models[m], new TreeDomain(tree, dx), times, positions, treeProtocol,
                        settings);
                double[] out = new double[times.length * run.positionCount()];
                run.solve(params[m], out);
                ScalarRun reference = ScalarRun.prepare(models[m], cable, times, cablePositions, protocol, settings);
                double[] expected = new double[times.length * cablePositions.length];
                reference.solve(params[m], expected);
                assertEquals(reference.lastStepCount(), run.lastStepCount(), "steps");
                double err = 0;
                for (int f = 0; f < times.length; f++) {
                    for (int q = 0; q < 81; q++) {
                        err = Math.max(err, Math.abs(out[f * 202 + q] - expected[f * 201 + q]));
                    }
                    for (int q = 0; q < 121; q++) {
                        err = Math.max(err, Math.abs(out[f * 202 + 81 + q] - expected[f * 201 + 80 + q]));
                    }
                }
                // Identity derived in the comment above: the tree solver must reproduce the cable to rounding.
                assertTrue(err < 1e-12, models[m] + ", order " + order + ": largest difference from the cable " + err);
            }
        }
    }

    @Test
    void oneBranchWithOpenEndsIsACableWithFixedEnds() {
        TreeGeometry tree = TreeGeometry.of(List.of(Branch.of("only", 30)), List.of())
                .withBoundary(start("only"), Boundary.FIXED).withBoundary(end("only"), Boundary.FIXED);
        double[] x = range(0, 0.2, 151);
        double[] times = range(0, 1, 21);
        List<Stimulus> protocol = List.of(Stimulus.pulse(0, 4, 1.5, 1.0));
        TreeRun run = TreeRun.prepare("diffusion-decay", new TreeDomain(tree, 0.2), times, Map.of("only", x),
                List.of(new TreeStimulus("only", protocol.get(0))), SolverSettings.DEFAULT);
        double[] out = new double[times.length * x.length];
        run.solve(new double[] {2, 0.1}, out);
        ScalarRun cable = ScalarRun.prepare("diffusion-decay", new Domain(30, 0.2, Boundary.FIXED), times, x,
                protocol, SolverSettings.DEFAULT);
        double[] expected = new double[out.length];
        cable.solve(new double[] {2, 0.1}, expected);
        double err = 0;
        for (int i = 0; i < out.length; i++) {
            err = Math.max(err, Math.abs(out[i] - expected[i]));
        }
        // Identity: an open free end is the cable's fixed end.
        assertTrue(err < 1e-12, "largest difference from the cable with fixed ends: " + err);
        assertEquals(0, out[out.length - x.length], 0, "the open start stays at the resting value");
    }

    /**
     * Diffusion on a star of n semi-infinite branches joined at x = 0 (x measured from the junction along each
     * branch), from a point source of mass M at x0 on branch s, derived here by the method of images. Try
     * u_s = M [G(x - x0) + R G(x + x0)] on the source branch and u_k = M T G(x + x0) on every other branch, with G
     * the heat kernel: each satisfies the heat equation on its half-line. Continuity at the junction,
     * u_s(0) = u_k(0), gives 1 + R = T. Conservation of flux (Kirchhoff), sum_b A_b du_b/dx(0) = 0 (every x
     * pointing away from the junction), with G'(-x0) = -G'(x0) = x0 G(x0) / (2 D t), gives A_s (1 - R) = S T where
     * S is the summed area of the other branches. So R = (A_s - S) / (A_s + S) and T = 2 A_s / (A_s + S); for n
     * equal branches R = 2/n - 1 and T = 2/n. With decay every term is multiplied by exp(-k t). A Gaussian of
     * peak a and sd w at x0 is the point source of mass a w sqrt(2 pi) at the earlier time -w^2 / (2D).
     */
    private static double star(boolean sourceBranch, double x, double x0, double areaSource, double areaOthers,
            double mass, double d, double k, double t) {
        double r = (areaSource - areaOthers) / (areaSource + areaOthers);
        double tr = 2 * areaSource / (areaSource + areaOthers);
        double decay = Math.exp(-k * t);
        if (sourceBranch) {
            return mass * decay * (heatKernel(x - x0, d, t) + r * heatKernel(x + x0, d, t));
        }
        return mass * decay * tr * heatKernel(x + x0, d, t);
    }

    /** Largest error of a star of three 60 um branches (radii given) against the closed form, relative to the peak. */
    private static double starError(double[] radii, double dx, int order, double dtS) {
        List<Branch> branches = new ArrayList<>();
        for (int b = 0; b < radii.length; b++) {
            branches.add(new Branch("b" + b, 60, radii[b]));
        }
        List<BranchEnd> starts = new ArrayList<>();
        for (Branch b : branches) {
            starts.add(start(b.name()));
        }
        TreeGeometry tree = TreeGeometry.of(branches, List.of(new Junction(starts)));
        double areaSource = branches.get(0).areaUm2();
        double areaOthers = 0;
        for (int b = 1; b < branches.size(); b++) {
            areaOthers += branches.get(b).areaUm2();
        }
        double d = 0.8;
        double k = 0.1;
        double x0 = 5;
        double t0 = 0.6;   // the closed form at t0 is the initial state, so the run starts from a smooth profile
        double mass = 2.0;
        TreeDomain domain = new TreeDomain(tree, dx);
        double[] times = {4, 10};
        Map<String, double[]> positions = TreeRun.nodePositions(domain);
        TreeRun run = TreeRun.prepare("diffusion-decay", domain, times, positions, List.of(),
                SolverSettings.DEFAULT.withSpatialOrder(order).withFixedStepS(dtS));
        final double a0 = areaSource;
        final double aO = areaOthers;
        run.setInitialState((b, x) -> star(b == 0, x, x0, a0, aO, mass, d, 0, t0));
        double[] out = new double[times.length * run.positionCount()];
        run.solve(new double[] {d, k}, out);
        double err = 0;
        double peak = 0;
        for (int f = 0; f < times.length; f++) {
            for (int b = 0; b < branches.size(); b++) {
                double[] x = positions.get("b" + b);
                for (int q = 0; q < x.length; q++) {
                    double exact = star(b == 0, x[q], x0, areaSource, areaOthers, mass, d, 0, times[f] + t0)
                            * Math.exp(-k * times[f]);
                    double v = out[f * run.positionCount() + run.offset(b) + q];
                    err = Math.max(err, Math.abs(v - exact));
                    peak = Math.max(peak, exact);
                }
            }
        }
        return err / peak;
    }

    @Test
    void symmetricYJunctionMatchesTheStarGraphClosedForm() {
        double[] equal = {0.5, 0.5, 0.5};
        double rel = starError(equal, 0.1, 4, 0.01);
        // REF: star-graph closed form derived by the method of images in star() above, from the 1D heat kernel of
        // Crank 1975 (plane source) [published formula; derivation in this test]; sheet s2.1, s2.3
        assertTrue(rel < 1e-4, "largest error relative to the peak, three equal branches, dx = 0.1 um: " + rel);
        double unequal = starError(new double[] {0.6, 0.3, 0.45}, 0.1, 4, 0.01);
        // REF: the same derivation with areas, R = (A_s - S)/(A_s + S), T = 2 A_s/(A_s + S) [derived in this test]
        assertTrue(unequal < 1e-4, "largest error relative to the peak, unequal radii: " + unequal);
    }

    @Test
    void starGraphErrorFallsAtTheSchemesOrder() {
        double[] radii = {0.5, 0.35, 0.5};
        double coarse4 = starError(radii, 0.4, 4, 0.005);
        double fine4 = starError(radii, 0.2, 4, 0.005);
        double coarse2 = starError(radii, 0.4, 2, 0.005);
        double fine2 = starError(radii, 0.2, 2, 0.005);
        // REF: star-graph closed form derived in this test (method of images); compact scheme order 4, three-point
        // Laplacian order 2 [common practice]; sheet s6.2. The junction rows keep the order (see TreeGrid).
        assertEquals(4.0, Math.log(coarse4 / fine4) / Math.log(2), 0.4, "observed order, compact scheme");
        assertEquals(2.0, Math.log(coarse2 / fine2) / Math.log(2), 0.2, "observed order, three-point Laplacian");
    }

    @Test
    void sealedEndsConserveTheAmountOnABranchedTree() {
        TreeGeometry tree = fiveBranches();
        TreeDomain domain = new TreeDomain(tree, 0.2);
        Map<String, double[]> positions = TreeRun.nodePositions(domain);
        double[] times = range(0, 2, 11);
        List<TreeStimulus> protocol = List.of(new TreeStimulus("trunk", Stimulus.pulse(0, 18, 1.5, 3.0)),
                new TreeStimulus("b", Stimulus.pulse(3, 2, 0.7, 1.0)),
                new TreeStimulus("c", Stimulus.injection(5, 4, 4, 2.0, 1.0)));
        for (int order : new int[] {2, 4}) {
            TreeRun run = TreeRun.prepare("diffusion-decay", domain, times, positions, protocol,
                    SolverSettings.DEFAULT.withSpatialOrder(order));
            double[] out = new double[times.length * run.positionCount()];
            run.solve(new double[] {2.0, 0}, out);
            double[] amount = new double[times.length];
            for (int f = 0; f < times.length; f++) {
                for (int b = 0; b < tree.branchCount(); b++) {
                    Branch branch = tree.branches().get(b);
                    double h = domain.spacingUm(b);
                    double[] x = positions.get(branch.name());
                    for (int q = 0; q < x.length; q++) {
                        double share = q == 0 || q == x.length - 1 ? 0.5 : 1;
                        amount[f] += branch.areaUm2() * h * share * out[f * run.positionCount() + run.offset(b) + q];
                    }
                }
            }
            // The injection's total: its profile (Gaussian in the distance along the tree) times the node volumes.
            double added = 0;
            for (int b = 0; b < tree.branchCount(); b++) {
                Branch branch = tree.branches().get(b);
                double[] x = positions.get(branch.name());
                for (int q = 0; q < x.length; q++) {
                    double dist = tree.distanceUm("c", 4, branch.name(), x[q]);
                    double share = q == 0 || q == x.length - 1 ? 0.5 : 1;
                    added += Math.exp(-0.5 * dist * dist / 4.0) * branch.areaUm2() * domain.spacingUm(b) * share;
                }
            }
            // Identity derived in TreeGrid: V^T L = 0 and V^T B = V^T, so diffusion moves substance and creates none;
            // an amount summed branch by branch with trapezoid weights counts each junction node's volume once.
            assertEquals(amount[0], amount[1], 1e-10 * amount[0], "order " + order + ": amount at 2 s");
            assertEquals(amount[2] + added, amount[5], 1e-10 * amount[5], "order " + order + ": after the injection");
            assertEquals(amount[5], amount[10], 1e-10 * amount[5], "order " + order + ": amount at 20 s");
            assertEquals(amount[10], run.finalAmount(), 1e-10 * amount[10], "order " + order + ": node amount");
        }
    }

    /** A trunk, a branch point into a and b, and a second branch point at b's end into c and d. */
    static TreeGeometry fiveBranches() {
        return TreeGeometry.of(List.of(new Branch("trunk", 30, 0.6), new Branch("a", 20, 0.4),
                new Branch("b", 15, 0.5), new Branch("c", 12, 0.3), new Branch("d", 10, 0.35)),
                List.of(Junction.of(end("trunk"), start("a"), start("b")),
                        Junction.of(end("b"), start("c"), start("d"))));
    }

    @Test
    void sensitivitiesMatchCentralDifferencesOfSolve() {
        TreeGeometry tree = fiveBranches().withBoundary(end("a"), Boundary.FIXED);
        TreeDomain domain = new TreeDomain(tree, 0.5);
        Map<String, double[]> positions = new LinkedHashMap<>();
        positions.put("a", range(0.3, 1.7, 11));
        positions.put("trunk", range(0.5, 2.5, 12));
        positions.put("d", range(0, 1, 11));
        double[] times = range(0, 0.5, 13);
        List<TreeStimulus> protocol = List.of(new TreeStimulus("trunk", Stimulus.pulse(0, 26, 1.5, 1.0)),
                new TreeStimulus("b", Stimulus.injection(1.2, 2, 10, 1.0, 0.6)),
                new TreeStimulus("c", Stimulus.clamp(3.1, 1.0, 6, 1.0, 0.8)));
        String[] models = {"diffusion-decay", "nagumo", "fisher-kpp"};
        double[][] params = {{0.8, 0.3}, {1.2, 2.0, 0.2}, {0.7, 0.9}};
        for (int m = 0; m < models.length; m++) {
            TreeRun run = TreeRun.prepare(models[m], domain, times, positions, protocol,
                    SolverSettings.DEFAULT.withFixedStepS(0.05));
            int size = times.length * run.positionCount();
            double[] out = new double[size];
            double[][] sens = new double[params[m].length][size];
            run.solveWithSensitivities(params[m], out, sens);
            for (int q = 0; q < params[m].length; q++) {
                double step = 1e-5 * params[m][q];
                double[] up = params[m].clone();
                double[] down = params[m].clone();
                up[q] += step;
                down[q] -= step;
                double[] fUp = new double[size];
                double[] fDown = new double[size];
                run.solve(up, fUp);
                run.solve(down, fDown);
                double scale = 0;
                double err = 0;
                for (int i = 0; i < size; i++) {
                    double fd = (fUp[i] - fDown[i]) / (2 * step);
                    scale = Math.max(scale, Math.abs(fd));
                    err = Math.max(err, Math.abs(fd - sens[q][i]));
                }
                // Self-consistency: central differences have error O(step^2) plus rounding ~1e-16/step.
                assertTrue(scale > 0, models[m] + ": parameter " + q + " has an effect");
                assertTrue(err < 1e-6 * scale, models[m] + " d/d" + run.parameterNames().get(q) + ": " + err
                        + " vs scale " + scale);
            }
        }
    }

    @Test
    void badTreesAndSamplingAreRefused() {
        List<Branch> three = List.of(Branch.of("a", 10), Branch.of("b", 10), Branch.of("c", 10));
        String loop = assertThrows(IllegalArgumentException.class, () -> TreeGeometry.of(three,
                List.of(Junction.of(end("a"), start("b")), Junction.of(end("b"), start("c")),
                        Junction.of(end("c"), start("a"))))).getMessage();
        assertTrue(loop.matches("branches [abc], [abc] and [abc] form a loop.*"), loop);
        String apart = assertThrows(IllegalArgumentException.class, () -> TreeGeometry.of(three,
                List.of(Junction.of(end("a"), start("b"))))).getMessage();
        assertTrue(apart.contains("branch c is not joined"), apart);
        String twice = assertThrows(IllegalArgumentException.class, () -> TreeGeometry.of(three,
                List.of(Junction.of(end("a"), start("b")), Junction.of(end("a"), start("c"))))).getMessage();
        assertTrue(twice.contains("a:end is in two junctions"), twice);
        String self = assertThrows(IllegalArgumentException.class, () -> TreeGeometry.of(List.of(Branch.of("a", 5)),
                List.of(Junction.of(start("a"), end("a"))))).getMessage();
        assertTrue(self.contains("joined to itself"), self);
        String radius = assertThrows(IllegalArgumentException.class, () -> TreeGeometry.of(List.of(
                new Branch("a", 5, 0.5), Branch.of("b", 5)), List.of(Junction.of(end("a"), start("b")))))
                .getMessage();
        assertTrue(radius.contains("branch b has no radius"), radius);
        TreeGeometry ok = TreeGeometry.of(three, List.of(Junction.of(end("a"), start("b"), start("c"))));
        assertThrows(IllegalArgumentException.class, () -> ok.withBoundary(end("a"), Boundary.FIXED));
        TreeDomain domain = new TreeDomain(ok, 0.5);
        assertThrows(IllegalArgumentException.class, () -> TreeRun.prepare("nagumo", domain, new double[] {1},
                Map.of("a", new double[] {11}), List.of(), SolverSettings.DEFAULT));
        assertThrows(IllegalArgumentException.class, () -> TreeRun.prepare("nagumo", domain, new double[] {1},
                Map.of("e", new double[] {1}), List.of(), SolverSettings.DEFAULT));
        assertThrows(IllegalArgumentException.class, () -> TreeRun.prepare("nagumo", domain, new double[] {1},
                Map.of("a", new double[] {1}), List.of(new TreeStimulus("b", Stimulus.pulse(0, 12, 1, 1))),
                SolverSettings.DEFAULT));
    }

    @Test
    void distancesRunThroughTheJunctions() {
        TreeGeometry tree = fiveBranches();
        // Sums of branch lengths along the unique path, worked by hand from fiveBranches().
        assertEquals(4, tree.distanceUm("trunk", 20, "trunk", 24), 1e-12);
        assertEquals(10 + 5, tree.distanceUm("trunk", 20, "a", 5), 1e-12);
        assertEquals(10 + 15 + 3, tree.distanceUm("trunk", 20, "d", 3), 1e-12);
        assertEquals(12 + 15 + 20, tree.distanceUm("c", 12, "a", 20), 1e-12);
        assertEquals(2 + 7, tree.distanceUm("c", 2, "d", 7), 1e-12);
        List<TreeGeometry.Segment> layout = tree.layoutFrom("trunk", 20);
        assertEquals(6, layout.size(), "two stretches of the trunk and one per other branch");
    }
}
