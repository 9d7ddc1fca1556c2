package org.dendrokin.core.analysis;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.dendrokin.core.Progress;
import org.dendrokin.core.calib.MeanLifetime;
import org.dendrokin.core.calib.RatioChange;
import org.dendrokin.core.calib.SaturationLimits;
import org.dendrokin.core.calib.TwoStateLifetime;
import org.dendrokin.core.kymo.FrameSource;
import org.dendrokin.core.kymo.Kymograph;
import org.dendrokin.core.kymo.KymographExtractor;
import org.dendrokin.core.path.DendritePath;
import org.junit.jupiter.api.Test;

/** The reporter methods in the calibration stage: R/R0 and dR/R0 from two channels, and lifetimes. */
class CalibrationStageReportersTest {
    private static final double[] DISTANCES = {0, 0.5};
    private static final double[] TIMES = {0, 0.1, 0.2, 0.3, 0.4};

    private static Kymograph kymograph(double... values) {
        return new Kymograph(DISTANCES, TIMES, values, "intensity");
    }

    private static CalibrationRequest ratioChange(RatioChange.Output output) {
        return new CalibrationRequest(new RatioChange(output), SaturationLimits.DEFAULT, null, null);
    }

    /**
     * Two positions, five frames, baseline frames 0 to 2. Worked by hand:
     * position 0: numerator 110 130 120 210 160 minus 10 = 100 120 110 200 150; denominator 70 75 65 70 70 minus its
     * background 20 25 15 20 20 = 50 each; R = 2.0 2.4 2.2 4.0 3.0; R0 = median(2.0, 2.4, 2.2) = 2.2.
     * position 1: numerator 60 60 60 90 75 minus 10 = 50 50 50 80 65; denominator 120 150 90 120 120 minus the
     * background = 100 125 75 100 100; R = 0.5 0.4 2/3 0.8 0.65; R0 = median(0.5, 0.4, 2/3) = 0.5.
     */
    private static Kymograph workedRatio() {
        Kymograph num = kymograph(110, 60, 130, 60, 120, 60, 210, 90, 160, 75);
        Kymograph den = kymograph(70, 120, 75, 150, 65, 90, 70, 120, 70, 120);
        return CalibrationStage.ratio(num, new double[] {10, 10, 10, 10, 10}, den, new double[] {20, 25, 15, 20, 20});
    }

    @Test
    void ratioOverItsBaselineMatchesTheHandWorkedExample() {
        CalibrationStage.Calibrated change = CalibrationStage.apply(ratioChange(RatioChange.Output.CHANGE), null, null,
                workedRatio(), 0, 2);
        // REF: R = (F_num - B_num) / (F_den - B_den), R0 = baseline median, dR/R0 = R/R0 - 1; worked by hand in the
        // javadoc of workedRatio [common practice]
        double[] expected = {2.0 / 2.2 - 1, 0.5 / 0.5 - 1, 2.4 / 2.2 - 1, 0.4 / 0.5 - 1, 0, (2.0 / 3) / 0.5 - 1,
            4.0 / 2.2 - 1, 0.8 / 0.5 - 1, 3.0 / 2.2 - 1, 0.65 / 0.5 - 1};
        double[] got = change.signal().values();
        for (int i = 0; i < expected.length; i++) {
            assertEquals(expected[i], got[i], 1e-12, "dR/R0 at frame " + i / 2 + ", position " + i % 2);
        }
        assertEquals("dR/R0", change.signal().signalUnit());
        assertNull(change.summary(), "no saturation limits for a relative change");
        assertTrue(change.warnings().isEmpty(), change.warnings().toString());
        CalibrationStage.Calibrated ratio = CalibrationStage.apply(ratioChange(RatioChange.Output.RATIO), null, null,
                workedRatio(), 0, 2);
        assertEquals(4.0 / 2.2, ratio.signal().value(3, 0), 1e-12, "R/R0 at frame 3, position 0");
        assertEquals("R/R0", ratio.signal().signalUnit());
        assertFalse(ratio.propagated(), "nothing to propagate");
    }

    @Test
    void aPositionWithoutAPositiveBaselineRatioIsEmptyAndSaid() {
        // position 1's numerator is at its background during the baseline: R0 = 0
        Kymograph num = kymograph(110, 10, 130, 10, 120, 10, 210, 90, 160, 75);
        Kymograph den = kymograph(70, 120, 75, 150, 65, 90, 70, 120, 70, 120);
        Kymograph r = CalibrationStage.ratio(num, new double[] {10, 10, 10, 10, 10}, den,
                new double[] {20, 25, 15, 20, 20});
        CalibrationStage.Calibrated c = CalibrationStage.apply(ratioChange(RatioChange.Output.CHANGE), null, null, r,
                0, 2);
        assertTrue(Double.isNaN(c.signal().value(3, 1)), "no R0, no dR/R0");
        assertEquals(4.0 / 2.2 - 1, c.signal().value(3, 0), 1e-12, "the other position is unaffected");
        assertTrue(c.warnings().get(0).startsWith("At 1 of 2 positions"), c.warnings().toString());
    }

    /** Frames held in memory: {@code frames[t][row * width + column]}. */
    private record Frames(int width, int height, float[][] frames) implements FrameSource {
        static Frames of(int width, int height, int count, PixelValue value) {
            float[][] f = new float[count][width * height];
            for (int t = 0; t < count; t++) {
                for (int i = 0; i < width * height; i++) {
                    f[t][i] = (float) value.at(t, i % width, i / width);
                }
            }
            return new Frames(width, height, f);
        }

        @Override
        public int frameCount() {
            return frames.length;
        }

        @Override
        public float[] readRows(int frame, int firstRow, int rowCount, float[] dst) {
            System.arraycopy(frames[frame], firstRow * width, dst, 0, rowCount * width);
            return dst;
        }
    }

    private interface PixelValue {
        double at(int frame, int column, int row);
    }

    /** A horizontal path through the centres of row 3, band of 3 pixels (rows 2 to 4), 1 um pixels. */
    private static final DendritePath PATH = DendritePath.of(new double[] {1.5, 8.5}, new double[] {3.5, 3.5}, false);

    private static Kymograph along(FrameSource source) {
        return KymographExtractor.extract(source, PATH, 1, 0.1, 3, 1, Progress.NONE).kymograph();
    }

    /** Lifetime 2.0 ns in row 2, 2.5 ns in row 3 and 1.5 ns in row 4, with 100, 300 and 100 photons. */
    private static LifetimeRequest rows(boolean withPhotons) {
        Frames tau = Frames.of(10, 7, 4, (t, c, r) -> r == 2 ? 2.0 : r == 3 ? 2.5 : 1.5);
        Frames n = Frames.of(10, 7, 4, (t, c, r) -> r == 3 ? 300 : 100);
        return new LifetimeRequest(tau, withPhotons ? n : null);
    }

    @Test
    void lifetimeIsPhotonWeightedWithItsPhotonLimitedSd() {
        CalibrationStage.Lifetime l = CalibrationStage.lifetime(rows(true), CalibrationStageReportersTest::along, 3);
        // REF: (100 x 2.0 + 300 x 2.5 + 100 x 1.5) / 500 = 2.2 ns, worked by hand [common practice]
        assertEquals(2.2, l.lifetimeNs().value(2, 3), 1e-6, "photon-weighted lifetime (ns)");
        assertEquals(500, l.photons().value(2, 3), 1e-9, "photons across the band");
        CalibrationRequest mean = new CalibrationRequest(MeanLifetime.INSTANCE, SaturationLimits.DEFAULT, null, null);
        CalibrationStage.Calibrated c = CalibrationStage.apply(mean, null, null, null, l, 0, 1);
        assertEquals("ns", c.signal().signalUnit());
        assertEquals(2.2, c.signal().value(1, 2), 1e-6);
        // REF: tau / sqrt(N) = 2.2 / sqrt(500) [from memory: Kollner & Wolfrum 1992; fairly sure]
        assertEquals(2.2 / Math.sqrt(500), c.sdMicromolar().value(1, 2), 1e-6, "SD of the lifetime (ns)");
        assertTrue(c.propagated());

        TwoStateLifetime model = new TwoStateLifetime(2.6, 1.1, 0.02, 0.04);
        CalibrationRequest fraction = new CalibrationRequest(model, SaturationLimits.DEFAULT, null, null);
        CalibrationStage.Calibrated p = CalibrationStage.apply(fraction, null, null, null, l, 0, 1);
        // REF: P = tau_f (tau_f - tau_m) / ((tau_f - tau_b)(tau_f + tau_b - tau_m)) = 2.6 x 0.4 / (1.5 x 1.5)
        // [from memory: Yasuda et al. 2006 Nat Neurosci 9:283; re-derived in TwoStateLifetimeTest]
        assertEquals(2.6 * 0.4 / (1.5 * 1.5), p.signal().value(0, 0), 1e-6, "fraction bound");
        assertEquals("fraction bound", p.signal().signalUnit());
        double fromPhotons = model.derivative(2.2) * 2.2 / Math.sqrt(500);
        // REF: delta method, independent errors add in quadrature [common practice]
        assertEquals(Math.hypot(fromPhotons, model.concentrationSdMicromolar(2.2)), p.sdMicromolar().value(0, 0),
                1e-6, "SD of the fraction bound");
        assertNull(p.summary(), "no saturation limits for a fraction");
    }

    @Test
    void withoutPhotonCountsTheLifetimeIsAPlainAverageAndSaysSo() {
        CalibrationStage.Lifetime l = CalibrationStage.lifetime(rows(false), CalibrationStageReportersTest::along, 3);
        // REF: (2.0 + 2.5 + 1.5) / 3 = 2.0 ns, worked by hand [common practice]
        assertEquals(2.0, l.lifetimeNs().value(0, 0), 1e-6, "equal weights");
        assertNull(l.photons());
        assertTrue(l.warnings().get(0).contains("equal weights"), l.warnings().toString());
        CalibrationRequest mean = new CalibrationRequest(MeanLifetime.INSTANCE, SaturationLimits.DEFAULT, null, null);
        CalibrationStage.Calibrated c = CalibrationStage.apply(mean, null, null, null, l, 0, 1);
        assertTrue(c.warnings().get(0).contains("equal weights"), "the warning reaches the results");
        assertFalse(c.propagated(), "no precision without photons");
    }

    @Test
    void theLifetimeMethodWithoutItsMovieIsAnInputProblem() {
        CalibrationRequest mean = new CalibrationRequest(MeanLifetime.INSTANCE, SaturationLimits.DEFAULT, null, null);
        assertThrows(AnalysisInputException.class, () -> CalibrationStage.apply(mean, null, null, null, null, 0, 1));
    }
}
