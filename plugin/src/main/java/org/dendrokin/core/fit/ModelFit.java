package org.dendrokin.core.fit;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Locale;
import java.util.Random;
import java.util.concurrent.atomic.AtomicLong;
import java.util.stream.IntStream;

import org.apache.commons.math3.distribution.TDistribution;
import org.apache.commons.math3.exception.MathIllegalStateException;
import org.apache.commons.math3.fitting.leastsquares.LeastSquaresBuilder;
import org.apache.commons.math3.fitting.leastsquares.LeastSquaresOptimizer;
import org.apache.commons.math3.fitting.leastsquares.LeastSquaresProblem;
import org.apache.commons.math3.fitting.leastsquares.LevenbergMarquardtOptimizer;
import org.apache.commons.math3.fitting.leastsquares.ValueAndJacobianFunction;
import org.apache.commons.math3.linear.Array2DRowRealMatrix;
import org.apache.commons.math3.linear.ArrayRealVector;
import org.apache.commons.math3.linear.CholeskyDecomposition;
import org.apache.commons.math3.linear.EigenDecomposition;
import org.apache.commons.math3.linear.MatrixUtils;
import org.apache.commons.math3.linear.RealMatrix;
import org.apache.commons.math3.linear.RealVector;
import org.apache.commons.math3.linear.SingularValueDecomposition;
import org.apache.commons.math3.util.Pair;
import org.dendrokin.core.Checks;
import org.dendrokin.core.Progress;

/**
 * Weighted nonlinear least squares: minimises chi^2(theta) = sum_i ((y_i - f_i(theta)) / sigma_i)^2 with
 * Commons Math's {@link LevenbergMarquardtOptimizer} (Levenberg 1944, Marquardt 1963; sheet s8.1) on the
 * transformed coordinates of each {@link ParameterSpec} (log for positive parameters, logistic for bounded
 * ones), from several starting points, keeping the lowest chi^2.
 *
 * <p>Uncertainty (sheet s8.2), computed here rather than taken from Commons Math (whose reduced chi-square
 * divides by n - p + 1 and whose sigma is not scaled): s^2 = chi^2 / (n - p), C = s^2 (J^T J)^-1 with J the
 * weighted Jacobian on the optimiser's scale, 95% interval u +- t(0.975, n - p) sqrt(C_jj) mapped back to
 * natural units. Profile-likelihood intervals (optional, for the model's headline parameters): the values of
 * u_j where the minimum of chi^2 over the other parameters rises by s^2 t(0.975, n - p)^2 (the profile t
 * statistic of Bates and Watts 1988 reaching the t quantile); they are asymmetric and stop at a bound the data
 * do not close. A parametric bootstrap (optional): refits to f(theta_hat) + s sigma_i z_i, z_i standard
 * normal from a seeded generator, in parallel; 2.5th and 97.5th percentiles.
 *
 * <p>Large problems of a model with one-pass {@link FitModel#normalEquations} are handed to the optimiser in
 * compressed form: at each point A = J^T W J, g = J^T W r and chi^2 are summed in one pass, A = R^T R (Cholesky),
 * z = R^-T g, rho = sqrt(chi^2 - |z|^2), and the optimiser sees the p + 1 residuals (z, rho) with the Jacobian
 * (R; 0). Since (R; 0)^T (R; 0) = J^T W J, (R; 0)^T (z, rho) = J^T W r and |(z, rho)|^2 = chi^2, every quantity
 * the Levenberg-Marquardt iteration uses (steps, predicted and actual reductions, column scaling, the
 * orthogonality test) is that of the full problem, while each iteration costs O(p^3) instead of O(n p^2). Forming
 * J^T W J squares the condition number, so a start falls back to the full problem when the scaled A is worse
 * conditioned than 1e8 (or not positive definite) anywhere on its way.
 *
 * <p>Nothing numerical throws: a start that fails is skipped, and if all fail, or J^T J is singular, the result
 * says {@code converged = false} with the reason.
 */
public final class ModelFit {
    private static final double SINGULAR_CONDITION = 1e13;
    /** chi^2 / (n - p) below which the remaining starts are skipped (the weights make it about 1 for a good fit). */
    private static final double NOISE_LEVEL_FIT = 1.2;
    /** Data points per parameter from which a model with one-pass normal equations is fitted in compressed form. */
    private static final int COMPRESS_POINTS_PER_PARAMETER = 50;
    /** Largest condition number of the scaled J^T W J for which the compressed form is trusted. */
    private static final double COMPRESS_MAX_CONDITION = 1e8;

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
    private final AtomicLong evaluations = new AtomicLong();
    private final boolean compressed;

    private ModelFit(FitModel model, FitData data, Options options, Form form) {
        Checks.require(model.size() == data.size(),
                "model " + model.name() + " predicts " + model.size() + " points but the data have " + data.size());
        Checks.require(form != Form.COMPRESSED || model.hasNormalEquations(),
                "model " + model.name() + " has no one-pass normal equations");
        this.model = model;
        this.data = data;
        this.options = options;
        this.specs = model.parameters();
        this.p = specs.size();
        this.compressed = form == Form.COMPRESSED || (form == Form.AUTO && model.hasNormalEquations()
                && data.usedCount() >= COMPRESS_POINTS_PER_PARAMETER * p);
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
        long total = starts.size() + (options.profiles ? 2L * model.headlineParameters().size() : 0)
                + options.bootstrapReplicates;
        long done = 0;
        Local best = null;
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
                Local local = minimise(u0, new boolean[p], data);
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

    private FitResult summarise(Local best, int n, List<String> warnings, Progress progress, long done, long total) {
        double[] u = best.u;
        double[] theta = natural(u);
        double[] fitted = new double[model.size()];
        double[][] normal = null;
        if (compressed) {
            // one pass gives the prediction and J^T W J for the intervals
            NormalEquations ne = new NormalEquations(p);
            model.normalEquations(theta, data, ne, fitted);
            evaluations.incrementAndGet();
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
            evaluations.incrementAndGet();
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
        double tq = tQuantile(dof);
        double aic = InformationCriteria.aic(chi2, n, p);
        double aicc = InformationCriteria.aicc(chi2, n, p);
        double bic = InformationCriteria.bic(chi2, n, p);

        double[][] cov = normal != null ? covarianceOfNormal(normal, s2)
                : compressed ? null : covariance(weightedJacobian(u, new boolean[p], data), s2);
        boolean[] atBound = atBound(u);
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
                    fitted, warnings, evaluations.get());
        }
        double[][] corr = new double[p][p];
        for (int i = 0; i < p; i++) {
            for (int j = 0; j < p; j++) {
                corr[i][j] = cov[i][j] / Math.sqrt(cov[i][i] * cov[j][j]);
            }
        }
        Interval[] wald = new Interval[p];
        for (int j = 0; j < p; j++) {
            double half = tq * Math.sqrt(cov[j][j]);
            ParameterSpec s = specs.get(j);
            wald[j] = new Interval(s.toNatural(u[j] - half), s.toNatural(u[j] + half), Interval.WALD_T);
        }
        Interval[] profile = new Interval[p];
        if (options.profiles) {
            for (String name : model.headlineParameters()) {
                int j = model.indexOf(name);
                if (j >= 0) {
                    progress.checkCancelled();
                    profile[j] = profile(best, j, tq * Math.sqrt(cov[j][j]), s2 * tq * tq, warnings);
                    done += 2;
                    progress.report("profiling " + name, done, total);
                }
            }
        }
        Interval[] boot = new Interval[p];
        if (options.bootstrapReplicates > 0) {
            boot = bootstrap(best, fitted, Math.sqrt(s2), warnings, progress, done, total);
        }
        Interval[] reported = new Interval[p];
        for (int j = 0; j < p; j++) {
            reported[j] = profile[j] != null ? profile[j] : wald[j];
        }
        java.util.Set<String> poor = Identifiability.assess(model, theta, reported, corr, atBound, warnings);
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
            derived.add(derivedEstimate(q, u, cov, tq));
        }
        return new FitResult(model.name(), true, "", est, derived, n, chi2, rmse, aic, aicc, bic, corr, fitted,
                warnings, evaluations.get());
    }

    // ---- optimisation ------------------------------------------------------------------------------------

    /** Result of one local minimisation on the free coordinates. */
    private static final class Local {
        double[] u;
        double chiSquare;
        String failure;
    }

    /**
     * Minimises chi^2 over the coordinates not marked fixed, starting from u0 (fixed ones keep their u0 value).
     */
    private Local minimise(double[] u0, boolean[] fixed, FitData target) {
        int[] free = IntStream.range(0, p).filter(j -> !fixed[j]).toArray();
        if (compressed) {
            try {
                CompressedObjective objective = new CompressedObjective(u0, free, target);
                return minimise(u0, free, objective, new double[free.length + 1], () -> objective.nonFinite);
            } catch (CompressionBreakdown e) {
                // J^T W J is too ill-conditioned somewhere on the way: start again on the full problem
            }
        }
        Objective objective = new Objective(u0, free, target);
        double[] y = new double[target.usedCount()];
        for (int i = 0; i < y.length; i++) {
            int g = target.usedIndex(i);
            y[i] = target.value(g) / target.sigma(g);
        }
        return minimise(u0, free, objective, y, () -> objective.nonFinite);
    }

    private Local minimise(double[] u0, int[] free, ValueAndJacobianFunction objective, double[] y,
                           java.util.function.BooleanSupplier nonFinite) {
        Local out = new Local();
        double[] start = new double[free.length];
        for (int f = 0; f < free.length; f++) {
            start[f] = u0[free[f]];
        }
        LeastSquaresProblem problem = new LeastSquaresBuilder()
                .start(start)
                .model(objective)
                .target(y)
                .lazyEvaluation(true)
                .maxEvaluations(options.maxEvaluations)
                .maxIterations(options.maxEvaluations)
                .build();
        LevenbergMarquardtOptimizer optimizer = new LevenbergMarquardtOptimizer()
                .withCostRelativeTolerance(options.tolerance)
                .withParameterRelativeTolerance(options.tolerance);
        try {
            LeastSquaresOptimizer.Optimum optimum = optimizer.optimize(problem);
            double[] uFree = optimum.getPoint().toArray();
            double[] u = u0.clone();
            for (int f = 0; f < free.length; f++) {
                u[free[f]] = uFree[f];
            }
            double cost = optimum.getCost();
            out.u = u;
            out.chiSquare = cost * cost;
            if (!Double.isFinite(out.chiSquare) || nonFinite.getAsBoolean()) {
                out.failure = "the model gave no finite prediction near the optimum";
            }
        } catch (MathIllegalStateException e) {
            out.failure = e.getMessage();
        } catch (IllegalArgumentException e) {
            out.failure = "the model could not be evaluated: " + e.getMessage();
        }
        return out;
    }

    /** chi^2 / weighted residuals and Jacobian for Commons Math, on the free coordinates. */
    private final class Objective implements ValueAndJacobianFunction {
        private final double[] base;
        private final int[] free;
        private final FitData target;
        private double[] lastPoint;
        private double[] lastValue;
        private boolean lastNonFinite;
        boolean nonFinite;

        Objective(double[] base, int[] free, FitData target) {
            this.base = base.clone();
            this.free = free;
            this.target = target;
        }

        private double[] full(double[] uFree) {
            double[] u = base.clone();
            for (int f = 0; f < free.length; f++) {
                u[free[f]] = uFree[f];
            }
            return u;
        }

        @Override
        public RealVector computeValue(double[] uFree) {
            // The optimiser asks twice for the value of each trial point (residuals, then cost): compute it once.
            if (lastPoint != null && Arrays.equals(lastPoint, uFree)) {
                nonFinite = lastNonFinite;
                return new ArrayRealVector(lastValue, true);
            }
            double[] values = new double[model.size()];
            model.evaluate(natural(full(uFree)), values, null);
            evaluations.incrementAndGet();
            double[] v = gather(values);
            lastPoint = uFree.clone();
            lastValue = v;
            lastNonFinite = nonFinite;
            return new ArrayRealVector(v, true);
        }

        private double[] gather(double[] values) {
            double[] v = new double[target.usedCount()];
            nonFinite = false;
            for (int i = 0; i < v.length; i++) {
                int g = target.usedIndex(i);
                double f = values[g];
                if (!Double.isFinite(f)) {
                    nonFinite = true;
                    f = 1e30;  // pushes the optimiser back from a region where the model breaks down
                }
                v[i] = f / target.sigma(g);
            }
            return v;
        }

        @Override
        public RealMatrix computeJacobian(double[] uFree) {
            double[][] all = weightedJacobian(full(uFree), fixedMask(free), target);
            double[][] j = new double[all.length][free.length];
            for (int i = 0; i < all.length; i++) {
                for (int f = 0; f < free.length; f++) {
                    j[i][f] = all[i][free[f]];
                }
            }
            return new Array2DRowRealMatrix(j, false);
        }

        @Override
        public Pair<RealVector, RealMatrix> value(RealVector point) {
            double[] x = point.toArray();
            return new Pair<>(computeValue(x), computeJacobian(x));
        }
    }

    /** Signals that the compressed form cannot be trusted at some point; the start is redone on the full problem. */
    private static final class CompressionBreakdown extends RuntimeException {
        private static final long serialVersionUID = 1L;

        CompressionBreakdown() {
            super(null, null, false, false);
        }
    }

    /**
     * The compressed problem (see the class comment): residuals (z, rho) and Jacobian (R; 0) on the free
     * coordinates, with target 0 so that target - model = (z, rho). The optimiser asks for the value and the
     * Jacobian of a point separately and sometimes twice; a few recent points are kept so that each costs one pass.
     */
    private final class CompressedObjective implements ValueAndJacobianFunction {
        private static final int CACHE = 4;
        private final double[] base;
        private final int[] free;
        private final FitData target;
        private final NormalEquations normal = new NormalEquations(p);
        private final double[][] keys = new double[CACHE][];
        private final double[][] values = new double[CACHE][];
        private final double[][][] jacobians = new double[CACHE][][];
        private int next;
        boolean nonFinite;

        CompressedObjective(double[] base, int[] free, FitData target) {
            this.base = base.clone();
            this.free = free;
            this.target = target;
        }

        private int slot(double[] uFree) {
            for (int i = 0; i < CACHE; i++) {
                if (keys[i] != null && Arrays.equals(keys[i], uFree)) {
                    return i;
                }
            }
            int i = next;
            next = (next + 1) % CACHE;
            keys[i] = null;
            compute(uFree, i);
            keys[i] = uFree.clone();
            return i;
        }

        private void compute(double[] uFree, int i) {
            double[] u = base.clone();
            for (int f = 0; f < free.length; f++) {
                u[free[f]] = uFree[f];
            }
            model.normalEquations(natural(u), target, normal, null);
            evaluations.incrementAndGet();
            int q = free.length;
            double[] value = new double[q + 1];
            values[i] = value;
            jacobians[i] = null;
            nonFinite = !normal.isFinite();
            if (nonFinite) {
                value[q] = -1e30 * Math.sqrt(target.usedCount());  // pushes the optimiser back, as on the full problem
                return;
            }
            double[] chain = new double[q];
            double[] root = new double[q];
            for (int a = 0; a < q; a++) {
                chain[a] = specs.get(free[a]).derivative(u[free[a]]);
                double diag = normal.matrix(free[a], free[a]) * chain[a] * chain[a];
                if (!(diag > 0)) {
                    throw new CompressionBreakdown();
                }
                root[a] = Math.sqrt(diag);
            }
            // scaled A (unit diagonal), so the condition test and the Cholesky thresholds are scale-free
            double[][] scaled = new double[q][q];
            for (int a = 0; a < q; a++) {
                for (int b = 0; b < q; b++) {
                    scaled[a][b] = normal.matrix(free[a], free[b]) * chain[a] * chain[b] / (root[a] * root[b]);
                }
            }
            RealMatrix s = new Array2DRowRealMatrix(scaled, false);
            double[] eig = new EigenDecomposition(s).getRealEigenvalues();
            double lo = Double.POSITIVE_INFINITY;
            double hi = 0;
            for (double ev : eig) {
                lo = Math.min(lo, ev);
                hi = Math.max(hi, ev);
            }
            if (!(lo > 0) || hi / lo > COMPRESS_MAX_CONDITION) {
                throw new CompressionBreakdown();
            }
            RealMatrix l;
            try {
                l = new CholeskyDecomposition(s, 1e-12, 0).getL();
            } catch (org.apache.commons.math3.linear.NonPositiveDefiniteMatrixException e) {
                throw new CompressionBreakdown();
            }
            // A = D S D, S = L L^T, so R = L^T D and z solves (D L) z = g, i.e. L z = g / D
            double[] z = new double[q];
            for (int a = 0; a < q; a++) {
                z[a] = normal.gradient(free[a]) * chain[a] / root[a];
            }
            RealVector zv = new ArrayRealVector(z, false);
            MatrixUtils.solveLowerTriangularSystem(l, zv);
            double zz = 0;
            for (int a = 0; a < q; a++) {
                zz += z[a] * z[a];
                value[a] = -z[a];
            }
            value[q] = -Math.sqrt(Math.max(0, normal.chiSquare() - zz));
            double[][] jac = new double[q + 1][q];
            for (int a = 0; a < q; a++) {
                for (int b = a; b < q; b++) {
                    jac[a][b] = l.getEntry(b, a) * root[b];
                }
            }
            jacobians[i] = jac;
        }

        @Override
        public RealVector computeValue(double[] uFree) {
            return new ArrayRealVector(values[slot(uFree)], true);
        }

        @Override
        public RealMatrix computeJacobian(double[] uFree) {
            double[][] jac = jacobians[slot(uFree)];
            if (jac == null) {
                throw new CompressionBreakdown();   // the model broke down at an accepted point
            }
            return new Array2DRowRealMatrix(jac, true);
        }

        @Override
        public Pair<RealVector, RealMatrix> value(RealVector point) {
            double[] x = point.toArray();
            return new Pair<>(computeValue(x), computeJacobian(x));
        }
    }

    private boolean[] fixedMask(int[] free) {
        boolean[] fixed = new boolean[p];
        Arrays.fill(fixed, true);
        for (int f : free) {
            fixed[f] = false;
        }
        return fixed;
    }

    /**
     * Weighted Jacobian d(f_i / sigma_i) / d u_j at the used points, n x p; columns of fixed coordinates are
     * left zero. Analytic when the model has one, otherwise forward differences computed in parallel.
     */
    private double[][] weightedJacobian(double[] u, boolean[] fixed, FitData target) {
        int n = target.usedCount();
        double[][] j = new double[n][p];
        double[] theta = natural(u);
        if (model.hasJacobian()) {
            double[] values = new double[model.size()];
            double[] jac = new double[model.size() * p];
            model.evaluate(theta, values, jac);
            evaluations.incrementAndGet();
            double[] chain = new double[p];
            for (int c = 0; c < p; c++) {
                chain[c] = fixed[c] ? 0 : specs.get(c).derivative(u[c]);
            }
            for (int i = 0; i < n; i++) {
                int g = target.usedIndex(i);
                double w = 1 / target.sigma(g);
                for (int c = 0; c < p; c++) {
                    j[i][c] = jac[g * p + c] * chain[c] * w;
                }
            }
            return j;
        }
        double[] values = new double[model.size()];
        model.evaluate(theta, values, null);
        evaluations.incrementAndGet();
        IntStream.range(0, p).filter(c -> !fixed[c]).parallel().forEach(c -> {
            double h = 1e-7 * Math.max(1, Math.abs(u[c]));
            double[] up = u.clone();
            up[c] += h;
            double[] shifted = new double[model.size()];
            model.evaluate(natural(up), shifted, null);
            evaluations.incrementAndGet();
            double step = up[c] - u[c];
            for (int i = 0; i < n; i++) {
                int g = target.usedIndex(i);
                j[i][c] = (shifted[g] - values[g]) / step / target.sigma(g);
            }
        });
        return j;
    }

    private double[] natural(double[] u) {
        double[] theta = new double[p];
        for (int j = 0; j < p; j++) {
            theta[j] = specs.get(j).toNatural(u[j]);
        }
        return theta;
    }

    // ---- uncertainty -------------------------------------------------------------------------------------

    /** s^2 (J^T J)^-1, or null if J^T J is singular (condition number of its scaled form above 1e13). */
    static double[][] covariance(double[][] jac, double s2) {
        int n = jac.length;
        int q = n == 0 ? 0 : jac[0].length;
        double[][] jtj = new double[q][q];
        for (double[] row : jac) {
            for (int a = 0; a < q; a++) {
                double ra = row[a];
                if (ra != 0) {
                    for (int b = a; b < q; b++) {
                        jtj[a][b] += ra * row[b];
                    }
                }
            }
        }
        for (int a = 0; a < q; a++) {
            for (int b = 0; b < a; b++) {
                jtj[a][b] = jtj[b][a];
            }
        }
        return covarianceOfNormal(jtj, s2);
    }

    /** s^2 A^-1 for A = J^T J (symmetric, not modified), or null if A is singular as for {@link #covariance}. */
    static double[][] covarianceOfNormal(double[][] jtj, double s2) {
        int q = jtj.length;
        double[] scale = new double[q];
        for (int a = 0; a < q; a++) {
            if (!(jtj[a][a] > 0) || !Double.isFinite(jtj[a][a])) {
                return null;
            }
            scale[a] = 1 / Math.sqrt(jtj[a][a]);
        }
        double[][] scaled = new double[q][q];
        for (int a = 0; a < q; a++) {
            for (int b = 0; b < q; b++) {
                scaled[a][b] = jtj[a][b] * scale[a] * scale[b];
            }
        }
        SingularValueDecomposition svd = new SingularValueDecomposition(new Array2DRowRealMatrix(scaled, false));
        if (!(svd.getConditionNumber() < SINGULAR_CONDITION)) {
            return null;
        }
        double[][] inv = svd.getSolver().getInverse().getData();
        double[][] cov = new double[q][q];
        for (int a = 0; a < q; a++) {
            for (int b = 0; b < q; b++) {
                cov[a][b] = s2 * inv[a][b] * scale[a] * scale[b];
            }
        }
        return cov;
    }

    /** t(0.975, dof), the two-sided 95% Student t quantile. */
    static double tQuantile(int dof) {
        return new TDistribution(null, dof).inverseCumulativeProbability(0.975);
    }

    private boolean[] atBound(double[] u) {
        boolean[] b = new boolean[p];
        for (int j = 0; j < p; j++) {
            ParameterSpec s = specs.get(j);
            if (s.scale() == ParameterSpec.Scale.LOGISTIC) {
                b[j] = Math.abs(u[j]) > 9;  // within about 1e-4 of the range from an end
            } else if (s.scale() == ParameterSpec.Scale.LOG) {
                b[j] = u[j] < -40 || u[j] > 40;
            }
        }
        return b;
    }

    private ParameterEstimate derivedEstimate(DerivedQuantity q, double[] u, double[][] cov, double tq) {
        double value = q.value(natural(u));
        double[] grad = new double[p];
        for (int j = 0; j < p; j++) {
            double h = 1e-6 * Math.max(1, Math.abs(u[j]));
            double[] up = u.clone();
            double[] dn = u.clone();
            up[j] += h;
            dn[j] -= h;
            double a = q.value(natural(up));
            double b = q.value(natural(dn));
            if (q.positive()) {
                a = Math.log(a);
                b = Math.log(b);
            }
            grad[j] = (a - b) / (2 * h);
        }
        double var = 0;
        for (int a = 0; a < p; a++) {
            for (int b = 0; b < p; b++) {
                var += grad[a] * cov[a][b] * grad[b];
            }
        }
        double se = Math.sqrt(var);
        Interval ci;
        double seNatural;
        if (q.positive() && value > 0) {
            ci = new Interval(value * Math.exp(-tq * se), value * Math.exp(tq * se), Interval.DELTA);
            seNatural = value * se;
        } else {
            ci = new Interval(value - tq * se, value + tq * se, Interval.DELTA);
            seNatural = se;
        }
        return new ParameterEstimate(q.name(), q.unit(), value, seNatural, ci, List.of(), false, true);
    }

    /**
     * Profile-likelihood interval of coordinate j. The profiled chi^2 is nearly quadratic in u_j near the
     * minimum, so sqrt(chi^2(u_j) - chi^2_min) is nearly linear: each side is bracketed by doubling steps of
     * one Wald half-width and then solved by the Illinois variant of regula falsi on that square root.
     */
    private Interval profile(Local best, int j, double waldHalfWidth, double threshold, List<String> warnings) {
        ParameterSpec s = specs.get(j);
        double[] range = s.naturalRange();
        double step = Math.max(waldHalfWidth, 1e-9);
        double lo = profileSide(best, j, -1, step, threshold, warnings);
        double hi = profileSide(best, j, +1, step, threshold, warnings);
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
    private double profileSide(Local best, int j, int direction, double step, double threshold,
                               List<String> warnings) {
        boolean[] fixed = new boolean[p];
        fixed[j] = true;
        double target = Math.sqrt(threshold);
        double limit = specs.get(j).scale() == ParameterSpec.Scale.LINEAR ? 1e4 * step : 30;
        double inside = 0;
        double insideG = -target;
        double[] insideU = best.u;
        double outside = Double.NaN;
        double outsideG = Double.NaN;
        double d = step;
        while (d <= limit) {
            double[] start = insideU.clone();
            start[j] = best.u[j] + direction * d;
            Local local = minimise(start, fixed, data);
            if (local.failure != null) {
                return Double.NaN;
            }
            double g = Math.sqrt(Math.max(0, local.chiSquare - best.chiSquare)) - target;
            if (local.chiSquare < best.chiSquare - 1e-9 * best.chiSquare) {
                warnings.add("Profiling " + specs.get(j).name() + " found a lower chi-square than the fit itself: "
                        + "the fit may have stopped at a local minimum.");
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
            Local local = minimise(start, fixed, data);
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

    private Interval[] bootstrap(Local best, double[] fitted, double s, List<String> warnings, Progress progress,
                                 long done, long total) {
        int reps = options.bootstrapReplicates;
        double[][] values = new double[reps][];
        AtomicLong finished = new AtomicLong(done);
        IntStream.range(0, reps).parallel().forEach(r -> {
            if (progress.isCancelled()) {
                return;
            }
            Random random = new Random(options.seed + 7919L * r);
            double[] y = new double[data.size()];
            Arrays.fill(y, Double.NaN);
            for (int i = 0; i < data.usedCount(); i++) {
                int g = data.usedIndex(i);
                y[g] = fitted[g] + s * data.sigma(g) * random.nextGaussian();
            }
            Local local = minimise(best.u, new boolean[p], data.withValues(y));
            if (local.failure == null) {
                values[r] = natural(local.u);
            }
            progress.report("bootstrap", finished.incrementAndGet(), total);
        });
        progress.checkCancelled();
        List<double[]> ok = Arrays.stream(values).filter(v -> v != null).toList();
        Interval[] out = new Interval[p];
        if (ok.size() < 0.9 * reps) {
            warnings.add(String.format(Locale.ROOT, "Only %d of %d bootstrap refits converged; the bootstrap "
                    + "intervals may be too narrow.", ok.size(), reps));
        }
        if (ok.size() < 20) {
            return out;
        }
        for (int j = 0; j < p; j++) {
            final int c = j;
            double[] v = ok.stream().mapToDouble(x -> x[c]).sorted().toArray();
            out[j] = new Interval(quantile(v, 0.025), quantile(v, 0.975), Interval.BOOTSTRAP);
        }
        return out;
    }

    private static double quantile(double[] sorted, double q) {
        double pos = q * (sorted.length - 1);
        int i = (int) Math.floor(pos);
        int k = Math.min(sorted.length - 1, i + 1);
        return sorted[i] + (pos - i) * (sorted[k] - sorted[i]);
    }
}
