package org.dendrokin.core.model;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.ArrayList;
import java.util.List;

import org.junit.jupiter.api.Test;

/**
 * The time-marching driver on a stepper whose step is exact: every node decays independently, du/dt = -lambda u + q
 * (no diffusion), so u(t) is known in closed form for any protocol and the driver's events, sources, clamps,
 * step counts and interpolated outputs can be checked one by one.
 */
class TimeMarcherTest {
    private static final double LAMBDA = 0.7;

    /** du/dt = -lambda u + q at every node, stepped exactly: u1 = u0 e + q (1 - e) / lambda, e = exp(-lambda dt). */
    private static final class DecayStepper implements Stepper {
        final double[] u;
        final double[] q;
        final List<Double> dampedAtS = new ArrayList<>();
        final List<Double> stepsS = new ArrayList<>();
        double timeS;

        DecayStepper(int n) {
            u = new double[n];
            q = new double[n];
        }

        @Override
        public int nodeCount() {
            return u.length;
        }

        @Override
        public double[] field(int f) {
            return u;
        }

        @Override
        public void setSources(double[][] rates) {
            for (int i = 0; i < q.length; i++) {
                q[i] = rates[0] == null ? 0 : rates[0][i];
            }
        }

        @Override
        public void hold(int f, boolean[] nodes, double value) {
            for (int i = 0; i < u.length; i++) {
                if (nodes[i]) {
                    u[i] = value;
                }
            }
        }

        @Override
        public void step(double dtS, boolean damped) {
            if (damped) {
                dampedAtS.add(timeS);
            }
            stepsS.add(dtS);
            double e = Math.exp(-LAMBDA * dtS);
            for (int i = 0; i < u.length; i++) {
                u[i] = u[i] * e + q[i] * (1 - e) / LAMBDA;
            }
            timeS += dtS;
        }
    }

    private record Marched(double[] out, DecayStepper stepper, long steps, double[] x, double[] times) {
    }

    private static Marched march(List<Stimulus> stimuli, double[] times, SolverSettings settings, double dtMax) {
        Domain domain = new Domain(10, 0.5, Boundary.NO_FLUX);
        CableGrid grid = new CableGrid(domain);
        double[] x = {0, 2.5, 5, 7.5, 10};   // on nodes, so the sampling adds no error in space
        OutputSampler sampler = new OutputSampler(x, domain.lengthUm(), grid.h, grid.n);
        StimulusLayout layout = new StimulusLayout(grid, stimuli);
        TimeMarcher marcher = new TimeMarcher(times, stimuli, layout, new int[stimuli.size()], 1, sampler, settings);
        DecayStepper stepper = new DecayStepper(grid.n);
        double[] out = new double[times.length * x.length];
        long steps = marcher.run(stepper, dtMax, new double[][] {out});
        return new Marched(out, stepper, steps, x, times);
    }

    @Test
    void pulsesAndInjectionsFollowTheLinearOdeBetweenAndAtSteps() {
        double t1 = 0.4;
        double t2 = 1.0;
        double duration = 2.0;
        List<Stimulus> stimuli = List.of(Stimulus.pulse(t1, 5, 1.5, 2.0), Stimulus.injection(t2, duration, 5, 1.5,
                0.9));
        double[] times = new double[41];
        for (int f = 0; f < times.length; f++) {
            times[f] = 0.137 * f;    // frames fall between steps, not on breakpoints
        }
        double dtMax = 0.01;
        Marched m = march(stimuli, times, SolverSettings.DEFAULT, dtMax);
        double rate = 0.9 / duration;
        double worst = 0;
        for (int f = 0; f < times.length; f++) {
            double t = times[f];
            for (int p = 0; p < m.x().length; p++) {
                double g = stimuli.get(0).profile(m.x()[p]);
                double pulse = t >= t1 ? 2.0 * g * Math.exp(-LAMBDA * (t - t1)) : 0;
                double on = Math.min(Math.max(t - t2, 0), duration);
                // source on during [t2, t2 + duration): charge while on, decay after
                double injected = rate * g * (1 - Math.exp(-LAMBDA * on)) / LAMBDA
                        * Math.exp(-LAMBDA * Math.max(t - t2 - duration, 0));
                double exact = pulse + injected;
                worst = Math.max(worst, Math.abs(m.out()[f * m.x().length + p] - exact));
            }
        }
        // linear interpolation in time between exact steps errs by at most dt^2 / 8 max|u''|, and
        // |u''| <= lambda^2 x 2 (the pulse) + lambda x rate (the injection)
        // REF: exact solution of the linear ODE u' = -lambda u + q [common practice]; linear interpolation error
        // bound, Burden & Faires, Numerical Analysis, Thm 3.3 [published]
        double bound = dtMax * dtMax / 8 * (2 * LAMBDA * LAMBDA + LAMBDA * rate);
        assertTrue(worst < bound, "largest error " + worst + " vs bound " + bound);
        assertTrue(worst > 0, "the frames between steps are interpolated");
        assertEquals(m.steps(), m.stepper().stepsS.size(), "steps counted");
    }

    @Test
    void stepsFillEachGapEquallyAndTheStepAfterASharpChangeIsDamped() {
        List<Stimulus> stimuli = List.of(Stimulus.pulse(0.3, 5, 1, 1), Stimulus.clamp(0.75, 0.5, 5, 1, 0.4));
        double[] times = {0, 0.5, 2};
        SolverSettings settings = SolverSettings.DEFAULT;
        Marched m = march(stimuli, times, settings, 0.1);
        // breakpoints 0, 0.3, 0.75, 1.25, 2 (the clamp starts at 0.75 and ends at 1.25)
        double[] breaks = {0, 0.3, 0.75, 1.25, 2};
        long expected = 0;
        int k = 0;
        for (int j = 0; j + 1 < breaks.length; j++) {
            double gap = breaks[j + 1] - breaks[j];
            long count = settings.stepCount(gap, 0.1);
            expected += count;
            for (long s = 0; s < count; s++, k++) {
                assertEquals(gap / count, m.stepper().stepsS.get(k), 1e-15, "step " + k + " in gap " + j);
            }
        }
        assertEquals(expected, m.steps(), "step count");
        List<Double> damped = m.stepper().dampedAtS;
        assertEquals(3, damped.size(), "damped after the pulse, the clamp's start and its end: " + damped);
        for (int i = 0; i < 3; i++) {
            assertEquals(breaks[i + 1], damped.get(i), 1e-12, "damped step " + i + " starts at the event");
        }
        Marched plain = march(stimuli, times, settings.withSmoothing(false), 0.1);
        assertTrue(plain.stepper().dampedAtS.isEmpty(), "no damped step without smoothing");
    }

    @Test
    void clampsHoldTheirNodesAndReleaseThem() {
        List<Stimulus> stimuli = List.of(Stimulus.clamp(0.5, 1.0, 5, 1.2, 0.8));
        double[] times = {0.25, 0.5, 0.9, 1.5, 2.5};
        Marched m = march(stimuli, times, SolverSettings.DEFAULT, 0.05);
        int centre = 2;   // x = 5 um
        assertEquals(0, m.out()[centre], 0, "before the clamp");
        for (int f = 1; f <= 3; f++) {
            // REF: definition of a clamp (value held over [t, t + duration]) [common practice]
            assertEquals(0.8, m.out()[f * m.x().length + centre], 1e-15, "held at t = " + times[f]);
        }
        // REF: exact solution of u' = -lambda u from the released value [common practice]
        assertEquals(0.8 * Math.exp(-LAMBDA * 1.0), m.out()[4 * m.x().length + centre], 1e-12,
                "decays freely once released");
        assertEquals(0, m.out()[4 * m.x().length], 0, "nodes outside the clamp are untouched");
    }
}
