package org.dendrokin.core.preprocess;

import java.util.ArrayList;
import java.util.List;
import java.util.Locale;

import org.dendrokin.core.kymo.Kymograph;
import org.dendrokin.core.spread.Estimate;
import org.dendrokin.core.units.Unit;

/**
 * Photobleaching correction by a single exponential fitted to the signal outside the response.
 *
 * <p>Model (sheet s9): after background subtraction the signal that bleaches is S(x, t) b(t) with
 * b(t) = exp(-t / tau), b(0) = 1; the corrected signal is S_corr = S / b(t). The offset that does not bleach
 * is the background, already removed, so the fit has no offset term.
 *
 * <p>Which samples are fitted. Each position is first divided by its own baseline median, so that all
 * positions start near 1. A position responds when, after the stimulus, its 15-frame moving average rises
 * above 1 + 3 standard deviations of that average (noise from the baseline frames). Because a spreading signal
 * reaches farther than it can be detected, the excluded stretch is widened on each side by half the number of
 * responding positions (at least two). The bleach trace is the mean of the normalised signal over all positions in the
 * baseline frames and over the quiet (non-responding) positions after the stimulus. That trace is fitted by
 * {@link ExponentialFit} as A exp(-t / tau) with t the frame time. If every position responds, only the
 * baseline frames are fitted, and a warning says so. A rate whose 95% interval includes zero, or a rising
 * signal, is reported and not corrected.
 */
public final class BleachCorrection {
    private static final int MARGIN = 2;
    private static final int SMOOTH_HALF = 7;
    /** Residual RMS of the bleaching fit, in frame-to-frame noise, above which its shape is called wrong. */
    static final double SHAPE_RATIO = 3.0;
    /** Lag-1 correlation of those residuals above which they are called systematic. */
    static final double SHAPE_CORRELATION = 0.5;
    /** Largest residual, as a fraction of the normalised trace (1 at baseline), that matters. */
    static final double SHAPE_SIZE = 0.01;

    private BleachCorrection() {
    }

    /**
     * @param corrected    the corrected intensity (the input itself when nothing was corrected)
     * @param applied      true when the correction was applied
     * @param timeConstant fitted tau, s, with its 95% interval; null when no fit was possible
     * @param traceTimesS  times of the frames in the bleach trace, s
     * @param trace        the fitted trace (normalised mean of the quiet samples; NaN where no sample)
     * @param fitted       the fitted curve at every frame (NaN when no fit)
     * @param quietPositions number of positions used after the stimulus
     * @param warnings     plain sentences
     * @param fastPhase    the fast phase when the bleaching was corrected as two exponentials ({@code timeConstant}
     *                     is then the slow one's), else null
     */
    public record Result(Kymograph corrected, boolean applied, Estimate timeConstant, double[] traceTimesS,
            double[] trace, double[] fitted, int quietPositions, List<String> warnings, FastPhase fastPhase) {
        /** A result with one exponential (or none). */
        public Result(Kymograph corrected, boolean applied, Estimate timeConstant, double[] traceTimesS,
                      double[] trace, double[] fitted, int quietPositions, List<String> warnings) {
            this(corrected, applied, timeConstant, traceTimesS, trace, fitted, quietPositions, warnings, null);
        }
    }

    /**
     * The fast phase of bleaching in two phases, b(t) = f exp(-t / tau1) + (1 - f) exp(-t / tau2).
     *
     * @param fraction     f, the share of the dye that bleaches fast (dimensionless)
     * @param timeConstant tau1, s, with its 95% interval
     */
    public record FastPhase(double fraction, Estimate timeConstant) {
    }

    /**
     * @param intensity          background-subtracted intensity. Not modified.
     * @param baselineFirst      first baseline frame, inclusive
     * @param baselineLast       last baseline frame, inclusive
     * @param firstResponseFrame first frame at or after the stimulus; {@code frameCount()} when there is none
     */
    public static Result correct(Kymograph intensity, int baselineFirst, int baselineLast, int firstResponseFrame) {
        int nt = intensity.frameCount();
        int nx = intensity.positionCount();
        List<String> warnings = new ArrayList<>();
        double[][] norm = new double[nt][nx];
        double[] noise = new double[nx];
        double[] base = new double[baselineLast - baselineFirst + 1];
        for (int p = 0; p < nx; p++) {
            double[] col = intensity.column(p);
            System.arraycopy(col, baselineFirst, base, 0, base.length);
            double m = Robust.median(base);
            for (int f = 0; f < nt; f++) {
                norm[f][p] = m > 0 ? col[f] / m : Double.NaN;
            }
            for (int f = 0; f < base.length; f++) {
                base[f] = norm[baselineFirst + f][p];
            }
            noise[p] = Robust.madSd(base);
        }
        boolean[] core = new boolean[nx];
        int coreCount = 0;
        for (int p = 0; p < nx && firstResponseFrame < nt; p++) {
            double[] after = new double[nt - firstResponseFrame];
            for (int f = firstResponseFrame; f < nt; f++) {
                after[f - firstResponseFrame] = norm[f][p];
            }
            double[] smooth = Robust.movingAverage(after, SMOOTH_HALF);
            double peak = Double.NEGATIVE_INFINITY;
            for (double v : smooth) {
                peak = Double.isFinite(v) ? Math.max(peak, v) : peak;
            }
            if (peak > 1 + 3 * noise[p] / Math.sqrt(2 * SMOOTH_HALF + 1) || !Double.isFinite(noise[p])) {
                core[p] = true;
                coreCount++;
            }
        }
        // The spreading signal reaches beyond where it is detectable; widen the excluded stretch on each side by
        // half its own length (at least MARGIN positions).
        int margin = Math.max(MARGIN, coreCount / 2);
        boolean[] responding = new boolean[nx];
        for (int p = 0; p < nx; p++) {
            if (core[p]) {
                for (int q = Math.max(0, p - margin); q <= Math.min(nx - 1, p + margin); q++) {
                    responding[q] = true;
                }
            }
        }
        int quiet = 0;
        for (int p = 0; p < nx; p++) {
            quiet += responding[p] ? 0 : 1;
        }
        double[] times = intensity.timesS();
        double[] trace = new double[nt];
        for (int f = 0; f < nt; f++) {
            boolean baseline = f < firstResponseFrame;
            double sum = 0;
            int n = 0;
            for (int p = 0; p < nx; p++) {
                if ((baseline || !responding[p]) && Double.isFinite(norm[f][p])) {
                    sum += norm[f][p];
                    n++;
                }
            }
            trace[f] = n > 0 && (baseline || quiet >= 3) ? sum / n : Double.NaN;
        }
        if (firstResponseFrame < nt && quiet < 3) {
            warnings.add("Every part of the path responded to the stimulus, so the bleaching was estimated from the "
                    + "baseline frames alone; if the baseline is short, the correction is uncertain.");
        }
        double[] fitted = new double[nt];
        java.util.Arrays.fill(fitted, Double.NaN);
        ExponentialFit.Result fit;
        try {
            fit = ExponentialFit.fit(times, trace, times[0]);
        } catch (IllegalArgumentException e) {
            warnings.add("Too few frames without a response to estimate photobleaching; no bleaching correction was "
                    + "applied.");
            return new Result(intensity, false, null, times, trace, fitted, quiet, warnings);
        }
        for (int f = 0; f < nt; f++) {
            fitted[f] = fit.valueAt(times[f], times[0]);
        }
        double[] ci = fit.rateCi95();
        if (!fit.converged() || !(fit.rate() > 0) || !(ci[0] > 0)) {
            warnings.add(String.format(Locale.ROOT, "No significant photobleaching was found (fitted loss rate %.3g 1/s, "
                    + "95%% interval %.3g to %.3g 1/s); no bleaching correction was applied.", fit.rate(), ci[0], ci[1]));
            return new Result(intensity, false, null, times, trace, fitted, quiet, warnings);
        }
        double tau = 1 / fit.rate();
        String shape = shapeMisfit(times, trace, fitted);
        if (shape != null) {
            Result two = twoPhases(intensity, times, trace, quiet, warnings);
            if (two != null) {
                return two;
            }
            warnings.add(shape);
        }
        Estimate estimate = new Estimate(tau, Unit.SECOND.symbol(), 1 / ci[1], 1 / ci[0],
                "Student t on the fitted rate (Jacobian covariance), inverted");
        double duration = times[nt - 1] - times[0];
        if (tau > 20 * duration) {
            warnings.add(String.format(Locale.ROOT, "Photobleaching is slight: the fitted time constant (%.3g s) is far "
                    + "longer than the movie (%.3g s).", tau, duration));
        }
        double[] values = intensity.values();
        for (int f = 0; f < nt; f++) {
            double b = Math.exp(-(times[f] - times[0]) / tau);
            for (int p = 0; p < nx; p++) {
                values[f * nx + p] /= b;
            }
        }
        return new Result(intensity.withValues(values, intensity.signalUnit()), true, estimate, times, trace, fitted,
                quiet, warnings);
    }

    /**
     * Bleaching in a fast and a slow phase, when one exponential missed the trace: the trace fitted as
     * f exp(-t / tau1) + (1 - f) exp(-t / tau2) ({@link ExponentialFit#fitTwo}) and, if that fit converges to two
     * decaying phases whose rates are both clearly above zero and its residuals pass {@link #shapeMisfit}, the
     * intensity divided by it. Null when the two phases do not describe the trace either.
     */
    private static Result twoPhases(Kymograph intensity, double[] times, double[] trace, int quiet,
                                    List<String> warnings) {
        ExponentialFit.TwoPhases two;
        try {
            two = ExponentialFit.fitTwo(times, trace, times[0]);
        } catch (IllegalArgumentException e) {
            return null;
        }
        double lo1 = two.fastRate() - two.tQuantile() * two.fastRateSe();
        double lo2 = two.slowRate() - two.tQuantile() * two.slowRateSe();
        if (!two.converged() || !(lo1 > 0) || !(lo2 > 0)) {
            return null;
        }
        int nt = times.length;
        double[] fitted = new double[nt];
        for (int f = 0; f < nt; f++) {
            fitted[f] = two.valueAt(times[f], times[0]);
        }
        if (shapeMisfit(times, trace, fitted) != null) {
            return null;
        }
        double hi1 = two.fastRate() + two.tQuantile() * two.fastRateSe();
        double hi2 = two.slowRate() + two.tQuantile() * two.slowRateSe();
        String method = "Student t on the fitted rate of a two-exponential fit (Jacobian covariance), inverted";
        Estimate slow = new Estimate(1 / two.slowRate(), Unit.SECOND.symbol(), 1 / hi2, 1 / lo2, method);
        Estimate fast = new Estimate(1 / two.fastRate(), Unit.SECOND.symbol(), 1 / hi1, 1 / lo1, method);
        int nx = intensity.positionCount();
        double[] values = intensity.values();
        for (int f = 0; f < nt; f++) {
            double u = times[f] - times[0];
            double b = two.fastFraction() * Math.exp(-two.fastRate() * u)
                    + (1 - two.fastFraction()) * Math.exp(-two.slowRate() * u);
            for (int p = 0; p < nx; p++) {
                values[f * nx + p] /= b;
            }
        }
        List<String> all = new ArrayList<>(warnings);
        all.add(String.format(Locale.ROOT, "The bleaching has a fast and a slow phase: %.0f%% of the signal fades with "
                + "a time constant of %.3g s and the rest with %.3g s. One exponential missed the trace away from the "
                + "response in a systematic way, so the correction divided by both phases. Even so, treat the decay "
                + "rate k and the decay time with caution: on test movies with a third of the dye bleaching fast, k "
                + "came out about 20%% too high (median) after this correction. Check the bleaching picture.",
                100 * two.fastFraction(),
                fast.value(), slow.value()));
        return new Result(intensity.withValues(values, intensity.signalUnit()), true, slow, times, trace, fitted,
                quiet, all, new FastPhase(two.fastFraction(), fast));
    }

    /**
     * A sentence when the bleaching does not follow the fitted single exponential, else null. The residuals of the
     * fit to the quiet trace are compared with the trace's own frame-to-frame noise (1.4826 times the median
     * absolute deviation of consecutive differences, over sqrt 2, which a smooth trend leaves out): a residual RMS
     * above {@value #SHAPE_RATIO} times that noise, a lag-1 correlation of the residuals above
     * {@value #SHAPE_CORRELATION} and a largest residual above {@value #SHAPE_SIZE} of the trace mean systematic
     * misfit, as two bleaching phases of different speed leave it [common practice: a runs-style check of a fit's
     * residuals]. The correction then leaves a drift in dF/F0 that the decay rate absorbs.
     */
    static String shapeMisfit(double[] times, double[] trace, double[] fitted) {
        List<Double> r = new ArrayList<>();
        List<Double> diffs = new ArrayList<>();
        double previous = Double.NaN;
        for (int f = 0; f < trace.length; f++) {
            if (Double.isFinite(trace[f]) && Double.isFinite(fitted[f])) {
                double res = trace[f] - fitted[f];
                if (Double.isFinite(previous)) {
                    diffs.add(trace[f] - previous);
                }
                r.add(res);
                previous = trace[f];
            } else {
                previous = Double.NaN;
            }
        }
        if (r.size() < 20 || diffs.size() < 10) {
            return null;
        }
        double[] d = diffs.stream().mapToDouble(Double::doubleValue).toArray();
        double noise = Robust.madSd(d) / Math.sqrt(2);
        double ss = 0;
        double lag = 0;
        double largest = 0;
        for (int i = 0; i < r.size(); i++) {
            ss += r.get(i) * r.get(i);
            largest = Math.max(largest, Math.abs(r.get(i)));
            if (i > 0) {
                lag += r.get(i) * r.get(i - 1);
            }
        }
        double rms = Math.sqrt(ss / r.size());
        double correlation = ss > 0 ? lag / ss : 0;
        if (rms > SHAPE_RATIO * noise && correlation > SHAPE_CORRELATION && largest > SHAPE_SIZE) {
            return String.format(Locale.ROOT, "The bleaching does not follow one exponential: the fitted curve misses "
                    + "the mean intensity away from the response by up to %.2g%% in a systematic way (residuals "
                    + "correlated from frame to frame, r = %.2f; %.1f times the frame-to-frame noise), as when the dye "
                    + "bleaches in a fast and a slow phase. The correction leaves a drift in the signal that the fitted "
                    + "decay rate k and the decay time absorb: do not trust them for this movie (a shorter movie, "
                    + "less laser power, or a stable baseline period helps).", 100 * largest, correlation,
                    rms / noise);
        }
        return null;
    }
}
