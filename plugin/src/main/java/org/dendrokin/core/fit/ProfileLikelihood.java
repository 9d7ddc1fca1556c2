package org.dendrokin.core.fit;

import java.util.List;
import java.util.Locale;

/**
 * Profile-likelihood intervals: the values of u_j (the optimiser's scale) where the minimum of chi^2 over the other
 * parameters rises by s^2 t(0.975, n - p)^2 above its overall minimum, the profile t statistic of Bates and Watts
 * (1988, ch. 6) reaching the t quantile. They can be asymmetric and stop at a bound the data do not close. For a
 * model linear in its parameters chi^2 is exactly quadratic along the profile, and the interval is the Wald-t one.
 *
 * <p>The profiled chi^2 is nearly quadratic in u_j near the minimum, so sqrt(chi^2(u_j) - chi^2_min) is nearly
 * linear: each side is bracketed by doubling steps of one Wald half-width and then solved by the Illinois variant of
 * regula falsi on that square root (to 1e-3 of the step, at most 12 refits).
 */
final class ProfileLikelihood {
    private final Minimiser minimiser;
    private final FitData data;
    private final Minimiser.Local best;

    /**
     * @param minimiser refits with one coordinate held
     * @param data      the fit's data
     * @param best      the overall minimum
     */
    ProfileLikelihood(Minimiser minimiser, FitData data, Minimiser.Local best) {
        this.minimiser = minimiser;
        this.data = data;
        this.best = best;
    }

    /**
     * The profile interval of coordinate j, natural units; an end the data do not close is the edge of the
     * parameter's range, with a warning.
     *
     * @param j              the parameter
     * @param waldHalfWidth  the Wald-t half width of u_j (sets the first step)
     * @param threshold      the rise of chi^2 that ends the interval, s^2 t^2
     * @param warnings       receives sentences about open ends and a lower minimum found on the way. Modified.
     */
    Interval interval(int j, double waldHalfWidth, double threshold, List<String> warnings) {
        ParameterSpec s = minimiser.spec(j);
        double[] range = s.naturalRange();
        double step = Math.max(waldHalfWidth, 1e-9);
        double lo = side(j, -1, step, threshold, warnings);
        double hi = side(j, +1, step, threshold, warnings);
        double lower = Double.isNaN(lo) ? range[0] : s.toNatural(lo);
        double upper = Double.isNaN(hi) ? range[1] : s.toNatural(hi);
        if (Double.isNaN(lo) || Double.isNaN(hi)) {
            warnings.add(String.format(Locale.ROOT, "The data do not bound %s on the %s side: its 95%% profile "
                    + "interval runs to the edge of the allowed range.", s.name(),
                    Double.isNaN(lo) && Double.isNaN(hi) ? "lower or upper" : Double.isNaN(lo) ? "lower" : "upper"));
        }
        return new Interval(lower, upper, Interval.PROFILE);
    }

    /** The u_j on one side where the profile crosses the threshold, or NaN if it does not within reach. */
    private double side(int j, int direction, double step, double threshold, List<String> warnings) {
        boolean[] fixed = new boolean[minimiser.parameterCount()];
        fixed[j] = true;
        double target = Math.sqrt(threshold);
        double limit = minimiser.spec(j).scale() == ParameterSpec.Scale.LINEAR ? 1e4 * step : 30;
        double inside = 0;
        double insideG = -target;
        double[] insideU = best.u;
        double outside = Double.NaN;
        double outsideG = Double.NaN;
        double d = step;
        while (d <= limit) {
            double[] start = insideU.clone();
            start[j] = best.u[j] + direction * d;
            Minimiser.Local local = minimiser.minimise(start, fixed, data);
            if (local.failure != null) {
                return Double.NaN;
            }
            double g = Math.sqrt(Math.max(0, local.chiSquare - best.chiSquare)) - target;
            if (local.chiSquare < best.chiSquare - 1e-9 * best.chiSquare) {
                warnings.add("Profiling " + minimiser.spec(j).name() + " found a lower chi-square than the fit "
                        + "itself: the fit may have stopped at a local minimum.");
            }
            if (g >= 0) {
                outside = d;
                outsideG = g;
                break;
            }
            inside = d;
            insideG = g;
            insideU = local.u;
            d *= 2;
        }
        if (Double.isNaN(outside)) {
            return Double.NaN;
        }
        // Illinois regula falsi on g(d) = sqrt(chi^2(d) - chi^2_min) - sqrt(threshold)
        int side = 0;
        double a = inside;
        double ga = insideG;
        double b = outside;
        double gb = outsideG;
        for (int it = 0; it < 12 && Math.abs(b - a) > 1e-3 * step; it++) {
            double c = b - gb * (b - a) / (gb - ga);
            double[] start = insideU.clone();
            start[j] = best.u[j] + direction * c;
            Minimiser.Local local = minimiser.minimise(start, fixed, data);
            if (local.failure != null) {
                break;
            }
            double gc = Math.sqrt(Math.max(0, local.chiSquare - best.chiSquare)) - target;
            if (Math.abs(gc) < 1e-3 * target) {
                return best.u[j] + direction * c;
            }
            if (gc * gb > 0) {
                b = c;
                gb = gc;
                if (side == 1) {
                    ga /= 2;
                }
                side = 1;
            } else {
                a = c;
                ga = gc;
                insideU = local.u;
                if (side == -1) {
                    gb /= 2;
                }
                side = -1;
            }
        }
        return best.u[j] + direction * (a + b) / 2;
    }
}
