package org.dendrokin.core.preprocess;

import java.util.ArrayList;
import java.util.List;

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
    /** Interquartile range of a normal distribution in standard deviations, 2 z(0.75) [common practice]. */
    static final double IQR_PER_SD = 1.349;
    private static final int MAX_PIXELS = 20000;
    private static final int MIN_PIXELS = 20;
    /** Fewest pixels on one side of the path for that side to count at a position. */
    private static final int MIN_SIDE_PIXELS = 10;

    private BackgroundEstimator() {
    }

    /**
     * @param value       the background, grey values (NaN when too few far pixels)
     * @param spread      how much the background varies across the field: the robust standard deviation
     *                    (interquartile range / 1.349) of the far pixels' time averages, grey values (NaN when too few
     *                    far pixels). The background under the path is never seen, so this is also the uncertainty
     *                    given to any estimate of it.
     * @param pixelCount  number of far pixels used
     * @param frameCount  number of frames averaged
     * @param description one sentence for the report
     */
    public record Estimate(double value, double spread, int pixelCount, int frameCount, String description) {
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
            return new Estimate(Double.NaN, Double.NaN, n, frameIndices.length, String.format(Locale.ROOT,
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
        Percentile percentile = new Percentile();
        percentile.setData(sum);
        double value = percentile.evaluate(PERCENTILE);
        double spread = (percentile.evaluate(75) - percentile.evaluate(25)) / IQR_PER_SD;
        return new Estimate(value, spread, n, frameIndices.length, String.format(Locale.ROOT,
                "Estimated from the data: the %.0fth percentile of %d pixels more than %.3g pixels from the path, each "
                        + "averaged over %d frames.", PERCENTILE, n, minDistancePx, frameIndices.length));
    }

    /**
     * The background beside the path, position by position. For each path sample and each side of the path, the
     * median of the time-averaged pixels that lie between {@code innerPx} and {@code outerPx} from the path on that
     * side and whose nearest path sample is within {@code halfWindow} samples of it (pixels nearest to an end sample
     * lie beyond the path, not beside it, and are left out); the background under the path is the mean of the two
     * sides' medians, or the one side's where the other has too few pixels (near the image's edge). Uneven
     * background (a gradient, out-of-focus structure) then enters each position's dF/F0 with its own level rather
     * than one level for the whole path, which matters because any error in the background is divided by the
     * bleaching correction and grows over the movie. Averaging the two sides follows a background that changes
     * across the path; a median of one side is not moved by a spine or a neighbouring neurite that covers less
     * than half of its pixels. Positions without enough pixels beside them take the nearest position's value; NaN
     * everywhere when there are fewer than {@value #MIN_PIXELS} such pixels in all.
     *
     * <p>Measured on the project's realistic movies (seeds 1 to 20, bench/coverage/README.md), the mean of the two
     * sides' medians missed the background under the path by 4 to 27 counts RMS per movie, against 8 to 38 for the
     * lower quartile of both sides pooled (the method before 2026-12-04): a blob of background centred near the path is brighter under it than beside
     * it, and a low percentile reads lower still.
     *
     * @param frames       the movie channel. Not modified.
     * @param pathXPx      x of the path samples, ImageJ pixel coordinates. Not modified.
     * @param pathYPx      y of the path samples. Not modified.
     * @param innerPx      smallest distance from the path, pixels
     * @param outerPx      largest distance from the path, pixels
     * @param halfWindow   path samples on each side whose beside-pixels count for a sample
     * @param frameIndices frames to average (0-based). Not modified.
     * @param progress     one report per frame; checked for cancellation
     * @return the background of each path sample, grey values
     */
    public static double[] besidePath(FrameSource frames, double[] pathXPx, double[] pathYPx, double innerPx,
            double outerPx, int halfWindow, int[] frameIndices, Progress progress) {
        Checks.sameLength(pathXPx.length, pathYPx);
        int w = frames.width();
        int h = frames.height();
        int samples = pathXPx.length;
        int x0 = w;
        int y0 = h;
        int x1 = -1;
        int y1 = -1;
        for (int s = 0; s < samples; s++) {
            x0 = Math.min(x0, (int) Math.floor(pathXPx[s] - outerPx));
            y0 = Math.min(y0, (int) Math.floor(pathYPx[s] - outerPx));
            x1 = Math.max(x1, (int) Math.ceil(pathXPx[s] + outerPx));
            y1 = Math.max(y1, (int) Math.ceil(pathYPx[s] + outerPx));
        }
        x0 = Math.max(0, x0);
        y0 = Math.max(0, y0);
        x1 = Math.min(w - 1, x1);
        y1 = Math.min(h - 1, y1);
        List<Integer> pixels = new ArrayList<>();
        List<Integer> nearest = new ArrayList<>();
        List<Boolean> left = new ArrayList<>();
        double inner2 = innerPx * innerPx;
        double outer2 = outerPx * outerPx;
        for (int j = y0; j <= y1; j++) {
            for (int i = x0; i <= x1; i++) {
                double cx = i + 0.5;
                double cy = j + 0.5;
                double best = Double.POSITIVE_INFINITY;
                int at = -1;
                for (int s = 0; s < samples; s++) {
                    double dx = cx - pathXPx[s];
                    double dy = cy - pathYPx[s];
                    double d2 = dx * dx + dy * dy;
                    if (d2 < best) {
                        best = d2;
                        at = s;
                    }
                }
                // a pixel nearest to an end of the path lies beyond it, not beside it
                if (best >= inner2 && best <= outer2 && at > 0 && at < samples - 1) {
                    pixels.add(j * w + i);
                    nearest.add(at);
                    // the side: the sign of the local tangent crossed with the offset from the path
                    double tx = pathXPx[at + 1] - pathXPx[at - 1];
                    double ty = pathYPx[at + 1] - pathYPx[at - 1];
                    left.add(tx * (cy - pathYPx[at]) - ty * (cx - pathXPx[at]) > 0);
                }
            }
        }
        double[] out = new double[samples];
        java.util.Arrays.fill(out, Double.NaN);
        if (pixels.size() < MIN_PIXELS) {
            return out;
        }
        int n = pixels.size();
        double[] mean = new double[n];
        float[] buffer = new float[(y1 - y0 + 1) * w];
        for (int k = 0; k < frameIndices.length; k++) {
            progress.checkCancelled();
            frames.readRows(frameIndices[k], y0, y1 - y0 + 1, buffer);
            for (int q = 0; q < n; q++) {
                mean[q] += buffer[pixels.get(q) - y0 * w] / frameIndices.length;
            }
        }
        List<List<List<Double>>> bySide = List.of(new ArrayList<>(), new ArrayList<>());
        for (List<List<Double>> side : bySide) {
            for (int s = 0; s < samples; s++) {
                side.add(new ArrayList<>());
            }
        }
        for (int q = 0; q < n; q++) {
            bySide.get(left.get(q) ? 0 : 1).get(nearest.get(q)).add(mean[q]);
        }
        Percentile median = new Percentile(50);
        for (int s = 0; s < samples; s++) {
            double sum = 0;
            int sides = 0;
            for (List<List<Double>> side : bySide) {
                List<Double> pool = new ArrayList<>();
                for (int t = Math.max(0, s - halfWindow); t <= Math.min(samples - 1, s + halfWindow); t++) {
                    pool.addAll(side.get(t));
                }
                if (pool.size() >= MIN_SIDE_PIXELS) {
                    sum += median.evaluate(pool.stream().mapToDouble(Double::doubleValue).toArray());
                    sides++;
                }
            }
            if (sides > 0) {
                out[s] = sum / sides;
            }
        }
        fillGaps(out);
        return out;
    }

    /** Replaces NaN values by the nearest finite value along the array. Modifies {@code v}. */
    private static void fillGaps(double[] v) {
        int last = -1;
        for (int i = 0; i < v.length; i++) {
            if (Double.isFinite(v[i])) {
                for (int j = last + 1; j < i; j++) {
                    v[j] = last < 0 || i - j < j - last ? v[i] : v[last];
                }
                last = i;
            }
        }
        for (int j = last + 1; j < v.length && last >= 0; j++) {
            v[j] = v[last];
        }
    }
}
