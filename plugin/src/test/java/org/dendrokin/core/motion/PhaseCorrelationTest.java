package org.dendrokin.core.motion;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Arrays;
import java.util.SplittableRandom;

import org.junit.jupiter.api.Test;

class PhaseCorrelationTest {

    @Test
    void gaussianOffsetIsExactOnAGaussian() {
        for (double centre : new double[] {-0.49, -0.2, 0, 0.13, 0.4}) {
            double s = 1.5;
            double[] v = new double[3];
            for (int i = 0; i < 3; i++) {
                v[i] = 7 * Math.exp(-(i - 1 - centre) * (i - 1 - centre) / (2 * s * s));
            }
            // REF: the logarithm of a Gaussian is a parabola, whose vertex three samples fix exactly [common practice]
            assertEquals(centre, PhaseCorrelation.gaussianOffset(v[0], v[1], v[2]), 1e-12, "peak position (px)");
        }
        // REF: vertex of the parabola through (-1, 0), (0, 4), (1, 2): x = (0 - 2) / (2 (0 - 8 + 2)) = 1/6
        // [common practice]
        assertEquals(1 / 6.0, PhaseCorrelation.gaussianOffset(0, 4, 2), 1e-12, "parabola when a value is not positive");
    }

    /**
     * A periodic, band-limited random image (every frequency below the transform's cut-off, random amplitudes and
     * phases), evaluated exactly at positions moved by a sub-pixel shift: by the Fourier shift theorem its spectrum
     * is the unmoved one times exp(-2 pi i k.d / n), so the whitened cross spectrum is that phase ramp exactly and
     * the correlation peak is the weighting's Gaussian centred on d.
     */
    @Test
    void recoversAnExactFourierShift() {
        int n = 64;
        double[] weights = new double[n * n];
        Arrays.fill(weights, 1);
        PhaseCorrelation correlation = new PhaseCorrelation(n, n, weights, n, n, 1.5, 16);
        SplittableRandom random = new SplittableRandom(41);
        int kMax = 25;
        double[][] amplitude = new double[2 * kMax + 1][kMax + 1];
        double[][] phase = new double[2 * kMax + 1][kMax + 1];
        for (double[] row : amplitude) {
            for (int i = 0; i < row.length; i++) {
                row[i] = random.nextDouble(0.2, 1);
            }
        }
        for (double[] row : phase) {
            for (int i = 0; i < row.length; i++) {
                row[i] = random.nextDouble(0, 2 * Math.PI);
            }
        }
        correlation.reference(toDouble(render(n, kMax, amplitude, phase, 0, 0)));
        double[][] shifts = {{0.3, -0.2}, {-2.75, 1.5}, {5.49, -7.01}, {-0.5, 0.5}, {11.2, 3.3}};
        for (double[] d : shifts) {
            PhaseCorrelation.Shift s = correlation.measure(render(n, kMax, amplitude, phase, d[0], d[1]));
            // REF: Fourier shift theorem; exact up to the weighting's tails cut below 1e-3 [common practice]
            assertEquals(d[0], s.dxPx(), 2e-3, "x shift (px) for " + Arrays.toString(d));
            assertEquals(d[1], s.dyPx(), 2e-3, "y shift (px) for " + Arrays.toString(d));
            assertEquals(1.0, s.peakHeight(), 0.01, "peak height for a pure translation");
        }
    }

    @Test
    void independentNoiseGivesALowPeak() {
        int n = 64;
        double[] weights = MotionCorrectionTest.tukey2d(n);
        PhaseCorrelation correlation = new PhaseCorrelation(n, n, weights, n, n, MotionCorrection.PEAK_SIGMA_PX, 16);
        SplittableRandom random = new SplittableRandom(42);
        double[] reference = new double[n * n];
        for (int i = 0; i < reference.length; i++) {
            reference[i] = random.nextDouble();
        }
        correlation.reference(reference);
        for (int r = 0; r < 20; r++) {
            float[] tile = new float[n * n];
            for (int i = 0; i < tile.length; i++) {
                tile[i] = (float) random.nextDouble();
            }
            double peak = correlation.measure(tile).peakHeight();
            // the threshold below which a frame counts as unreliable must flag a frame that matches nothing
            assertTrue(peak < MotionCorrection.MIN_PEAK_HEIGHT, "peak height " + peak + " of unrelated noise");
        }
    }

    /** The image sum a cos(2 pi (kx x + ky y) / n + phase) at pixel centres moved back by (dx, dy). */
    private static float[] render(int n, int kMax, double[][] amplitude, double[][] phase, double dx, double dy) {
        float[] image = new float[n * n];
        for (int y = 0; y < n; y++) {
            for (int x = 0; x < n; x++) {
                double sum = 0;
                for (int ky = -kMax; ky <= kMax; ky++) {
                    for (int kx = 0; kx <= kMax; kx++) {
                        if (kx == 0 && ky <= 0) {
                            continue;
                        }
                        double arg = 2 * Math.PI * (kx * (x - dx) + ky * (y - dy)) / n;
                        sum += amplitude[ky + kMax][kx] * Math.cos(arg + phase[ky + kMax][kx]);
                    }
                }
                image[y * n + x] = (float) sum;
            }
        }
        return image;
    }

    private static double[] toDouble(float[] v) {
        double[] d = new double[v.length];
        for (int i = 0; i < v.length; i++) {
            d[i] = v[i];
        }
        return d;
    }
}
