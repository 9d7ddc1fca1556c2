package org.dendrokin.core.motion;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;

import java.util.SplittableRandom;

import org.junit.jupiter.api.Test;

class RealFft2dTest {

    private static double[] randomImage(int nx, int ny, long seed) {
        SplittableRandom random = new SplittableRandom(seed);
        double[] image = new double[nx * ny];
        for (int i = 0; i < image.length; i++) {
            image[i] = random.nextDouble(-1, 1);
        }
        return image;
    }

    @Test
    void forwardIsTheDiscreteFourierTransform() {
        for (int[] size : new int[][] {{8, 4}, {4, 16}, {16, 8}}) {
            int nx = size[0];
            int ny = size[1];
            double[] image = randomImage(nx, ny, 31 + nx * ny);
            RealFft2d fft = new RealFft2d(nx, ny);
            int half = fft.halfWidth();
            double[] re = new double[ny * half];
            double[] im = new double[ny * half];
            fft.forward(image, re, im);
            for (int ky = 0; ky < ny; ky++) {
                for (int kx = 0; kx < half; kx++) {
                    double sr = 0;
                    double si = 0;
                    for (int y = 0; y < ny; y++) {
                        for (int x = 0; x < nx; x++) {
                            double phase = -2 * Math.PI * ((double) kx * x / nx + (double) ky * y / ny);
                            sr += image[y * nx + x] * Math.cos(phase);
                            si += image[y * nx + x] * Math.sin(phase);
                        }
                    }
                    // REF: the definition X(k) = sum f(x) exp(-2 pi i k.x / n), summed directly [common practice]
                    assertEquals(sr, re[ky * half + kx], 1e-12, "real part at " + kx + ", " + ky);
                    assertEquals(si, im[ky * half + kx], 1e-12, "imaginary part at " + kx + ", " + ky);
                }
            }
        }
    }

    @Test
    void inverseUndoesForward() {
        int nx = 32;
        int ny = 16;
        double[] image = randomImage(nx, ny, 32);
        RealFft2d fft = new RealFft2d(nx, ny);
        double[] re = new double[ny * fft.halfWidth()];
        double[] im = new double[ny * fft.halfWidth()];
        fft.forward(image, re, im);
        double[] back = new double[nx * ny];
        fft.inverse(re, im, back);
        for (int i = 0; i < image.length; i++) {
            // REF: the inverse DFT with 1/(nx ny) recovers the image [common practice]
            assertEquals(image[i], back[i], 1e-13, "pixel " + i);
        }
    }

    @Test
    void truncatedTransformsAgreeWithTheFullOnesWhereComputed() {
        int nx = 32;
        int ny = 32;
        int columns = 11;
        int reach = 6;
        RealFft2d fft = new RealFft2d(nx, ny);
        int half = fft.halfWidth();
        double[] image = randomImage(nx, ny, 33);
        double[] re = new double[ny * half];
        double[] im = new double[ny * half];
        double[] reCut = new double[ny * half];
        double[] imCut = new double[ny * half];
        fft.forward(image, re, im);
        fft.forward(image, reCut, imCut, columns);
        for (int ky = 0; ky < ny; ky++) {
            for (int kx = 0; kx < half; kx++) {
                int i = ky * half + kx;
                if (kx < columns) {
                    assertEquals(re[i], reCut[i], 1e-12, "real part at " + kx + ", " + ky);
                    assertEquals(im[i], imCut[i], 1e-12, "imaginary part at " + kx + ", " + ky);
                } else {
                    // zero beyond the columns, as the truncated inverse assumes
                    re[i] = 0;
                    im[i] = 0;
                }
            }
        }
        double[] full = new double[nx * ny];
        double[] cut = new double[nx * ny];
        fft.inverse(re, im, full);
        fft.inverse(re, im, cut, columns, reach);
        for (int y = 0; y < ny; y++) {
            if (y > reach && y < ny - reach) {
                continue;
            }
            for (int x = 0; x < nx; x++) {
                assertEquals(full[y * nx + x], cut[y * nx + x], 1e-13, "pixel " + x + ", " + y);
            }
        }
    }

    @Test
    void refusesSizesThatAreNotPowersOfTwo() {
        assertThrows(IllegalArgumentException.class, () -> new RealFft2d(24, 16));
        assertThrows(IllegalArgumentException.class, () -> new RealFft2d(16, 2));
    }
}
