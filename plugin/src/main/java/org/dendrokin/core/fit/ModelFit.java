package org.dendrokin.core.fit;

import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.Set;
import java.util.function.DoubleUnaryOperator;

import org.dendrokin.core.Checks;
import org.dendrokin.core.Progress;

/**
 * Weighted nonlinear least squares from several starting points: minimises chi^2(theta) =
 * sum_i ((y_i - f_i(theta)) / sigma_i)^2 from each start ({@link Minimiser}: Commons Math's Levenberg-Marquardt on
 * the transformed coordinates of each {@link ParameterSpec}, log for positive parameters, logistic for bounded
 * ones), keeps the lowest chi^2, and makes the intervals:
 * <ul>
 * <li>{@link WaldT}: s^2 = chi^2 / (n - p), C = s^2 (J^T J)^-1 on the optimiser's scale, u +- t(0.975, n - p)
 *     sqrt(C_jj) mapped back (sheet s8.2); always, as the second interval beside each profiled one;</li>
 * <li>{@link ProfileLikelihood} (optional, the model's headline parameters): where the profiled chi^2 rises by
 *     s^2 t^2; reported when made;</li>
 * <li>{@link ParametricBootstrap} (optional): percentiles of refits to data simulated from the fit;</li>
 * <li>{@link DeltaMethod} for the model's derived quantities;</li>
 * <li>{@link Sandwich} (on by default, for data with a grid shape such as a kymograph): when the residuals are
 *     correlated between neighbouring samples or more variable than the weights say, the robust interval
 *     ({@link Interval#ROBUST_PROFILE}, {@link Interval#ROBUST_WALD_T}, {@link Interval#ROBUST_DELTA}) is reported
 *     and the model-based one kept beside it; otherwise the model-based interval is reported with a note saying that
 *     no structure was found.</li>
 * </ul>
 *
 * <p>Large problems of a model with one-pass {@link FitModel#normalEquations} are handed to the optimiser in the
 * equivalent {@link CompressedProblem} form (p + 1 residuals instead of n), with the {@link FullProblem} as
 * fallback; the choice is the {@link Form}.
 *
 * <p>Nothing numerical throws: a start that fails is skipped, and if all fail, or J^T J is singular, the result
 * says {@code converged = false} with the reason.
 */
public final class ModelFit {
    /** chi^2 / (n - p) below which the remaining starts are skipped (the weights make it about 1 for a good fit). */
    private static final double NOISE_LEVEL_FIT = 1.2;

    /** How the problem is handed to the optimiser; package-private so that tests can compare the two. */
    enum Form {
        /** Compressed when the model has one-pass normal equations and the data are many. */
        AUTO,
        /** Always the n weighted residuals and the n x p Jacobian. */
        FULL,
        /** Always the p + 1 compressed residuals (the model must have one-pass normal equations). */
        COMPRESSED
    }

    /**
     * How to fit.
     *
     * @param maxEvaluations      model evaluations allowed per start
     * @param tolerance           relative tolerance on chi^2 and on the parameters (Commons Math's cost and
     *                            parameter tolerances)
     * @param profiles            make profile-likelihood intervals for the headline parameters
     * @param bootstrapReplicates number of parametric-bootstrap refits (0: none)
     * @param seed                seed of the bootstrap's random numbers
     * @param robust              on data with a grid shape, test the residuals for structure and, where they have
     *                            it, report the robust ({@link Sandwich}) interval instead of the model-based one
     */
    public record Options(int maxEvaluations, double tolerance, boolean profiles, int bootstrapReplicates, long seed,
                          boolean robust) {
        public Options {
            Checks.positive(maxEvaluations, "maxEvaluations");
            Checks.positiveFinite(tolerance, "tolerance");
            Checks.require(bootstrapReplicates >= 0, "bootstrapReplicates must be zero or positive");
        }

        /** Options with robust intervals. */
        public Options(int maxEvaluations, double tolerance, boolean profiles, int bootstrapReplicates, long seed) {
            this(maxEvaluations, tolerance, profiles, bootstrapReplicates, seed, true);
        }

        /** 1000 evaluations a start, tolerance 1e-10, profiles on, no bootstrap, robust intervals on. */
        public static Options defaults() {
            return new Options(1000, 1e-10, true, 0, 1L, true);
        }

        public Options withProfiles(boolean on) {
            return new Options(maxEvaluations, tolerance, on, bootstrapReplicates, seed, robust);
        }

        public Options withBootstrap(int replicates, long newSeed) {
            return new Options(maxEvaluations, tolerance, profiles, replicates, newSeed, robust);
        }

        public Options withTolerance(double newTolerance) {
            return new Options(maxEvaluations, newTolerance, profiles, bootstrapReplicates, seed, robust);
        }

        public Options withMaxEvaluations(int n) {
            return new Options(n, tolerance, profiles, bootstrapReplicates, seed, robust);
        }

        public Options withRobust(boolean on) {
            return new Options(maxEvaluations, tolerance, profiles, bootstrapReplicates, seed, on);
        }
    }

    private final FitModel model;
    private final FitData data;
    private final Options options;
    private final List<ParameterSpec> specs;
    private final int p;
    private final Minimiser minimiser;

    private ModelFit(FitModel model, FitData data, Options options, Form form) {
        this.minimiser = new Minimiser(model, data, form, options.maxEvaluations(), options.tolerance());
        this.model = model;
        this.data = data;
        this.options = options;
        this.specs = model.parameters();
        this.p = specs.size();
    }

    /**
     * Fits the model from each start and returns the best fit with its intervals and warnings.
     *
     * @param model    the model; its {@code evaluate} is called from several threads
     * @param data     observations and their sigmas on the model's grid
     * @param starts   starting points, natural parameter values in the model's order; at least one
     * @param options  tolerances, profiles, bootstrap
     * @param progress reports one unit per start, profile side and bootstrap replicate; checked for cancel
     */
    public static FitResult fit(FitModel model, FitData data, List<double[]> starts, Options options,
                                Progress progress) {
        return fit(model, data, starts, options, progress, Form.AUTO);
    }

    /** As {@link #fit(FitModel, FitData, List, Options, Progress)}, with the form of the problem chosen. */
    static FitResult fit(FitModel model, FitData data, List<double[]> starts, Options options, Progress progress,
                         Form form) {
        Checks.require(!starts.isEmpty(), "a fit needs at least one starting point");
        return new ModelFit(model, data, options, form).run(starts, progress);
    }

    private FitResult run(List<double[]> starts, Progress progress) {
        int n = data.usedCount();
        List<String> warnings = new ArrayList<>();
        if (n <= p + 1) {
            return FitResult.failed(model.name(), String.format(Locale.ROOT,
                    "only %d usable data points for %d parameters, too few to fit", n, p), warnings);
        }
        long total = starts.size() + (options.profiles() ? 2L * model.headlineParameters().size() : 0)
                + options.bootstrapReplicates();
        long done = 0;
        Minimiser.Local best = null;
        String lastFailure = "no start could be evaluated";
        for (double[] start : starts) {
            progress.checkCancelled();
            Checks.require(start.length == p, "a start has " + start.length + " values, the model has " + p);
            double[] u0 = new double[p];
            boolean valid = true;
            for (int j = 0; j < p; j++) {
                try {
                    u0[j] = specs.get(j).toInternal(start[j]);
                } catch (IllegalArgumentException e) {
                    valid = false;
                    lastFailure = "a starting value was outside its allowed range: " + e.getMessage();
                }
            }
            if (valid) {
                Minimiser.Local local = minimiser.minimise(u0, new boolean[p], data);
                if (local.failure == null) {
                    if (best == null || local.chiSquare < best.chiSquare) {
                        best = local;
                    }
                } else {
                    lastFailure = local.failure;
                }
            }
            progress.report("fitting " + model.name(), ++done, total);
            if (best != null && best.chiSquare / (n - p) < NOISE_LEVEL_FIT) {
                // The residuals are already at the noise level the weights describe: no start can do much better.
                done += starts.size() - (starts.indexOf(start) + 1);
                break;
            }
        }
        if (best == null) {
            return FitResult.failed(model.name(), "the optimiser did not converge from any start: " + lastFailure,
                    warnings);
        }
        return summarise(best, n, warnings, progress, done, total);
    }

    private FitResult summarise(Minimiser.Local best, int n, List<String> warnings, Progress progress, long done,
                                long total) {
        double[] u = best.u;
        double[] theta = minimiser.natural(u);
        double[] fitted = new double[model.size()];
        double[][] normal = null;
        if (minimiser.compressed()) {
            // one pass gives the prediction and J^T W J for the intervals
            NormalEquations ne = new NormalEquations(p);
            model.normalEquations(theta, data, ne, fitted);
            minimiser.countEvaluation();
            if (ne.isFinite()) {
                normal = new double[p][p];
                for (int a = 0; a < p; a++) {
                    for (int b = 0; b < p; b++) {
                        normal[a][b] = ne.matrix(a, b) * specs.get(a).derivative(u[a]) * specs.get(b).derivative(u[b]);
                    }
                }
            }
        } else {
            model.evaluate(theta, fitted, null);
            minimiser.countEvaluation();
        }
        double chi2 = best.chiSquare;
        double rss = 0;
        for (int i = 0; i < n; i++) {
            int g = data.usedIndex(i);
            double r = data.value(g) - fitted[g];
            rss += r * r;
        }
        double rmse = Math.sqrt(rss / n);
        int dof = n - p;
        double s2 = chi2 / dof;
        double tq = WaldT.tQuantile(dof);
        double aic = InformationCriteria.aic(chi2, n, p);
        double aicc = InformationCriteria.aicc(chi2, n, p);
        double bic = InformationCriteria.bic(chi2, n, p);

        double[][] weightedJacobian = normal == null && !minimiser.compressed()
                ? minimiser.weightedJacobian(u, new boolean[p], data) : null;
        double[][] cov = normal != null ? WaldT.covarianceOfNormal(normal, s2)
                : weightedJacobian != null ? WaldT.covariance(weightedJacobian, s2) : null;
        boolean[] atBound = minimiser.atBound(u);
        if (cov == null) {
            String names = String.join(", ", specs.stream().map(ParameterSpec::name).toList());
            warnings.add("The data cannot tell the parameters (" + names + ") apart: the fit's sensitivity matrix "
                    + "is singular, so no intervals can be given and the values are not estimates.");
            List<ParameterEstimate> est = new ArrayList<>();
            for (int j = 0; j < p; j++) {
                est.add(new ParameterEstimate(specs.get(j).name(), specs.get(j).unit(), theta[j], Double.NaN, null,
                        List.of(), atBound[j], false));
            }
            return new FitResult(model.name(), false, "the parameters are not identifiable from these data "
                    + "(singular sensitivity matrix)", est, List.of(), n, chi2, rmse, aic, aicc, bic, null,
                    fitted, warnings, minimiser.evaluations());
        }
        double[][] corr = WaldT.correlation(cov);
        Interval[] wald = WaldT.intervals(specs, u, cov, tq);
        Interval[] profile = new Interval[p];
        if (options.profiles()) {
            ProfileLikelihood profiles = new ProfileLikelihood(minimiser, data, best);
            for (String name : model.headlineParameters()) {
                int j = model.indexOf(name);
                if (j >= 0) {
                    progress.checkCancelled();
                    profile[j] = profiles.interval(j, tq * Math.sqrt(cov[j][j]), s2 * tq * tq, warnings);
                    done += 2;
                    progress.report("profiling " + name, done, total);
                }
            }
        }
        Interval[] boot = new Interval[p];
        if (options.bootstrapReplicates() > 0) {
            boot = ParametricBootstrap.intervals(minimiser, data, best, fitted, Math.sqrt(s2),
                    options.bootstrapReplicates(), options.seed(), warnings, progress, done, total);
        }
        List<DerivedQuantity> quantities = model.derivedQuantities();
        Sandwich.Assessment[] robust = assessRobust(u, theta, fitted, weightedJacobian, cov, s2, n, quantities);
        double[][] inputCov = inputCovariance(u, theta, fitted, weightedJacobian, cov, s2);
        Interval[] reported = new Interval[p];
        double[] se = new double[p];
        List<List<Interval>> others = new ArrayList<>();
        for (int j = 0; j < p; j++) {
            Interval modelBased = profile[j] != null ? profile[j] : wald[j];
            Sandwich.Assessment a = robust[j];
            List<Interval> other = new ArrayList<>();
            se[j] = specs.get(j).derivative(u[j]) * Math.sqrt(cov[j][j]);
            if (a != null && a.applies(tq)) {
                reported[j] = widened(modelBased, j, u[j], a.widening(tq), a.appliedNote());
                se[j] *= Math.sqrt(a.ratio());
                other.add(modelBased);
            } else {
                reported[j] = a == null ? modelBased : withNote(modelBased, a.keptNote(tq));
            }
            if (inputCov != null && inputCov[j][j] > 0) {
                ParameterSpec s = specs.get(j);
                double sd = Math.sqrt(inputCov[j][j]);
                other.add(0, reported[j]);
                reported[j] = withInput(reported[j], u[j], tq * sd, s::toInternal, s::toNatural, s.naturalRange(),
                        "fit's");
                double sdNatural = s.derivative(u[j]) * sd;
                se[j] = Math.sqrt(se[j] * se[j] + sdNatural * sdNatural);
            }
            if (profile[j] != null) {
                other.add(wald[j]);
            }
            if (boot[j] != null) {
                other.add(boot[j]);
            }
            others.add(other);
        }
        Set<String> poor = Identifiability.assess(model, theta, reported, corr, atBound, warnings);
        List<ParameterEstimate> est = new ArrayList<>();
        for (int j = 0; j < p; j++) {
            ParameterSpec s = specs.get(j);
            est.add(new ParameterEstimate(s.name(), s.unit(), theta[j], se[j], reported[j], others.get(j),
                    atBound[j], !poor.contains(s.name())));
        }
        List<ParameterEstimate> derived = new ArrayList<>();
        for (int k = 0; k < quantities.size(); k++) {
            ParameterEstimate d = derivedEstimate(quantities.get(k), u, cov, tq, robust[p + k]);
            derived.add(inputCov == null ? d : derivedWithInput(quantities.get(k), d, u, inputCov, tq));
        }
        return new FitResult(model.name(), true, "", est, derived, n, chi2, rmse, aic, aicc, bic, corr, fitted,
                warnings, minimiser.evaluations());
    }

    /**
     * A derived quantity by the delta method, from the robust covariance when the residuals call for it (the
     * model-based interval is then kept beside it).
     */
    private ParameterEstimate derivedEstimate(DerivedQuantity q, double[] u, double[][] cov, double tq,
                                              Sandwich.Assessment a) {
        ParameterEstimate delta = DeltaMethod.estimate(q, u, minimiser::natural, cov, tq, Interval.DELTA);
        if (a == null) {
            return delta;
        }
        if (!a.applies(tq)) {
            return new ParameterEstimate(q.name(), q.unit(), delta.value(), delta.standardError(),
                    withNote(delta.ci95(), a.keptNote(tq)), List.of(), false, true);
        }
        double robustSe = Math.sqrt(a.robustVariance());
        Interval ci = DeltaMethod.interval(q, delta.value(), robustSe, a.quantile(), Interval.ROBUST_DELTA,
                a.appliedNote());
        double seNatural = q.positive() && delta.value() > 0 ? delta.value() * robustSe : robustSe;
        return new ParameterEstimate(q.name(), q.unit(), delta.value(), seNatural, ci, List.of(delta.ci95()), false,
                true);
    }

    // ---- the uncertainty of an input --------------------------------------------------------------------------

    /**
     * The covariance on the optimiser's scale that the data's input uncertainty adds, sum over shifts of
     * delta u delta u^T with delta u = (J^T W J)^-1 J^T W delta y (see {@link InputUncertainty}); null when the data
     * carry none or have no grid shape.
     */
    private double[][] inputCovariance(double[] u, double[] theta, double[] fitted, double[][] weightedJacobian,
                                       double[][] cov, double s2) {
        InputUncertainty in = data.inputUncertainty();
        if (in == null || in.shifts().isEmpty() || data.columns() == 0 || !(s2 > 0)) {
            return null;
        }
        int columns = data.columns();
        int parts = in.shifts().size();
        double[][] projected = new double[parts][p];
        Sandwich.Frames rows = frames(u, theta, fitted, weightedJacobian);
        double[] e = new double[columns];
        double[] jw = new double[columns * p];
        for (int f = 0; f < data.rows(); f++) {
            rows.frame(f, e, jw);
            for (int c = 0; c < columns; c++) {
                int g = data.point(f, c);
                double w = Math.sqrt(data.weight(g));
                if (w == 0) {
                    continue;
                }
                for (int b = 0; b < parts; b++) {
                    double dy = in.shift(b)[g];
                    if (dy == 0 || !Double.isFinite(dy)) {
                        continue;
                    }
                    double wdy = w * dy;
                    for (int j = 0; j < p; j++) {
                        projected[b][j] += jw[c * p + j] * wdy;
                    }
                }
            }
        }
        // cov / s2 is (J^T W J)^-1 on the optimiser's scale
        double[][] out = new double[p][p];
        for (int b = 0; b < parts; b++) {
            double[] du = new double[p];
            for (int a = 0; a < p; a++) {
                for (int j = 0; j < p; j++) {
                    du[a] += cov[a][j] / s2 * projected[b][j];
                }
            }
            for (int a = 0; a < p; a++) {
                for (int j = 0; j < p; j++) {
                    out[a][j] += du[a] * du[j];
                }
            }
        }
        return out;
    }

    /**
     * An interval widened for the input's uncertainty: each side's distance from the estimate on the internal scale
     * and {@code extra} added in quadrature (an end the data leave open stays open). The method gains the input's
     * name ({@code robust-profile+background}).
     */
    private Interval withInput(Interval i, double centre, double extra, DoubleUnaryOperator toInternal,
                               DoubleUnaryOperator toNatural, double[] range, String scale) {
        double lower = i.lower();
        double upper = i.upper();
        if (lower > range[0] && Double.isFinite(lower)) {
            double a = centre - toInternal.applyAsDouble(lower);
            lower = toNatural.applyAsDouble(centre - Math.hypot(a, extra));
        }
        if (upper < range[1] && Double.isFinite(upper)) {
            double c = toInternal.applyAsDouble(upper) - centre;
            upper = toNatural.applyAsDouble(centre + Math.hypot(c, extra));
        }
        String source = data.inputUncertainty().source();
        String note = String.format(Locale.ROOT, "Widened for the uncertainty of the %s, which the residuals cannot "
                + "show (its own 95%% half-width %.3g on the %s scale).", source.replace("+", " and the "), extra,
                scale);
        String before = i.note().isEmpty() || i.note().endsWith(".") ? i.note() : i.note() + ".";
        return new Interval(lower, upper, i.method() + "+" + source, before.isEmpty() ? note : before + " " + note);
    }

    /** A derived quantity's interval and standard error widened for the input's uncertainty (delta method). */
    private ParameterEstimate derivedWithInput(DerivedQuantity q, ParameterEstimate d, double[] u, double[][] inputCov,
                                               double tq) {
        if (d.ci95() == null || !Double.isFinite(d.value())) {
            return d;
        }
        double sd = Math.sqrt(DeltaMethod.quadraticForm(DeltaMethod.gradient(q, u, minimiser::natural), inputCov));
        if (!(sd > 0)) {
            return d;
        }
        boolean log = q.positive() && d.value() > 0;
        double centre = log ? Math.log(d.value()) : d.value();
        Interval ci = log ? withInput(d.ci95(), centre, tq * sd, Math::log, Math::exp,
                new double[] {0, Double.POSITIVE_INFINITY}, "log")
                : withInput(d.ci95(), centre, tq * sd, x -> x, x -> x,
                        new double[] {Double.NEGATIVE_INFINITY, Double.POSITIVE_INFINITY}, "natural");
        double sdNatural = log ? d.value() * sd : sd;
        List<Interval> others = new ArrayList<>();
        others.add(d.ci95());
        others.addAll(d.otherIntervals());
        return new ParameterEstimate(d.name(), d.unit(), d.value(), Math.hypot(d.standardError(), sdNatural), ci,
                others, d.atBound(), d.identifiable());
    }

    // ---- robust intervals ------------------------------------------------------------------------------------

    /**
     * The robust assessment of every parameter (unit gradients) and derived quantity (its gradient on the optimiser's
     * scale), or all null when robust intervals are off, the data have no grid shape, or the fit is exact.
     */
    private Sandwich.Assessment[] assessRobust(double[] u, double[] theta, double[] fitted,
                                               double[][] weightedJacobian, double[][] cov, double s2, int n,
                                               List<DerivedQuantity> quantities) {
        double[][] targets = new double[p + quantities.size()][];
        if (!options.robust() || data.columns() == 0 || !(s2 > 0)) {
            return new Sandwich.Assessment[targets.length];
        }
        for (int j = 0; j < p; j++) {
            targets[j] = new double[p];
            targets[j][j] = 1;
        }
        for (int k = 0; k < quantities.size(); k++) {
            targets[p + k] = DeltaMethod.gradient(quantities.get(k), u, minimiser::natural);
        }
        return Sandwich.assess(frames(u, theta, fitted, weightedJacobian), data.rows(), data.columns(),
                scaled(cov, 1 / s2), s2, n, targets);
    }

    /**
     * The weighted residuals and Jacobian rows frame by frame (safe to read from several threads): from the weighted Jacobian of the full problem when
     * there is one, else from the model a frame at a time when it can evaluate ranges, else from a weighted
     * Jacobian evaluated here.
     */
    private Sandwich.Frames frames(double[] u, double[] theta, double[] fitted, double[][] weightedJacobian) {
        int columns = data.columns();
        double[] chain = new double[p];
        for (int j = 0; j < p; j++) {
            chain[j] = specs.get(j).derivative(u[j]);
        }
        if (weightedJacobian == null && model.hasRangeEvaluation() && data.rowMajor()) {
            // frames are read from several threads: one pair of work arrays each
            ThreadLocal<double[][]> work = ThreadLocal.withInitial(() -> new double[][] {new double[columns],
                new double[columns * p]});
            return (f, e, jw) -> {
                double[] values = work.get()[0];
                double[] jac = work.get()[1];
                model.evaluateRange(theta, f * columns, (f + 1) * columns, values, jac);
                for (int c = 0; c < columns; c++) {
                    int g = f * columns + c;
                    double w = Math.sqrt(data.weight(g));
                    e[c] = w == 0 ? 0 : (data.observed(g) - values[c]) * w;
                    for (int j = 0; j < p; j++) {
                        jw[c * p + j] = jac[c * p + j] * chain[j] * w;
                    }
                }
            };
        }
        double[][] rows = weightedJacobian != null ? weightedJacobian
                : minimiser.weightedJacobian(u, new boolean[p], data);
        int[] usedAt = new int[data.size()];
        java.util.Arrays.fill(usedAt, -1);
        for (int i = 0; i < data.usedCount(); i++) {
            usedAt[data.usedIndex(i)] = i;
        }
        return (f, e, jw) -> {
            java.util.Arrays.fill(jw, 0);
            for (int c = 0; c < columns; c++) {
                int g = data.point(f, c);
                int i = usedAt[g];
                if (i < 0) {
                    e[c] = 0;
                    continue;
                }
                e[c] = (data.value(g) - fitted[g]) / data.sigma(g);
                System.arraycopy(rows[i], 0, jw, c * p, p);
            }
        };
    }

    /** c times a matrix (not modified). */
    private static double[][] scaled(double[][] m, double c) {
        double[][] out = new double[m.length][];
        for (int a = 0; a < m.length; a++) {
            out[a] = m[a].clone();
            for (int b = 0; b < m[a].length; b++) {
                out[a][b] *= c;
            }
        }
        return out;
    }

    /**
     * The robust interval of parameter j: the model-based interval's distances from the estimate on the optimiser's
     * scale times the widening factor (an end the data leave open stays open).
     */
    private Interval widened(Interval modelBased, int j, double uj, double factor, String note) {
        ParameterSpec s = specs.get(j);
        double[] range = s.naturalRange();
        double lower = modelBased.lower();
        double upper = modelBased.upper();
        if (lower > range[0] && Double.isFinite(lower)) {
            lower = s.toNatural(uj - factor * (uj - s.toInternal(lower)));
        }
        if (upper < range[1] && Double.isFinite(upper)) {
            upper = s.toNatural(uj + factor * (s.toInternal(upper) - uj));
        }
        String method = modelBased.method().equals(Interval.PROFILE) ? Interval.ROBUST_PROFILE : Interval.ROBUST_WALD_T;
        return new Interval(lower, upper, method, note);
    }

    private static Interval withNote(Interval i, String note) {
        return new Interval(i.lower(), i.upper(), i.method(), note);
    }
}
