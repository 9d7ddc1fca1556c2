package org.dendrokin.core.fit;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Random;

import org.dendrokin.core.Progress;
import org.dendrokin.core.kymo.Kymograph;
import org.dendrokin.core.model.Boundary;
import org.dendrokin.core.model.Domain;
import org.dendrokin.core.model.SolverSettings;
import org.dendrokin.core.model.Stimulus;
import org.dendrokin.core.model.TreeDomain;
import org.dendrokin.core.model.TreeGeometry;
import org.dendrokin.core.model.TreeGeometry.Branch;
import org.dendrokin.core.model.TreeGeometry.BranchEnd;
import org.dendrokin.core.model.TreeGeometry.End;
import org.dendrokin.core.model.TreeGeometry.Junction;
import org.dendrokin.core.model.TreeRun;
import org.dendrokin.core.model.TreeStimulus;
import org.dendrokin.core.units.Unit;
import org.junit.jupiter.api.Test;

/**
 * Fits of diffusion-decay on a branched dendrite. The synthetic session is not made by the engine: its kymographs
 * are the closed form of diffusion with decay on a star of three semi-infinite branches (trunk radius 0.6 um, side
 * branches a and b of 0.4 and 0.5 um) from a Gaussian pulse on the trunk 6 um before the branch point, derived in
 * {@code TreeRunTest.star} by the method of images and Kirchhoff's law at the junction; branches of 40 um are long
 * enough that their far ends see nothing in 20 s. Each branch has its own amplitude and baseline (dye loading,
 * background), and seeded Gaussian noise.
 */
class TreeFitModelTest {
    private static final double D = 0.8;
    private static final double K = 0.15;
    private static final double X0 = 6;       // pulse, um before the branch point
    private static final double W = 1.0;      // its standard deviation, um
    private static final double STEP_S = 0.05;
    private static final Map<String, double[]> TRUE_AMP_BASE = Map.of("trunk", new double[] {1.0, 0.05},
            "a", new double[] {0.7, -0.02}, "b", new double[] {1.3, 0.1});

    private static double[] range(double first, double step, int count) {
        double[] v = new double[count];
        for (int i = 0; i < count; i++) {
            v[i] = first + step * i;
        }
        return v;
    }

    private static BranchEnd start(String b) {
        return new BranchEnd(b, End.START);
    }

    private static BranchEnd end(String b) {
        return new BranchEnd(b, End.END);
    }

    static TreeGeometry star() {
        return TreeGeometry.of(List.of(new Branch("trunk", 40, 0.6), new Branch("a", 40, 0.4),
                new Branch("b", 40, 0.5)), List.of(Junction.of(end("trunk"), start("a"), start("b"))));
    }

    private static double heat(double y, double t) {
        return Math.exp(-y * y / (4 * D * t)) / Math.sqrt(4 * Math.PI * D * t);
    }

    /**
     * The star closed form (TreeRunTest.star): on the source branch G(y - y0) + R G(y + y0), on the others
     * T G(y + y0), y from the branch point, R = (A_s - S)/(A_s + S), T = 2 A_s/(A_s + S), times exp(-k t); a
     * Gaussian of peak 1 and sd W is the point source of mass W sqrt(2 pi) at time -W^2/(2D).
     */
    private static double closedForm(String branch, double x, double t) {
        double as = Math.PI * 0.36;
        double others = Math.PI * (0.16 + 0.25);
        double r = (as - others) / (as + others);
        double tr = 2 * as / (as + others);
        double mass = W * Math.sqrt(2 * Math.PI);
        double te = t + W * W / (2 * D);
        double decay = Math.exp(-K * t);
        if (branch.equals("trunk")) {
            double y = 40 - x;
            return mass * decay * (heat(y - X0, te) + r * heat(y + X0, te));
        }
        return mass * decay * tr * heat(x + X0, te);
    }

    private static Map<String, double[]> positions() {
        Map<String, double[]> p = new LinkedHashMap<>();
        p.put("trunk", range(20, 0.5, 41));
        p.put("a", range(0, 0.5, 41));
        p.put("b", range(0, 0.5, 41));
        return p;
    }

    /** The synthetic session's kymographs, one per branch, with noise of sd sigma (seeded). */
    private static Map<String, Kymograph> session(double[] times, double sigma, long seed) {
        Random random = new Random(seed);
        Map<String, Kymograph> out = new LinkedHashMap<>();
        for (Map.Entry<String, double[]> e : positions().entrySet()) {
            double[] x = e.getValue();
            double[] ab = TRUE_AMP_BASE.get(e.getKey());
            double[] v = new double[times.length * x.length];
            for (int f = 0; f < times.length; f++) {
                for (int q = 0; q < x.length; q++) {
                    v[f * x.length + q] = ab[1] + ab[0] * closedForm(e.getKey(), x[q], times[f])
                            + sigma * random.nextGaussian();
                }
            }
            out.put(e.getKey(), new Kymograph(x, times, v, "dF/F0"));
        }
        return out;
    }

    /**
     * As {@link #session}, but each frame's noise along each branch is a moving sum of 5 independent normals scaled
     * to sd sigma, so that neighbouring positions share it as they do in a kymograph averaged over a band and
     * blurred by the optics.
     */
    private static Map<String, Kymograph> correlatedSession(double[] times, double sigma, long seed) {
        Random random = new Random(seed);
        Map<String, Kymograph> out = new LinkedHashMap<>();
        int window = 5;
        for (Map.Entry<String, double[]> e : positions().entrySet()) {
            double[] x = e.getValue();
            double[] ab = TRUE_AMP_BASE.get(e.getKey());
            double[] v = new double[times.length * x.length];
            double[] white = new double[x.length + window - 1];
            for (int f = 0; f < times.length; f++) {
                for (int i = 0; i < white.length; i++) {
                    white[i] = random.nextGaussian();
                }
                for (int q = 0; q < x.length; q++) {
                    double sum = 0;
                    for (int i = 0; i < window; i++) {
                        sum += white[q + i];
                    }
                    v[f * x.length + q] = ab[1] + ab[0] * closedForm(e.getKey(), x[q], times[f])
                            + sigma * sum / Math.sqrt(window);
                }
            }
            out.put(e.getKey(), new Kymograph(x, times, v, "dF/F0"));
        }
        return out;
    }

    private static List<TreeStimulus> pulse() {
        return List.of(new TreeStimulus("trunk", Stimulus.pulse(0, 40 - X0, W, 1.0)));
    }

    private static FitResult fit(TreeFitModel model, Map<String, Kymograph> kymos, double sigma) {
        Map<String, Double> sigmas = new LinkedHashMap<>();
        for (String b : model.branches()) {
            sigmas.put(b, sigma);
        }
        FitData data = model.data(kymos, sigmas);
        double[] start = model.completeStart(new double[] {1.6 * D, 0.5 * K}, data);
        return ModelFit.fit(model, data, List.of(start), ModelFit.Options.defaults().withProfiles(false),
                Progress.NONE);
    }

    private static double value(FitResult r, String name) {
        return r.estimate(name).orElseThrow().value();
    }

    private static double se(FitResult r, String name) {
        return r.estimate(name).orElseThrow().standardError();
    }

    @Test
    void recoversDAndKFromAllBranchesAndTheSameFromTheMainPathAlone() {
        double[] times = range(0, 0.25, 81);
        double sigma = 0.01;
        TreeDomain domain = new TreeDomain(star(), 0.25);
        for (long seed : new long[] {141, 142, 143}) {
            Map<String, Kymograph> kymos = session(times, sigma, seed);
            TreeFitModel all = new TreeFitModel("diffusion-decay", domain, times, positions(), pulse(), STEP_S,
                    Unit.DF_F0);
            FitResult full = fit(all, kymos, sigma);
            assertTrue(full.converged(), "fit of all branches converged, seed " + seed);
            // REF: star-graph closed form (method of images, Kirchhoff junction; derived in TreeRunTest) with the
            // session's true D and k [derived in the test]; 10% as the issue asks
            assertEquals(D, value(full, "D"), 0.1 * D, "D from all branches (um^2/s), seed " + seed);
            assertEquals(K, value(full, "k"), 0.1 * K, "k from all branches (1/s), seed " + seed);
            for (String b : List.of("trunk", "a", "b")) {
                String amp = TreeFitModel.amplitudeName(b);
                // REF: closed form's truth [derived in the test]; 4 standard errors (the side branches' signal is
                // a few times the noise, so their amplitudes are known to several per cent only)
                assertEquals(TRUE_AMP_BASE.get(b)[0], value(full, amp), 4 * se(full, amp), "amplitude of " + b
                        + ", seed " + seed);
            }

            // The side branch b removed from the DATA, not from the model's geometry: the trunk and a are the main
            // path through the branch point, and the model still lets signal leave into b there, as the dendrite
            // does. Both fits are unbiased, so they must agree within the statistical error of the smaller data set
            // (a nested estimator's difference has variance var(main path) - var(all)).
            Map<String, double[]> mainPath = new LinkedHashMap<>(positions());
            mainPath.remove("b");
            TreeFitModel main = new TreeFitModel("diffusion-decay", domain, times, mainPath, pulse(), STEP_S,
                    Unit.DF_F0);
            Map<String, Kymograph> mainKymos = new LinkedHashMap<>(kymos);
            mainKymos.remove("b");
            FitResult path = fit(main, mainKymos, sigma);
            assertTrue(path.converged(), "fit of the main path converged, seed " + seed);
            for (String p : List.of("D", "k")) {
                double diff = Math.abs(value(path, p) - value(full, p));
                double allowed = 3 * Math.sqrt(Math.max(se(path, p) * se(path, p) - se(full, p) * se(full, p),
                        0.25 * se(path, p) * se(path, p)));
                // REF: difference of nested least-squares estimates, var = var(subset) - var(all) [common practice]
                assertTrue(diff <= allowed, p + ": main path " + value(path, p) + " vs all branches " + value(full, p)
                        + " differ by more than 3 standard errors of the difference (" + allowed + "), seed " + seed);
                // REF: closed form's truth, 10% [derived in the test]
                assertEquals(p.equals("D") ? D : K, value(path, p), 0.1 * (p.equals("D") ? D : K),
                        p + " from the main path, seed " + seed);
            }
        }
    }

    @Test
    void intervalsHoldTheTruthWhenTheNoiseIsSharedByNeighbouringPositions() {
        // Noise shared by 5 neighbouring positions makes the estimates' variance several times what independent
        // noise of the same sd would give; the model-based interval cannot know, the robust one reads it from the
        // residuals of all branches laid side by side, frame by frame.
        double[] times = range(0, 0.25, 81);
        double sigma = 0.01;
        TreeDomain domain = new TreeDomain(star(), 0.25);
        TreeFitModel model = new TreeFitModel("diffusion-decay", domain, times, positions(), pulse(), STEP_S,
                Unit.DF_F0);
        int seeds = 40;
        int[] robust = new int[2];
        int[] modelBased = new int[2];
        for (long seed = 1; seed <= seeds; seed++) {
            FitResult r = fit(model, correlatedSession(times, sigma, 9000 + seed), sigma);
            assertTrue(r.converged(), "fit converged, seed " + seed);
            String[] names = {"D", "k"};
            double[] truth = {D, K};
            for (int j = 0; j < 2; j++) {
                ParameterEstimate e = r.estimate(names[j]).orElseThrow();
                assertEquals(Interval.ROBUST_WALD_T, e.ci95().method(), names[j] + ", seed " + seed);
                Interval wald = e.otherIntervals().stream().filter(i -> i.method().equals(Interval.WALD_T))
                        .findFirst().orElseThrow();
                robust[j] += e.ci95().contains(truth[j]) ? 1 : 0;
                modelBased[j] += wald.contains(truth[j]) ? 1 : 0;
            }
        }
        System.out.printf(java.util.Locale.ROOT, "tree fit, noise shared by 5 positions, %d seeds: robust intervals "
                + "hold D %d, k %d; model-based D %d, k %d%n", seeds, robust[0], robust[1], modelBased[0],
                modelBased[1]);
        for (int j = 0; j < 2; j++) {
            // REF: star-graph closed form's truth [derived in the test]; a 95% interval should hold it in about 38
            // of 40 seeds; 34 allows for the sandwich's own noise [common practice: binomial spread, sd 1.4 of 40]
            assertTrue(robust[j] >= 34, "robust intervals held the truth in " + robust[j] + " of " + seeds);
            // the check can fail: the model-based interval, blind to the shared noise, holds it far less often
            assertTrue(modelBased[j] <= 32, "model-based intervals held the truth in " + modelBased[j] + " of "
                    + seeds);
        }
    }

    @Test
    void aTreeWithoutItsSideBranchFitsLikeTheUnbranchedCable() {
        // With the side branch removed from the geometry too, trunk + a in series is one cable of 80 um: the
        // junction is then an ordinary node (TreeRunTest), so the tree fit must give the cable fit's numbers.
        TreeGeometry series = TreeGeometry.of(List.of(new Branch("trunk", 40, 0.6), new Branch("a", 40, 0.6)),
                List.of(Junction.of(end("trunk"), start("a"))));
        double[] times = range(0, 0.25, 61);
        double[] x = range(20, 0.5, 81);   // 20 to 60 um along the cable
        Random random = new Random(7);
        double[] cableValues = new double[times.length * x.length];
        for (int f = 0; f < times.length; f++) {
            for (int q = 0; q < x.length; q++) {
                double y = x[q] - 34;
                double te = times[f] + W * W / (2 * D);
                // REF: Crank 1975 Gaussian pulse times exp(-k t) [published formula]; sheet s2.2, s2.3
                cableValues[f * x.length + q] = 0.02 + W * Math.sqrt(2 * Math.PI) * heat(y, te)
                        * Math.exp(-K * times[f]) + 0.01 * random.nextGaussian();
            }
        }
        Domain cable = new Domain(80, 0.25, Boundary.NO_FLUX);
        EngineFitModel cableModel = new EngineFitModel("diffusion-decay", cable, times, x,
                List.of(Stimulus.pulse(0, 34, W, 1.0)), STEP_S, Unit.DF_F0);
        FitData cableData = FitData.unweighted(cableValues);
        FitResult cableFit = ModelFit.fit(cableModel, cableData, List.of(new double[] {1.6 * D, 0.5 * K, 0.9, 0}),
                ModelFit.Options.defaults().withProfiles(false), Progress.NONE);
        // the same samples as two branch kymographs; the junction column (40 um) goes to the trunk only
        Map<String, double[]> pos = new LinkedHashMap<>();
        pos.put("trunk", range(20, 0.5, 41));
        pos.put("a", range(0.5, 0.5, 40));
        TreeFitModel treeModel = new TreeFitModel("diffusion-decay", new TreeDomain(series, 0.25), times, pos,
                List.of(new TreeStimulus("trunk", Stimulus.pulse(0, 34, W, 1.0))), STEP_S, Unit.DF_F0);
        double[] trunk = new double[times.length * 41];
        double[] side = new double[times.length * 40];
        for (int f = 0; f < times.length; f++) {
            System.arraycopy(cableValues, f * 81, trunk, f * 41, 41);
            System.arraycopy(cableValues, f * 81 + 41, side, f * 40, 40);
        }
        Map<String, Kymograph> kymos = new LinkedHashMap<>();
        kymos.put("trunk", new Kymograph(pos.get("trunk"), times, trunk, "dF/F0"));
        kymos.put("a", new Kymograph(pos.get("a"), times, side, "dF/F0"));
        FitData treeData = treeModel.data(kymos, Map.of("trunk", 1.0, "a", 1.0));
        // one amplitude and baseline for both branches would be the cable's model: start both at the cable's
        double[] start = {1.6 * D, 0.5 * K, 0.9, 0, 0.9, 0};
        FitResult treeFit = ModelFit.fit(treeModel, treeData, List.of(start),
                ModelFit.Options.defaults().withProfiles(false), Progress.NONE);
        assertTrue(cableFit.converged() && treeFit.converged(), "both fits converged");
        // Identity: the same engine discretisation, the same data; only the per-branch amplitudes and baselines
        // differ, and with noise only they are free, so D and k agree to the statistical error of that freedom.
        for (String p : List.of("D", "k")) {
            double tol = 2 * se(cableFit, p);
            assertEquals(value(cableFit, p), value(treeFit, p), tol, p + ": tree of two branches vs cable");
        }
    }

    @Test
    void theOnePassNormalEquationsEqualSumsOverTheFullJacobian() {
        double[] times = range(0, 0.5, 21);
        TreeFitModel model = new TreeFitModel("nagumo", new TreeDomain(star(), 0.5), times, positions(), pulse(),
                0.1, Unit.DF_F0);
        int n = model.size();
        int np = model.parameters().size();
        Random random = new Random(3);
        double[] y = new double[n];
        double[] sigma = new double[n];
        for (int g = 0; g < n; g++) {
            y[g] = random.nextDouble();
            sigma[g] = 0.05 + 0.05 * random.nextDouble();
        }
        y[11] = Double.NaN;
        FitData data = new FitData(y, sigma);
        double[] p = {1.2, 0.45, 0.25, 1.3, 0.02, 0.8, 0.1, 1.1, -0.05};
        NormalEquations ne = new NormalEquations(np);
        double[] fitted = new double[n];
        model.normalEquations(p, data, ne, fitted);
        double[] values = new double[n];
        double[] jac = new double[n * np];
        model.evaluate(p, values, jac);
        double[][] a = new double[np][np];
        double[] grad = new double[np];
        double chi = 0;
        for (int i = 0; i < data.usedCount(); i++) {
            int g = data.usedIndex(i);
            double w = data.weight(g);
            double r = data.value(g) - values[g];
            chi += w * r * r;
            for (int j = 0; j < np; j++) {
                grad[j] += w * jac[g * np + j] * r;
                for (int k = 0; k < np; k++) {
                    a[j][k] += w * jac[g * np + j] * jac[g * np + k];
                }
            }
        }
        // REF: J^T W J, J^T W r and chi^2 by their definitions (Levenberg 1944; Marquardt 1963), sheet s8.1
        assertEquals(chi, ne.chiSquare(), 1e-10 * chi, "chi^2");
        for (int j = 0; j < np; j++) {
            assertEquals(grad[j], ne.gradient(j), 1e-9 * Math.sqrt(a[j][j] * chi) + 1e-300, "gradient " + j);
            for (int k = 0; k < np; k++) {
                assertEquals(a[j][k], ne.matrix(j, k), 1e-9 * Math.sqrt(a[j][j] * a[k][k]) + 1e-300,
                        "matrix " + j + "," + k);
            }
        }
        for (int g = 0; g < n; g++) {
            assertEquals(values[g], fitted[g], 1e-12, "fitted value at " + g);
        }
    }

    @Test
    void forwardDifferencesAgreeWithTheEnginesExactSensitivities() {
        double[] times = range(0, 0.5, 21);
        TreeDomain domain = new TreeDomain(star(), 0.5);
        TreeFitModel model = new TreeFitModel("nagumo", domain, times, positions(), pulse(), 0.1, Unit.DF_F0);
        double[] p = {1.1, 0.6, 0.22, 1.4, 0.05, 0.9, 0.0, 1.2, 0.1};
        int n = model.size();
        int np = p.length;
        double[] values = new double[n];
        double[] jac = new double[n * np];
        model.evaluate(p, values, jac);
        TreeRun run = TreeRun.prepare("nagumo", domain, times, positions(), pulse(),
                SolverSettings.DEFAULT.withFixedStepS(0.1));
        int size = times.length * run.positionCount();
        double[] u = new double[size];
        double[][] sens = new double[3][size];
        run.solveWithSensitivities(new double[] {p[0], p[1], p[2]}, u, sens);
        Map<String, Kymograph> uByBranch = run.kymographs(u, "u");
        for (int j = 0; j < 3; j++) {
            Map<String, Kymograph> sj = run.kymographs(sens[j], "u");
            double scale = 0;
            double err = 0;
            int g = 0;
            for (int k = 0; k < 3; k++) {
                String b = run.sampledBranches().get(k);
                double amp = p[3 + 2 * k];
                double[] s = sj.get(b).values();
                double[] ub = uByBranch.get(b).values();
                for (int i = 0; i < s.length; i++, g++) {
                    double exact = amp * s[i];
                    scale = Math.max(scale, Math.abs(exact));
                    err = Math.max(err, Math.abs(jac[g * np + j] - exact));
                    assertEquals(p[4 + 2 * k] + amp * ub[i], values[g], 1e-12, "value of " + b + " at " + i);
                }
            }
            // REF: a forward difference with relative step h has error O(h) times the second derivative [common
            // practice]; the engine's forward sensitivities are its exact derivatives
            assertTrue(err < 1e-5 * scale, "column " + j + ": max difference " + err + " of scale " + scale);
        }
    }
}
