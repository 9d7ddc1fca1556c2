package org.dendrokin.core.kymo;

import java.util.function.Function;

import org.dendrokin.core.Checks;
import org.dendrokin.core.Progress;
import org.dendrokin.core.path.DendritePath;

/**
 * A band average weighted by a second movie, as a mean fluorescence lifetime needs: pixel i of the band, with
 * value v_i (e.g. the mean lifetime tau_i, ns) and weight N_i (its photon count), contributes in proportion to
 * N_i, so a sample is
 *
 * <pre>
 *     v = sum_i c_i N_i v_i / sum_i c_i N_i
 * </pre>
 *
 * where c_i is the share of pixel i in the plain band average of {@link KymographExtractor} (its bilinear weight at
 * each band point, over the number of points; for a path along pixel centres, 1/m for each of the m pixels across
 * the band). Because that plain average is linear in the pixel values, the sample is the plain band average of
 * the movie N v divided by the plain band average of N: both are made by the existing extractors, along a fixed
 * or a moving path, from two {@link FrameSource} views that read the value and weight movies together, frame by
 * frame ({@link #weightedValues}, {@link #weights}). A pixel whose weight is zero, negative or NaN (no photons)
 * adds nothing, whatever its value (lifetime exports often hold 0 or NaN there); a sample whose weights sum to
 * zero is NaN; a NaN value with a positive weight makes its sample NaN.
 */
public final class PhotonWeighting {
    private PhotonWeighting() {
    }

    /**
     * The weighted band average and the plain band average of the weights.
     *
     * @param mean       sum c_i N_i v_i / sum c_i N_i, in the value movie's unit
     * @param meanWeight sum c_i N_i: the band-mean weight per pixel (e.g. photons per pixel)
     */
    public record Weighted(Kymograph mean, Kymograph meanWeight) {
        public Weighted {
            Checks.require(mean.positionCount() == meanWeight.positionCount()
                    && mean.frameCount() == meanWeight.frameCount(), "the two kymographs differ in size");
        }
    }

    /**
     * The movie N v: each pixel's value times its usable weight (0 where the weight is not positive).
     *
     * @param values  the value movie (e.g. mean lifetime, ns). Not modified.
     * @param weights the weight movie (e.g. photon counts), same width, height and frame count. Not modified.
     */
    public static FrameSource weightedValues(FrameSource values, FrameSource weights) {
        Checks.require(values.width() == weights.width() && values.height() == weights.height()
                && values.frameCount() == weights.frameCount(), "the value and weight movies differ in size: "
                + size(values) + " and " + size(weights));
        return new Combined(values, weights, true);
    }

    /** The movie of usable weights: N where positive, else 0. Not modified. */
    public static FrameSource weights(FrameSource weights) {
        return new Combined(null, weights, false);
    }

    /**
     * Divides the band average of N v by that of N, sample by sample.
     *
     * @param weightedSum band average of {@link #weightedValues} (unit: value times weight). Not modified.
     * @param weightSum   band average of {@link #weights}, same grid. Not modified.
     * @param unit        unit of the result (the value movie's unit, e.g. {@code "ns"})
     */
    public static Weighted divide(Kymograph weightedSum, Kymograph weightSum, String unit) {
        Checks.require(weightedSum.positionCount() == weightSum.positionCount()
                && weightedSum.frameCount() == weightSum.frameCount(), "the two kymographs differ in size");
        double[] a = weightedSum.values();
        double[] b = weightSum.values();
        double[] mean = new double[a.length];
        for (int i = 0; i < a.length; i++) {
            mean[i] = b[i] > 0 ? a[i] / b[i] : Double.NaN;
        }
        return new Weighted(weightedSum.withValues(mean, unit), weightSum.withValues(b, weightSum.signalUnit()));
    }

    /**
     * The weighted band average with any extractor: {@code extractor} turns a movie into its plain band-average
     * kymograph (e.g. {@link KymographExtractor#extract} along a fixed path, or along a path moved with the measured
     * motion) and is called twice, on {@link #weightedValues} and on {@link #weights}.
     *
     * @param unit unit of the result, e.g. {@code "ns"}
     */
    public static Weighted extract(FrameSource values, FrameSource weights, Function<FrameSource, Kymograph> extractor,
                                   String unit) {
        Kymograph sum = extractor.apply(weightedValues(values, weights));
        Kymograph norm = extractor.apply(weights(weights));
        return divide(sum, norm, unit);
    }

    /**
     * The weighted band average along a fixed path, with the geometry of
     * {@link KymographExtractor#extract(FrameSource, DendritePath, double, double, double, double, Progress)}.
     */
    public static Weighted extract(FrameSource values, FrameSource weights, DendritePath path, double pixelSizeUm,
                                   double frameIntervalS, double bandWidthUm, double stepUm, String unit,
                                   Progress progress) {
        return extract(values, weights, source -> KymographExtractor.extract(source, path, pixelSizeUm,
                frameIntervalS, bandWidthUm, stepUm, progress).kymograph(), unit);
    }

    /**
     * Pixels behind one sample of the band average: the number of band points across the path (as the extractor
     * places them, max(1, round(w)) for a band w pixels wide) times the step along the path in pixels. The band-mean
     * weight per pixel times this is the weight (e.g. photons) collected for the sample.
     *
     * @param bandWidthUm band width, um, &gt;= 0
     * @param pixelSizeUm pixel size, um, &gt; 0
     * @param stepUm      spacing of samples along the path, um, &gt; 0
     */
    public static double pixelsPerSample(double bandWidthUm, double pixelSizeUm, double stepUm) {
        Checks.nonNegativeFinite(bandWidthUm, "path width (um)");
        Checks.positiveFinite(pixelSizeUm, "pixelSizeUm");
        Checks.positiveFinite(stepUm, "stepUm");
        return Math.max(1, Math.round(bandWidthUm / pixelSizeUm)) * (stepUm / pixelSizeUm);
    }

    private static String size(FrameSource f) {
        return f.width() + " x " + f.height() + " pixels, " + f.frameCount() + " frames";
    }

    /** N v (values given) or N (values null), with N replaced by 0 where it is not positive. */
    private static final class Combined implements FrameSource {
        private final FrameSource values;
        private final FrameSource weights;
        private final boolean product;

        Combined(FrameSource values, FrameSource weights, boolean product) {
            this.values = values;
            this.weights = weights;
            this.product = product;
        }

        @Override
        public int width() {
            return weights.width();
        }

        @Override
        public int height() {
            return weights.height();
        }

        @Override
        public int frameCount() {
            return weights.frameCount();
        }

        @Override
        public float[] readRows(int frame, int firstRow, int rowCount, float[] dst) {
            int n = rowCount * width();
            float[] w = weights.readRows(frame, firstRow, rowCount, new float[n]);
            float[] v = product ? values.readRows(frame, firstRow, rowCount, new float[n]) : null;
            combine(w, v, n, dst);
            return dst;
        }

        @Override
        public float[] gather(int frame, int[] pixelIndices, float[] dst) {
            int n = pixelIndices.length;
            float[] w = weights.gather(frame, pixelIndices, new float[n]);
            float[] v = product ? values.gather(frame, pixelIndices, new float[n]) : null;
            combine(w, v, n, dst);
            return dst;
        }

        private static void combine(float[] w, float[] v, int n, float[] dst) {
            for (int i = 0; i < n; i++) {
                float weight = w[i] > 0 ? w[i] : 0;
                dst[i] = v == null ? weight : weight == 0 ? 0 : weight * v[i];
            }
        }
    }
}
