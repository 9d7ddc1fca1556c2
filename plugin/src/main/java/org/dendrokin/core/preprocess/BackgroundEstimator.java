package org.dendrokin.core.preprocess;

import java.util.Locale;

import org.apache.commons.math3.stat.descriptive.rank.Percentile;
import org.dendrokin.core.Checks;
import org.dendrokin.core.Progress;
import org.dendrokin.core.kymo.FrameSource;

/**
 * Estimates a movie's background from pixels far from the dendrite path, when session.json gives neither a
 * value nor a background ROI.
 *
 * <p>Method. Candidate pixels lie on a regular grid (every {@code stride}-th column and row, the stride chosen so
 * that at most about 20000 pixels are looked at) and farther than {@code minDistancePx} from every sample of
 * the path (pixel centre at i + 0.5, j + 0.5, ImageJ convention). Each candidate is averaged over the given
 * frames, which shrinks its noise by the square root of their number; the background is the 25th percentile
 * of these averages (Commons Math {@link Percentile}, default estimator). The low percentile keeps other cells
 * or neurites in the field, which are brighter than the background, from raising the value as long as they
 * cover less than three quarters of the far pixels. One value is used for the whole movie.
 */
public final class BackgroundEstimator {
    /** Percentile of the far pixels' time averages taken as the background. */
    public static final double PERCENTILE = 25;
    private static final int MAX_PIXELS = 20000;
    private static final int MIN_PIXELS = 20;

    private BackgroundEstimator() {
    }

    /**
     * @param value       the background, grey values (NaN when too few far pixels)
     * @param pixelCount  number of far pixels used
     * @param frameCount  number of frames averaged
     * @param description one sentence for the report
     */
    public record Estimate(double value, int pixelCount, int frameCount, String description) {
    }

    /**
     * @param frames        the movie channel; whole frames are read, so pass a few frames only
     * @param pathXPx       x of the path samples, ImageJ pixel coordinates. Not modified.
     * @param pathYPx       y of the path samples. Not modified.
     * @param minDistancePx smallest distance from the path for a background pixel, pixels
     * @param frameIndices  frames to average (0-based). Not modified.
     * @param progress      one report per frame; checked for cancellation
     */
    public static Estimate fromFarPixels(FrameSource frames, double[] pathXPx, double[] pathYPx,
            double minDistancePx, int[] frameIndices, Progress progress) {
        Checks.sameLength(pathXPx.length, pathYPx);
        Checks.require(frameIndices.length > 0, "at least one frame is needed to estimate the background");
        int w = frames.width();
        int h = frames.height();
        int stride = Math.max(1, (int) Math.ceil(Math.sqrt((double) w * h / MAX_PIXELS)));
        double min2 = minDistancePx * minDistancePx;
        int nCols = (w + stride - 1) / stride;
        int nRows = (h + stride - 1) / stride;
        int[] index = new int[nCols * nRows];
        int n = 0;
        for (int j = 0; j < h; j += stride) {
            for (int i = 0; i < w; i += stride) {
                double cx = i + 0.5;
                double cy = j + 0.5;
                boolean far = true;
                for (int s = 0; s < pathXPx.length && far; s++) {
                    double dx = cx - pathXPx[s];
                    double dy = cy - pathYPx[s];
                    far = !(dx * dx + dy * dy < min2);
                }
                if (far) {
                    index[n++] = j * w + i;
                }
            }
        }
        if (n < MIN_PIXELS) {
            return new Estimate(Double.NaN, n, frameIndices.length, String.format(Locale.ROOT,
                    "Only %d pixels lie more than %.3g pixels from the path, too few to estimate the background.",
                    n, minDistancePx));
        }
        double[] sum = new double[n];
        float[] buffer = new float[w * h];
        for (int k = 0; k < frameIndices.length; k++) {
            progress.checkCancelled();
            frames.readRows(frameIndices[k], 0, h, buffer);
            for (int q = 0; q < n; q++) {
                sum[q] += buffer[index[q]];
            }
            progress.report("estimating the background", k + 1, frameIndices.length);
        }
        for (int q = 0; q < n; q++) {
            sum[q] /= frameIndices.length;
        }
        double value = new Percentile(PERCENTILE).evaluate(sum);
        return new Estimate(value, n, frameIndices.length, String.format(Locale.ROOT,
                "Estimated from the data: the %.0fth percentile of %d pixels more than %.3g pixels from the path, each "
                        + "averaged over %d frames.", PERCENTILE, n, minDistancePx, frameIndices.length));
    }
}
