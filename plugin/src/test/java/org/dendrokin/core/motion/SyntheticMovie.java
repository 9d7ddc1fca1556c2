package org.dendrokin.core.motion;

import java.util.SplittableRandom;
import java.util.function.IntFunction;

import org.dendrokin.core.kymo.FrameSource;

/**
 * A movie of a {@link SyntheticDendrite} moved rigidly by a known shift in every frame: pixel (i, j) of frame f holds
 * the scene at (i + 1/2 - dx[f], j + 1/2 - dy[f]), so the content lies exactly (dx, dy) from where it lies in an
 * unshifted frame. Optional Poisson-like noise (Gaussian with variance equal to the mean, seeded per frame) and a
 * response that moves with the tissue. Frames are rendered once and kept.
 */
final class SyntheticMovie implements FrameSource {
    private final int width;
    private final int height;
    private final float[][] frames;

    /**
     * @param scene    the scene
     * @param dxPx     shift of each frame along x, pixels
     * @param dyPx     shift of each frame along y, pixels
     * @param response the relative change of signal in each frame (scene coordinates), or null
     * @param noise    true to add Poisson-like noise
     * @param seed     seed of the noise
     */
    SyntheticMovie(SyntheticDendrite scene, double[] dxPx, double[] dyPx, IntFunction<SyntheticDendrite.Gain> response,
            boolean noise, long seed) {
        this.width = scene.width;
        this.height = scene.height;
        this.frames = new float[dxPx.length][width * height];
        for (int f = 0; f < dxPx.length; f++) {
            SyntheticDendrite.Gain gain = response == null ? null : response.apply(f);
            SplittableRandom random = new SplittableRandom(seed * 1_000_003L + f);
            for (int j = 0; j < height; j++) {
                for (int i = 0; i < width; i++) {
                    double v = scene.at(i + 0.5 - dxPx[f], j + 0.5 - dyPx[f], gain);
                    if (noise) {
                        v += Math.sqrt(v) * gaussian(random);
                    }
                    frames[f][j * width + i] = (float) v;
                }
            }
        }
    }

    /** A focal rise of {@code amplitude} (relative) at (x, y) from {@code firstFrame}, spreading and fading. */
    static IntFunction<SyntheticDendrite.Gain> focalResponse(double xPx, double yPx, double amplitude,
            int firstFrame) {
        return f -> {
            if (f < firstFrame) {
                return null;
            }
            int t = f - firstFrame;
            double a = amplitude * Math.exp(-t / 40.0);
            double s2 = 4 + 1.5 * t;
            return (x, y) -> a * Math.exp(-((x - xPx) * (x - xPx) + (y - yPx) * (y - yPx)) / (2 * s2));
        };
    }

    /**
     * A diffusion-decay pulse along a straight dendrite lying along x: relative change
     * {@code A s0 / sqrt(V) exp(-(x - x0)^2 / (2 V)) exp(-k tau)}, V = s0^2 + 2 D tau, tau = (f - firstFrame) dt,
     * the closed form of c_t = D c_xx - k c after a Gaussian pulse (Crank 1975).
     *
     * @param x0Px        release position, pixels
     * @param amplitude   A, relative change at the release
     * @param s0Px        s0, pixels
     * @param dPx2PerS    D, pixels^2/s
     * @param kPerS       k, 1/s
     * @param firstFrame  frame of the release
     * @param frameS      frame interval, s
     */
    static IntFunction<SyntheticDendrite.Gain> diffusionDecay(double x0Px, double amplitude, double s0Px,
            double dPx2PerS, double kPerS, int firstFrame, double frameS) {
        return f -> {
            if (f < firstFrame) {
                return null;
            }
            double tau = (f - firstFrame) * frameS;
            double v = s0Px * s0Px + 2 * dPx2PerS * tau;
            double a = amplitude * s0Px / Math.sqrt(v) * Math.exp(-kPerS * tau);
            return (x, y) -> a * Math.exp(-(x - x0Px) * (x - x0Px) / (2 * v));
        };
    }

    private static double gaussian(SplittableRandom random) {
        // Box-Muller; one of the pair is enough here
        double u = 1 - random.nextDouble();
        double v = random.nextDouble();
        return Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * v);
    }

    @Override
    public int width() {
        return width;
    }

    @Override
    public int height() {
        return height;
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
