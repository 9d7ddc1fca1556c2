package org.dendrokin.core.preprocess;

import static org.junit.jupiter.api.Assertions.assertEquals;

import java.util.Random;

import org.dendrokin.core.Progress;
import org.dendrokin.core.kymo.FrameSource;
import org.junit.jupiter.api.Test;

/** The background beside the path follows a background that changes along and across the path. */
class BesidePathBackgroundTest {
    @Test
    void aGradientAlongThePathIsFollowed() {
        // background 100 + 0.5 x counts
        double[] x = pathX();
        double[] bg = besideAHorizontalDendrite((i, j) -> 100 + 0.5 * i, 9);
        // away from the ends, where the window is symmetric about the sample
        for (int s = 4; s < x.length - 4; s += 10) {
            // REF: the background as generated, 100 + 0.5 x [common practice]. Tolerance: the median of noise of
            // sd 3 / sqrt(16) over a few dozen pixels lies within about 0.3 of its mean
            assertEquals(100 + 0.5 * x[s], bg[s], 0.5, "background beside path sample " + s);
        }
    }

    @Test
    void aGradientAcrossThePathIsInterpolatedFromBothSides() {
        // background 100 + 2 (y - 30) counts, steep across the path
        double[] bg = besideAHorizontalDendrite((i, j) -> 100 + 2 * (j - 30), 10);
        for (int s = 4; s < bg.length - 4; s += 10) {
            // REF: the background as generated, 100 on the path's line [common practice]; one lower quartile of both
            // sides pooled would read about 100 - 2 * 13 = 74 here
            assertEquals(100, bg[s], 0.5, "background under the path at sample " + s);
        }
    }

    /** A background level at pixel centre (x, y), ImageJ coordinates. */
    private interface Level {
        double at(double x, double y);
    }

    /**
     * The background beside a path along y = 30 from x = 25 to 174 in 16 frames of 200 x 60 pixels: the given
     * background, a bright line 6 pixels wide along the path (the dendrite) and white noise of sd 3.
     */
    private static double[] besideAHorizontalDendrite(Level level, long seed) {
        int w = 200;
        int h = 60;
        Random random = new Random(seed);
        float[][] frames = new float[16][w * h];
        for (float[] f : frames) {
            for (int j = 0; j < h; j++) {
                for (int i = 0; i < w; i++) {
                    double line = Math.abs(j + 0.5 - 30) < 3 ? 500 : 0;
                    f[j * w + i] = (float) (level.at(i + 0.5, j + 0.5) + line + 3 * random.nextGaussian());
                }
            }
        }
        double[] x = pathX();
        double[] y = new double[x.length];
        java.util.Arrays.fill(y, 30);
        int[] picks = new int[16];
        for (int i = 0; i < picks.length; i++) {
            picks[i] = i;
        }
        return BackgroundEstimator.besidePath(frames(w, h, frames), x, y, 8, 18, 3, picks, Progress.NONE);
    }

    private static double[] pathX() {
        double[] x = new double[150];
        for (int s = 0; s < x.length; s++) {
            x[s] = 25 + s;
        }
        return x;
    }

    @Test
    void theSpreadOfTheFarPixelsIsTheirStandardDeviation() {
        int w = 200;
        int h = 200;
        // an uneven background: every pixel its own level, normal with sd 12 about 80, the same in every frame
        Random random = new Random(11);
        float[] level = new float[w * h];
        for (int i = 0; i < level.length; i++) {
            level[i] = (float) (80 + 12 * random.nextGaussian());
        }
        float[][] frames = {level, level, level, level};
        BackgroundEstimator.Estimate e = BackgroundEstimator.fromFarPixels(frames(w, h, frames),
                new double[] {100, 101}, new double[] {100, 100}, 10, new int[] {0, 1, 2, 3}, Progress.NONE);
        // REF: for a normal distribution the interquartile range is 1.349 standard deviations [common practice];
        // about 20000 pixels give the spread to about 1%
        assertEquals(12, e.spread(), 0.4, "spread");
        // REF: the lower quartile of a normal, mean - 0.674 sd [common practice]
        assertEquals(80 - 0.674 * 12, e.value(), 0.4, "background");
    }

    private static FrameSource frames(int w, int h, float[][] frames) {
        return new FrameSource() {
            public int width() {
                return w;
            }

            public int height() {
                return h;
            }

            public int frameCount() {
                return frames.length;
            }

            public float[] readRows(int frame, int firstRow, int rowCount, float[] dst) {
                System.arraycopy(frames[frame], firstRow * w, dst, 0, rowCount * w);
                return dst;
            }

            public float[] gather(int frame, int[] pixelIndices, float[] dst) {
                for (int i = 0; i < pixelIndices.length; i++) {
                    dst[i] = frames[frame][pixelIndices[i]];
                }
                return dst;
            }
        };
    }
}
