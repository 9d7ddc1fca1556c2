package org.dendrokin.core.motion;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.SplittableRandom;

import org.dendrokin.core.Progress;
import org.dendrokin.core.kymo.Extraction;
import org.dendrokin.core.kymo.FrameSource;
import org.dendrokin.core.kymo.KymographExtractor;
import org.dendrokin.core.path.DendritePath;
import org.junit.jupiter.api.Test;

/**
 * Motion measured on synthetic movies whose every frame is a continuous scene evaluated at exactly shifted pixel
 * centres, so the true shift is known; Poisson-like noise seeded.
 */
class MotionCorrectionTest {
    private static final int WIDTH = 128;
    private static final int HEIGHT = 96;
    private static final int FRAMES = 100;
    private static final int BASELINE_LAST = 19;
    private static final double PIXEL_UM = 0.3;
    private static final double BAND_UM = 1.0;
    private static final SyntheticDendrite SCENE = new SyntheticDendrite(WIDTH, HEIGHT, 7);
    private static final DendritePath PATH = SCENE.path(16, 112);
    private static final double STIMULUS_X = 64;
    private static final double STIMULUS_Y = SCENE.centreY(STIMULUS_X);

    private static MotionTrace measure(FrameSource movie, StimulusRegion stimulus) {
        return MotionCorrection.measure(movie, PixelBox.around(PATH, 0), 0, BASELINE_LAST, stimulus,
                MotionSettings.of(PIXEL_UM, BAND_UM), Progress.NONE);
    }

    /**
     * RMS distance, pixels, between the measured and the true shifts, the truth taken against the reference: the
     * mean position of the baseline frames.
     */
    private static double rmsError(MotionTrace trace, double[] dx, double[] dy) {
        double mx = 0;
        double my = 0;
        for (int f = 0; f <= BASELINE_LAST; f++) {
            mx += dx[f] / (BASELINE_LAST + 1);
            my += dy[f] / (BASELINE_LAST + 1);
        }
        double[] ex = trace.dxPx();
        double[] ey = trace.dyPx();
        double sum = 0;
        for (int f = 0; f < dx.length; f++) {
            double e = Math.hypot(ex[f] - (dx[f] - mx), ey[f] - (dy[f] - my));
            sum += e * e;
        }
        return Math.sqrt(sum / dx.length);
    }

    @Test
    void measuresASlowLinearDrift() {
        // 0.8 um along x over the movie (2.7 px at 0.3 um), and 0.4 um up, from the first frame on
        double[] dx = new double[FRAMES];
        double[] dy = new double[FRAMES];
        for (int f = 0; f < FRAMES; f++) {
            dx[f] = 0.8 / PIXEL_UM * f / (FRAMES - 1);
            dy[f] = -0.4 / PIXEL_UM * f / (FRAMES - 1);
        }
        MotionTrace trace = measure(new SyntheticMovie(SCENE, dx, dy, null, true, 1), null);
        // REF: the drift the movie was rendered with [common practice]
        assertTrue(rmsError(trace, dx, dy) < 0.1, "RMS error " + rmsError(trace, dx, dy) + " px");
        assertTrue(trace.warnings().stream().anyMatch(w -> w.contains("moved by up to")),
                "a 0.8 um drift exceeds a quarter of the 1 um band: " + trace.warnings());
    }

    @Test
    void measuresASuddenJump() {
        double[] dx = new double[FRAMES];
        double[] dy = new double[FRAMES];
        for (int f = 50; f < FRAMES; f++) {
            dx[f] = 2.3;
            dy[f] = -1.7;
        }
        MotionTrace trace = measure(new SyntheticMovie(SCENE, dx, dy, null, true, 2), null);
        // REF: the jump the movie was rendered with [common practice]
        assertTrue(rmsError(trace, dx, dy) < 0.1, "RMS error " + rmsError(trace, dx, dy) + " px");
        assertEquals(0, trace.framesAtLimit(), "frames at the search limit");
    }

    @Test
    void measuresSubPixelJitter() {
        SplittableRandom random = new SplittableRandom(3);
        double[] dx = new double[FRAMES];
        double[] dy = new double[FRAMES];
        for (int f = 0; f < FRAMES; f++) {
            dx[f] = random.nextDouble(-0.6, 0.6);
            dy[f] = random.nextDouble(-0.6, 0.6);
        }
        MotionTrace trace = measure(new SyntheticMovie(SCENE, dx, dy, null, true, 3), null);
        // REF: the jitter the movie was rendered with [common practice]
        assertTrue(rmsError(trace, dx, dy) < 0.1, "RMS error " + rmsError(trace, dx, dy) + " px");
    }

    @Test
    void aStrongFocalResponseIsNotTakenForMotion() {
        double[] still = new double[FRAMES];
        // a fivefold local rise (dF/F0 = 4) from frame 20, spreading and fading; only the signal channel
        SyntheticMovie clean = new SyntheticMovie(SCENE, still, still,
                SyntheticMovie.focalResponse(STIMULUS_X, STIMULUS_Y, 4, BASELINE_LAST + 1), false, 4);
        MotionTrace trace = measure(clean, null);
        double[] dx = trace.dxPx();
        double[] dy = trace.dyPx();
        for (int f = 0; f < FRAMES; f++) {
            // REF: the movie does not move [common practice]
            assertTrue(Math.hypot(dx[f], dy[f]) < 0.1, "shift of frame " + f + ": " + dx[f] + ", " + dy[f] + " px");
        }
        SyntheticMovie noisy = new SyntheticMovie(SCENE, still, still,
                SyntheticMovie.focalResponse(STIMULUS_X, STIMULUS_Y, 4, BASELINE_LAST + 1), true, 4);
        MotionTrace noisyTrace = measure(noisy, null);
        assertTrue(rmsError(noisyTrace, still, still) < 0.1, "RMS shift with noise " + rmsError(noisyTrace, still,
                still) + " px");
    }

    @Test
    void measuresDriftThroughAResponseWithTheStimulusRegionGiven() {
        double[] dx = new double[FRAMES];
        double[] dy = new double[FRAMES];
        for (int f = 0; f < FRAMES; f++) {
            dx[f] = 0.8 / PIXEL_UM * f / (FRAMES - 1);
            dy[f] = 0.3 / PIXEL_UM * f / (FRAMES - 1);
        }
        SyntheticMovie movie = new SyntheticMovie(SCENE, dx, dy,
                SyntheticMovie.focalResponse(STIMULUS_X, STIMULUS_Y, 4, BASELINE_LAST + 1), true, 5);
        MotionTrace trace = measure(movie, new StimulusRegion(STIMULUS_X, STIMULUS_Y, 8));
        // REF: the drift the movie was rendered with [common practice]
        assertTrue(rmsError(trace, dx, dy) < 0.1, "RMS error " + rmsError(trace, dx, dy) + " px");
    }

    @Test
    void findsTheShiftOfAGaussianBlob() {
        // frame 0 the reference; each later frame the blob moved by one of the shifts
        double[][] shifts = {{0, 0}, {0.5, 0}, {0, -0.5}, {0.25, 0.75}, {-1.3, 2.6}, {3.1, -2.2}, {-0.05, 0.05},
            {7.5, 6.4}};
        int n = 96;
        float[][] frames = new float[shifts.length][n * n];
        double s = 1.5;
        for (int f = 0; f < shifts.length; f++) {
            for (int j = 0; j < n; j++) {
                for (int i = 0; i < n; i++) {
                    double x = i + 0.5 - 48 - shifts[f][0];
                    double y = j + 0.5 - 48 - shifts[f][1];
                    frames[f][j * n + i] = (float) (10 + 500 * Math.exp(-(x * x + y * y) / (2 * s * s)));
                }
            }
        }
        MotionTrace trace = MotionCorrection.measure(new Frames(n, n, frames), new PixelBox(40, 40, 56, 56), 0, 0,
                null, MotionSettings.of(PIXEL_UM, BAND_UM), Progress.NONE);
        for (int f = 0; f < shifts.length; f++) {
            // REF: a Gaussian blob drawn at a known offset; the offset is the shift, exactly [common practice]
            assertEquals(shifts[f][0], trace.dxPx()[f], 2e-3, "x shift (px) of frame " + f);
            assertEquals(shifts[f][1], trace.dyPx()[f], 2e-3, "y shift (px) of frame " + f);
        }
    }

    @Test
    void correctedKymographMatchesTheStillMovie() {
        double[] dx = new double[FRAMES];
        double[] dy = new double[FRAMES];
        for (int f = 0; f < FRAMES; f++) {
            dx[f] = 0.8 / PIXEL_UM * f / (FRAMES - 1);
            dy[f] = -0.5 / PIXEL_UM * f / (FRAMES - 1);
        }
        double[] still = new double[FRAMES];
        SyntheticMovie drifting = new SyntheticMovie(SCENE, dx, dy, null, true, 6);
        SyntheticMovie stillNoisy = new SyntheticMovie(SCENE, still, still, null, true, 7);
        SyntheticMovie stillClean = new SyntheticMovie(SCENE, still, still, null, false, 0);
        MotionTrace trace = measure(drifting, null);
        Extraction corrected = MotionCorrection.extract(drifting, PATH, trace, PIXEL_UM, 0.1, BAND_UM, PIXEL_UM,
                Progress.NONE);
        Extraction uncorrected = KymographExtractor.extract(drifting, PATH, PIXEL_UM, 0.1, BAND_UM, PIXEL_UM,
                Progress.NONE);
        Extraction noisy = KymographExtractor.extract(stillNoisy, PATH, PIXEL_UM, 0.1, BAND_UM, PIXEL_UM,
                Progress.NONE);
        double[] truth = KymographExtractor.extract(stillClean, PATH, PIXEL_UM, 0.1, BAND_UM, PIXEL_UM,
                Progress.NONE).kymograph().values();
        double noise = rms(noisy.kymograph().values(), truth);
        double after = rms(corrected.kymograph().values(), truth);
        double before = rms(uncorrected.kymograph().values(), truth);
        // REF: the still movie's kymograph; a still noisy movie sets the noise level [common practice]
        assertTrue(after < 1.2 * noise, "corrected RMS difference " + after + " against noise " + noise);
        assertTrue(before > 3 * after, "uncorrected RMS difference " + before + ", corrected " + after);
    }

    @Test
    void measuringAndExtractingTogetherGivesWhatTheyGiveApart() {
        // 250 frames: four blocks of measurement, the last one short, so that blocks are sampled while others run
        int frames = 250;
        double[] dx = new double[frames];
        double[] dy = new double[frames];
        for (int f = 0; f < frames; f++) {
            dx[f] = 0.6 / PIXEL_UM * f / (frames - 1) + (f >= 140 ? 1.7 : 0);
            dy[f] = 0.3 * Math.sin(f / 9.0);
        }
        SyntheticMovie drifting = new SyntheticMovie(SCENE, dx, dy, null, true, 11);
        MotionSettings settings = MotionSettings.of(PIXEL_UM, BAND_UM);
        MotionTrace apart = MotionCorrection.measure(drifting, PixelBox.around(PATH, 0), 0, BASELINE_LAST, null,
                settings, Progress.NONE);
        Extraction extracted = MotionCorrection.extract(drifting, PATH, apart, PIXEL_UM, 0.1, BAND_UM, PIXEL_UM,
                Progress.NONE);
        MotionCorrection.Corrected together = MotionCorrection.measureAndExtract(drifting, PixelBox.around(PATH, 0),
                0, BASELINE_LAST, null, settings, drifting, PATH, 0.1, BAND_UM, PIXEL_UM, Progress.NONE);
        // REF: the same measurement and extraction made one after the other [common practice]; exact equality
        assertArrayEquals(apart.dxPx(), together.trace().dxPx(), 0.0, "x shifts");
        assertArrayEquals(apart.dyPx(), together.trace().dyPx(), 0.0, "y shifts");
        assertArrayEquals(extracted.kymograph().values(), together.extraction().kymograph().values(), 0.0,
                "kymograph");
        assertEquals(extracted.samplesOutside(), together.extraction().samplesOutside());
    }

    @Test
    void placesTheWindowAwayFromTheStimulus() {
        SyntheticDendrite wide = new SyntheticDendrite(256, 96, 8);
        DendritePath path = wide.path(16, 240);
        double[] still = new double[30];
        SyntheticMovie movie = new SyntheticMovie(wide, still, still, null, true, 9);
        for (double sx : new double[] {40, 128, 210}) {
            StimulusRegion stimulus = new StimulusRegion(sx, wide.centreY(sx), 10);
            MotionTrace trace = MotionCorrection.measure(movie, PixelBox.around(path, 0), 0, 9, stimulus,
                    MotionSettings.of(PIXEL_UM, BAND_UM), Progress.NONE);
            MotionTrace.Reference r = trace.reference();
            boolean overlaps = sx + 10 > r.xPx() && sx - 10 < r.xPx() + r.widthPx();
            assertFalse(overlaps, "window at x = " + r.xPx() + " to " + (r.xPx() + r.widthPx())
                    + " overlaps the stimulus disc at x = " + sx);
        }
    }

    @Test
    void flagsFramesThatMatchNothing() {
        // frames of independent noise on a flat background: nothing to register
        float[][] frames = new float[12][64 * 64];
        SplittableRandom random = new SplittableRandom(10);
        for (float[] frame : frames) {
            for (int i = 0; i < frame.length; i++) {
                frame[i] = (float) (100 + 10 * random.nextDouble());
            }
        }
        FrameSource noise = new Frames(64, 64, frames);
        MotionTrace trace = MotionCorrection.measure(noise, new PixelBox(10, 30, 54, 34), 0, 3, null,
                MotionSettings.of(PIXEL_UM, BAND_UM), Progress.NONE);
        assertTrue(trace.warnings().stream().anyMatch(w -> w.contains("could not be measured reliably")),
                "warnings: " + trace.warnings());
    }

    @Test
    void quietMovieGivesNoWarning() {
        double[] still = new double[40];
        MotionTrace trace = MotionCorrection.measure(new SyntheticMovie(SCENE, still, still, null, true, 11),
                PixelBox.around(PATH, 0), 0, 9, null, MotionSettings.of(PIXEL_UM, BAND_UM), Progress.NONE);
        assertTrue(trace.warnings().isEmpty(), "warnings: " + trace.warnings());
        assertEquals(40, trace.frameCount(), "frames");
    }

    @Test
    void runningMedianRemovesASingleWrongFrameAndKeepsASteps() {
        // REF: the median of each 3-frame window, by hand [common practice]
        assertArrayEquals(new double[] {0, 0, 0, 0, 0}, MotionCorrection.runningMedian(
                new double[] {0, 0, 5, 0, 0}, 3), 0, "outlier removed");
        assertArrayEquals(new double[] {0, 0, 0, 1, 1, 1}, MotionCorrection.runningMedian(
                new double[] {0, 0, 0, 1, 1, 1}, 3), 0, "step kept");
        // the ends use the frames there are: {1, 4} -> 2.5, {4, 9} -> 6.5
        assertArrayEquals(new double[] {2.5, 4, 6.5}, MotionCorrection.runningMedian(new double[] {1, 4, 9}, 3), 0,
                "ends");
    }

    @Test
    void smoothingIsAppliedToTheTraceAndTheRawValuesKept() {
        double[] dx = new double[30];
        double[] dy = new double[30];
        for (int f = 0; f < 30; f++) {
            dx[f] = f < 15 ? 0 : 2;
        }
        SyntheticMovie movie = new SyntheticMovie(SCENE, dx, dy, null, true, 12);
        MotionTrace trace = MotionCorrection.measure(movie, PixelBox.around(PATH, 0), 0, 9, null,
                MotionSettings.of(PIXEL_UM, BAND_UM).withSmoothingFrames(5), Progress.NONE);
        double[] raw = trace.measuredDxPx();
        assertArrayEquals(MotionCorrection.runningMedian(raw, 5), trace.dxPx(), 0, "smoothed trace");
        assertEquals(2.0, trace.dxPx()[20], 0.1, "step kept by the median (px)");
    }

    @Test
    void summarisesTheTraceInMicrometres() {
        double[] dx = {0, 3, 0, -1};
        double[] dy = {0, 4, 0, 0};
        MotionTrace trace = new MotionTrace(dx, dy, dx, dy, new double[] {1, 0.9, 0.8, 0.7}, 0, 0.2, 0.25,
                new MotionTrace.Reference(0, 0, 0, 0, 64, 64, false), java.util.List.of());
        // REF: by hand: largest |(3, 4)| = 5 px = 1 um; RMS sqrt((25 + 1) / 4) px * 0.2 um [common practice]
        assertEquals(1.0, trace.maxShiftUm(), 1e-12, "max shift (um)");
        assertEquals(Math.sqrt(26 / 4.0) * 0.2, trace.rmsShiftUm(), 1e-12, "RMS shift (um)");
        assertEquals(0.85, trace.medianPeakHeight(), 1e-12, "median peak height");
        assertArrayEquals(new double[] {0, 0.6000000000000001, 0, -0.2}, trace.dxUm(), 1e-12, "x shifts (um)");
        assertTrue(trace.exceedsThreshold(), "1 um is above 0.25 um");
    }

    @Test
    void placesTheStimulusGivenAlongThePath() {
        // an L-shaped path: 10 px right, then 20 px down; 0.5 um pixels
        DendritePath path = DendritePath.of(new double[] {5, 15, 15}, new double[] {5, 5, 25}, false);
        StimulusRegion r = StimulusRegion.alongPath(path, 8.0, 0.5, 2.0);
        // REF: by hand: 8 um = 16 px along the path, 6 px past the corner [common practice]
        assertEquals(15.0, r.xPx(), 1e-9, "x (px)");
        assertEquals(11.0, r.yPx(), 1e-9, "y (px)");
        assertEquals(4.0, r.radiusPx(), 1e-12, "radius (px)");
        // REF: by hand: beyond the end, the last vertex [common practice]
        assertEquals(25.0, StimulusRegion.alongPath(path, 100, 0.5, 2.0).yPx(), 1e-9, "y (px) past the end");
        // REF: weights: 0 within the radius, 1 beyond twice the radius, 1/2 half way [common practice]
        assertEquals(0.0, r.weight(15, 13), 1e-12, "weight inside");
        assertEquals(0.5, r.weight(15, 17), 1e-12, "weight half way through the taper");
        assertEquals(1.0, r.weight(15, 20), 1e-12, "weight outside");
    }

    @Test
    void refusesABaselineOutsideTheMovie() {
        double[] still = new double[5];
        SyntheticMovie movie = new SyntheticMovie(SCENE, still, still, null, false, 0);
        assertThrows(IllegalArgumentException.class, () -> MotionCorrection.measure(movie, PixelBox.around(PATH, 0),
                3, 9, null, MotionSettings.of(PIXEL_UM, BAND_UM), Progress.NONE));
        assertThrows(IllegalArgumentException.class, () -> MotionCorrection.measure(movie,
                new PixelBox(500, 500, 600, 600), 0, 2, null, MotionSettings.of(PIXEL_UM, BAND_UM), Progress.NONE));
    }

    @Test
    void stopsWhenCancelled() {
        double[] still = new double[5];
        SyntheticMovie movie = new SyntheticMovie(SCENE, still, still, null, false, 0);
        Progress cancelled = new Progress() {
            @Override
            public void report(String stage, long done, long total) {
            }

            @Override
            public boolean isCancelled() {
                return true;
            }
        };
        assertThrows(Progress.CancelledException.class, () -> MotionCorrection.measure(movie,
                PixelBox.around(PATH, 0), 0, 2, null, MotionSettings.of(PIXEL_UM, BAND_UM), cancelled));
    }

    /** Frames held in memory, {@code frames[t][row * width + column]}. */
    private record Frames(int width, int height, float[][] frames) implements FrameSource {
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

    /** The Tukey window of the measurement, n x n, row-major (for tests of the correlation alone). */
    static double[] tukey2d(int n) {
        double[] w1 = MotionCorrection.Window.tukey(n);
        double[] w = new double[n * n];
        for (int j = 0; j < n; j++) {
            for (int i = 0; i < n; i++) {
                w[j * n + i] = w1[i] * w1[j];
            }
        }
        return w;
    }

    private static double rms(double[] a, double[] b) {
        double sum = 0;
        for (int i = 0; i < a.length; i++) {
            sum += (a[i] - b[i]) * (a[i] - b[i]);
        }
        return Math.sqrt(sum / a.length);
    }
}
