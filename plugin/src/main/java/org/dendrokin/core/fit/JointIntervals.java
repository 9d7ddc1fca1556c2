package org.dendrokin.core.fit;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;

import org.dendrokin.core.Progress;

/**
 * The intervals of a joint fit's global coordinates: profile likelihood, bootstrap over sessions, Wald-t, and the
 * choice of the one to report. Every refit is a {@link JointProblem#solve} started near its answer.
 */
final class JointIntervals {
    /** Past this many natural-log units a log-scale profile is taken as open (e^30 times the estimate). */
    private static final double LOG_LIMIT = 30;

    private JointIntervals() {
    }

    /**
     * Profile-likelihood interval of global coordinate j: the values where F, minimised over every other free
     * coordinate, rises by {@link GlobalFit#CHI2_95} above its minimum. sqrt(F - F_min) is nearly linear in the
     * coordinate, so each side is bracketed by doubling steps of one Wald half-width and then solved by the Illinois
     * variant of regula falsi on it. An end the data do not close is the range's end, with a warning.
     *
     * @param fixed the coordinates already held in this problem (besides j), length G
     */
    static Interval profile(JointProblem problem, JointProblem.Solution best, int j, boolean[] fixed, double[] m,
                            double waldHalf, GlobalFit.Options options, List<String> warnings,
                            GlobalFit.Counter counter) {
        ParameterSpec spec = problem.coordinates().get(j).spec();
        double step = Double.isFinite(waldHalf) && waldHalf > 0 ? waldHalf : 0.1;
        double[] ends = new double[2];
        for (int side = 0; side < 2; side++) {
            int direction = side == 0 ? -1 : 1;
            double d = side(problem, best, j, direction, step, fixed, m, options, warnings, counter.progress());
            double u = best.state().gamma[j] + direction * d;
            double[] range = spec.naturalRange();
            ends[side] = Double.isNaN(d) ? range[side] : spec.toNatural(u);
            counter.step("profiling " + problem.coordinates().get(j).name());
        }
        if (Double.isNaN(ends[0] - ends[1]) || Double.isInfinite(ends[0]) || Double.isInfinite(ends[1])) {
            warnings.add("The data do not bound " + problem.coordinates().get(j).name() + " on both sides: its 95% "
                    + "profile interval runs to the edge of the allowed range.");
        }
        return new Interval(ends[0], ends[1], Interval.PROFILE);
    }

    /** The distance from the estimate (optimiser's scale) where the profile crosses the threshold, or NaN. */
    private static double side(JointProblem problem, JointProblem.Solution best, int j, int direction, double step,
                               boolean[] fixed, double[] m, GlobalFit.Options options, List<String> warnings,
                               Progress progress) {
        boolean[] held = fixed.clone();
        held[j] = true;
        double target = Math.sqrt(GlobalFit.CHI2_95);
        double limit = problem.coordinates().get(j).spec().scale() == ParameterSpec.Scale.LINEAR ? 1e4 * step
                : LOG_LIMIT;
        double inside = 0;
        double insideG = -target;
        JointProblem.Solution insideSolution = best;
        double outside = Double.NaN;
        double outsideG = Double.NaN;
        double d = step;
        while (d <= limit) {
            JointProblem.Solution s = refit(problem, insideSolution, j, direction * (d - inside), held, m, options,
                    progress);
            if (!s.converged()) {
                return Double.NaN;
            }
            double gd = g(s, best, target, problem, warnings);
            if (gd >= 0) {
                outside = d;
                outsideG = gd;
                break;
            }
            inside = d;
            insideG = gd;
            insideSolution = s;
            d *= 2;
        }
        if (Double.isNaN(outside)) {
            return Double.NaN;
        }
        int last = 0;
        double a = inside;
        double ga = insideG;
        double b = outside;
        double gb = outsideG;
        for (int it = 0; it < 12 && Math.abs(b - a) > 1e-4 * step; it++) {
            double c = b - gb * (b - a) / (gb - ga);
            JointProblem.Solution s = refit(problem, insideSolution, j, direction * (c - a), held, m, options,
                    progress);
            if (!s.converged()) {
                break;
            }
            double gc = g(s, best, target, problem, warnings);
            if (Math.abs(gc) < 1e-3 * target) {
                return c;
            }
            if (gc * gb > 0) {
                b = c;
                gb = gc;
                if (last == 1) {
                    ga /= 2;
                }
                last = 1;
            } else {
                a = c;
                ga = gc;
                insideSolution = s;
                if (last == -1) {
                    gb /= 2;
                }
                last = -1;
            }
        }
        return (a + b) / 2;
    }

    /** sqrt(F - F_min) - target at a profile point; notes a lower minimum than the fit's own. */
    private static double g(JointProblem.Solution s, JointProblem.Solution best, double target, JointProblem problem,
                            List<String> warnings) {
        double rise = s.objective() - best.objective();
        if (rise < -1e-6 * Math.max(1, Math.abs(best.objective())) && warnings.stream()
                .noneMatch(w -> w.startsWith("Profiling found"))) {
            warnings.add("Profiling found a lower minimum than the joint fit itself: the fit may have stopped at a "
                    + "local minimum.");
        }
        return Math.sqrt(Math.max(0, rise)) - target;
    }

    /** Refit with coordinate j moved by delta from a solution (others started at their linear response). */
    static JointProblem.Solution refit(JointProblem problem, JointProblem.Solution from, int j, double delta,
                                       boolean[] held, double[] m, GlobalFit.Options options, Progress progress) {
        boolean[] others = held.clone();
        others[j] = false;
        JointProblem.State start = problem.response(from, j, delta, others, m);
        return problem.solve(start, held, m, options.maxPasses(), progress);
    }

    /**
     * Refits of the group to its sessions resampled with replacement (seeded), each by one Gauss-Newton step from the
     * joint estimate ({@link JointProblem#resampleSteps}); the global coordinates of each (optimiser's scale), null
     * where the step could not be made.
     */
    static double[][] bootstrap(JointProblem problem, JointProblem.Solution best, GlobalFit.Options options,
                                long seed, GlobalFit.Counter counter) {
        int n = problem.blocks().size();
        List<double[]> draws = new ArrayList<>();
        for (int r = 0; r < options.bootstrapReplicates(); r++) {
            draws.add(GlobalFit.resample(n, seed + 7919L * r));
        }
        counter.progress().checkCancelled();
        double[][] out = problem.resampleSteps(best, draws);
        counter.step("bootstrap over sessions");
        return out;
    }

    /**
     * The bootstrap-over-sessions interval of global coordinate j: u_hat +- t(0.975, G - 1) sqrt(G / (G - 1)) s_boot on
     * the coordinate's own scale (log for D and k), mapped back, where s_boot is the standard deviation of the refits
     * to resampled sessions and G the number of sessions. Resampling G clusters underestimates the variance by
     * (G - 1) / G, and with few clusters the estimate of it is itself uncertain, hence the factor and the t quantile
     * with G - 1 degrees of freedom (the small-cluster corrections of cluster-robust inference; Cameron and Miller
     * 2015, J Hum Resour 50:317, sections VI.B-C). Null when fewer than 20 refits converged.
     */
    static Interval bootstrap(double[][] replicates, int j, ParameterSpec spec, double estimate, int sessions) {
        if (replicates == null) {
            return null;
        }
        double[] v = Arrays.stream(replicates).filter(r -> r != null).mapToDouble(r -> r[j]).toArray();
        double variance = clusterVariance(v, sessions);
        if (!(variance >= 0)) {
            return null;
        }
        double half = tQuantile(sessions - 1) * Math.sqrt(variance);
        return new Interval(spec.toNatural(estimate - half), spec.toNatural(estimate + half), GlobalFit.BOOTSTRAP);
    }

    /**
     * The variance of refits to resampled sessions times G / (G - 1), or NaN if fewer than 20 converged.
     *
     * @param values   the refits' values on the coordinate's scale (NaN for failed ones)
     * @param sessions G
     */
    static double clusterVariance(double[] values, int sessions) {
        double[] v = Arrays.stream(values).filter(Double::isFinite).toArray();
        if (v.length < 20 || sessions < 2) {
            return Double.NaN;
        }
        double mean = Arrays.stream(v).average().orElseThrow();
        double ss = 0;
        for (double x : v) {
            ss += (x - mean) * (x - mean);
        }
        return ss / (v.length - 1) * sessions / (sessions - 1.0);
    }

    /**
     * How much more the refits to resampled sessions scatter than the noise of the data allows: the standard deviation
     * of the refits over the model-based standard error sqrt((H^-1)_jj), both on the coordinate's scale and without
     * the small-cluster corrections. Near 1 when the sessions share the constant; well above 1 when they differ by
     * more than their noise (cell-to-cell variation). NaN without enough refits.
     */
    static double scatterRatio(double[][] replicates, int j, double variance) {
        if (replicates == null) {
            return Double.NaN;
        }
        double[] v = Arrays.stream(replicates).filter(r -> r != null).mapToDouble(r -> r[j]).toArray();
        if (v.length < 20) {
            return Double.NaN;
        }
        double mean = Arrays.stream(v).average().orElseThrow();
        double ss = 0;
        for (double x : v) {
            ss += (x - mean) * (x - mean);
        }
        return Math.sqrt(ss / (v.length - 1) / variance);
    }

    /** t(0.975, dof), the two-sided 95% Student t quantile. */
    static double tQuantile(double dof) {
        return new org.apache.commons.math3.distribution.TDistribution(null, Math.max(1, dof))
                .inverseCumulativeProbability(0.975);
    }

    /**
     * The estimate of a global coordinate with its intervals: ci95 is the wider (on the coordinate's scale) of the
     * profile and bootstrap intervals, or the Wald-t interval when neither was made; the others follow.
     *
     * @param u        the estimate on the optimiser's scale
     * @param variance its variance on that scale (H^-1)
     * @param tq       Student t quantile for the Wald interval
     */
    static ParameterEstimate estimate(JointProblem.Coordinate c, double u, double variance, double tq, Interval profile,
                                      Interval bootstrap) {
        ParameterSpec spec = c.spec();
        double half = tq * Math.sqrt(variance);
        Interval wald = new Interval(spec.toNatural(u - half), spec.toNatural(u + half), Interval.WALD_T);
        Interval reported = wald;
        List<Interval> others = new ArrayList<>();
        if (profile != null && bootstrap != null) {
            boolean bootWider = width(bootstrap, spec) > width(profile, spec);
            reported = bootWider ? bootstrap : profile;
            others.add(bootWider ? profile : bootstrap);
        } else if (profile != null || bootstrap != null) {
            reported = profile != null ? profile : bootstrap;
        }
        if (reported != wald) {
            others.add(wald);
        }
        double value = spec.toNatural(u);
        boolean open = !reported.isFinite() || reported.lower() <= spec.naturalRange()[0]
                || reported.upper() >= spec.naturalRange()[1];
        return new ParameterEstimate(c.name(), spec.unit(), value, spec.derivative(u) * Math.sqrt(variance), reported,
                others, false, !open);
    }

    /** Width of an interval on the coordinate's own scale (log ratio for a positive constant). */
    private static double width(Interval i, ParameterSpec spec) {
        if (spec.scale() == ParameterSpec.Scale.LOG) {
            return Math.log(i.upper() / i.lower());
        }
        return i.upper() - i.lower();
    }
}
