package org.dendrokin.core.model;

import java.util.List;
import java.util.Map;

/**
 * A one-species built-in model, u_t = D (1/A) d/dx(A du/dx) + f(u; p), with the diffusion coefficient D as its
 * first parameter and the reaction term f after it. An entry gives f and its derivatives node by node (the
 * reference the solver's sub-steps are checked against), the reaction sub-step the solver takes over whole rows
 * of nodes (exact where f allows, else the L-stable Rosenbrock method ROS2), the rate the step rule must resolve,
 * and, for fits, its starting points and advice.
 * <p>
 * The row methods are what {@link ScalarStepper} calls once per half step; each is one or a few loops with no
 * dependence between nodes, which the JIT vectorises, so no call is made per node. Subclasses live in this
 * package and are listed in {@link ModelCatalogue}; they are immutable and thread-safe.
 */
public abstract class ScalarModel implements BuiltInModel {
    /** gamma of ROS2, 1 + 1/sqrt(2), which makes it L-stable (Verwer, Spee, Blom &amp; Hundsdorfer 1999). */
    static final double ROS2_GAMMA = 1 + 1 / Math.sqrt(2);

    @Override
    public final String observedSpecies() {
        return "u";
    }

    @Override
    public String signalUnit() {
        return "u";
    }

    @Override
    public final Engine engine() {
        return Engine.SCALAR;
    }

    @Override
    public final Realisation realise(double[] parameters, List<Stimulus> stimuli) {
        return new Realisation.Scalar(this, parameters, stimuli, observedSpecies(), Map.of());
    }

    /**
     * The reaction term f(u; p), in units of u per second.
     *
     * @param u value at one node
     * @param p parameters in the order of {@link #parameters()} (D first, unused by f)
     */
    public abstract double rate(double u, double[] p);

    /** df/du at u, 1/s. */
    public abstract double rateDu(double u, double[] p);

    /** df/dp_j at u; 0 for j = 0 (D does not enter f). */
    public abstract double rateDp(double u, double[] p, int j);

    /**
     * One reaction sub-step at every node: {@code to[i]} = the solution at time tau of du/dt = f(u; p) started
     * from {@code from[i]}, exactly or by ROS2 (second order, L-stable). Allocates nothing.
     *
     * @param p    parameters, already checked. Not modified.
     * @param tau  sub-step, s, positive
     * @param from values before, length at least n. Not modified unless it is {@code to}.
     * @param to   receives the values after; may be {@code from}. Modified.
     * @param n    number of nodes
     */
    abstract void react(double[] p, double tau, double[] from, double[] to, int n);

    /**
     * {@link #react} in place together with its tangent-linear update of the sensitivities: with R the sub-step's
     * map, s_D &lt;- (dR/du) s_D and s_j &lt;- (dR/du) s_j + dR/dp_j for the reaction parameters, the exact
     * derivatives of the discrete step.
     *
     * @param u       values, replaced by the values after the sub-step. Modified.
     * @param sens    one row per parameter, du/dp_j at every node. Modified.
     * @param scratch {@link #scratchRows()} rows of at least n values. Modified.
     */
    abstract void reactWithSensitivities(double[] p, double tau, double[] u, double[][] sens, int n,
            double[][] scratch);

    /** Rows of scratch space {@link #reactWithSensitivities} needs. */
    int scratchRows() {
        return 0;
    }

    /**
     * Starting points for a fit to a kymograph: the model's parameters for a few plausible fronts or spreads,
     * read off the model-free measures.
     */
    public abstract StartPoints startPoints(DataGuesses guesses);

    /**
     * What to report instead when the data do not determine the parameters separately (one sentence or two), or
     * "" when the model has no such advice.
     */
    public String fitAdvice() {
        return "";
    }
}
