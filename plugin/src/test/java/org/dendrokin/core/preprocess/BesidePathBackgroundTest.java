package org.dendrokin.core.preprocess;

import static org.junit.jupiter.api.Assertions.assertEquals;

import java.util.Random;

import org.dendrokin.core.Progress;
import org.dendrokin.core.kymo.FrameSource;
import org.junit.jupiter.api.Test;

/** The background beside the path follows a background that changes along the path. */
class BesidePathBackgroundTest {
    @Test
    void aGradientAlongThePathIsFollowed() {
        int w = 200;
        int h = 60;
        // background 100 + 0.5 x counts, a bright line along y = 30 (the dendrite), white noise of sd 3
        Random random = new Random(9);
        float[][] frames = new float[16][w * h];
        for (float[] f : frames) {
            for (int j = 0; j < h; j++) {
                for (int i = 0; i < w; i++) {
                    double line = Math.abs(j + 0.5 - 30) < 3 ? 500 : 0;
                    f[j * w + i] = (float) (100 + 0.5 * (i + 0.5) + line + 3 * random.nextGaussian());
                }
            }
        }
        FrameSource source = new FrameSource() {
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
        int n = 150;
        double[] x = new double[n];
        double[] y = new double[n];
        for (int s = 0; s < n; s++) {
            x[s] = 25 + s;
            y[s] = 30;
        }
        int[] picks = new int[16];
        for (int i = 0; i < picks.length; i++) {
            picks[i] = i;
        }
        double[] bg = BackgroundEstimator.besidePath(source, x, y, 8, 18, 3, picks, Progress.NONE);
        // away from the ends, where the window is symmetric about the sample
        for (int s = 4; s < n - 4; s += 10) {
            // REF: the background as generated, 100 + 0.5 x [common practice]. Tolerance: the 25th percentile of
            // noise of sd 3 / sqrt(16) lies 0.5 below its mean, and across a window of +-3.5 px the gradient
            // spreads the values by +-1.75, whose lower quartile lies about 0.9 below the middle
            assertEquals(100 + 0.5 * x[s], bg[s], 1.5, "background beside path sample " + s);
        }
    }
}
