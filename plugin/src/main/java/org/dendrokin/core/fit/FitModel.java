package org.dendrokin.core.fit;

import java.util.List;

/**
 * A model that predicts every point of the data grid (for a kymograph: {@code frame * positions + position},
 * row-major) from its parameters. Implementations must be safe to call from several threads at once,
 * because finite-difference Jacobians and bootstrap replicates are computed in parallel.
 */
public interface FitModel {
    /** The model's name as written in results.json, e.g. {@code "diffusion-decay"}. */
    String name();

    /** The parameters, in the order of the arrays passed to {@link #evaluate}. */
    List<ParameterSpec> parameters();

    /** Number of grid points predicted. */
    int size();

    /**
     * Predicts the grid.
     *
     * @param parameters natural parameter values, in the order of {@link #parameters()}. Not modified.
     * @param values     receives the prediction at each grid point, length {@link #size()}. Modified.
     * @param jacobian   if not null and {@link #hasJacobian()}, receives d value / d parameter, row-major
     *                   {@code size() x parameters().size()}, natural scale. Modified.
     */
    void evaluate(double[] parameters, double[] values, double[] jacobian);

    /** True if {@link #evaluate} fills the Jacobian; otherwise the fitter uses finite differences. */
    default boolean hasJacobian() {
        return true;
    }

    /**
     * True if {@link #normalEquations} is implemented. The fitter then solves large problems through them (one
     * pass over the data per parameter point, no n x p Jacobian kept) instead of through {@link #evaluate}.
     */
    default boolean hasNormalEquations() {
        return false;
    }

    /**
     * Predicts the grid and sums the weighted normal equations over the data in one pass: A = sum w_i J_i J_i^T,
     * g = sum w_i r_i J_i, chi^2 = sum w_i r_i^2 with J_i = d f_i / d theta (natural scale), r_i = y_i - f_i and
     * w_i = {@link FitData#weight}. Must agree with {@link #evaluate} to rounding and be safe to call from several
     * threads at once. Only called when {@link #hasNormalEquations()}.
     *
     * @param parameters natural parameter values. Not modified.
     * @param data       observations on this model's grid. Not modified.
     * @param out        cleared and filled. Modified.
     * @param fitted     if not null, receives the prediction at every grid point, length {@link #size()}. Modified.
     */
    default void normalEquations(double[] parameters, FitData data, NormalEquations out, double[] fitted) {
        throw new UnsupportedOperationException(name() + " has no one-pass normal equations");
    }

    /**
     * True if {@link #evaluateRange} is implemented: the fitter then reads the Jacobian a block of points at a time
     * after the fit (for the robust intervals) instead of evaluating all of it into an n x p array.
     */
    default boolean hasRangeEvaluation() {
        return false;
    }

    /**
     * Predicts the grid points [from, to) only, with their Jacobian rows. Must agree with {@link #evaluate} to
     * rounding and be safe to call from several threads at once. Only called when {@link #hasRangeEvaluation()}.
     *
     * @param parameters natural parameter values. Not modified.
     * @param from       first grid point, inclusive
     * @param to         last grid point, exclusive
     * @param values     receives f_i at index i - from, length at least to - from. Modified.
     * @param jacobian   receives d f_i / d theta (natural scale), row-major (to - from) x p. Modified.
     */
    default void evaluateRange(double[] parameters, int from, int to, double[] values, double[] jacobian) {
        throw new UnsupportedOperationException(name() + " does not evaluate ranges of its grid");
    }

    /** The parameters whose intervals users read first (profiled when profiles are asked for). */
    default List<String> headlineParameters() {
        return List.of();
    }

    /** Quantities computed from the parameters that the data may fix better than the parameters themselves. */
    default List<DerivedQuantity> derivedQuantities() {
        return List.of();
    }

    /**
     * A plain sentence added to the warnings when headline parameters are poorly determined, saying what the
     * data do fix instead (empty for none).
     */
    default String poorlyDeterminedAdvice() {
        return "";
    }

    /** Index of a parameter by name, or -1. */
    default int indexOf(String parameterName) {
        List<ParameterSpec> specs = parameters();
        for (int i = 0; i < specs.size(); i++) {
            if (specs.get(i).name().equals(parameterName)) {
                return i;
            }
        }
        return -1;
    }
}
