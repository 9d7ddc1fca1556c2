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

        double[] distancesUm = new double[n];
        for (int k = 0; k < n; k++) {
            distancesUm[k] = k * stepUm;
        }
        double[] timesS = new double[frameCount];
        for (int f = 0; f < frameCount; f++) {
            timesS[f] = f * frameIntervalS;
        }
        Kymograph kymograph = new Kymograph(distancesUm, timesS, values, INTENSITY);
        return new Extraction(kymograph, (long) stencil.outsideCount * frameCount,
                n == 0 ? 0 : stencil.outsideCount / (double) n, samples.xPx(), samples.yPx());
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

        private static double clamp(double v, int max) {
            return Math.max(0, Math.min(max, v));
        }
    }
}
