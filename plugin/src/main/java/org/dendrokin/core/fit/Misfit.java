package org.dendrokin.core.fit;

import java.util.Locale;

import org.dendrokin.core.Checks;
import org.dendrokin.core.kymo.Kymograph;

/**
 * Whether a fitted model leaves structure in its residuals, and which: a lack-of-fit figure with a plain verdict.
 * The residuals are standardised, e = (y - f) / sigma with the fit's own noise level of each position, and only
 * the frames from the stimulus on are read (before it the fits see baseline only).
 *
 * <p>Before the figure is made, the part of each position's residuals proportional to the model's response there
 * is removed (a response a few percent larger or smaller at some positions, from uneven loading or a background or
 * bleaching correction slightly off, leaves the shape of the spread alone). The figure is the lag-1 correlation of
 * e between consecutive frames at the same position,
 * r_t = sum e(f, p) e(f + 1, p) / sum e(f, p)^2. Camera noise is independent from frame to frame, so r_t is near
 * 0 when the model describes the data up to noise; a model that misses a shape leaves residuals that change
 * slowly in time, and r_t approaches 1 (Durbin and Watson 1950 built their test on the same lag-1 correlation).
 * Neighbouring positions share pixels through the band and the interpolation, so the spatial correlation is not
 * used for the verdict, only reported. Three patterns are told apart for the sentence:
 * <ul>
 * <li>stripes along time: the mean residual of each position over the frames after the stimulus explains more
 * than {@value #STRIPE_SHARE} of the residual variance: a position is off for the whole movie, as when the
 * specimen moves or a spine head enters the band;</li>
 * <li>a blob at the stimulus: more than {@value #BLOB_SHARE} of the residual sum of squares lies within
 * {@value #BLOB_UM} um and {@value #BLOB_FRAMES} frames of the stimulus;</li>
 * <li>a band along the front: more than {@value #FRONT_SHARE} of it lies in the tenth of the samples where the
 * model changes fastest in time.</li>
 * </ul>
 *
 * <p>Thresholds: on 24 realistic synthetic movies of the project's own generator (curved spiny dendrite, spine
 * heads with their own signal, blur, uneven loading, Poisson-Gaussian noise, uneven background, bleaching; no
 * motion), fitted by the model that made them, r_t ran from 0.03 to 0.51; with a 0.8 um drift over the movie left
 * uncorrected, or a bright spine head moving into the band, it was above 0.7 ({@code MisfitOnRealisticMoviesTest}),
 * and two bistable fronts fitted by the nagumo model gave 0.6 to 0.7 (the plateau behind a front carries the spine
 * heads' own delays). Residuals with r_t below {@value #STRUCTURE} are called noise-like, from there to
 * {@value #MISFIT} structured (the model is nearly right; the intervals account for it), and from {@value #MISFIT}
 * a misfit: the model does not describe the data, and it takes no part in the model comparison.
 */
public final class Misfit {
    /** r_t from which residuals count as structured. */
    public static final double STRUCTURE = 0.3;
    /** r_t from which a fit counts as a misfit. */
    public static final double MISFIT = 0.7;
    static final double STRIPE_SHARE = 0.1;
    static final double BLOB_SHARE = 0.5;
    static final double BLOB_UM = 3.0;
    static final int BLOB_FRAMES = 10;
    static final double FRONT_SHARE = 0.4;

    /** The verdict. */
    public enum Verdict {
        /** Residuals like noise. */
        NOISE_LIKE("noise-like"),
        /** Some structure: the model is nearly right. */
        STRUCTURED("structured"),
        /** The model does not describe the data. */
        MISFIT("misfit");

        private final String label;

        Verdict(String label) {
            this.label = label;
        }

        /** As written in results.json. */
        public String label() {
            return label;
        }
    }

    /** Where the residual structure lies. */
    public enum Pattern {
        NONE("none", ""),
        STRIPES("stripes along time", "a position stays off for the whole movie: something moved, or a spine head "
                + "entered the band"),
        STIMULUS_BLOB("a blob at the stimulus", "the model misses the start of the response at the stimulated site "
                + "(its width or timing)"),
        FRONT_BAND("a band along the front", "the model misses the shape or speed of the spreading front"),
        GENERAL("structure spread over the kymograph", "the response has a shape the model does not have");

        private final String label;
        private final String meaning;

        Pattern(String label, String meaning) {
            this.label = label;
            this.meaning = meaning;
        }

        /** As written in results.json. */
        public String label() {
            return label;
        }

        /** What the pattern usually means, for the sentence. */
        public String meaning() {
            return meaning;
        }
    }

    /**
     * The lack of fit of one model.
     *
     * @param temporalCorrelation r_t, the figure the verdict rests on
     * @param spatialCorrelation  the same between neighbouring positions (for information)
     * @param chiSquarePerPoint   mean e^2 over the frames from the stimulus on (1 for residuals at the noise level)
     * @param stripeShare         share of the residual variance in the positions' mean residuals
     * @param blobShare           share of the residual sum of squares near the stimulus
     * @param frontShare          share of it where the model changes fastest
     * @param verdict             noise-like, structured or misfit
     * @param pattern             where the structure lies (NONE for noise-like residuals)
     */
    public record Result(double temporalCorrelation, double spatialCorrelation, double chiSquarePerPoint,
                         double stripeShare, double blobShare, double frontShare, Verdict verdict, Pattern pattern) {
        /** The threshold of the verdict's figure: from it on, a misfit. */
        public double threshold() {
            return MISFIT;
        }

        /** One sentence for the report, naming the model. */
        public String sentence(String model) {
            String figure = String.format(Locale.ROOT, "correlation of the residuals between frames %.2f",
                    temporalCorrelation);
            return switch (verdict) {
                case NOISE_LIKE -> String.format(Locale.ROOT, "The %s residuals look like noise (%s, below %.1f).",
                        model, figure, STRUCTURE);
                case STRUCTURED -> String.format(Locale.ROOT, "The %s residuals show some structure (%s; %s): the "
                        + "model is only nearly right, and its intervals allow for that.", model, figure,
                        pattern.label());
                case MISFIT -> String.format(Locale.ROOT, "The %s model does not describe these data: its residuals "
                        + "show %s (%s, misfit from %.1f); %s.", model, pattern.label(), figure, MISFIT,
                        pattern.meaning());
            };
        }
    }

    private Misfit() {
    }

    /**
     * Measures the residual structure of one fit.
     *
     * @param k             the data. Not modified.
     * @param fitted        the model's prediction at every sample, row-major as {@code k}. Not modified.
     * @param sigma         noise standard deviation of each position (length {@code k.positionCount()}).
     *                      Not modified.
     * @param firstFrame    first frame at or after the stimulus
     * @param stimulusUm    stimulus position, um along the path
     */
    public static Result of(Kymograph k, double[] fitted, double[] sigma, int firstFrame, double stimulusUm) {
        int nx = k.positionCount();
        int nt = k.frameCount();
        Checks.require(fitted.length == nx * nt, "one fitted value per sample is needed");
        Checks.require(sigma.length == nx, "one noise level per position is needed");
        double[] e = new double[nx * nt];
        for (int f = 0; f < nt; f++) {
            for (int p = 0; p < nx; p++) {
                int i = f * nx + p;
                e[i] = f >= firstFrame ? (k.value(f, p) - fitted[i]) / sigma[p] : Double.NaN;
            }
        }
        double rawStripe = stripeShare(e, nx, nt, firstFrame);
        removeGains(e, fitted, nx, nt, firstFrame);
        double sum2 = 0;
        double lagT = 0;
        double normT = 0;
        double lagX = 0;
        double normX = 0;
        long n = 0;
        double dx = k.distanceStepUm();
        double blob = 0;
        for (int f = firstFrame; f < nt; f++) {
            for (int p = 0; p < nx; p++) {
                double v = e[f * nx + p];
                if (!Double.isFinite(v)) {
                    continue;
                }
                sum2 += v * v;
                n++;
                if (f + 1 < nt && Double.isFinite(e[(f + 1) * nx + p])) {
                    lagT += v * e[(f + 1) * nx + p];
                    normT += v * v;
                }
                if (p + 1 < nx && Double.isFinite(e[f * nx + p + 1])) {
                    lagX += v * e[f * nx + p + 1];
                    normX += v * v;
                }
                if (f - firstFrame < BLOB_FRAMES && Math.abs(k.distanceUm(p) - stimulusUm) <= BLOB_UM + dx / 2) {
                    blob += v * v;
                }
            }
        }
        if (n < 2 || !(sum2 > 0)) {
            return new Result(Double.NaN, Double.NaN, Double.NaN, Double.NaN, Double.NaN, Double.NaN,
                    Verdict.NOISE_LIKE, Pattern.NONE);
        }
        double rT = normT > 0 ? lagT / normT : Double.NaN;
        double rX = normX > 0 ? lagX / normX : Double.NaN;
        double stripeShare = rawStripe;
        double blobShare = blob / sum2;
        double frontShare = frontShare(k, fitted, e, firstFrame, sum2);
        Verdict verdict = !(rT >= STRUCTURE) ? Verdict.NOISE_LIKE : rT < MISFIT ? Verdict.STRUCTURED : Verdict.MISFIT;
        Pattern pattern = Pattern.NONE;
        if (verdict != Verdict.NOISE_LIKE) {
            pattern = stripeShare > STRIPE_SHARE ? Pattern.STRIPES : blobShare > BLOB_SHARE ? Pattern.STIMULUS_BLOB
                    : frontShare > FRONT_SHARE ? Pattern.FRONT_BAND : Pattern.GENERAL;
        }
        return new Result(rT, rX, sum2 / n, stripeShare, blobShare, frontShare, verdict, pattern);
    }

    /**
     * Share of the residual sum of squares (frames from {@code firstFrame} on) in the positions' mean residuals: a
     * position that stays off for the whole movie. Measured before any gain is removed, since a spine or a drift
     * that adds light to a position also changes its response.
     */
    private static double stripeShare(double[] e, int nx, int nt, int firstFrame) {
        double total = 0;
        double stripe = 0;
        for (int p = 0; p < nx; p++) {
            double sum = 0;
            int n = 0;
            for (int f = firstFrame; f < nt; f++) {
                double v = e[f * nx + p];
                if (Double.isFinite(v)) {
                    sum += v;
                    total += v * v;
                    n++;
                }
            }
            if (n > 0) {
                stripe += sum * sum / n;
            }
        }
        return total > 0 ? stripe / total : Double.NaN;
    }

    /**
     * Removes from each position's residuals the part proportional to the model's response there: a position whose
     * response is a few percent larger or smaller than the model's throughout (uneven loading, a background or
     * bleaching slightly off, a spine in the band) is not a different shape of the spread. The response is the
     * fitted value minus its mean before the stimulus; the gain is the least-squares slope through the origin.
     * Modifies {@code e}.
     */
    private static void removeGains(double[] e, double[] fitted, int nx, int nt, int firstFrame) {
        for (int p = 0; p < nx; p++) {
            double rest = 0;
            for (int f = 0; f < firstFrame; f++) {
                rest += fitted[f * nx + p];
            }
            rest = firstFrame > 0 ? rest / firstFrame : 0;
            double sxy = 0;
            double sxx = 0;
            for (int f = firstFrame; f < nt; f++) {
                double v = e[f * nx + p];
                double r = fitted[f * nx + p] - rest;
                if (Double.isFinite(v)) {
                    sxy += v * r;
                    sxx += r * r;
                }
            }
            if (sxx > 0) {
                double gain = sxy / sxx;
                for (int f = firstFrame; f < nt; f++) {
                    e[f * nx + p] -= gain * (fitted[f * nx + p] - rest);
                }
            }
        }
    }

    /** Share of the residual sum of squares in the tenth of the samples where the model changes fastest in time. */
    private static double frontShare(Kymograph k, double[] fitted, double[] e, int firstFrame, double sum2) {
        int nx = k.positionCount();
        int nt = k.frameCount();
        int count = Math.max(0, (nt - 1 - firstFrame) * nx);
        if (count == 0) {
            return Double.NaN;
        }
        double[] rate = new double[count];
        double[] energy = new double[count];
        int i = 0;
        for (int f = firstFrame; f + 1 < nt; f++) {
            for (int p = 0; p < nx; p++) {
                double v = e[f * nx + p];
                rate[i] = Math.abs(fitted[(f + 1) * nx + p] - fitted[f * nx + p]);
                energy[i] = Double.isFinite(v) ? v * v : 0;
                i++;
            }
        }
        double[] sorted = rate.clone();
        java.util.Arrays.sort(sorted);
        double cut = sorted[(int) Math.floor(0.9 * (sorted.length - 1))];
        double inBand = 0;
        for (int j = 0; j < count; j++) {
            if (rate[j] > cut) {
                inBand += energy[j];
            }
        }
        return inBand / sum2;
    }
}
