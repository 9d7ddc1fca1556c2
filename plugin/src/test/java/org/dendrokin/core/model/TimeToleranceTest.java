package org.dendrokin.core.model;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.List;
import java.util.Map;
import java.util.function.Function;

import org.dendrokin.core.Progress;
import org.junit.jupiter.api.Test;

class TimeToleranceTest {
    /** Reference runs divide the rule's step by 2^REFERENCE_HALVINGS: their time error is ~4^-10 of the rule's. */
    private static final int REFERENCE_HALVINGS = 10;

    private static Simulation.Spec gaussianSpec(SolverSettings settings) {
        // pulse of peak 2 and sd 1 um at 30 um; D = 1 um^2/s, k = 0.4 1/s; the rule's step is 0.5 w^2 / D = 2 s
        return new Simulation.Spec("diffusion-decay", Map.of("D", 1.0, "k", 0.4), null, null,
                new Domain(60, 0.1, Boundary.NO_FLUX), 6, 0.5, nodes(new Domain(60, 0.1, Boundary.NO_FLUX)),
                List.of(Stimulus.pulse(0, 30, 1.0, 2.0)), settings, null);
    }

    private static Simulation.Spec nagumoSpec(SolverSettings settings) {
        // front launched by a pulse at 5 um; D = 1 um^2/s, k = 2 1/s, a = 0.2
        Domain domain = new Domain(60, 0.25, Boundary.NO_FLUX);
        return new Simulation.Spec("nagumo", Map.of("D", 1.0, "k", 2.0, "a", 0.2), null, null, domain, 30, 0.2,
                nodes(domain), List.of(Stimulus.pulse(0, 5, 2.0, 1.0)), settings, null);
    }

    private static Simulation.Spec networkSpec(SolverSettings settings) {
        // FitzHugh-Nagumo pulse as a network
        Domain domain = new Domain(80, 0.25, Boundary.NO_FLUX);
        return new Simulation.Spec("fitzhugh-nagumo", Map.of("D", 1.0, "k", 1.0, "alpha", 0.1, "eps", 0.01,
                "gamma", 0.5), null, null, domain, 30, 0.5, nodes(domain), List.of(Stimulus.pulse(0, 5, 2.0, 1.0)),
                settings, null);
    }

    private static Simulation.Spec protocolSpec(SolverSettings settings) {
        // Nagumo with a pulse, a short injection and a late pulse: event gaps of uneven length, some short
        Domain domain = new Domain(60, 0.25, Boundary.NO_FLUX);
        return new Simulation.Spec("nagumo", Map.of("D", 1.0, "k", 2.0, "a", 0.2), null, null, domain, 12, 0.25,
                nodes(domain), List.of(Stimulus.pulse(0, 5, 2.0, 1.0), Stimulus.injection(3.03, 0.07, 40, 1.5, 0.8),
                        Stimulus.pulse(3.11, 50, 1.0, 0.6)), settings, null);
    }

    private static double[] nodes(Domain d) {
        double[] x = new double[d.nodeCount()];
        for (int i = 0; i < x.length; i++) {
            x[i] = d.nodeUm(i);
        }
        return x;
    }

    private static double maxDiff(double[] a, double[] b) {
        double m = 0;
        for (int i = 0; i < a.length; i++) {
            m = Math.max(m, Math.abs(a[i] - b[i]));
        }
        return m;
    }

    private static double[] values(Simulation.Result r) {
        return r.kymograph().values();
    }

    private static double info(Simulation.Result r, String key) {
        return ((Number) r.solverInfo().get(key)).doubleValue();
    }

    /** Crank 1975 (2.2) for a pulse of peak 2 and sd 1 um, times exp(-k t) (2.3). */
    private static double gaussian(double d, double k, double x, double t) {
        double var = 1 + 2 * d * t;
        return 2 / Math.sqrt(var) * Math.exp(-x * x / (2 * var)) * Math.exp(-k * t);
    }

    /** The estimate against the time error alone (the same grid, a step 2^-refHalvings of the rule's). */
    private static void assertHonest(Function<SolverSettings, Simulation.Spec> problem, double tolerance,
            int refHalvings, String name) {
        double[] reference = values(Simulation.run(problem.apply(SolverSettings.DEFAULT.halved(refHalvings)),
                Progress.NONE));
        Simulation.Result r = Simulation.run(problem.apply(SolverSettings.DEFAULT.withTimeTolerance(tolerance)),
                Progress.NONE);
        double trueError = maxDiff(values(r), reference);
        double estimate = info(r, "time_error_estimate");
        double allowed = info(r, "time_error_allowed");
        assertTrue(r.warnings().isEmpty(), name + ": no warning expected, got " + r.warnings());
        assertTrue(info(r, "time_step_halvings") >= 1, name + ": at least one halving to estimate the error");
        assertTrue(trueError <= allowed, name + ": true time error " + trueError + " within the allowed " + allowed);
        // REF: Richardson 1911, err(u_h/2) ~ |u_h/2 - u_h| / (2^p - 1) for order p = 2 [published: standard]
        assertTrue(estimate >= trueError / 2 && estimate <= 2 * trueError, name + ": estimate " + estimate
                + " vs true time error " + trueError);
    }

    @Test
    void richardsonEstimateMatchesTheTrueTimeError() {
        double[] reference = values(Simulation.run(gaussianSpec(SolverSettings.DEFAULT.halved(10)), Progress.NONE));
        double[] x = nodes(new Domain(60, 0.1, Boundary.NO_FLUX));
        double worst = 0;
        for (int f = 0; f <= 12; f++) {
            for (int i = 0; i < x.length; i++) {
                worst = Math.max(worst, Math.abs(reference[f * x.length + i] - gaussian(1, 0.4, x[i] - 30, 0.5 * f)));
            }
        }
        // REF: Crank 1975 (2.2) x exp(-k t) [published formula]; sheet s2.2, s2.3: the problem is the closed form
        assertTrue(worst < 1e-4, "reference run vs closed form: " + worst);
        assertHonest(TimeToleranceTest::gaussianSpec, 1e-4, 10, "Gaussian pulse");

        Simulation.Result front = Simulation.run(nagumoSpec(SolverSettings.DEFAULT.halved(8)), Progress.NONE);
        // REF: McKean 1970, c = sqrt(D k / 2)(1 - 2a) = 0.6 um/s [published formula]; sheet s5.2
        assertEquals(0.6, front.frontSpeedUmPerS(), 0.01 * 0.6, "front speed of the reference run (um/s)");
        assertHonest(TimeToleranceTest::nagumoSpec, 1e-4, 8, "Nagumo front");
        // REF: FitzHugh 1961 / Nagumo 1962 as a two-species network [published equations]; Richardson as above
        assertHonest(TimeToleranceTest::networkSpec, 1e-5, 8, "FitzHugh-Nagumo network");
        assertHonest(TimeToleranceTest::protocolSpec, 1e-4, 8, "uneven protocol");
    }

    @Test
    void tighterToleranceGivesSmallerStepAndErrorAtSecondOrder() {
        double[] reference = values(Simulation.run(gaussianSpec(SolverSettings.DEFAULT.halved(10)), Progress.NONE));
        double lastStep = Double.POSITIVE_INFINITY;
        double lastError = Double.POSITIVE_INFINITY;
        for (double tolerance : new double[] {1e-3, 1e-4, 1e-5}) {
            Simulation.Result r = Simulation.run(gaussianSpec(SolverSettings.DEFAULT.withTimeTolerance(tolerance)),
                    Progress.NONE);
            double step = info(r, "mean_time_step_s");
            double error = maxDiff(values(r), reference);
            assertTrue(step < lastStep, "tolerance " + tolerance + ": step " + step + " below " + lastStep);
            assertTrue(error < lastError, "tolerance " + tolerance + ": error " + error + " below " + lastError);
            assertTrue(error <= info(r, "time_error_allowed"), "tolerance " + tolerance + ": error " + error);
            lastStep = step;
            lastError = error;
        }
        double previous = Double.NaN;
        for (int j = 2; j <= 4; j++) {
            double error = maxDiff(values(Simulation.run(gaussianSpec(SolverSettings.DEFAULT.halved(j)),
                    Progress.NONE)), reference);
            if (j > 2) {
                double order = Math.log(previous / error) / Math.log(2);
                // REF: Crank-Nicolson with Strang splitting is second order in time [published: standard]; sheet s6.4
                assertEquals(2, order, 0.2, "observed order between halvings " + (j - 1) + " and " + j);
            }
            previous = error;
        }
    }

    @Test
    void warnsWhenTheHalvingsRunOut() {
        Simulation.Result r = Simulation.run(gaussianSpec(SolverSettings.DEFAULT.withTimeTolerance(1e-9)),
                Progress.NONE, 2);
        assertEquals(1, r.warnings().size(), "one warning: " + r.warnings());
        String w = r.warnings().get(0);
        assertTrue(w.contains("2 halvings") && w.contains("time_tolerance"), w);
        assertEquals(2, info(r, "time_step_halvings"), "halvings made");
        assertTrue(info(r, "time_error_estimate") > info(r, "time_error_allowed"), "estimate above the allowed");
        for (double v : values(r)) {
            assertTrue(Double.isFinite(v), "the finest run is still given");
        }
    }

    @Test
    void withoutToleranceTheRuleRunsOnce() {
        Simulation.Result plain = Simulation.run(gaussianSpec(SolverSettings.DEFAULT), Progress.NONE);
        ScalarRun run = ScalarRun.prepare("diffusion-decay", new Domain(60, 0.1, Boundary.NO_FLUX),
                gaussianSpec(SolverSettings.DEFAULT).outputTimesS(), nodes(new Domain(60, 0.1, Boundary.NO_FLUX)),
                List.of(Stimulus.pulse(0, 30, 1.0, 2.0)), SolverSettings.DEFAULT);
        double[] out = new double[values(plain).length];
        run.solve(new double[] {1.0, 0.4}, out);
        assertEquals(0, maxDiff(out, values(plain)), "the same single run as before");
        assertEquals(run.lastStepCount(), plain.steps(), "steps of one run");
        assertFalse(plain.solverInfo().containsKey("time_error_estimate"), "no estimate without a tolerance");
        assertThrows(IllegalArgumentException.class, () -> SolverSettings.DEFAULT.withTimeTolerance(-1e-3));
    }
}
