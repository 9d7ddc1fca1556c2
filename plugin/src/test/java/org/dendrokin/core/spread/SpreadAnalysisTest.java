package org.dendrokin.core.spread;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.dendrokin.core.kymo.Kymograph;
import org.junit.jupiter.api.Test;

class SpreadAnalysisTest {
    private interface Field {
        double at(double xUm, double tS);
    }

    private static Kymograph grid(int nx, double dx, int nt, double dt, Field field) {
        double[] d = new double[nx];
        double[] t = new double[nt];
        double[] v = new double[nx * nt];
        for (int p = 0; p < nx; p++) {
            d[p] = p * dx;
        }
        for (int f = 0; f < nt; f++) {
            t[f] = f * dt;
            for (int p = 0; p < nx; p++) {
                v[f * nx + p] = field.at(d[p], t[f]);
            }
        }
        return new Kymograph(d, t, v, "dF/F0");
    }

    @Test
    void frontSpeedOfAConstantSpeedFront() {
        double v = 2.0;
        double x0 = 10;
        // A logistic front travelling both ways from x0 at v um/s; its half-maximum passes d at t = 1 + |d| / v.
        Kymograph k = grid(201, 0.25, 400, 0.05, (x, t) -> 1 / (1 + Math.exp(-(t - 1 - Math.abs(x - x0) / v) / 0.2)));
        SpreadAnalysis.Result r = SpreadAnalysis.measure(k, 1.0, x0, 0.0);
        // REF: constant-speed front, arrival t = |d| / v by construction [common practice]
        assertEquals(v, r.frontSpeed().value(), 0.01 * v, "front speed, um/s");
        assertTrue(r.frontSpeed().lo95() <= v && v <= r.frontSpeed().hi95(), "interval holds the speed");
        assertEquals(SpreadAnalysis.FrontVerdict.FRONT, r.front().verdict());
        assertEquals(v, r.front().left().value(), 0.01 * v, "speed towards the path's start, um/s");
        assertEquals(v, r.front().right().value(), 0.01 * v, "speed towards the path's end, um/s");
        assertTrue(r.warnings().stream().anyMatch(w -> w.contains("end of the path")),
                "a front that runs off the path is flagged: " + r.warnings());
        assertTrue(r.warnings().stream().noneMatch(w -> w.contains("slows down")), "a steady front does not slow");
    }

    @Test
    void aFrontWhoseArrivalGrowsWithDistanceSquaredIsFlaggedAsSlowing() {
        double x0 = 10;
        // Half-maximum passes distance d at t = 1 + d^2 / 4, the diffusive law t ~ d^2 / (4 D) with D = 1.
        Kymograph k = grid(121, 0.25, 400, 0.05,
                (x, t) -> 1 / (1 + Math.exp(-(t - 1 - Math.pow(x - x0, 2) / 4) / 0.1)));
        SpreadAnalysis.Result r = SpreadAnalysis.measure(k, 1.0, x0, 0.0);
        // REF: diffusive spreading: arrival time grows with distance squared [common practice]; sheet s2.5
        assertTrue(r.warnings().stream().anyMatch(w -> w.contains("slows down")), r.warnings().toString());
        assertNull(r.frontSpeed(), "no front speed where arrival grows with distance squared");
        assertEquals(SpreadAnalysis.FrontVerdict.DIFFUSIVE, r.front().verdict());
        assertTrue(r.front().reason().contains("square of the distance"), r.front().reason());
    }

    @Test
    void aResponseEverywhereAtOnceHasNoFront() {
        double x0 = 10;
        // The whole stretch rises within one frame (a profile fixed in space, switched on at t = 1 s).
        Kymograph k = grid(121, 0.25, 200, 0.05, (x, t) -> t < 1 ? 0
                : Math.exp(-Math.pow(x - x0, 2) / 50) * Math.exp(-(t - 1) / 4));
        SpreadAnalysis.Result r = SpreadAnalysis.measure(k, 1.0, x0, 0.0);
        // REF: simultaneous onset at every position: no propagation by construction [common practice]
        assertNull(r.frontSpeed(), r.front().reason());
        assertTrue(r.front().verdict() == SpreadAnalysis.FrontVerdict.SIMULTANEOUS
                || r.front().verdict() == SpreadAnalysis.FrontVerdict.NO_INCREASE, r.front().verdict().name());
    }

    @Test
    void frontsOnTheTwoSidesAreMeasuredApartAndCompared() {
        double x0 = 20;
        double left = 1.0;
        double right = 3.0;
        // Half-maximum passes d at t = 1 + |d| / v, with v = 1 um/s towards the path's start and 3 um/s towards its end.
        Kymograph k = grid(161, 0.25, 600, 0.05, (x, t) -> 1 / (1 + Math.exp(-(t - 1
                - Math.abs(x - x0) / (x < x0 ? left : right)) / 0.2)));
        SpreadAnalysis.Result r = SpreadAnalysis.measure(k, 1.0, x0, 0.0);
        // REF: constant-speed fronts, arrival t = |d| / v on each side by construction [common practice]
        assertEquals(left, r.front().left().value(), 0.02 * left, "speed towards the start, um/s");
        assertEquals(right, r.front().right().value(), 0.02 * right, "speed towards the end, um/s");
        assertTrue(r.warnings().stream().anyMatch(w -> w.contains("different speeds")), r.warnings().toString());
    }

    @Test
    void signalSpreadingOffAShortPathIsFlaggedForTheDecayTime() {
        double x0 = 10;
        Field pulse = (x, t) -> {
            double var = 1 + 2 * 1.0 * t;
            return 5 / Math.sqrt(2 * Math.PI * var) * Math.exp(-Math.pow(x - x0, 2) / (2 * var)) * Math.exp(-0.05 * t);
        };
        // D = 1 um^2/s for 40 s: s.d. 9 um, so about a quarter of a Gaussian centred on a 20 um path lies beyond it.
        SpreadAnalysis.Result shortPath = SpreadAnalysis.measure(grid(81, 0.25, 401, 0.1, pulse), 0.0, x0, 0.0);
        // REF: Gaussian pulse, variance s0^2 + 2 D t; share beyond +-10 um is 2 (1 - Phi(10 / 9)) = 0.27 [published formula: Crank 1975]; sheet s2.2
        assertTrue(shortPath.warnings().stream().anyMatch(w -> w.contains("beyond the ends of the path")),
                shortPath.warnings().toString());
        assertTrue(shortPath.decayTime().value() < 1 / 0.05, "the summed signal decays faster than the signal");
        SpreadAnalysis.Result longPath = SpreadAnalysis.measure(grid(401, 0.25, 401, 0.1,
                (x, t) -> pulse.at(x - 40, t)), 0.0, x0 + 40, 0.0);
        assertTrue(longPath.warnings().stream().noneMatch(w -> w.contains("beyond the ends of the path")),
                longPath.warnings().toString());
    }

    @Test
    void lengthConstantOfAnExponentialProfile() {
        double lambda = 4.0;
        double x0 = 20;
        Kymograph k = grid(161, 0.25, 100, 0.5,
                (x, t) -> t < 5 ? 0 : 3 * Math.exp(-Math.abs(x - x0) / lambda) * (t - 5) * Math.exp(-(t - 5) / 6));
        SpreadAnalysis.Result r = SpreadAnalysis.measure(k, 4.75, x0, 0.0);
        // REF: peak(d) = P0 exp(-|d| / lambda), steady source with decay [published formula: Crank 1975]; sheet s2.4
        assertEquals(lambda, r.peakDecayLength().value(), 1e-9, "length constant, um");
        assertEquals("um", r.peakDecayLength().unit());
    }

    @Test
    void gaussianPulseGivesDFromVarianceGrowthAndKFromTheIntegratedDecay() {
        double dUm2PerS = 1.0;
        double kPerS = 0.1;
        double s0 = 1.0;
        double x0 = 50;
        Kymograph k = grid(401, 0.25, 201, 0.1, (x, t) -> {
            double var = s0 * s0 + 2 * dUm2PerS * t;
            return 5 / Math.sqrt(2 * Math.PI * var) * Math.exp(-Math.pow(x - x0, 2) / (2 * var)) * Math.exp(-kPerS * t);
        });
        SpreadAnalysis.Result r = SpreadAnalysis.measure(k, 0.0, x0, 0.0);
        // REF: Gaussian pulse, variance s0^2 + 2 D t [published formula: Crank 1975 ch. 2; Einstein 1905]; sheet s2.2, s2.5
        assertEquals(dUm2PerS, r.apparentD().value(), 1e-6, "apparent D, um^2/s");
        assertTrue(r.varianceWindowS()[1] > r.varianceWindowS()[0], "a time window is reported");
        // REF: total amount decays as exp(-k t) under first-order decay [published: Crank 1975]; sheet s2.3
        assertEquals(1 / kPerS, r.decayTime().value(), 1e-6, "decay time, s");

    }

    @Test
    void noResponseGivesNullsWithReasons() {
        java.util.Random random = new java.util.Random(3);
        Kymograph k = grid(40, 0.5, 60, 1, (x, t) -> 0.05 * random.nextGaussian());
        SpreadAnalysis.Result r = SpreadAnalysis.measure(k, 10, 10, 0.05);
        assertNull(r.frontSpeed());
        assertNull(r.peakDecayLength());
        assertNull(r.decayTime());
        assertTrue(!r.warnings().isEmpty());
    }

    private static double pulse(double x, double t, double x0) {
        if (t < 1) {
            return 0;
        }
        double var = 1 + 2 * 0.5 * (t - 1);
        return 2 / Math.sqrt(var) * Math.exp(-Math.pow(x - x0, 2) / (2 * var)) * Math.exp(-0.1 * (t - 1));
    }

    @Test
    void aStretchOfNaNIsSkippedWithoutHarm() {
        Kymograph k = grid(200, 0.2, 120, 0.25, (x, t) -> x > 28 && x < 31 ? Double.NaN : pulse(x, t, 20));
        SpreadAnalysis.Result r = SpreadAnalysis.measure(k, 1.0, 20, 0.0);
        // REF: Gaussian pulse variance s0^2 + 2 D t with D = 0.5 [published formula: Crank 1975]; sheet s2.2
        assertEquals(0.5, r.apparentD().value(), 0.01, "apparent D with a NaN stretch, um^2/s");
        assertTrue(r.peakDecayLength() != null && r.decayTime() != null);
        // REF: a decaying Gaussian pulse is no front of constant shape [published formula: Crank 1975]; sheet s2.2
        assertNull(r.frontSpeed(), r.front().reason());
    }

    @Test
    void aResponseAtTheVeryEndOfThePathIsMeasuredWithWarnings() {
        Kymograph k = grid(100, 0.2, 120, 0.25, (x, t) -> pulse(x, t, 19.8));
        SpreadAnalysis.Result r = SpreadAnalysis.measure(k, 1.0, 19.8, 0.0);
        assertNull(r.apparentD(), "no symmetric window at the path's end");
        assertTrue(r.warnings().stream().anyMatch(w -> w.contains("end of the path")), r.warnings().toString());
    }

    @Test
    void oneFrameAfterTheStimulusGivesNullsNotExceptions() {
        Kymograph k = grid(100, 0.2, 20, 0.25, (x, t) -> pulse(x, t + 3.75, 10));
        SpreadAnalysis.Result r = SpreadAnalysis.measure(k, 4.75, 10, 0.01);
        assertNull(r.frontSpeed());
        assertNull(r.decayTime());
        assertTrue(r.warnings().stream().anyMatch(w -> w.contains("too few")), r.warnings().toString());
    }
}
