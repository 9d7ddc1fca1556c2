package org.dendrokin.core.preprocess;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Random;

import org.apache.commons.math3.distribution.NormalDistribution;
import org.dendrokin.core.Progress;
import org.dendrokin.core.kymo.FrameSource;
import org.junit.jupiter.api.Test;

class BackgroundEstimatorTest {
    /** Frames of background b + Gaussian noise, a bright horizontal dendrite at row 20 and a bright blob. */
    private static FrameSource frames(int w, int h, int n, double b, double sd, long seed) {
        float[][] data = new float[n][w * h];
        Random random = new Random(seed);
        for (int f = 0; f < n; f++) {
            for (int j = 0; j < h; j++) {
                for (int i = 0; i < w; i++) {
                    double v = b + sd * random.nextGaussian();
                    if (Math.abs(j + 0.5 - 20) < 3) {
                        v += 1000;
                    }
                    if (i < w / 5) {
                        v += 400;
                    }
                    data[f][j * w + i] = (float) v;
                }
            }
        }
        return new FrameSource() {
            @Override
            public int width() {
                return w;
            }

            @Override
            public int height() {
                return h;
            }

            @Override
            public int frameCount() {
                return n;
            }

            @Override
            public float[] readRows(int frame, int firstRow, int rowCount, float[] dst) {
                System.arraycopy(data[frame], firstRow * w, dst, 0, rowCount * w);
                return dst;
            }
        };
    }

    @Test
    void lowPercentileOfFarPixelsIgnoresThePathAndABrightNeighbour() {
        FrameSource f = frames(100, 80, 16, 120, 8, 17);
        double[] xs = new double[100];
        double[] ys = new double[100];
        for (int i = 0; i < 100; i++) {
            xs[i] = i + 0.5;
            ys[i] = 20;
        }
        BackgroundEstimator.Estimate e = BackgroundEstimator.fromFarPixels(f, xs, ys, 10, new int[] {0, 3, 7, 15},
                Progress.NONE);
        // A fifth of the far pixels are bright, so the 25th percentile of all far pixels is the 0.25 / 0.8
        // quantile of the dim ones, N(b, sd^2 / m) with b = 120, sd = 8 and m = 4 frames averaged.
        // REF: normal quantile function, Commons Math NormalDistribution [common practice]
        double expected = new NormalDistribution(120, 8 / 2.0).inverseCumulativeProbability(0.25 / 0.8);
        assertEquals(expected, e.value(), 0.3, "background, grey values");
        assertTrue(e.pixelCount() > 1000, "far pixels used");
    }

    @Test
    void tooFewFarPixelsGivesNaN() {
        FrameSource f = frames(10, 10, 2, 100, 1, 1);
        BackgroundEstimator.Estimate e = BackgroundEstimator.fromFarPixels(f, new double[] {5}, new double[] {5}, 50,
                new int[] {0}, Progress.NONE);
        assertFalse(Double.isFinite(e.value()));
    }
}
