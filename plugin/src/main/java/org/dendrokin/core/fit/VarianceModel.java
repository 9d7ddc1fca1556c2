package org.dendrokin.core.fit;

import java.util.ArrayList;
import java.util.List;
import java.util.Locale;

import org.dendrokin.core.Checks;
import org.dendrokin.core.kymo.Kymograph;
import org.dendrokin.core.preprocess.Robust;

/**
 * Noise that grows with the signal: the variance of a kymograph sample at position x is
 * <pre>
 *   sigma^2 = s0(x)^2 + g max(L - b, 0)
 * </pre>
 * with s0(x) the baseline noise of the position ({@link NoiseEstimate#perPosition}), L the local signal level, b the
 * baseline level and g (signal units) the photon-noise gain: for photon-limited fluorescence of mean F the variance
 * is a + c F (a Poisson-Gaussian camera; Foi et al. 2008, IEEE Trans Image Process 17:1737), and dividing by F0 (dF/F0)
 * or mapping through a calibration keeps it linear in the signal near its level.
 *
 * <p>g is estimated from the data without a model, so every model is fitted with the same weights (their chi^2 and
 * information criteria stay comparable) and misfit of one model does not pass for noise. The second difference in
 * time d = y_f+1 - 2 y_f + y_f-1 has variance 6 sigma^2 when the noise is independent from frame to frame and the
 * signal changes slowly, and it is uncorrelated with the 3 x 3 mean L around the sample (the mean's weights along the
 * sample's column, 1/9 each, meet d's coefficients 1, -2, 1, which sum to zero). So E[d^2 / 6] = c s0^2 + g' L+
 * (L+ = max(L - b, 0)), fitted to every sample by iteratively reweighted least squares with Var(d^2 / 6) =
 * 2 E[d^2 / 6]^2 (Gaussian noise), leaving out, after the first pass, the squares beyond 25 times their expectation
 * (where the signal turns: fronts, the peak), and without the frames next to the stimulus. The scale c is about 1
 * for noise independent in time and takes up the loss of variance in second differences of noise correlated in time;
 * g = g' / c. Its standard error is the least-squares one inflated for the correlation of neighbouring squares (see
 * {@link #estimate}). g is used only when it exceeds {@value #SIGNIFICANT} standard errors; otherwise the weights are
 * those of the baseline noise alone, exactly as without this model.
 *
 * <p>The weight of a sample uses the mean of its eight neighbours as its level, not the sample itself, so that a
 * sample's own noise does not lower its weight (which would bias the fit downwards).
 */
public final class VarianceModel {
    /** Fewest samples above the baseline noise from which the gain is estimated. */
    static final int MIN_BRIGHT = 50;
    /** Standard errors by which g must exceed zero to be used. */
    static final double SIGNIFICANT = 3;
    /** Second differences beyond this many expected standard deviations are left out of the gain estimate. */
    static final double OUTLIER = 5;

    private final double[] baselineSd;
    private final double baselineLevel;
    private final double gain;
    private final double gainStandardError;
    private final boolean signalDependent;

    private VarianceModel(double[] baselineSd, double baselineLevel, double gain, double gainStandardError) {
        this.baselineSd = baselineSd.clone();
        this.baselineLevel = baselineLevel;
        this.gain = gain;
        this.gainStandardError = gainStandardError;
        this.signalDependent = gain > SIGNIFICANT * gainStandardError && gain > 0;
    }

    /** Baseline noise only (g = 0). */
    public static VarianceModel baselineOnly(double[] baselineSd) {
        return new VarianceModel(baselineSd, 0, 0, Double.NaN);
    }

    /**
     * Estimates g from the kymograph.
     *
     * @param k                  the kymograph. Not modified.
     * @param baselineSd         s0 per position, signal units ({@link NoiseEstimate#perPosition}). Not modified.
     * @param baselineLevel      b, the signal's level before the stimulus, signal units
     * @param firstFrameAfter    first frame at or after the stimulus; it and the frames next to it are left out
     */
    public static VarianceModel estimate(Kymograph k, double[] baselineSd, double baselineLevel, int firstFrameAfter) {
        int nx = k.positionCount();
        int nt = k.frameCount();
        Checks.require(baselineSd.length == nx, "need one baseline noise level per position (" + nx + ")");
        // grid of the samples used: level L+, d^2 and s0^2 at (f, x), NaN where left out
        double[] level = new double[nx * nt];
        double[] d2 = new double[nx * nt];
        double[] s0sq = new double[nx * nt];
        java.util.Arrays.fill(d2, Double.NaN);
        int bright = 0;
        for (int f = 1; f + 1 < nt; f++) {
            if (f >= firstFrameAfter - 1 && f <= firstFrameAfter + 1) {
                continue;
            }
            for (int x = 0; x < nx; x++) {
                double a = k.value(f - 1, x);
                double b = k.value(f, x);
                double c = k.value(f + 1, x);
                double l = blockMean(k, f, x, true) - baselineLevel;
                if (!(Double.isFinite(a) && Double.isFinite(b) && Double.isFinite(c) && Double.isFinite(l)
                        && baselineSd[x] > 0)) {
                    continue;
                }
                double d = c - 2 * b + a;
                int i = f * nx + x;
                level[i] = Math.max(0, l);
                d2[i] = d * d / 6;
                s0sq[i] = baselineSd[x] * baselineSd[x];
                bright += l > baselineSd[x] ? 1 : 0;
            }
        }
        if (bright < MIN_BRIGHT) {
            return new VarianceModel(baselineSd, baselineLevel, 0, Double.NaN);
        }
        // E[d^2] = c s0^2 + g' L; iteratively reweighted least squares (Var d^2 = 2 E[d^2]^2 for Gaussian noise),
        // leaving out second differences beyond 5 expected SDs (where the signal turns)
        double scale = 1;
        double slope = 0;
        double[] cov = null;
        boolean[] kept = new boolean[d2.length];
        for (int pass = 0; pass < 4; pass++) {
            double a11 = 0;
            double a12 = 0;
            double a22 = 0;
            double b1 = 0;
            double b2 = 0;
            for (int i = 0; i < d2.length; i++) {
                double expected = Math.max(scale * s0sq[i] + slope * level[i], 1e-12 * s0sq[i]);
                kept[i] = Double.isFinite(d2[i]) && (pass == 0 || d2[i] <= OUTLIER * OUTLIER * expected);
                if (!kept[i]) {
                    continue;
                }
                double w = 1 / (expected * expected);
                a11 += w * s0sq[i] * s0sq[i];
                a12 += w * s0sq[i] * level[i];
                a22 += w * level[i] * level[i];
                b1 += w * s0sq[i] * d2[i];
                b2 += w * level[i] * d2[i];
            }
            double det = a11 * a22 - a12 * a12;
            if (!(det > 0)) {
                return new VarianceModel(baselineSd, baselineLevel, 0, Double.NaN);
            }
            scale = (a22 * b1 - a12 * b2) / det;
            slope = (a11 * b2 - a12 * b1) / det;
            cov = new double[] {2 * a22 / det, -2 * a12 / det, 2 * a11 / det};
            if (!(scale > 0)) {
                return new VarianceModel(baselineSd, baselineLevel, 0, Double.NaN);
            }
        }
        // Neighbouring second differences share samples (correlation -2/3 a frame apart, so 4/9 between their
        // squares), and interpolated kymographs have noise correlated along the path: the least-squares variance
        // is for independent squares, so it is inflated by 1 + 2 sum of the correlations of the standardized
        // squares at lags 1 and 2 in time and 1 along the path (1.94 for independent noise).
        double inflation = 1 + 2 * (lagCorrelation(d2, level, s0sq, kept, scale, slope, nx, nx)
                + lagCorrelation(d2, level, s0sq, kept, scale, slope, nx, 2 * nx)
                + lagCorrelation(d2, level, s0sq, kept, scale, slope, nx, 1));
        inflation = Math.max(1, inflation);
        // g = g' / c: the gain relative to the baseline variance as the second differences see both
        double g = slope / scale;
        double var = cov[2] / (scale * scale) - 2 * slope * cov[1] / Math.pow(scale, 3)
                + slope * slope * cov[0] / Math.pow(scale, 4);
        return new VarianceModel(baselineSd, baselineLevel, g, Math.sqrt(Math.max(0, var * inflation)));
    }

    /**
     * Correlation of u = d^2 / E[d^2] - 1 between samples {@code lag} grid places apart (nx for one frame, 1 for
     * one position, pairs within a frame only for lags below nx).
     */
    private static double lagCorrelation(double[] d2, double[] level, double[] s0sq, boolean[] kept, double scale,
                                         double slope, int nx, int lag) {
        double num = 0;
        double den = 0;
        for (int i = 0; i < d2.length; i++) {
            if (!kept[i]) {
                continue;
            }
            double u = d2[i] / (scale * s0sq[i] + slope * level[i]) - 1;
            den += u * u;
            int j = i + lag;
            if (j < d2.length && kept[j] && (lag >= nx || j / nx == i / nx)) {
                num += u * (d2[j] / (scale * s0sq[j] + slope * level[j]) - 1);
            }
        }
        return den > 0 ? num / den : 0;
    }

    /** Mean of the finite values of the 3 x 3 block around (f, x), with or without the centre; NaN if none. */
    private static double blockMean(Kymograph k, int f, int x, boolean centre) {
        double sum = 0;
        int n = 0;
        for (int df = -1; df <= 1; df++) {
            int ff = f + df;
            if (ff < 0 || ff >= k.frameCount()) {
                continue;
            }
            for (int dx = -1; dx <= 1; dx++) {
                int xx = x + dx;
                if (xx < 0 || xx >= k.positionCount() || (!centre && df == 0 && dx == 0)) {
                    continue;
                }
                double v = k.value(ff, xx);
                if (Double.isFinite(v)) {
                    sum += v;
                    n++;
                }
            }
        }
        return n == 0 ? Double.NaN : sum / n;
    }

    /** The estimated gain g (signal units), whether or not it is used. */
    public double gain() {
        return gain;
    }

    /** Standard error of g (NaN if it could not be estimated). */
    public double gainStandardError() {
        return gainStandardError;
    }

    /** True if g exceeds twice its standard error and the weights use it. */
    public boolean signalDependent() {
        return signalDependent;
    }

    /** s0 per position, signal units. */
    public double[] baselineSd() {
        return baselineSd.clone();
    }

    /**
     * The fit data of the kymograph with this model's sigmas: s0 of the position alone when the noise does not
     * depend on the signal (exactly the baseline weights), else sqrt(s0^2 + g max(L - b, 0)) with L the mean of the
     * sample's finite neighbours.
     *
     * @param k the kymograph the model was estimated on. Not modified.
     */
    public FitData fitData(Kymograph k) {
        if (!signalDependent) {
            return FitData.of(k, baselineSd);
        }
        int nx = k.positionCount();
        double[] sigma = new double[nx * k.frameCount()];
        for (int f = 0; f < k.frameCount(); f++) {
            for (int x = 0; x < nx; x++) {
                double level = blockMean(k, f, x, false) - baselineLevel;
                double extra = Double.isFinite(level) ? gain * Math.max(0, level) : 0;
                sigma[f * nx + x] = Math.sqrt(baselineSd[x] * baselineSd[x] + extra);
            }
        }
        return FitData.ofSamples(k, sigma);
    }

    /** A plain sentence on the weights, for the results. */
    public String describe() {
        double median = Robust.median(baselineSd);
        if (signalDependent) {
            return String.format(Locale.ROOT, "weights from the noise variance s0^2 + g x signal: s0 from the baseline "
                    + "frames (median %.3g), g = %.3g +- %.2g estimated from the data (noise grows with the signal)",
                    median, gain, gainStandardError);
        }
        if (Double.isFinite(gainStandardError)) {
            return String.format(Locale.ROOT, "weights from the baseline noise (median %.3g): the noise does not grow "
                    + "measurably with the signal (g = %.2g +- %.2g)", median, gain, gainStandardError);
        }
        return String.format(Locale.ROOT, "weights from the baseline noise (median %.3g)", median);
    }

    @Override
    public String toString() {
        return describe();
    }
}
