package org.dendrokin.core.analysis;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotNull;
import static org.junit.jupiter.api.Assertions.assertNull;

import java.util.Arrays;
import java.util.List;

import org.dendrokin.core.Progress;
import org.dendrokin.core.calib.NoCalibration;
import org.dendrokin.core.calib.RatioChange;
import org.dendrokin.core.calib.SaturationLimits;
import org.dendrokin.core.fit.InputUncertainty;
import org.dendrokin.core.kymo.Kymograph;
import org.dendrokin.core.preprocess.Preprocessing;
import org.junit.jupiter.api.Test;

/**
 * The background's uncertainty as shifts of a ratio signal, against a hand calculation: a numerator that steps
 * from 200 to 300 counts at the stimulus over a steady denominator of 100, both on a background of 20 known to
 * within 5 counts.
 */
class BackgroundUncertaintyTest {
    private static final int POSITIONS = 20;
    private static final int FRAMES = 30;
    private static final double STEP_UM = 0.5;

    @Test
    void theBackgroundMovesDeltaFOverF0AsWorkedByHand() {
        Kymograph intensity = steps(200, 300);
        double[] level = new double[FRAMES];
        Arrays.fill(level, 20);
        double[] along = new double[POSITIONS];
        CalibrationRequest none = new CalibrationRequest(NoCalibration.INSTANCE,
                SaturationLimits.DEFAULT, null, null);
        Preprocessing.Options options = new Preprocessing.Options(9.5, 4.0, new int[] {0, 9}, false);
        Preprocessing.Result pre = Preprocessing.run(intensity, level, along, options);
        Kymograph signal = pre.deltaF().kymograph();
        AnalysisResult.Background background = new AnalysisResult.Background(level, along, 20, 5, "test");
        InputUncertainty u = SessionAnalysis.backgroundUncertainty(none, Normalisation.NONE, intensity, background,
                null, options, pre, signal, Progress.NONE);
        List<double[]> shifts = u.shifts();
        assertEquals(2, shifts.size());
        for (int f = 0; f < FRAMES; f++) {
            for (int p = 0; p < POSITIONS; p++) {
                // REF: worked by hand [common practice]: dF/F0 after the stimulus (300 - 20) / (200 - 20) - 1, and
                // with the background 5 higher (300 - 25) / (200 - 25) - 1
                double expected = f >= 10 ? 275.0 / 175 - 280.0 / 180 : 0;
                assertEquals(p < 10 ? expected : 0, shifts.get(0)[f * POSITIONS + p], 1e-12);
                assertEquals(p >= 10 ? expected : 0, shifts.get(1)[f * POSITIONS + p], 1e-12);
            }
        }
    }

    /** Every position: {@code before} counts in frames 0-9, {@code after} from frame 10 on. */
    private static Kymograph steps(double before, double after) {
        double[] x = new double[POSITIONS];
        for (int p = 0; p < POSITIONS; p++) {
            x[p] = p * STEP_UM;
        }
        double[] t = new double[FRAMES];
        double[] v = new double[FRAMES * POSITIONS];
        for (int f = 0; f < FRAMES; f++) {
            t[f] = f;
            Arrays.fill(v, f * POSITIONS, (f + 1) * POSITIONS, f < 10 ? before : after);
        }
        return new Kymograph(x, t, v, "intensity");
    }

    @Test
    void eachChannelsBackgroundMovesTheRatioAsWorkedByHand() {
        Kymograph numerator = steps(200, 300);
        Kymograph denominator = steps(100, 100);
        double[] level = new double[FRAMES];
        Arrays.fill(level, 20);
        double[] along = new double[POSITIONS];
        SessionAnalysis.RatioParts parts = new SessionAnalysis.RatioParts(numerator, level, along, 5, denominator,
                level, along, 5);
        CalibrationRequest cal = new CalibrationRequest(new RatioChange(RatioChange.Output.RATIO),
                SaturationLimits.DEFAULT, null, null);
        Preprocessing.Options options = new Preprocessing.Options(9.5, 4.0, new int[] {0, 9}, false);
        Preprocessing.Result pre = Preprocessing.run(numerator, level, along, options);
        Kymograph signal = CalibrationStage.apply(cal, pre.bleach().corrected(), pre.deltaF().kymograph(),
                parts.ratio(null, null), 0, 9).signal();
        AnalysisResult.Background background = new AnalysisResult.Background(level, along, 20, 5, "test");

        InputUncertainty u = SessionAnalysis.backgroundUncertainty(cal, Normalisation.NONE, numerator, background,
                parts, options, pre, signal, Progress.NONE);
        assertNotNull(u);
        List<double[]> shifts = u.shifts();
        // stretches of 5 um are 10 samples: two for the numerator's background, then two for the denominator's
        assertEquals(4, shifts.size());
        // REF: worked by hand [common practice]. After the stimulus R / R0 = (300 - 20) / (200 - 20) = 1.555556;
        // with the numerator's background 5 higher, (300 - 25) / (200 - 25) = 1.571429, a change of 0.015873 where
        // the background was raised and none elsewhere or before the stimulus. The denominator's background
        // cancels in R / R0 while the denominator is steady: no change at all.
        for (int f = 0; f < FRAMES; f++) {
            for (int p = 0; p < POSITIONS; p++) {
                int g = f * POSITIONS + p;
                double expected = f >= 10 ? 275.0 / 175 - 280.0 / 180 : 0;
                assertEquals(p < 10 ? expected : 0, shifts.get(0)[g], 1e-12, "first stretch, " + f + ", " + p);
                assertEquals(p >= 10 ? expected : 0, shifts.get(1)[g], 1e-12, "second stretch, " + f + ", " + p);
                assertEquals(0, shifts.get(2)[g], 1e-12);
                assertEquals(0, shifts.get(3)[g], 1e-12);
            }
        }

        // backgrounds given as values: nothing to carry
        SessionAnalysis.RatioParts given = new SessionAnalysis.RatioParts(numerator, level, null, Double.NaN,
                denominator, level, null, Double.NaN);
        assertNull(SessionAnalysis.backgroundUncertainty(cal, Normalisation.NONE, numerator, background, given,
                options, pre, signal, Progress.NONE));
    }
}
