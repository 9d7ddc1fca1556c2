package org.dendrokin.core.fit;

import java.util.ArrayList;
import java.util.List;
import java.util.Locale;

import org.dendrokin.core.Progress;
import org.dendrokin.core.kymo.Kymograph;
import org.dendrokin.core.spread.Estimate;
import org.dendrokin.core.spread.SpreadAnalysis;
import org.dendrokin.core.units.Unit;

/**
 * The speed and width of travelling fronts fitted directly ({@link TravellingFronts}), after they have formed:
 * the identifiable part of a bistable wave, which a formed front fixes even where D, k and a are not separately
 * fixed. Both fronts are fitted together with one speed, then with one speed each, and the two speeds compared.
 *
 * <p>Which samples: the frames from the time the fronts have moved three front widths beyond the stimulated
 * region (its half-width at half maximum in the first frame), at the speed the arrival times give; before that the
 * fronts are still forming and their shape is not the travelling one. Starts: three widths (half, once and twice
 * the guess), offsets zero, the plateau and baseline read off the data.
 */
public final class FrontFit {
    /** Front widths beyond the stimulated region that the fronts must have moved before their samples count. */
    static final double FORMED_WIDTHS = 3;

    private FrontFit() {
    }

    /**
     * What the fits gave.
     *
     * @param shared         the fit with one speed for both fronts (the headline), or a failed result
     * @param separate       the fit with a speed for each front (both sides in view only), or null
     * @param fromS          the first time (s) whose frames were used
     * @param comparison     a sentence comparing the two fronts' speeds (empty for one front)
     */
    public record Result(FitResult shared, FitResult separate, double fromS, String comparison) {
    }

    /**
     * @param k         the kymograph. Not modified.
     * @param sigma     noise standard deviation of each position. Not modified.
     * @param t0        stimulus time, s
     * @param x0        stimulus position, um
     * @param front     the model-free front measures (speed on each side), or null
     * @param stimulusWidthUm half-width of the stimulated region, um
     * @param plateau   the excited level above baseline (signal unit), a start
     * @param baseline  the resting level (signal unit), a start
     * @param unit      signal unit
     * @param options   fitter options
     * @param progress  progress and cancellation
     */
    public static Result fit(Kymograph k, double[] sigma, double t0, double x0, SpreadAnalysis.Front front,
                             double stimulusWidthUm, double plateau, double baseline, Unit unit,
                             ModelFit.Options options, Progress progress) {
        double dx = Math.max(k.distanceStepUm(), 1e-6);
        double first = k.distanceUm(0);
        double last = k.distanceUm(k.positionCount() - 1);
        double widthGuess = Math.max(2 * dx, stimulusWidthUm / 2);
        Estimate leftSpeed = front == null ? null : front.left();
        Estimate rightSpeed = front == null ? null : front.right();
        double pooled = front != null && Double.isFinite(front.nearSpeedUmPerS()) ? front.nearSpeedUmPerS()
                : Double.NaN;
        boolean left = x0 - first > stimulusWidthUm + 4 * widthGuess && (leftSpeed != null || rightSpeed == null);
        boolean right = last - x0 > stimulusWidthUm + 4 * widthGuess && (rightSpeed != null || leftSpeed == null);
        if (!left && !right) {
            return new Result(FitResult.failed(TravellingFronts.NAME, "the path does not reach far enough beyond the "
                    + "stimulated region on either side to see a formed front", List.of()), null, Double.NaN, "");
        }
        double cl = leftSpeed != null ? leftSpeed.value() : rightSpeed != null ? rightSpeed.value() : pooled;
        double cr = rightSpeed != null ? rightSpeed.value() : cl;
        if (!(cl > 0)) {
            cl = cr > 0 ? cr : dx / Math.max(k.timeStepS(), 1e-6);
        }
        if (!(cr > 0)) {
            cr = cl;
        }
        double speed = left && right ? 0.5 * (cl + cr) : left ? cl : cr;
        double formed = (stimulusWidthUm + FORMED_WIDTHS * widthGuess) / speed;
        double from = t0 + formed;
        FitData data = windowed(k, sigma, from);
        if (data.usedCount() < 20) {
            return new Result(FitResult.failed(TravellingFronts.NAME, "too few frames after the fronts formed",
                    List.of()), null, from, "");
        }
        // a raster scan: the fronts are evaluated at each sample's own time
        double[] delays = k.hasSampleDelays() ? k.sampleDelaysS() : null;
        TravellingFronts shared = new TravellingFronts(k.distancesUm(), k.timesS(), delays, x0, t0, left, right, true,
                unit);
        List<double[]> starts = new ArrayList<>();
        for (double f : new double[] {1, 0.5, 2}) {
            starts.add(shared.pack(speed, speed, f * widthGuess, stimulusWidthUm, stimulusWidthUm, plateau,
                    baseline));
        }
        FitResult one = ModelFit.fit(shared, data, starts, options, progress);
        if (!(left && right) || !one.converged()) {
            return new Result(one, null, from, "");
        }
        TravellingFronts separate = new TravellingFronts(k.distancesUm(), k.timesS(), delays, x0, t0, true, true, false,
                unit);
        double c = one.estimate("front_speed").orElseThrow().value();
        double w = one.estimate("front_width").orElseThrow().value();
        double sl = one.estimate("offset_left").orElseThrow().value();
        double sr = one.estimate("offset_right").orElseThrow().value();
        double a = one.estimate("amplitude").orElseThrow().value();
        double b = one.estimate("baseline").orElseThrow().value();
        FitResult two = ModelFit.fit(separate, data, List.of(separate.pack(c, c, w, sl, sr, a, b)),
                options.withProfiles(false), progress);
        return new Result(one, two, from, comparison(two));
    }

    /** The data from time {@code fromS} on; earlier samples are left out (NaN). */
    private static FitData windowed(Kymograph k, double[] sigma, double fromS) {
        int nx = k.positionCount();
        double[] v = k.values();
        double[] s = new double[v.length];
        int start = k.firstFrameAtOrAfter(fromS);
        for (int f = 0; f < k.frameCount(); f++) {
            for (int p = 0; p < nx; p++) {
                s[f * nx + p] = sigma[p];
                if (f < start) {
                    v[f * nx + p] = Double.NaN;
                }
            }
        }
        return new FitData(v, s);
    }

    /** Whether the two fronts travel at different speeds, from the separate fit's intervals. */
    private static String comparison(FitResult two) {
        if (!two.converged()) {
            return "";
        }
        ParameterEstimate l = two.estimate("front_speed_left").orElse(null);
        ParameterEstimate r = two.estimate("front_speed_right").orElse(null);
        if (l == null || r == null || l.ci95() == null || r.ci95() == null) {
            return "";
        }
        boolean apart = l.ci95().upper() < r.ci95().lower() || r.ci95().upper() < l.ci95().lower();
        return String.format(Locale.ROOT, "The front towards the path's start travels at %.3g um/s (%.3g to %.3g) "
                + "and the one towards its end at %.3g um/s (%.3g to %.3g): %s.", l.value(), l.ci95().lower(),
                l.ci95().upper(), r.value(), r.ci95().lower(), r.ci95().upper(), apart
                        ? "their intervals do not overlap, so the two directions differ"
                        : "their intervals overlap, so the data do not tell them apart");
    }

    /** The derived estimates a wave fit reports from these fits: the shared speed and width, and each side. */
    static List<ParameterEstimate> derived(Result r) {
        List<ParameterEstimate> out = new ArrayList<>();
        r.shared().estimate("front_speed").ifPresent(out::add);
        r.shared().estimate("front_width").ifPresent(out::add);
        if (r.separate() != null && r.separate().converged()) {
            r.separate().estimate("front_speed_left").ifPresent(out::add);
            r.separate().estimate("front_speed_right").ifPresent(out::add);
        } else {
            r.shared().estimate("front_speed_left").ifPresent(out::add);
            r.shared().estimate("front_speed_right").ifPresent(out::add);
        }
        return out;
    }
}
