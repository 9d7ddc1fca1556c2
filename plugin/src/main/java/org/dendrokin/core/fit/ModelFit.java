package org.dendrokin.core.fit;

import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.Set;

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
 * <li>{@link DeltaMethod} for the model's derived quantities.</li>
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
     */
    public record Options(int maxEvaluations, double tolerance, boolean profiles, int bootstrapReplicates, long seed) {
        public Options {
            Checks.positive(maxEvaluations, "maxEvaluations");
            Checks.positiveFinite(tolerance, "tolerance");
            Checks.require(bootstrapReplicates >= 0, "bootstrapReplicates must be zero or positive");
        }

        /** 1000 evaluations a start, tolerance 1e-10, profiles on, no bootstrap. */
        public static Options defaults() {
            return new Options(1000, 1e-10, true, 0, 1L);
        }

        public Options withProfiles(boolean on) {
            return new Options(maxEvaluations, tolerance, on, bootstrapReplicates, seed);
        }

        public Options withBootstrap(int replicates, long newSeed) {
            return new Options(maxEvaluations, tolerance, profiles, replicates, newSeed);
        }

        public Options withTolerance(double newTolerance) {
            return new Options(maxEvaluations, newTolerance, profiles, bootstrapReplicates, seed);
        }

        public Options withMaxEvaluations(int n) {
            return new Options(n, tolerance, profiles, bootstrapReplicates, seed);
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

        double[][] cov = normal != null ? WaldT.covarianceOfNormal(normal, s2)
                : minimiser.compressed() ? null : WaldT.covariance(minimiser.weightedJacobian(u, new boolean[p], data),
                        s2);
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
        Interval[] reported = new Interval[p];
        for (int j = 0; j < p; j++) {
            reported[j] = profile[j] != null ? profile[j] : wald[j];
        }
        Set<String> poor = Identifiability.assess(model, theta, reported, corr, atBound, warnings);
        List<ParameterEstimate> est = new ArrayList<>();
        for (int j = 0; j < p; j++) {
            ParameterSpec s = specs.get(j);
            double se = s.derivative(u[j]) * Math.sqrt(cov[j][j]);
            List<Interval> others = new ArrayList<>();
            if (profile[j] != null) {
                others.add(wald[j]);
            }
            if (boot[j] != null) {
                others.add(boot[j]);
            }
            est.add(new ParameterEstimate(s.name(), s.unit(), theta[j], se, reported[j], others, atBound[j],
                    !poor.contains(s.name())));
        }
        List<ParameterEstimate> derived = new ArrayList<>();
        for (DerivedQuantity q : model.derivedQuantities()) {
            derived.add(DeltaMethod.estimate(q, u, minimiser::natural, cov, tq, Interval.DELTA));
        }
        return new FitResult(model.name(), true, "", est, derived, n, chi2, rmse, aic, aicc, bic, corr, fitted,
                warnings, minimiser.evaluations());
    }
}
