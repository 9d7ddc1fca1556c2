package org.dendrokin.core.motion;

import java.util.SplittableRandom;

import org.dendrokin.core.path.DendritePath;

/**
 * A continuous test scene, for rendering movies with exactly known motion: a dendrite (a ridge of Gaussian cross
 * section along a gentle sine curve) with spine heads beside it (small Gaussian blobs), a few dim out-of-focus blobs,
 * and a flat background. Coordinates are ImageJ pixel coordinates (pixel i covers [i, i+1)); intensities are in
 * photons, so that Poisson-like noise can be added. Invented numbers, for tests only.
 */
final class SyntheticDendrite {
    final int width;
    final int height;
    private final double centreY;
    private final double amplitudePx;
    private final double periodPx;
    private final double radiusPx = 1.6;
    private final double brightness = 150;
    private final double background = 20;
    private final double[] blobX;
    private final double[] blobY;
    private final double[] blobSigma;
    private final double[] blobPeak;
    private final boolean[] blobOnDendrite;

    /**
     * A dendrite along a gentle sine curve.
     *
     * @param width  image width, pixels
     * @param height image height, pixels
     * @param seed   places the spines and blobs
     */
    SyntheticDendrite(int width, int height, long seed) {
        this(width, height, seed, height / 10.0);
    }

    /**
     * @param width       image width, pixels
     * @param height      image height, pixels
     * @param seed        places the spines and blobs
     * @param amplitudePx amplitude of the dendrite's sine curve, pixels; 0 for a straight horizontal dendrite
     */
    SyntheticDendrite(int width, int height, long seed, double amplitudePx) {
        this.width = width;
        this.height = height;
        this.centreY = height / 2.0;
        this.amplitudePx = amplitudePx;
        this.periodPx = width * 0.9;
        SplittableRandom random = new SplittableRandom(seed);
        int spines = Math.max(4, width / 8);
        int haze = Math.max(3, width * height / 1500);
        int n = spines + haze;
        blobX = new double[n];
        blobY = new double[n];
        blobSigma = new double[n];
        blobPeak = new double[n];
        blobOnDendrite = new boolean[n];
        for (int i = 0; i < spines; i++) {
            double x = random.nextDouble(4, width - 4);
            double side = random.nextBoolean() ? 1 : -1;
            blobX[i] = x;
            blobY[i] = centreY(x) + side * random.nextDouble(3.5, 6.0);
            blobSigma[i] = random.nextDouble(0.9, 1.5);
            blobPeak[i] = brightness * random.nextDouble(0.5, 1.2);
            blobOnDendrite[i] = true;
        }
        for (int i = spines; i < n; i++) {
            blobX[i] = random.nextDouble(0, width);
            blobY[i] = random.nextDouble(0, height);
            blobSigma[i] = random.nextDouble(3, 7);
            blobPeak[i] = brightness * random.nextDouble(0.1, 0.3);
        }
    }

    /** Centre line of the dendrite, y at x (pixels). */
    double centreY(double x) {
        return centreY + amplitudePx * Math.sin(2 * Math.PI * x / periodPx);
    }

    /**
     * Scene intensity at (x, y), photons, with the dendrite and its spines multiplied by {@code 1 + gain(x, y)}.
     *
     * @param gain relative change of the dendrite's signal, in scene coordinates; null for none
     */
    double at(double x, double y, Gain gain) {
        double d = y - centreY(x);
        double dendrite = brightness * Math.exp(-d * d / (2 * radiusPx * radiusPx));
        double spines = 0;
        double haze = 0;
        for (int i = 0; i < blobX.length; i++) {
            double dx = x - blobX[i];
            double dy = y - blobY[i];
            double r2 = dx * dx + dy * dy;
            double s2 = blobSigma[i] * blobSigma[i];
            if (r2 > 25 * s2) {
                continue;
            }
            double v = blobPeak[i] * Math.exp(-r2 / (2 * s2));
            if (blobOnDendrite[i]) {
                spines += v;
            } else {
                haze += v;
            }
        }
        double g = gain == null ? 0 : gain.at(x, y);
        return background + haze + (dendrite + spines) * (1 + g);
    }

    /** The path along the dendrite's centre line from x = {@code fromPx} to {@code toPx}, a vertex every 2 px. */
    DendritePath path(double fromPx, double toPx) {
        int n = (int) Math.ceil((toPx - fromPx) / 2);
        double[] x = new double[n + 1];
        double[] y = new double[n + 1];
        for (int i = 0; i <= n; i++) {
            x[i] = fromPx + (toPx - fromPx) * i / n;
            y[i] = centreY(x[i]);
        }
        return DendritePath.of(x, y, false);
    }

    /** A relative change of signal over the scene. */
    interface Gain {
        double at(double x, double y);
    }
}
