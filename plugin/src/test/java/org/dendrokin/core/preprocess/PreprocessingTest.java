package org.dendrokin.core.preprocess;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Arrays;
import java.util.Random;

import org.dendrokin.core.kymo.Kymograph;
import org.junit.jupiter.api.Test;

class PreprocessingTest {
    private static final int NX = 60;
    private static final int NT = 120;
    private static final double DX = 0.25;
    private static final double DT = 0.5;

    /** Raw intensity = background + F0(x) (1 + a(x, t)) exp(-t / tau); a is a pulse at frame 40, x = 7 um. */
    private static Kymograph raw(double background, double tauS, double amplitude, double noiseSd, long seed) {
        Random random = new Random(seed);
        double[] d = new double[NX];
        double[] t = new double[NT];
        double[] v = new double[NX * NT];
        for (int p = 0; p < NX; p++) {
            d[p] = p * DX;
        }
        for (int f = 0; f < NT; f++) {
            t[f] = f * DT;
            for (int p = 0; p < NX; p++) {
                double f0 = 500 + 200 * Math.sin(p * 0.3);
                double a = f >= 40 ? amplitude * Math.exp(-Math.pow(d[p] - 7, 2) / 2) * Math.exp(-(t[f] - 20) / 8) : 0;
                double bleach = Double.isInfinite(tauS) ? 1 : Math.exp(-t[f] / tauS);
                v[f * NX + p] = background + f0 * (1 + a) * bleach + noiseSd * random.nextGaussian();
            }
        }
        return new Kymograph(d, t, v, "intensity");
    }

    private static double[] constant(double value) {
        double[] b = new double[NT];
        Arrays.fill(b, value);
        return b;
    }

    @Test
    void deltaFOverF0IsExactOnNoiseFreeFramesAfterBackgroundSubtraction() {
        Kymograph k = raw(150, Double.POSITIVE_INFINITY, 2.0, 0, 1);
        Preprocessing.Result r = Preprocessing.run(k, constant(150),
                new Preprocessing.Options(19.75, 7.0, null, false));
        // REF: dF/F0 = (F - F0) / F0 with F0 the baseline median, applied to the generating formula [common practice]
        double expected = 2.0 * Math.exp(-Math.pow(7.5 - 7, 2) / 2) * Math.exp(-(25 - 20) / 8.0);
        assertEquals(expected, r.deltaF().kymograph().value(50, 30), 1e-12, "dF/F0 at 7.5 um, 25 s");
        assertEquals(500 + 200 * Math.sin(30 * 0.3), r.deltaF().f0()[30], 1e-9, "F0 at position 30");
        assertEquals(0, r.baselineFirst());
        assertEquals(39, r.baselineLast(), "baseline: every frame before the stimulus at 19.75 s");
    }

    @Test
    void omittingTheBackgroundShrinksDeltaFAsExpected() {
        Kymograph k = raw(150, Double.POSITIVE_INFINITY, 2.0, 0, 1);
        Preprocessing.Result r = Preprocessing.run(k, constant(0), new Preprocessing.Options(19.75, 7.0, null, false));
        double f0 = 500 + 200 * Math.sin(30 * 0.3);
        double a = 2.0 * Math.exp(-Math.pow(7.5 - 7, 2) / 2) * Math.exp(-(25 - 20) / 8.0);
        // REF: an unsubtracted offset B scales dF/F0 by F0 / (F0 + B) [common practice]
        assertEquals(a * f0 / (f0 + 150), r.deltaF().kymograph().value(50, 30), 1e-12, "dF/F0 without background");
    }

    @Test
    void bleachCorrectionRecoversTheSheetsWorkedExample() {
        // Sheet s9: Bg = 200, S = 1000, tau = 120 s; at t = 60 s F = 806.5307 and S_corr = 1000.
        double[] d = {0, 1, 2, 3, 4};
        double[] t = new double[121];
        double[] v = new double[t.length * d.length];
        for (int f = 0; f < t.length; f++) {
            t[f] = f;
            for (int p = 0; p < d.length; p++) {
                v[f * d.length + p] = 200 + 1000 * Math.exp(-t[f] / 120);
            }
        }
        Kymograph k = new Kymograph(d, t, v, "intensity");
        // REF: single exponential with offset, worked example [common practice]; sheet s9
        assertEquals(806.5307, k.value(60, 2), 1e-4, "F at 60 s");
        BleachCorrection.Result r = BleachCorrection.correct(
                Preprocessing.run(k, constant121(200), new Preprocessing.Options(200.0, 2.0, null, false))
                        .backgroundSubtracted(), 0, 120, t.length);
        assertTrue(r.applied());
        // REF: S_corr = (F - Bg) / b(t) = 1000.000 [common practice]; sheet s9
        assertEquals(1000.0, r.corrected().value(60, 2), 1e-6, "corrected signal at 60 s");
        assertEquals(120.0, r.timeConstant().value(), 1e-6, "bleaching time constant, s");
    }

    private static double[] constant121(double value) {
        double[] b = new double[121];
        Arrays.fill(b, value);
        return b;
    }

    @Test
    void bleachFitIgnoresTheRespondingStretchAndRecoversTau() {
        Kymograph k = raw(100, 90, 1.5, 2.0, 5);
        Preprocessing.Result r = Preprocessing.run(k, constant(100), new Preprocessing.Options(19.75, 7.0, null, true));
        assertTrue(r.bleach().applied());
        // REF: recovery of the generating time constant (synthetic truth, 90 s) [common practice]
        assertEquals(90, r.bleach().timeConstant().value(), 90 * 0.05, "bleach time constant, s");
        assertTrue(r.bleach().timeConstant().lo95() < 90 && 90 < r.bleach().timeConstant().hi95(), "interval holds 90 s");
        assertTrue(r.bleach().quietPositions() < NX && r.bleach().quietPositions() > NX / 2, "quiet positions");
        // Far from the response, the corrected dF/F0 stays near zero late in the movie.
        double late = 0;
        for (int f = 100; f < NT; f++) {
            late += r.deltaF().kymograph().value(f, NX - 1) / 20;
        }
        assertEquals(0, late, 0.01, "late dF/F0 far from the stimulus after correction");
    }

    @Test
    void switchingBleachCorrectionOffLeavesTheDecline() {
        Kymograph k = raw(100, 90, 1.5, 0, 5);
        Preprocessing.Result r = Preprocessing.run(k, constant(100), new Preprocessing.Options(19.75, 7.0, null, false));
        assertFalse(r.bleach().applied());
        // REF: uncorrected bleaching: dF/F0 far from the stimulus = exp(-(t - t_base) / tau) / median - 1 [common practice]
        double expected = Math.exp(-59.5 / 90) / Math.exp(-9.75 / 90) - 1;
        assertEquals(expected, r.deltaF().kymograph().value(119, NX - 1), 1e-3, "uncorrected late dF/F0");
    }

    @Test
    void detectsTheStimulusTimeAndPosition() {
        Kymograph k = raw(100, 200, 1.0, 5.0, 9);
        Preprocessing.Result r = Preprocessing.run(k, constant(100), new Preprocessing.Options(null, null, null, true));
        assertEquals("detected", r.stimulus().source());
        StimulusDetector.Detection det = r.stimulus().detection();
        assertTrue(det.found(), det.describe());
        // REF: the generating pulse starts at frame 40 (t = 20 s) at 7 um [common practice: synthetic truth]
        assertEquals(40, det.onsetFrame(), "onset frame");
        assertEquals(19.75, det.timeS(), 1e-12, "stimulus time, s");
        assertEquals(7.0, det.positionUm(), DX, "stimulus position, um");
        assertEquals(39, r.baselineLast());
    }

    @Test
    void findsNoStimulusInPureNoise() {
        Kymograph k = raw(100, Double.POSITIVE_INFINITY, 0.0, 5.0, 13);
        StimulusDetector.Detection det = StimulusDetector.detect(k);
        assertFalse(det.found(), det.describe());
        Preprocessing.Result r = Preprocessing.run(k, constant(100), new Preprocessing.Options(null, null, null, true));
        assertFalse(r.stimulus().known());
        assertTrue(r.warnings().stream().anyMatch(w -> w.contains("No clear stimulus")), r.warnings().toString());
    }

    @Test
    void backgroundAboveTheSignalGivesEmptyPositionsAndAWarning() {
        Kymograph k = raw(0, Double.POSITIVE_INFINITY, 1.0, 0, 1);
        Preprocessing.Result r = Preprocessing.run(k, constant(650), new Preprocessing.Options(19.75, 7.0, null, false));
        assertTrue(r.deltaF().unusable() > 0);
        assertTrue(r.warnings().stream().anyMatch(w -> w.contains("zero or negative")), r.warnings().toString());
    }

    @Test
    void aGivenTimeIsKeptAndOnlyThePositionIsDetected() {
        Kymograph k = raw(100, Double.POSITIVE_INFINITY, 1.0, 5.0, 9);
        Preprocessing.Result r = Preprocessing.run(k, constant(100), new Preprocessing.Options(19.0, null, null, false));
        assertEquals("session.json and detected", r.stimulus().source());
        assertEquals(19.0, r.stimulus().timeS(), 0.0, "the given time, s");
        // REF: the generating pulse is centred at 7 um [common practice: synthetic truth]
        assertEquals(7.0, r.stimulus().positionUm(), DX, "detected position, um");
        assertEquals(37, r.baselineLast(), "frames before 19 s");
    }
}
