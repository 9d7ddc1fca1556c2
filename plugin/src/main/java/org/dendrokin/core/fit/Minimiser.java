package org.dendrokin.core.fit;

import java.util.Arrays;
import java.util.List;
import java.util.concurrent.atomic.AtomicLong;
import java.util.function.BooleanSupplier;
import java.util.stream.IntStream;

import org.apache.commons.math3.exception.MathIllegalStateException;
import org.apache.commons.math3.fitting.leastsquares.LeastSquaresBuilder;
import org.apache.commons.math3.fitting.leastsquares.LeastSquaresOptimizer;
import org.apache.commons.math3.fitting.leastsquares.LeastSquaresProblem;
import org.apache.commons.math3.fitting.leastsquares.LevenbergMarquardtOptimizer;
import org.apache.commons.math3.fitting.leastsquares.ValueAndJacobianFunction;
import org.dendrokin.core.Checks;

/**
 * One local weighted least-squares minimisation, chi^2(u) = sum_i ((y_i - f_i(theta(u))) / sigma_i)^2, by Commons
 * Math's {@link LevenbergMarquardtOptimizer} (Levenberg 1944, Marquardt 1963; sheet s8.1) on the coordinates u of
 * the optimiser's scale (see {@link ParameterSpec}), some of which may be held fixed (profiles). The multi-start
 * driver, the profiles and the bootstrap refits all minimise through one instance, which also counts the model
 * evaluations. The problem is handed over as a {@link CompressedProblem} when the model has one-pass normal
 * equations and the data are many (falling back to the {@link FullProblem} for a start where the compressed form
 * breaks down), otherwise as the full problem. Safe to use from several threads: each call builds its own problem.
 */
final class Minimiser {
    /** Result of one local minimisation: the end point and its chi^2, or why it failed. */
    static final class Local {
        double[] u;
        double chiSquare;
        String failure;
    }

    private final FitModel model;
    private final List<ParameterSpec> specs;
    private final int p;
    private final int maxEvaluations;
    private final double tolerance;
    private final boolean compressed;
    private final AtomicLong evaluations = new AtomicLong();

    /**
     * @param model          the model; its {@code evaluate} may be called from several threads
     * @param data           the data the fit is for (decides the form with {@code form})
     * @param form           how to hand the problem to the optimiser
     * @param maxEvaluations evaluations allowed per minimisation
     * @param tolerance      relative tolerance on chi^2 and on the parameters
     */
    Minimiser(FitModel model, FitData data, ModelFit.Form form, int maxEvaluations, double tolerance) {
        Checks.require(model.size() == data.size(),
                "model " + model.name() + " predicts " + model.size() + " points but the data have " + data.size());
        Checks.require(form != ModelFit.Form.COMPRESSED || model.hasNormalEquations(),
                "model " + model.name() + " has no one-pass normal equations");
        this.model = model;
        this.specs = model.parameters();
        this.p = specs.size();
        this.maxEvaluations = maxEvaluations;
        this.tolerance = tolerance;
        this.compressed = form == ModelFit.Form.COMPRESSED || (form == ModelFit.Form.AUTO
                && model.hasNormalEquations() && data.usedCount() >= CompressedProblem.POINTS_PER_PARAMETER * p);
    }

    FitModel model() {
        return model;
    }

    ParameterSpec spec(int j) {
        return specs.get(j);
    }

    List<ParameterSpec> specs() {
        return specs;
    }

    int parameterCount() {
        return p;
    }

    /** True if the problem is handed to the optimiser in compressed form. */
    boolean compressed() {
        return compressed;
    }

    /** Model evaluations so far (each pass over the data, each finite-difference column, counts one). */
    long evaluations() {
        return evaluations.get();
    }

    void countEvaluation() {
        evaluations.incrementAndGet();
    }

    /** Natural parameter values for coordinates u on the optimiser's scale. */
    double[] natural(double[] u) {
        double[] theta = new double[p];
        for (int j = 0; j < p; j++) {
            theta[j] = specs.get(j).toNatural(u[j]);
        }
        return theta;
    }

    /**
     * Minimises chi^2 over the coordinates not marked fixed, starting from u0 (fixed ones keep their u0 value).
     *
     * @param u0     start on the optimiser's scale. Not modified.
     * @param fixed  which coordinates to hold. Not modified.
     * @param target observations and sigmas (the fit's data, or a bootstrap replicate on the same grid)
     */
    Local minimise(double[] u0, boolean[] fixed, FitData target) {
        int[] free = IntStream.range(0, p).filter(j -> !fixed[j]).toArray();
        if (compressed) {
            try {
                CompressedProblem problem = new CompressedProblem(this, u0, free, target);
                return minimise(u0, free, problem, new double[free.length + 1], () -> problem.nonFinite);
            } catch (CompressedProblem.Breakdown e) {
                // J^T W J is too ill-conditioned somewhere on the way: start again on the full problem
            }
        }
        FullProblem problem = new FullProblem(this, u0, free, target);
        return minimise(u0, free, problem, FullProblem.weightedObservations(target), () -> problem.nonFinite);
    }

    private Local minimise(double[] u0, int[] free, ValueAndJacobianFunction objective, double[] y,
                           BooleanSupplier nonFinite) {
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
                .maxEvaluations(maxEvaluations)
                .maxIterations(maxEvaluations)
                .build();
        LevenbergMarquardtOptimizer optimizer = new LevenbergMarquardtOptimizer()
                .withCostRelativeTolerance(tolerance)
                .withParameterRelativeTolerance(tolerance);
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

    /** Mask of the coordinates not listed as free. */
    boolean[] fixedMask(int[] free) {
        boolean[] fixed = new boolean[p];
        Arrays.fill(fixed, true);
        for (int f : free) {
            fixed[f] = false;
        }
        return fixed;
    }

    /**
     * Weighted Jacobian d(f_i / sigma_i) / d u_j at the used points, n x p; columns of fixed coordinates are left
     * zero. Analytic when the model has one, otherwise forward differences computed in parallel.
     *
     * @param u      coordinates on the optimiser's scale. Not modified.
     * @param fixed  coordinates whose column stays zero. Not modified.
     * @param target the points and their sigmas
     */
    double[][] weightedJacobian(double[] u, boolean[] fixed, FitData target) {
        int n = target.usedCount();
        double[][] j = new double[n][p];
        double[] theta = natural(u);
        if (model.hasJacobian()) {
            double[] values = new double[model.size()];
            double[] jac = new double[model.size() * p];
            model.evaluate(theta, values, jac);
            countEvaluation();
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
        countEvaluation();
        IntStream.range(0, p).filter(c -> !fixed[c]).parallel().forEach(c -> {
            double h = 1e-7 * Math.max(1, Math.abs(u[c]));
            double[] up = u.clone();
            up[c] += h;
            double[] shifted = new double[model.size()];
            model.evaluate(natural(up), shifted, null);
            countEvaluation();
            double step = up[c] - u[c];
            for (int i = 0; i < n; i++) {
                int g = target.usedIndex(i);
                j[i][c] = (shifted[g] - values[g]) / step / target.sigma(g);
            }
        });
        return j;
    }

    /**
     * True for each coordinate that sits at the edge of its allowed range: a logistic coordinate beyond |u| = 9
     * (within about 1e-4 of the range from an end), a log coordinate beyond |u| = 40.
     */
    boolean[] atBound(double[] u) {
        boolean[] b = new boolean[p];
        for (int j = 0; j < p; j++) {
            ParameterSpec s = specs.get(j);
            if (s.scale() == ParameterSpec.Scale.LOGISTIC) {
                b[j] = Math.abs(u[j]) > 9;
            } else if (s.scale() == ParameterSpec.Scale.LOG) {
                b[j] = u[j] < -40 || u[j] > 40;
            }
        }
        return b;
    }
}
