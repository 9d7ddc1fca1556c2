package org.dendrokin.core.spread;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Locale;

import org.apache.commons.math3.distribution.NormalDistribution;
import org.apache.commons.math3.fitting.GaussianCurveFitter;
import org.apache.commons.math3.fitting.WeightedObservedPoints;
import org.apache.commons.math3.stat.regression.SimpleRegression;
import org.dendrokin.core.Checks;
import org.dendrokin.core.kymo.Kymograph;
import org.dendrokin.core.preprocess.ExponentialFit;
import org.dendrokin.core.preprocess.Robust;
import org.dendrokin.core.units.Unit;

/**
 * Model-free measures of how a signal spreads from a stimulus along the dendrite, read off a kymograph whose
 * baseline is zero (dF/F0, or a calibrated concentration change). None of them assumes a model; each comes
 * with a 95% interval or is null with the reason among the warnings.
 *
 * <ul>
 * <li>Front arrival: at each position, the time after the stimulus at which the signal (3-frame centred moving
 * average) first reaches half of its own peak, interpolated linearly between frames. Positions whose peak is
 * below 4 noise standard deviations of that average, or below a tenth of the largest peak, are left out.</li>
 * <li>Front speed, only where the arrival times show a front of constant speed: arrival must grow with
 * distance, the arrivals must spread over more than two frames, and they must not slow down as passive diffusion
 * does (under diffusion the arrival time grows with the square of the distance, Crank 1975, sheet s2.5; tested by
 * the speeds over the nearer and farther half of the positions and by which of a line in distance or in distance
 * squared fits the arrivals better). The speed is the Theil-Sen slope of distance from the stimulus against
 * arrival time (um/s), with Sen's rank interval ({@link TheilSen}), both sides of the stimulus pooled by absolute
 * distance; each side also gets its own.</li>
 * <li>Peak decay length: the peak amplitude P(d) at distance d fitted as P0 exp(-d / L) by least squares on
 * ln P (Commons Math {@link SimpleRegression}); the interval is the slope's Student t interval, mapped through
 * L = -1 / slope. For a brief release the peak also falls because the signal dilutes as it spreads, so L is
 * shorter than the length constant sqrt(D / k) of a reaction-diffusion model except far from the stimulus; the
 * name length constant is kept for sqrt(D / k) of a fitted model.</li>
 * <li>Decay time: the integrated signal I(t) = sum over positions of signal times the position step (um times
 * signal unit), from its peak to the end of the movie, fitted as A exp(-(t - t_peak) / tau) by
 * {@link ExponentialFit}. Under diffusion with first-order decay and sealed ends, I(t) is M exp(-k t) exactly,
 * so tau = 1/k (Crank 1975, sheet s2.3).</li>
 * <li>Apparent D: the spatial variance of the profile grows as s0^2 + 2 D t under diffusion (Einstein 1905;
 * Crank 1975, sheet s2.2, s2.5). Each frame's variance is measured by a Gaussian fitted to the profile within a
 * window symmetric about the stimulus (Commons Math {@link GaussianCurveFitter}), because the raw second moment
 * weights the noise in the tails by the squared distance. D is half the least-squares slope of variance against
 * time over the consecutive frames, from the stimulus on, whose summed signal is above 30% of its peak and ten
 * noise standard deviations, and whose fitted three standard deviations stay inside the window. The time
 * window used is reported. For a profile that is not Gaussian, this is the variance of the closest
 * Gaussian.</li>
 * </ul>
 */
public final class SpreadAnalysis {
    /** Frames at the end of the movie within which a position that first nears its peak may still be rising. */
    static final int END_FRAMES = 3;
    /** Share of the signal beyond the path's ends, at the end of the movie, above which the decay time is flagged. */
    static final double LEAKAGE_WARNING = 0.02;

    private SpreadAnalysis() {
    }

    /**
     * Everything measured.
     *
     * @param frontSpeed       um/s, or null when no constant-speed front is seen ({@code front} says why)
     * @param peakDecayLength  e-fold distance of the peak amplitude from the stimulus, um, or null
     * @param decayTime        s, or null
     * @param apparentD        um^2/s, or null
     * @param arrivalDistanceUm signed distance from the stimulus of each position with an arrival time
     * @param arrivalTimeS     arrival time after the stimulus, s (same length)
     * @param peakDistanceUm   signed distance from the stimulus of each position used for the peak decay length
     * @param peakAmplitude    peak signal at those positions (signal unit)
     * @param timesS           frame times after the stimulus, s (relative to the stimulus)
     * @param integrated       integrated signal at those times, um times signal unit
     * @param integratedFit    fitted decay curve at those times (NaN where not fitted)
     * @param variance         spatial variance of the profile at those times, um^2 (NaN outside the window)
     * @param varianceWindowS  {first, last} time after the stimulus used for the apparent D, s, or null
     * @param lines            for drawing the fitted lines: {front intercept (um at arrival 0), peak amplitude at
     *                         distance 0 (signal unit), variance intercept (um^2 at time 0)}; NaN where not fitted
     * @param front            whether the arrival times show a front of constant speed, and the speed on each side
     * @param warnings         plain sentences
     */
    public record Result(Estimate frontSpeed, Estimate peakDecayLength, Estimate decayTime, Estimate apparentD,
            double[] arrivalDistanceUm, double[] arrivalTimeS, double[] peakDistanceUm, double[] peakAmplitude,
            double[] timesS, double[] integrated, double[] integratedFit, double[] variance, double[] varianceWindowS,
            double[] lines, Front front, List<String> warnings) {
    }

    /** What the arrival times show. */
    public enum FrontVerdict {
        /** A front of constant speed. */
        FRONT("a front of constant speed"),
        /** Too few responding positions, or too short a stretch, to follow a front. */
        TOO_FEW_POSITIONS("too few positions to follow a front"),
        /** Arrival does not grow with distance. */
        NO_INCREASE("arrival does not grow with distance"),
        /** Every position responds within about two frames. */
        SIMULTANEOUS("near-simultaneous arrival"),
        /** Arrival grows with the square of the distance. */
        DIFFUSIVE("diffusive spread: arrival grows with distance squared"),
        /** The peak falls off steeply with distance: a decaying spread rather than a front of constant shape. */
        DECREMENTAL("the peak falls off with distance: no front of constant shape");

        private final String phrase;

        FrontVerdict(String phrase) {
            this.phrase = phrase;
        }

        /** A few words for a table cell or a terminal line. */
        public String phrase() {
            return phrase;
        }
    }

    /**
     * What the arrival times say about a front.
     *
     * @param verdict        what the arrival times show
     * @param reason         why there is no front speed, one sentence without its full stop (empty for a front)
     * @param nearSpeedUmPerS Theil-Sen speed over the nearer half of the positions, um/s, or NaN
     * @param farSpeedUmPerS  Theil-Sen speed over the farther half, um/s, or NaN
     * @param left           front speed on the side of smaller distances along the path, or null
     * @param right          front speed on the side of larger distances, or null
     */
    public record Front(FrontVerdict verdict, String reason, double nearSpeedUmPerS, double farSpeedUmPerS,
                        Estimate left, Estimate right) {
        /** True when the arrival times show a front of constant speed. */
        public boolean present() {
            return verdict == FrontVerdict.FRONT;
        }

        /** No front, for the given reason. */
        public static Front absent(FrontVerdict verdict, String reason) {
            return new Front(verdict, reason, Double.NaN, Double.NaN, null, null);
        }
    }

    /**
     * @param signal     kymograph with a zero baseline (dF/F0 or concentration change). Not modified.
     * @param stimulusTimeS     stimulus time, s
     * @param stimulusPositionUm stimulus position, um along the path
     * @param noiseSd    typical standard deviation of one sample of the signal at baseline (signal unit)
     */
    public static Result measure(Kymograph signal, double stimulusTimeS, double stimulusPositionUm, double noiseSd) {
        Checks.finite(stimulusTimeS, "stimulus time");
        Checks.finite(stimulusPositionUm, "stimulus position");
        List<String> warnings = new ArrayList<>();
        int nt = signal.frameCount();
        int nx = signal.positionCount();
        double dx = signal.distanceStepUm();
        double dt = signal.timeStepS();
        String unit = signal.signalUnit();
        int first = signal.firstFrameAtOrAfter(stimulusTimeS);
        int after = nt - first;
        double[] relTimes = new double[Math.max(0, after)];
        for (int f = first; f < nt; f++) {
            relTimes[f - first] = signal.timeS(f) - stimulusTimeS;
        }
        double[] empty = new double[0];
        if (after < 4 || nx < 3) {
            warnings.add(String.format(Locale.ROOT, "Only %d frames after the stimulus and %d positions: too few to "
                    + "measure the spread.", after, nx));
            double[] nan = nanArray(relTimes.length);
            return new Result(null, null, null, null, empty, empty, empty, empty, relTimes, nan, nan, nan, null,
                    nanArray(3), Front.absent(FrontVerdict.TOO_FEW_POSITIONS, "too few frames or positions"), warnings);
        }
        double noise = Double.isFinite(noiseSd) && noiseSd > 0 ? noiseSd : 0;

        // Peaks and arrival times, position by position.
        double[] peak = new double[nx];
        double[][] smooth = new double[nx][];
        double globalPeak = 0;
        for (int p = 0; p < nx; p++) {
            double[] col = signal.column(p);
            smooth[p] = Robust.movingAverage(col, 1);
            peak[p] = Double.NaN;
            for (int f = first; f < nt; f++) {
                if (Double.isFinite(smooth[p][f]) && !(smooth[p][f] <= peak[p])) {
                    peak[p] = smooth[p][f];
                }
            }
            if (peak[p] > globalPeak) {
                globalPeak = peak[p];
            }
        }
        double threshold = Math.max(4 * noise / Math.sqrt(3), 0.1 * globalPeak);
        boolean[] responds = new boolean[nx];
        List<double[]> arrivals = new ArrayList<>();
        List<double[]> peaks = new ArrayList<>();
        int rising = 0;
        for (int p = 0; p < nx; p++) {
            if (!(peak[p] > threshold) || !(globalPeak > 0)) {
                continue;
            }
            responds[p] = true;
            if (stillRising(smooth[p], first, peak[p])) {
                rising++;
                continue;
            }
            double d = signal.distanceUm(p) - stimulusPositionUm;
            peaks.add(new double[] {d, peak[p]});
            double half = peak[p] / 2;
            for (int f = first; f < nt; f++) {
                if (smooth[p][f] >= half) {
                    double t;
                    double prev = f > 0 ? smooth[p][f - 1] : Double.NaN;
                    if (f > 0 && Double.isFinite(prev) && prev < half) {
                        t = signal.timeS(f - 1) + (half - prev) / (smooth[p][f] - prev) * dt;
                    } else {
                        t = signal.timeS(f);
                    }
                    // a raster scan samples each position later than its frame's time
                    t += signal.sampleDelayS(p);
                    arrivals.add(new double[] {d, Math.max(0, t - stimulusTimeS), peak[p]});
                    break;
                }
            }
        }
        double[] arrD = column(arrivals, 0);
        double[] arrT = column(arrivals, 1);
        double[] pkD = column(peaks, 0);
        double[] pkA = column(peaks, 1);
        if (!(globalPeak > 4 * noise / Math.sqrt(3))) {
            warnings.add("No response stands out from the noise after the stimulus; the spread measures are not "
                    + "available.");
            double[] nan = nanArray(relTimes.length);
            return new Result(null, null, null, null, arrD, arrT, pkD, pkA, relTimes, nan, nan, nan, null, nanArray(3),
                    Front.absent(FrontVerdict.TOO_FEW_POSITIONS, "no response stands out from the noise"), warnings);
        }

        if (rising > 0) {
            warnings.add(String.format(Locale.ROOT, "At %d responding position%s the signal was still rising at the end "
                    + "of the movie, so %s peak and arrival time are not known; %s left out of the front and the peak "
                    + "decay length.", rising, rising == 1 ? "" : "s", rising == 1 ? "its" : "their",
                    rising == 1 ? "it was" : "they were"));
        }
        double[] lines = nanArray(3);
        // Positions that had responded by the first frame after the stimulus were reached by the stimulus itself,
        // not by a spread: they say nothing about a front.
        double initial = signal.timeS(first) - stimulusTimeS + 1e-9 * Math.max(1, dt);
        List<double[]> spreading = arrivals.stream().filter(a -> a[1] > initial).toList();
        double[] sprD = column(spreading, 0);
        double[] sprT = column(spreading, 1);
        Front front = Fronts.decide(sprD, sprT, column(spreading, 2), arrivals.size(), dx, dt,
                relTimes[relTimes.length - 1], warnings);
        Estimate speed = front.present() ? Fronts.speed(sprD, sprT, lines) : null;
        if (speed != null && (responds[0] || responds[nx - 1])) {
            double reach = 0;
            for (double d : sprD) {
                reach = Math.max(reach, Math.abs(d));
            }
            warnings.add(String.format(Locale.ROOT, "The response reached the end of the path, so the front was "
                    + "followed over only %.3g um. A front read off a short stretch is biased: near the stimulus it is "
                    + "still leaving the stimulated site, and it can speed up near a sealed end.", reach));
        } else if (speed != null && sprD.length < 10) {
            warnings.add(String.format(Locale.ROOT, "The front was followed at only %d positions; its speed is "
                    + "uncertain and may be biased by the stimulated site itself.", sprD.length));
        }
        Estimate lambda = peakDecayLength(pkD, pkA, lines, warnings);

        // Integrated signal and its decay.
        double[] integrated = new double[after];
        boolean[] usable = new boolean[nx];
        for (int p = 0; p < nx; p++) {
            usable[p] = true;
            for (int f = first; f < nt; f++) {
                usable[p] &= Double.isFinite(signal.value(f, p));
            }
        }
        for (int f = first; f < nt; f++) {
            double s = 0;
            for (int p = 0; p < nx; p++) {
                s += usable[p] ? signal.value(f, p) * dx : 0;
            }
            integrated[f - first] = s;
        }
        double[] integratedFit = nanArray(after);
        Estimate decay = decayTime(relTimes, integrated, integratedFit, unit, warnings);
        if (decay != null && (responds[0] || responds[nx - 1])) {
            warnings.add("The signal reached an end of the path, so the summed signal also falls as it leaves the "
                    + "path; the decay time is then shorter than the signal's own decay time.");
        }

        double[] variance = nanArray(after);
        double[] window = new double[2];
        Estimate d = apparentD(signal, first, stimulusPositionUm, noise, variance, relTimes, window, lines, warnings);
        if (decay != null && d != null && !(responds[0] || responds[nx - 1])) {
            leakageWarning(signal, stimulusPositionUm, d.value(), lines[2], relTimes[relTimes.length - 1], decay,
                    warnings);
        }
        return new Result(speed, lambda, decay, d, arrD, arrT, pkD, pkA, relTimes, integrated, integratedFit, variance,
                d == null ? null : window, lines, front, warnings);
    }

    /**
     * True when a position's signal first came within 10% of its largest value in the last {@value #END_FRAMES}
     * frames: it may still have been rising when the movie ended, so its peak and its arrival time at half of the
     * peak are not known.
     */
    private static boolean stillRising(double[] smooth, int first, double peak) {
        int n = smooth.length;
        for (int f = first; f < n; f++) {
            if (smooth[f] >= 0.9 * peak) {
                return f >= n - END_FRAMES;
            }
        }
        return true;
    }

    private static Estimate peakDecayLength(double[] distance, double[] peak, double[] lines, List<String> warnings) {
        SimpleRegression reg = new SimpleRegression();
        for (int i = 0; i < distance.length; i++) {
            if (peak[i] > 0) {
                reg.addData(Math.abs(distance[i]), Math.log(peak[i]));
            }
        }
        if (reg.getN() < 4) {
            warnings.add("The peak decay length is not available: the response was seen at fewer than 4 positions.");
            return null;
        }
        double slope = reg.getSlope();
        if (!(slope < 0)) {
            warnings.add("The peak decay length is not available: the peak does not fall off with distance from the "
                    + "stimulus.");
            return null;
        }
        lines[1] = Math.exp(reg.getIntercept());
        double half = reg.getSlopeConfidenceInterval(0.05);
        double lo = -1 / (slope - half);
        double hi = slope + half < 0 ? -1 / (slope + half) : Double.POSITIVE_INFINITY;
        Estimate e = new Estimate(-1 / slope, Unit.MICROMETRE.symbol(), lo, hi,
                "Student t on the slope of ln(peak) against distance, mapped to -1/slope");
        if (e.isVague()) {
            warnings.add("The peak decay length is poorly determined: its 95% interval is wider than the value.");
        }
        return e;
    }

    private static Estimate decayTime(double[] t, double[] integrated, double[] fitOut, String unit,
            List<String> warnings) {
        int peakAt = 0;
        for (int i = 1; i < integrated.length; i++) {
            if (integrated[i] > integrated[peakAt]) {
                peakAt = i;
            }
        }
        int n = integrated.length - peakAt;
        if (n < 4) {
            warnings.add("The decay time is not available: the integrated signal peaks too close to the end of the "
                    + "movie.");
            return null;
        }
        double[] tt = Arrays.copyOfRange(t, peakAt, t.length);
        double[] yy = Arrays.copyOfRange(integrated, peakAt, integrated.length);
        ExponentialFit.Result fit = ExponentialFit.fit(tt, yy, t[peakAt]);
        double[] ci = fit.rateCi95();
        if (!fit.converged() || !(fit.rate() > 0)) {
            warnings.add("The decay time is not available: the integrated signal does not decay within the movie.");
            return null;
        }
        for (int i = peakAt; i < t.length; i++) {
            fitOut[i] = fit.valueAt(t[i], t[peakAt]);
        }
        double tau = 1 / fit.rate();
        double hi = ci[0] > 0 ? 1 / ci[0] : Double.POSITIVE_INFINITY;
        double observed = t[t.length - 1] - t[peakAt];
        if (tau > observed) {
            warnings.add(String.format(Locale.ROOT, "The decay time (%.3g s) is longer than the part of the movie after "
                    + "the peak (%.3g s), so it is an extrapolation.", tau, observed));
        }
        return new Estimate(tau, Unit.SECOND.symbol(), 1 / ci[1], hi,
                "Student t on the fitted rate (Jacobian covariance), inverted");
    }

    /**
     * Warns when a diffusing signal spreads beyond the ends of the path within the movie, which makes the summed
     * signal fall faster than the signal itself. The share outside is that of a Gaussian centred on the stimulus
     * with variance s0^2 + 2 D t from the apparent D (Crank 1975, sheet s2.2): Phi((x_first - x0) / s) +
     * 1 - Phi((x_last - x0) / s) at the last frame.
     */
    private static void leakageWarning(Kymograph k, double x0, double dUm2PerS, double variance0, double lastTimeS,
                                       Estimate decay, List<String> warnings) {
        double var = Math.max(variance0, 0) + 2 * dUm2PerS * lastTimeS;
        if (!(var > 0)) {
            return;
        }
        double s = Math.sqrt(var);
        NormalDistribution normal = new NormalDistribution(null, 0, 1);
        double outside = normal.cumulativeProbability((k.distanceUm(0) - x0) / s)
                + 1 - normal.cumulativeProbability((k.distanceUm(k.positionCount() - 1) - x0) / s);
        if (outside > LEAKAGE_WARNING) {
            warnings.add(String.format(Locale.ROOT, "By the end of the movie about %.0f%% of the signal has spread "
                    + "beyond the ends of the path (estimated from the apparent D of %.3g um^2/s). The summed signal "
                    + "then falls also because signal leaves the path, so the decay time (%.3g s) is shorter than the "
                    + "signal's own; a model fitted with open ends (diffusion-decay) accounts for this.", 100 * outside,
                    dUm2PerS, decay.value()));
        }
    }

    private static Estimate apparentD(Kymograph k, int first, double x0, double noise, double[] varianceOut,
            double[] relTimes, double[] window, double[] lines, List<String> warnings) {
        int nx = k.positionCount();
        double dx = k.distanceStepUm();
        double half = Math.min(x0 - k.distanceUm(0), k.distanceUm(nx - 1) - x0);
        if (half < 3 * dx) {
            warnings.add("The apparent D is not available: the stimulus lies too close to an end of the path for a "
                    + "symmetric window.");
            return null;
        }
        double[] mass = new double[relTimes.length];
        double massMax = 0;
        int n = 0;
        for (int f = first; f < k.frameCount(); f++) {
            double m0 = 0;
            int used = 0;
            for (int p = 0; p < nx; p++) {
                double v = k.value(f, p);
                if (Math.abs(k.distanceUm(p) - x0) <= half && Double.isFinite(v)) {
                    m0 += v;
                    used++;
                }
            }
            n = Math.max(n, used);
            mass[f - first] = m0 * dx;
            massMax = Math.max(massMax, m0 * dx);
        }
        double massNoise = noise * dx * Math.sqrt(Math.max(1, n));
        SimpleRegression reg = new SimpleRegression();
        int start = -1;
        int end = -1;
        double sigma = Math.max(2 * dx, 1e-9);
        Arrays.fill(varianceOut, Double.NaN);
        for (int i = 0; i < relTimes.length; i++) {
            int f = first + i;
            boolean ok = mass[i] > 0.3 * massMax && mass[i] > 10 * massNoise;
            double var = Double.NaN;
            if (ok) {
                double[] fitted = gaussian(k, f, x0, half, sigma);
                var = fitted == null ? Double.NaN : fitted[2] * fitted[2];
                ok = fitted != null && 3 * fitted[2] < half && Math.abs(fitted[1] - x0) < half / 2;
                if (ok) {
                    sigma = fitted[2];
                }
            }
            if (ok) {
                if (start < 0) {
                    start = i;
                }
                end = i;
                varianceOut[i] = var;
                reg.addData(relTimes[i], var);
            } else if (start >= 0) {
                break;
            }
        }
        if (reg.getN() < 4) {
            warnings.add("The apparent D is not available: fewer than 4 frames have a profile clear of the noise and "
                    + "inside the path.");
            return null;
        }
        window[0] = relTimes[start];
        window[1] = relTimes[end];
        double slope = reg.getSlope();
        lines[2] = reg.getIntercept();
        double ci = reg.getSlopeConfidenceInterval(0.05);
        if (!(slope > 0)) {
            warnings.add("The apparent D is not available: the profile does not widen over time.");
            return null;
        }
        return new Estimate(slope / 2, Unit.DIFFUSION.symbol(), Math.max(0, (slope - ci) / 2), (slope + ci) / 2,
                "Student t on the least-squares slope of the profile variance against time");
    }

    /**
     * Fits one frame's profile within {@code half} of x0 by a Gaussian (Commons Math {@link GaussianCurveFitter}:
     * norm, mean, sigma); returns {norm, mean (um along the path), sigma (um)} or null if the fit fails.
     */
    private static double[] gaussian(Kymograph k, int frame, double x0, double half, double sigmaStart) {
        WeightedObservedPoints points = new WeightedObservedPoints();
        double peak = 0;
        for (int p = 0; p < k.positionCount(); p++) {
            double v = k.value(frame, p);
            double x = k.distanceUm(p);
            if (Math.abs(x - x0) <= half && Double.isFinite(v)) {
                points.add(x, v);
                peak = Math.max(peak, v);
            }
        }
        try {
            double[] p = GaussianCurveFitter.create().withMaxIterations(500)
                    .withStartPoint(new double[] {Math.max(peak, 1e-12), x0, sigmaStart}).fit(points.toList());
            p[2] = Math.abs(p[2]);
            return Double.isFinite(p[2]) && p[2] > 0 && p[0] > 0 ? p : null;
        } catch (RuntimeException e) {
            return null;
        }
    }

    private static double[] column(List<double[]> rows, int c) {
        double[] out = new double[rows.size()];
        for (int i = 0; i < out.length; i++) {
            out[i] = rows.get(i)[c];
        }
        return out;
    }

    private static double[] nanArray(int n) {
        double[] a = new double[n];
        Arrays.fill(a, Double.NaN);
        return a;
    }
}
