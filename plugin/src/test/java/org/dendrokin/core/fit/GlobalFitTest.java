package org.dendrokin.core.fit;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.ArrayList;
import java.util.HashMap;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;

import org.apache.commons.math3.fitting.leastsquares.LeastSquaresBuilder;
import org.apache.commons.math3.fitting.leastsquares.LeastSquaresOptimizer;
import org.apache.commons.math3.fitting.leastsquares.LevenbergMarquardtOptimizer;
import org.apache.commons.math3.fitting.leastsquares.MultivariateJacobianFunction;
import org.apache.commons.math3.linear.Array2DRowRealMatrix;
import org.apache.commons.math3.linear.ArrayRealVector;
import org.apache.commons.math3.linear.LUDecomposition;
import org.apache.commons.math3.linear.RealMatrix;
import org.apache.commons.math3.util.Pair;
import org.dendrokin.core.Progress;
import org.dendrokin.core.kymo.Kymograph;
import org.junit.jupiter.api.Test;

/** The joint fit of many sessions: its solution, its linear algebra and its group comparison. */
class GlobalFitTest {
    private static final GlobalFit.Options QUICK = GlobalFit.Options.defaults().withBootstrap(0, 1);

    @Test
    void oneSessionGivesTheSessionsOwnFit() {
        SeededStudy.Made m = SeededStudy.sessions(1, 0.5, 0.05, 15, 15, "s", 3).get(0);
        GlobalFit.GroupResult joint = GlobalFit.fitGroup("g", List.of(m.session()), QUICK, Progress.NONE);
        Kymograph k = m.kymograph();
        double[] sigma = NoiseEstimate.perPosition(k, 0, k.firstFrameAtOrAfter(SeededStudy.T0_S) - 1,
                new ArrayList<>());
        DiffusionDecayPulse model = new DiffusionDecayPulse(k.distancesUm(), k.timesS(), SeededStudy.T0_S,
                SeededStudy.X0_UM, null, org.dendrokin.core.units.Unit.DF_F0);
        Map<String, Double> s = m.session().start();
        FitResult own = ModelFit.fit(model, FitData.of(k, sigma), List.of(model.pack(s.get("D"), s.get("k"),
                s.get("amplitude"), SeededStudy.X0_UM, s.get("width"), s.get("baseline"), SeededStudy.T0_S)),
                ModelFit.Options.defaults(), Progress.NONE);
        assertTrue(joint.converged() && own.converged(), joint.reason() + own.reason());
        for (String name : List.of("D", "k")) {
            ParameterEstimate j = joint.estimate(name).orElseThrow();
            ParameterEstimate o = own.estimate(name).orElseThrow();
            // REF: ModelFit (Commons Math Levenberg-Marquardt) on the same session [common practice]: with one session
            // the joint objective n ln chi^2 has the same minimum as chi^2; both stop within about 1e-3 standard
            // errors of it (the joint fit's relative-offset rule, ModelFit's cost tolerance)
            assertEquals(o.value(), j.value(), 2e-3 * o.standardError(), name);
            // the thresholds differ: 3.84 on n ln chi^2 against s^2 t(n - p)^2 on chi^2, 0.2% for n = 2000
            double half = o.ci95().upper() - o.value();
            assertEquals(o.ci95().upper(), j.ci95().upper(), 0.01 * half, name + " profile upper end");
            assertEquals(o.ci95().lower(), j.ci95().lower(), 0.01 * half, name + " profile lower end");
        }
        for (String name : List.of("amplitude", "width", "baseline")) {
            double j = joint.sessions().get(0).parameters().stream().filter(p -> p.name().equals(name)).findFirst()
                    .orElseThrow().value();
            ParameterEstimate o = own.estimate(name).orElseThrow();
            assertEquals(o.value(), j, 2e-3 * o.standardError(), name);
        }
    }

    @Test
    void aRasterScannedSessionIsReadAtEachSamplesOwnTimeAsItsOwnFitIs() {
        SeededStudy.Made m = SeededStudy.sessions(1, 0.5, 0.05, 15, 15, "s", 4).get(0);
        double[] delays = new double[SeededStudy.POSITIONS];
        for (int p = 0; p < delays.length; p++) {
            delays[p] = SeededStudy.DT_S * p / delays.length;     // one scan line per position, top to bottom
        }
        Kymograph k = m.kymograph().withSampleDelays(delays);
        GlobalFit.Session s0 = m.session();
        GlobalFit.Session session = new GlobalFit.Session(s0.id(), k, s0.stimulusTimeS(), s0.stimulusPositionUm(),
                null, false, false, s0.start());
        GlobalFit.GroupResult joint = GlobalFit.fitGroup("g", List.of(session), QUICK, Progress.NONE);
        double[] sigma = NoiseEstimate.perPosition(k, 0, k.firstFrameAtOrAfter(SeededStudy.T0_S) - 1,
                new ArrayList<>());
        DiffusionDecayPulse inner = new DiffusionDecayPulse(k.distancesUm(), LineTimedModel.extendedTimes(k.timesS()),
                SeededStudy.T0_S, SeededStudy.X0_UM, null, org.dendrokin.core.units.Unit.DF_F0);
        LineTimedModel model = new LineTimedModel(inner, k.timesS(), delays);
        Map<String, Double> s = s0.start();
        FitResult own = ModelFit.fit(model, FitData.of(k, sigma), List.of(inner.pack(s.get("D"), s.get("k"),
                s.get("amplitude"), SeededStudy.X0_UM, s.get("width"), s.get("baseline"), SeededStudy.T0_S)),
                ModelFit.Options.defaults().withProfiles(false), Progress.NONE);
        assertTrue(joint.converged() && own.converged(), joint.reason() + own.reason());
        FitResult atFrameTimes = ModelFit.fit(new DiffusionDecayPulse(k.distancesUm(), k.timesS(), SeededStudy.T0_S,
                SeededStudy.X0_UM, null, org.dendrokin.core.units.Unit.DF_F0), FitData.of(k, sigma),
                List.of(own.values()), ModelFit.Options.defaults().withProfiles(false), Progress.NONE);
        for (String name : List.of("D", "k")) {
            double j = joint.estimate(name).orElseThrow().value();
            ParameterEstimate o = own.estimate(name).orElseThrow();
            // REF: ModelFit (Commons Math Levenberg-Marquardt) on the same line-timed model and data [common
            // practice]: one session's joint objective n ln chi^2 has the minimum of chi^2
            assertEquals(o.value(), j, 2e-3 * o.standardError(), name);
        }
        // the delays matter here: read at the frame times, the same data give another D
        double shift = Math.abs(atFrameTimes.estimate("D").orElseThrow().value() - own.estimate("D").orElseThrow()
                .value());
        assertTrue(shift > 0.1 * own.estimate("D").orElseThrow().standardError(), "shift " + shift);
    }

    @Test
    void blockEliminationGivesTheDenseInverse() {
        List<SeededStudy.Made> made = SeededStudy.sessions(4, 0.5, 0.05, 5, 30, "s", 21);
        Built b = build(made);
        JointProblem.Solution sol = b.problem.solve(b.start, new boolean[2], b.problem.ones(), 200, Progress.NONE);
        assertTrue(sol.converged(), sol.reason());
        BlockArrowSystem.Covariance cov = b.problem.covariance(sol, new boolean[2], b.problem.ones());
        // The dense H = sum_i w_i T_i^T J_i^T W_i J_i T_i from each session's analytic Jacobian (evaluate), inverted
        int q = 3;
        int size = 2 + q * made.size();
        double[][] h = new double[size][size];
        for (int i = 0; i < made.size(); i++) {
            JointProblem.Block blk = b.problem.blocks().get(i);
            double[] theta = b.problem.theta(i, sol.state());
            int p = theta.length;
            double[] values = new double[blk.model.size()];
            double[] jac = new double[blk.model.size() * p];
            blk.model.evaluate(theta, values, jac);
            double omega = blk.n / sol.chiSquare()[i];
            // optimiser coordinates: ln D, ln k (global), amplitude, ln width, baseline (local)
            int[] column = {0, 1, 2 + q * i, 3 + q * i, 4 + q * i};
            double[] chain = {theta[0], theta[1], 1, theta[3], 1};
            for (int g = 0; g < blk.model.size(); g++) {
                double w = blk.data.weight(g);
                if (w == 0) {
                    continue;
                }
                for (int a = 0; a < p; a++) {
                    for (int c = 0; c < p; c++) {
                        h[column[a]][column[c]] += omega * w * jac[g * p + a] * chain[a] * jac[g * p + c] * chain[c];
                    }
                }
            }
        }
        RealMatrix inv = new LUDecomposition(new Array2DRowRealMatrix(h)).getSolver().getInverse();
        for (int a = 0; a < 2; a++) {
            for (int c = 0; c < 2; c++) {
                // REF: Commons Math LU inverse of the dense matrix [common practice]
                assertEquals(inv.getEntry(a, c), cov.global()[a][c], 1e-7 * Math.sqrt(inv.getEntry(a, a)
                        * inv.getEntry(c, c)), "global covariance " + a + c);
            }
        }
        for (int i = 0; i < made.size(); i++) {
            for (int x = 0; x < q; x++) {
                int d = 2 + q * i + x;
                assertEquals(inv.getEntry(d, d), cov.local()[i][x], 1e-7 * inv.getEntry(d, d), "local variance");
            }
        }
    }

    @Test
    void theJointMinimumIsTheStackedLeastSquaresMinimum() {
        List<SeededStudy.Made> made = SeededStudy.sessions(3, 0.5, 0.05, 5, 30, "s", 33);
        Built b = build(made);
        JointProblem.Solution sol = b.problem.solve(b.start, new boolean[2], b.problem.ones(), 200, Progress.NONE);
        assertTrue(sol.converged(), sol.reason());
        // At the minimum of sum n_i ln chi2_i, each session's noise scale is s_i^2 = chi2_i / n_i; least squares with
        // weights 1 / (sigma^2 s_i^2) held at those values is stationary at the same point.
        int q = 3;
        int nb = made.size();
        double[] scale = new double[nb];
        List<int[]> used = new ArrayList<>();
        int rows = 0;
        for (int i = 0; i < nb; i++) {
            JointProblem.Block blk = b.problem.blocks().get(i);
            scale[i] = Math.sqrt(sol.chiSquare()[i] / blk.n);
            int[] u = new int[blk.n];
            for (int r = 0; r < blk.n; r++) {
                u[r] = blk.data.usedIndex(r);
            }
            used.add(u);
            rows += blk.n;
        }
        double[] target = new double[rows];
        int row = 0;
        for (int i = 0; i < nb; i++) {
            JointProblem.Block blk = b.problem.blocks().get(i);
            for (int g : used.get(i)) {
                target[row++] = blk.data.value(g) / (blk.data.sigma(g) * scale[i]);
            }
        }
        int size = 2 + q * nb;
        MultivariateJacobianFunction f = point -> {
            double[] v = point.toArray();
            double[] out = new double[target.length];
            double[][] jac = new double[target.length][size];
            int r = 0;
            for (int i = 0; i < nb; i++) {
                JointProblem.Block blk = b.problem.blocks().get(i);
                double[] theta = {Math.exp(v[0]), Math.exp(v[1]), v[2 + q * i], Math.exp(v[3 + q * i]), v[4 + q * i]};
                double[] chain = {theta[0], theta[1], 1, theta[3], 1};
                int[] column = {0, 1, 2 + q * i, 3 + q * i, 4 + q * i};
                double[] values = new double[blk.model.size()];
                double[] j = new double[blk.model.size() * 5];
                blk.model.evaluate(theta, values, j);
                for (int g : used.get(i)) {
                    double s = blk.data.sigma(g) * scale[i];
                    out[r] = values[g] / s;
                    for (int a = 0; a < 5; a++) {
                        jac[r][column[a]] = j[g * 5 + a] * chain[a] / s;
                    }
                    r++;
                }
            }
            return new Pair<>(new ArrayRealVector(out, false), new Array2DRowRealMatrix(jac, false));
        };
        double[] x0 = new double[size];
        x0[0] = Math.log(0.7);
        x0[1] = Math.log(0.04);
        for (int i = 0; i < nb; i++) {
            Map<String, Double> s = made.get(i).session().start();
            x0[2 + q * i] = s.get("amplitude");
            x0[3 + q * i] = Math.log(s.get("width"));
            x0[4 + q * i] = s.get("baseline");
        }
        LeastSquaresOptimizer.Optimum opt = new LevenbergMarquardtOptimizer().withCostRelativeTolerance(1e-12)
                .withParameterRelativeTolerance(1e-12).optimize(new LeastSquaresBuilder().start(x0).model(f)
                        .target(target).maxEvaluations(1000).maxIterations(1000).build());
        double[] x = opt.getPoint().toArray();
        BlockArrowSystem.Covariance cov = b.problem.covariance(sol, new boolean[2], b.problem.ones());
        // REF: Commons Math LevenbergMarquardtOptimizer on the stacked problem of all sessions [common practice];
        // the joint fit stops within about 1e-3 standard errors of the minimum (relative offset 1e-3)
        assertEquals(x[0], sol.state().gamma[0], 2e-3 * Math.sqrt(cov.global()[0][0]), "ln D");
        assertEquals(x[1], sol.state().gamma[1], 2e-3 * Math.sqrt(cov.global()[1][1]), "ln k");
        for (int i = 0; i < nb; i++) {
            for (int a = 0; a < q; a++) {
                assertEquals(x[2 + q * i + a], sol.state().u[i][a], 2e-3 * Math.sqrt(cov.local()[i][a]),
                        "session " + i + " coordinate " + a);
            }
        }
    }

    @Test
    void oneStepResampleRefitsAgreeWithConvergedRefits() {
        // sessions whose own D differ by 20%, so that a resample moves the shared D well away from the joint estimate
        List<SeededStudy.Made> made = SeededStudy.sessions(10, 0.5, 0.05, 0.2, 8, 30, "s", 61);
        Built b = build(made);
        JointProblem.Solution sol = b.problem.solve(b.start, new boolean[2], b.problem.ones(), 200, Progress.NONE);
        assertTrue(sol.converged(), sol.reason());
        List<double[]> draws = new ArrayList<>();
        for (int r = 0; r < 60; r++) {
            draws.add(GlobalFit.resample(10, 100 + r));
        }
        double[][] oneStep = b.problem.resampleSteps(sol, draws);
        double[] spread = new double[2];
        double[] error = new double[2];
        double[] spreadOne = new double[2];
        for (int r = 0; r < draws.size(); r++) {
            JointProblem.Solution full = b.problem.solve(sol.state(), new boolean[2], draws.get(r), 200, Progress.NONE);
            assertTrue(full.converged(), full.reason());
            for (int c = 0; c < 2; c++) {
                spread[c] += Math.pow(full.state().gamma[c] - sol.state().gamma[c], 2);
                error[c] += Math.pow(oneStep[r][c] - full.state().gamma[c], 2);
                spreadOne[c] += Math.pow(oneStep[r][c] - sol.state().gamma[c], 2);
            }
        }
        for (int c = 0; c < 2; c++) {
            String name = c == 0 ? "ln D" : "ln k";
            // REF: the one-step estimator has the converged one's distribution to first order (Andrews 2002,
            // Econometrica 70:119) [published]: the spread the interval is made from agrees within 5%
            assertEquals(1, Math.sqrt(spreadOne[c] / spread[c]), 0.05,
                    name + ": spread of one-step over converged refits");
            assertTrue(Math.sqrt(error[c]) < 0.15 * Math.sqrt(spread[c]), name + ": one-step error "
                    + Math.sqrt(error[c] / 60) + " against spread " + Math.sqrt(spread[c] / 60));
        }
    }

    @Test
    void aNoisySessionDoesNotPullTheSharedConstants() {
        List<SeededStudy.Made> good = SeededStudy.sessions(6, 0.5, 0.05, 20, 20, "good", 41);
        // a session with a four-fold D, at a tenth of the others' signal-to-noise ratio
        List<SeededStudy.Made> odd = SeededStudy.sessions(1, 2.0, 0.05, 2, 2, "odd", 42);
        List<GlobalFit.Session> all = new ArrayList<>(SeededStudy.only(good));
        all.addAll(SeededStudy.only(odd));
        GlobalFit.GroupResult without = GlobalFit.fitGroup("g", SeededStudy.only(good), QUICK, Progress.NONE);
        GlobalFit.GroupResult with = GlobalFit.fitGroup("g", all, QUICK, Progress.NONE);
        ParameterEstimate a = without.estimate("D").orElseThrow();
        ParameterEstimate b = with.estimate("D").orElseThrow();
        // weights 1 / sigma^2 from each session's own noise: the odd session moves D by less than a standard error
        assertEquals(a.value(), b.value(), a.standardError(), "D with and without the noisy session");
    }

    @Test
    void groupsOfTheSameSessionsDoNotDiffer() {
        List<SeededStudy.Made> made = SeededStudy.sessions(5, 0.5, 0.05, 8, 20, "s", 51);
        Map<String, List<GlobalFit.Session>> groups = new LinkedHashMap<>();
        groups.put("a", SeededStudy.only(made));
        groups.put("b", SeededStudy.only(made));
        GlobalFit.Result r = GlobalFit.fit(groups, QUICK, Progress.NONE);
        assertEquals(2, r.comparisons().size(), "one comparison per shared constant");
        for (GlobalFit.Comparison c : r.comparisons()) {
            assertEquals(0, c.statistic(), 1e-4, c.constant() + " likelihood-ratio statistic");
            assertEquals(1, c.pValue(), 0.01, c.constant() + " p");
            ParameterEstimate d = c.difference();
            assertEquals(0, d.value(), 1e-4 * r.groups().get(0).estimate(c.constant()).orElseThrow().value(),
                    c.constant() + " difference");
            assertTrue(d.ci95().contains(0), "the interval of a zero difference holds 0");
        }
    }

    @Test
    void theDifferenceIntervalExcludesZeroExactlyWhenTheTestRejects() {
        int agree = 0;
        int rejected = 0;
        for (int seed = 0; seed < 12; seed++) {
            // differences from none to clear, so that both outcomes occur
            double dB = 0.5 * (1 + 0.04 * seed);
            Map<String, List<GlobalFit.Session>> groups = new LinkedHashMap<>();
            groups.put("a", SeededStudy.only(SeededStudy.sessions(4, 0.5, 0.05, 10, 10, "a", 600 + seed)));
            groups.put("b", SeededStudy.only(SeededStudy.sessions(4, dB, 0.05, 10, 10, "b", 700 + seed)));
            GlobalFit.Comparison c = GlobalFit.fit(groups, QUICK, Progress.NONE).comparisons().get(0);
            assertEquals("D", c.constant());
            boolean excludes = !c.difference().ci95().contains(0);
            rejected += c.pValue() < 0.05 ? 1 : 0;
            // the profile interval is the set of differences the same likelihood-ratio test does not reject
            agree += excludes == (c.pValue() < 0.05) || Math.abs(c.pValue() - 0.05) < 0.002 ? 1 : 0;
        }
        assertEquals(12, agree, "profile interval and test agree");
        assertTrue(rejected > 0 && rejected < 12, "both outcomes occurred: " + rejected + " rejections");
    }

    @Test
    void aSessionWithoutAStartIsAProgrammingError() {
        SeededStudy.Made m = SeededStudy.sessions(1, 0.5, 0.05, 10, 10, "s", 1).get(0);
        Map<String, Double> start = new HashMap<>(m.session().start());
        start.remove("width");
        GlobalFit.Session s = new GlobalFit.Session("s", m.kymograph(), SeededStudy.T0_S, SeededStudy.X0_UM, null,
                false, false, start);
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class,
                () -> GlobalFit.fitGroup("g", List.of(s), QUICK, Progress.NONE));
        assertTrue(e.getMessage().contains("width"), e.getMessage());
    }

    @Test
    void aGroupOfOneSessionSaysItHasNoBootstrap() {
        SeededStudy.Made m = SeededStudy.sessions(1, 0.5, 0.05, 10, 10, "s", 1).get(0);
        GlobalFit.GroupResult g = GlobalFit.fitGroup("g", List.of(m.session()), GlobalFit.Options.defaults(),
                Progress.NONE);
        assertTrue(g.converged(), g.reason());
        assertFalse(g.estimate("D").orElseThrow().otherIntervals().stream()
                .anyMatch(i -> i.method().equals(GlobalFit.BOOTSTRAP)), "no bootstrap interval");
        assertTrue(g.warnings().stream().anyMatch(w -> w.contains("one session")), g.warnings().toString());
    }

    /** A group's problem built as GlobalFit builds it, with its start. */
    private record Built(JointProblem problem, JointProblem.State start) {
    }

    private static Built build(List<SeededStudy.Made> made) {
        List<JointProblem.Block> blocks = new ArrayList<>();
        List<double[]> theta0 = new ArrayList<>();
        for (SeededStudy.Made m : made) {
            Kymograph k = m.kymograph();
            double[] sigma = NoiseEstimate.perPosition(k, 0, k.firstFrameAtOrAfter(SeededStudy.T0_S) - 1,
                    new ArrayList<>());
            FitModel model = m.session().model(k);
            blocks.add(GlobalFit.block(m.session().id(), model, FitData.of(k, sigma), 0, -1, 1));
            Map<String, Double> s = m.session().start();
            theta0.add(new double[] {s.get("D"), s.get("k"), s.get("amplitude"), s.get("width"), s.get("baseline")});
        }
        JointProblem p = new JointProblem(GlobalFit.coordinates(blocks.get(0).specs, ""), blocks);
        return new Built(p, p.start(new double[] {0.6, 0.06}, theta0));
    }
}
