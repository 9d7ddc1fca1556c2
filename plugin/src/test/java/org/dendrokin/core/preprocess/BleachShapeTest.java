package org.dendrokin.core.preprocess;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Random;

import org.dendrokin.core.kymo.Kymograph;
import org.dendrokin.core.spread.Estimate;
import org.junit.jupiter.api.Test;

/** The bleaching correction notices bleaching that one exponential does not describe. */
class BleachShapeTest {
    private static final int NX = 40;
    private static final int NT = 150;

    /** A flat dendrite of 500 counts, bleaching by b(t), Gaussian noise of SD 5 counts, no response. */
    private static Kymograph bleaching(java.util.function.DoubleUnaryOperator b, long seed) {
        double[] x = new double[NX];
        double[] t = new double[NT];
        double[] v = new double[NX * NT];
        Random r = new Random(seed);
        for (int p = 0; p < NX; p++) {
            x[p] = 0.5 * p;
        }
        for (int f = 0; f < NT; f++) {
            t[f] = 0.5 * f;
            for (int p = 0; p < NX; p++) {
                v[f * NX + p] = 500 * b.applyAsDouble(t[f]) + 5 * r.nextGaussian();
            }
        }
        return new Kymograph(x, t, v, "counts");
    }

    @Test
    void twoPhasesOfBleachingAreFittedAndCorrected() {
        // REF: 30% of the dye bleaching with a 25 s time constant and 70% with 300 s is a sum of two exponentials,
        // b(t) = 0.3 exp(-t / 25) + 0.7 exp(-t / 300) [common practice]
        Kymograph k = bleaching(time -> 0.3 * Math.exp(-time / 25) + 0.7 * Math.exp(-time / 300), 3);
        BleachCorrection.Result r = BleachCorrection.correct(k, 0, 19, NT);
        assertTrue(r.applied());
        assertNotNull(r.fastPhase(), r.warnings().toString());
        assertTrue(r.warnings().stream().anyMatch(w -> w.contains("a fast and a slow phase")), r.warnings().toString());
        assertEquals(0.3, r.fastPhase().fraction(), 0.05, "share of the fast phase");
        Estimate fast = r.fastPhase().timeConstant();
        assertTrue(fast.lo95() <= 25 && 25 <= fast.hi95(), "fast time constant " + fast);
        Estimate slow = r.timeConstant();
        assertTrue(slow.lo95() <= 300 && 300 <= slow.hi95(), "slow time constant " + slow);
        // the corrected intensity stays at its first level (500 counts) to within 1% over the movie
        Kymograph c = r.corrected();
        for (int f = 0; f < NT; f += 10) {
            double mean = java.util.Arrays.stream(c.row(f)).average().orElseThrow();
            assertEquals(500, mean, 5, "frame " + f);
        }
    }

    @Test
    void bleachingThatNoExponentialSumDescribesIsCalledOut() {
        // a linear fade with a step at 40 s: neither one nor two exponentials follow it
        Kymograph k = bleaching(time -> 1 - 0.002 * time - (time > 40 ? 0.15 : 0), 4);
        BleachCorrection.Result r = BleachCorrection.correct(k, 0, 19, NT);
        assertTrue(r.warnings().stream().anyMatch(w -> w.contains("does not follow one exponential")),
                r.warnings().toString());
    }

    @Test
    void oneExponentialIsNotCalledOut() {
        for (long seed = 1; seed <= 20; seed++) {
            // REF: single-exponential bleaching b(t) = exp(-t / 150 s) is what the correction fits [common practice]
            Kymograph k = bleaching(time -> Math.exp(-time / 150), seed);
            BleachCorrection.Result r = BleachCorrection.correct(k, 0, 19, NT);
            assertTrue(r.applied());
            assertNotNull(r.timeConstant());
            assertEquals(150, r.timeConstant().value(), 15, "time constant, s");
            assertTrue(r.warnings().stream().noneMatch(w -> w.contains("does not follow one exponential")),
                    "seed " + seed + ": " + r.warnings());
        }
    }
}
