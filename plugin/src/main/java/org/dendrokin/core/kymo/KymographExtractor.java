package org.dendrokin.core.kymo;

import java.util.Arrays;

import org.dendrokin.core.Checks;
import org.dendrokin.core.Progress;
import org.dendrokin.core.path.DendritePath;
import org.dendrokin.core.path.PixelConvention;
import org.dendrokin.core.path.ResampledPath;

/**
 * Samples a movie along a dendrite path, frame by frame, into a raw intensity kymograph.
 *
 * <p>Geometry. The path is resampled at uniform arc length {@code stepUm} (sample k at distance
 * {@code k * stepUm} from the first vertex). Across each sample, along the unit normal n of the local tangent,
 * the band of width w = {@code bandWidthUm / pixelSizeUm} pixels is covered by m = max(1, round(w)) points at
 * offsets {@code o_j = (j + 1/2) w/m - w/2}, j = 0..m-1 (the midpoint rule over [-w/2, w/2]; for a whole
 * number of pixels this is one point a pixel, as ImageJ's wide line profiles use). The value of a sample is the
 * mean of the frame at these m points.
 *
 * <p>Interpolation. Each point, in ImageJ coordinates (pixel i covers [i, i+1)), is converted to array
 * coordinates by {@link PixelConvention#toArrayIndex} and the frame is interpolated bilinearly between the
 * four surrounding pixel centres. A point inside the image but within half a pixel of its border (beyond the
 * outermost pixel centres) takes the border pixels' values (the coordinate is clamped).
 *
 * <p>Outside the image. A sample with any band point outside [0, width] x [0, height] is NaN in every frame
 * (a partial band would bias the mean); such samples are counted in the result.
 *
 * <p>Reading. The pixels every sample needs are collected once; each frame is then read through
 * {@link FrameSource#gather}, so a path that touches a small part of the frame reads only that part.
 */
public final class KymographExtractor {
    /** Signal unit of an extracted kymograph: raw intensities, in the movie's own grey values. */
    public static final String INTENSITY = "intensity";

    private KymographExtractor() {
    }

    /**
     * Resamples the path at uniform arc length and averages each frame over a band across the local tangent,
     * as described in the class comment.
     *
     * @param frames         the movie channel; only the pixels the band touches are read. Not modified.
     * @param path           the path in ImageJ pixel coordinates
     * @param pixelSizeUm    pixel size, um, positive
     * @param frameIntervalS time between frames, s, positive; frame i is at {@code i * frameIntervalS}
     * @param bandWidthUm    width of the band averaged across the path, um, zero or positive (0 = on the line)
     * @param stepUm         spacing of the samples along the path, um, positive (usually the pixel size)
     * @param progress       receives one report a frame; checked for cancellation once a frame
     * @return the kymograph (signal unit {@value #INTENSITY}; distances in um from the first vertex; times in
     *         s) with the count of NaN values and the sample centres
     * @throws IllegalArgumentException for non-positive sizes or an empty movie
     * @throws Progress.CancelledException if the user cancelled
     */
    public static Extraction extract(FrameSource frames, DendritePath path, double pixelSizeUm,
            double frameIntervalS, double bandWidthUm, double stepUm, Progress progress) {
        Checks.positiveFinite(pixelSizeUm, "pixelSizeUm");
        Checks.positiveFinite(frameIntervalS, "frameIntervalS");
        Checks.nonNegativeFinite(bandWidthUm, "path width (um)");
        Checks.positiveFinite(stepUm, "stepUm");
        int width = frames.width();
        int height = frames.height();
        int frameCount = frames.frameCount();
        Checks.require(width > 0 && height > 0, "the movie has no pixels");
        Checks.require(frameCount > 0, "the movie has no frames");

        ResampledPath samples = path.resample(stepUm / pixelSizeUm);
        Stencil stencil = Stencil.build(samples, bandWidthUm / pixelSizeUm, width, height);
        int n = samples.size();

        double[] values = new double[frameCount * n];
        float[] gathered = new float[stencil.pixels.length];
        for (int f = 0; f < frameCount; f++) {
            progress.checkCancelled();
            frames.gather(f, stencil.pixels, gathered);
            int row = f * n;
            for (int k = 0; k < n; k++) {
                if (stencil.outside[k]) {
                    values[row + k] = Double.NaN;
                    continue;
                }
                double sum = 0;
                for (int q = stencil.start[k]; q < stencil.start[k + 1]; q++) {
                    sum += stencil.weight[q] * gathered[stencil.position[q]];
                }
                values[row + k] = sum;
            }
            progress.report("Extracting kymograph", f + 1, frameCount);
        }

        Kymograph kymograph = new Kymograph(distances(n, stepUm), times(frameCount, frameIntervalS), values,
                INTENSITY);
        return new Extraction(kymograph, (long) stencil.outsideCount * frameCount,
                n == 0 ? 0 : stencil.outsideCount / (double) n, samples.xPx(), samples.yPx());
    }

    /**
     * Samples a movie along a path that moves with the image: in frame f the path (and with it every band point) is
     * translated by {@code (dxPx[f], dyPx[f])} pixels before sampling, as {@link #extract(FrameSource, DendritePath,
     * double, double, double, double, Progress)} samples the unmoved path. A frame's value at a sample equals what
     * that method gives in that frame for the path translated by the frame's shift (up to rounding), including the
     * rules for band points near or beyond the image border: a sample with a band point outside the image is NaN in
     * that frame only, and counted.
     *
     * <p>Speed. The table of pixels is built once: for each band point, the 3 x 3 pixels from which any shift with
     * the same whole-pixel part can interpolate it. In each frame the whole-pixel part of the shift moves the table's
     * base (one index list, gathered in one call) and the fractional part sets the bilinear weights.
     *
     * @param frames         the movie channel; only the pixels the moved band touches are read. Not modified.
     * @param path           the path as drawn on the reference image, ImageJ pixel coordinates
     * @param pixelSizeUm    pixel size, um, positive
     * @param frameIntervalS time between frames, s, positive
     * @param bandWidthUm    width of the band averaged across the path, um, zero or positive
     * @param stepUm         spacing of the samples along the path, um, positive
     * @param dxPx           shift of each frame along x (columns), pixels, finite; one per frame. Not modified.
     * @param dyPx           shift of each frame along y (rows), pixels, finite; one per frame. Not modified.
     * @param progress       receives one report a frame; checked for cancellation once a frame
     * @return the kymograph, the number of NaN samples (outside the image in their frame), the fraction of all
     *         samples that are NaN, and the sample centres of the unmoved path
     * @throws IllegalArgumentException for non-positive sizes, an empty movie, or shifts that are not one finite
     *                                  value per frame
     * @throws Progress.CancelledException if the user cancelled
     */
    public static Extraction extract(FrameSource frames, DendritePath path, double pixelSizeUm,
            double frameIntervalS, double bandWidthUm, double stepUm, double[] dxPx, double[] dyPx,
            Progress progress) {
        Checks.positiveFinite(pixelSizeUm, "pixelSizeUm");
        Checks.positiveFinite(frameIntervalS, "frameIntervalS");
        Checks.nonNegativeFinite(bandWidthUm, "path width (um)");
        Checks.positiveFinite(stepUm, "stepUm");
        int width = frames.width();
        int height = frames.height();
        int frameCount = frames.frameCount();
        Checks.require(width > 0 && height > 0, "the movie has no pixels");
        Checks.require(frameCount > 0, "the movie has no frames");
        Checks.require(dxPx.length == frameCount && dyPx.length == frameCount, "one shift per frame is needed: "
                + dxPx.length + " and " + dyPx.length + " shifts for " + frameCount + " frames");
        MovingPath moving = new MovingPath(frames, path, pixelSizeUm, frameIntervalS, bandWidthUm, stepUm);
        for (int f = 0; f < frameCount; f++) {
            progress.checkCancelled();
            moving.sample(f, f + 1, dxPx, dyPx);
            progress.report("Extracting kymograph", f + 1, frameCount);
        }
        return moving.result();
    }

    /**
     * A kymograph along a path that moves with the image, filled a range of frames at a time, for a caller that
     * learns the shifts as it goes (motion correction samples each block of frames while it measures the next).
     * The result equals {@link #extract(FrameSource, DendritePath, double, double, double, double, double[],
     * double[], Progress)} with the same shifts. Reads the source on the calling thread; not thread-safe.
     */
    public static final class MovingPath {
        private final FrameSource frames;
        private final ResampledPath samples;
        private final MovingStencil stencil;
        private final double stepUm;
        private final double frameIntervalS;
        private final int n;
        private final double[] values;
        private final boolean[] done;
        private long outside;

        /**
         * @param frames         the movie channel; only the pixels the moved band touches are read. Not modified.
         * @param path           the path as drawn on the reference image, ImageJ pixel coordinates
         * @param pixelSizeUm    pixel size, um, positive
         * @param frameIntervalS time between frames, s, positive
         * @param bandWidthUm    width of the band averaged across the path, um, zero or positive
         * @param stepUm         spacing of the samples along the path, um, positive
         */
        public MovingPath(FrameSource frames, DendritePath path, double pixelSizeUm, double frameIntervalS,
                double bandWidthUm, double stepUm) {
            Checks.positiveFinite(pixelSizeUm, "pixelSizeUm");
            Checks.positiveFinite(frameIntervalS, "frameIntervalS");
            Checks.nonNegativeFinite(bandWidthUm, "path width (um)");
            Checks.positiveFinite(stepUm, "stepUm");
            Checks.require(frames.width() > 0 && frames.height() > 0, "the movie has no pixels");
            Checks.require(frames.frameCount() > 0, "the movie has no frames");
            this.frames = frames;
            this.samples = path.resample(stepUm / pixelSizeUm);
            this.stencil = MovingStencil.build(samples, bandWidthUm / pixelSizeUm);
            this.stepUm = stepUm;
            this.frameIntervalS = frameIntervalS;
            this.n = samples.size();
            this.values = new double[frames.frameCount() * n];
            this.done = new boolean[frames.frameCount()];
        }

        /**
         * Samples frames [from, to), frame f with the path moved by (dxPx[f], dyPx[f]) pixels.
         *
         * @param dxPx shift of each frame along x (columns), pixels, finite where sampled. Not modified.
         * @param dyPx shift of each frame along y (rows), pixels. Not modified.
         */
        public void sample(int from, int to, double[] dxPx, double[] dyPx) {
            for (int f = from; f < to; f++) {
                Checks.finite(dxPx[f], "the x shift of frame " + f);
                Checks.finite(dyPx[f], "the y shift of frame " + f);
                outside += stencil.sample(frames, f, dxPx[f], dyPx[f], values, f * n);
                done[f] = true;
            }
        }

        /**
         * The kymograph, the number of NaN samples (outside the image in their frame), the fraction of all samples
         * that are NaN, and the sample centres of the unmoved path.
         *
         * @throws IllegalStateException if a frame was not sampled
         */
        public Extraction result() {
            for (int f = 0; f < done.length; f++) {
                if (!done[f]) {
                    throw new IllegalStateException("frame " + f + " of the moving path was not sampled");
                }
            }
            int frameCount = done.length;
            return new Extraction(new Kymograph(distances(n, stepUm), times(frameCount, frameIntervalS),
                    values.clone(), INTENSITY), outside, outside / ((double) n * frameCount), samples.xPx(),
                    samples.yPx());
        }
    }

    private static double clamp(double v, int max) {
        return Math.max(0, Math.min(max, v));
    }

    private static double[] distances(int n, double stepUm) {
        double[] d = new double[n];
        for (int k = 0; k < n; k++) {
            d[k] = k * stepUm;
        }
        return d;
    }

    private static double[] times(int frameCount, double frameIntervalS) {
        double[] t = new double[frameCount];
        for (int f = 0; f < frameCount; f++) {
            t[f] = f * frameIntervalS;
        }
        return t;
    }

    /**
     * The table for a moving path. Band point q sits at (px[q], py[q]) in ImageJ coordinates on the unmoved path;
     * its block is the 3 x 3 pixels from column {@code floor(px - 1/2)} and row {@code floor(py - 1/2)} (array
     * indices). Shifted by d = n + phi (n whole, 0 <= phi < 1), the point's bilinear cell starts at block column
     * n_x + 0 or n_x + 1, so every pixel it interpolates from with a non-zero weight is a block pixel moved by n;
     * near the border, where the coordinate is clamped, the pixels with non-zero weight are still among them.
     * The blocks' pixels are kept once each, sorted by row and column, so that moving them all by n keeps them
     * sorted and they can be read in one {@link FrameSource#gather}.
     */
    private static final class MovingStencil {
        private static final long KEY_STRIDE = 1L << 32;
        private static final int KEY_COLUMN_OFFSET = 1 << 30;

        private final int pointsPerSample;
        private final double share;
        private final double[] px;
        private final double[] py;
        private final int[] blockX;
        private final int[] blockY;
        private final int[] blockSlot;
        private final int[] pixelCol;
        private final int[] pixelRow;
        private final int[] slot;
        private final int[] indices;
        private final float[] gathered;

        private MovingStencil(int pointsPerSample, double[] px, double[] py) {
            this.pointsPerSample = pointsPerSample;
            this.share = 1.0 / pointsPerSample;
            this.px = px;
            this.py = py;
            int points = px.length;
            this.blockX = new int[points];
            this.blockY = new int[points];
            for (int q = 0; q < points; q++) {
                blockX[q] = (int) Math.floor(PixelConvention.toArrayIndex(px[q]));
                blockY[q] = (int) Math.floor(PixelConvention.toArrayIndex(py[q]));
            }
            long[] all = new long[points * 9];
            for (int q = 0; q < points; q++) {
                for (int j = 0; j < 3; j++) {
                    for (int i = 0; i < 3; i++) {
                        all[q * 9 + j * 3 + i] = key(blockY[q] + j, blockX[q] + i);
                    }
                }
            }
            long[] distinct = Arrays.stream(all).sorted().distinct().toArray();
            this.pixelCol = new int[distinct.length];
            this.pixelRow = new int[distinct.length];
            for (int p = 0; p < distinct.length; p++) {
                pixelRow[p] = (int) Math.floorDiv(distinct[p], KEY_STRIDE);
                pixelCol[p] = (int) Math.floorMod(distinct[p], KEY_STRIDE) - KEY_COLUMN_OFFSET;
            }
            this.blockSlot = new int[points * 9];
            for (int i = 0; i < all.length; i++) {
                blockSlot[i] = Arrays.binarySearch(distinct, all[i]);
            }
            this.slot = new int[distinct.length];
            this.indices = new int[distinct.length];
            this.gathered = new float[distinct.length];
        }

        /** Row-major sort key of a pixel; rows and columns may be negative (off the image). */
        private static long key(int row, int col) {
            return row * KEY_STRIDE + col + KEY_COLUMN_OFFSET;
        }

        static MovingStencil build(ResampledPath samples, double bandWidthPx) {
            int n = samples.size();
            int m = Math.max(1, (int) Math.round(bandWidthPx));
            double[] x = samples.xPx();
            double[] y = samples.yPx();
            double[] nx = samples.normalX();
            double[] ny = samples.normalY();
            double[] px = new double[n * m];
            double[] py = new double[n * m];
            for (int k = 0; k < n; k++) {
                for (int j = 0; j < m; j++) {
                    double offset = (j + 0.5) * bandWidthPx / m - bandWidthPx / 2;
                    px[k * m + j] = x[k] + offset * nx[k];
                    py[k * m + j] = y[k] + offset * ny[k];
                }
            }
            return new MovingStencil(m, px, py);
        }

        /**
         * Samples frame f with the path moved by (dx, dy) into {@code values[at .. at + samples)}.
         *
         * @return the number of samples outside the image in this frame (NaN)
         */
        int sample(FrameSource frames, int f, double dx, double dy, double[] values, int at) {
            int width = frames.width();
            int height = frames.height();
            int shiftX = (int) Math.floor(dx);
            int shiftY = (int) Math.floor(dy);
            int count = 0;
            for (int p = 0; p < pixelCol.length; p++) {
                int c = pixelCol[p] + shiftX;
                int r = pixelRow[p] + shiftY;
                if (c >= 0 && c < width && r >= 0 && r < height) {
                    indices[count] = r * width + c;
                    slot[p] = count++;
                } else {
                    slot[p] = -1;
                }
            }
            if (count > 0) {
                int[] read = count == indices.length ? indices : Arrays.copyOf(indices, count);
                frames.gather(f, read, gathered);
            }
            int samples = px.length / pointsPerSample;
            int outside = 0;
            for (int k = 0; k < samples; k++) {
                double sum = 0;
                boolean out = false;
                for (int j = 0; j < pointsPerSample && !out; j++) {
                    int q = k * pointsPerSample + j;
                    double x = px[q] + dx;
                    double y = py[q] + dy;
                    if (!(x >= 0 && x <= width && y >= 0 && y <= height)) {
                        out = true;
                        break;
                    }
                    double xa = clamp(PixelConvention.toArrayIndex(x), width - 1);
                    double ya = clamp(PixelConvention.toArrayIndex(y), height - 1);
                    int x0 = Math.min((int) Math.floor(xa), Math.max(0, width - 2));
                    int y0 = Math.min((int) Math.floor(ya), Math.max(0, height - 2));
                    int x1 = Math.min(x0 + 1, width - 1);
                    int y1 = Math.min(y0 + 1, height - 1);
                    double fx = xa - x0;
                    double fy = ya - y0;
                    int lx0 = x0 - blockX[q] - shiftX;
                    int lx1 = x1 - blockX[q] - shiftX;
                    int ly0 = y0 - blockY[q] - shiftY;
                    int ly1 = y1 - blockY[q] - shiftY;
                    sum += term((1 - fx) * (1 - fy) * share, q, lx0, ly0);
                    sum += term(fx * (1 - fy) * share, q, lx1, ly0);
                    sum += term((1 - fx) * fy * share, q, lx0, ly1);
                    sum += term(fx * fy * share, q, lx1, ly1);
                }
                if (out) {
                    values[at + k] = Double.NaN;
                    outside++;
                } else {
                    values[at + k] = sum;
                }
            }
            return outside;
        }

        /**
         * Weight times the value of block pixel (lx, ly) of point q. A pixel off the block or off the image can only
         * carry a zero weight (see the class comment), or one of rounding size; it adds nothing.
         */
        private double term(double weight, int q, int lx, int ly) {
            if (lx < 0 || lx > 2 || ly < 0 || ly > 2) {
                return 0;
            }
            int s = slot[blockSlot[q * 9 + ly * 3 + lx]];
            return s < 0 ? 0 : weight * gathered[s];
        }
    }

    /**
     * The fixed part of the work: for each sample, the pixels it reads and their weights (bilinear weight
     * divided by the number of band points), in compressed-row form over one sorted array of distinct pixels.
     */
    private static final class Stencil {
        int[] pixels;
        int[] start;
        int[] position;
        double[] weight;
        boolean[] outside;
        int outsideCount;

        static Stencil build(ResampledPath samples, double bandWidthPx, int width, int height) {
            int n = samples.size();
            int m = Math.max(1, (int) Math.round(bandWidthPx));
            double[] x = samples.xPx();
            double[] y = samples.yPx();
            double[] nx = samples.normalX();
            double[] ny = samples.normalY();
            Stencil s = new Stencil();
            s.outside = new boolean[n];
            s.start = new int[n + 1];
            int[] index = new int[n * m * 4];
            double[] weight = new double[n * m * 4];
            int used = 0;
            for (int k = 0; k < n; k++) {
                s.start[k] = used;
                int begin = used;
                for (int j = 0; j < m && !s.outside[k]; j++) {
                    double offset = (j + 0.5) * bandWidthPx / m - bandWidthPx / 2;
                    double px = x[k] + offset * nx[k];
                    double py = y[k] + offset * ny[k];
                    if (!(px >= 0 && px <= width && py >= 0 && py <= height)) {
                        s.outside[k] = true;
                        break;
                    }
                    double xa = clamp(PixelConvention.toArrayIndex(px), width - 1);
                    double ya = clamp(PixelConvention.toArrayIndex(py), height - 1);
                    int x0 = Math.min((int) Math.floor(xa), Math.max(0, width - 2));
                    int y0 = Math.min((int) Math.floor(ya), Math.max(0, height - 2));
                    int x1 = Math.min(x0 + 1, width - 1);
                    int y1 = Math.min(y0 + 1, height - 1);
                    double fx = xa - x0;
                    double fy = ya - y0;
                    double share = 1.0 / m;
                    index[used] = y0 * width + x0;
                    weight[used++] = (1 - fx) * (1 - fy) * share;
                    index[used] = y0 * width + x1;
                    weight[used++] = fx * (1 - fy) * share;
                    index[used] = y1 * width + x0;
                    weight[used++] = (1 - fx) * fy * share;
                    index[used] = y1 * width + x1;
                    weight[used++] = fx * fy * share;
                }
                if (s.outside[k]) {
                    used = begin;
                    s.outsideCount++;
                }
            }
            s.start[n] = used;
            s.pixels = Arrays.stream(index, 0, used).sorted().distinct().toArray();
            s.position = new int[used];
            for (int q = 0; q < used; q++) {
                s.position[q] = Arrays.binarySearch(s.pixels, index[q]);
            }
            s.weight = Arrays.copyOf(weight, used);
            return s;
        }
    }
}
