package org.dendrokin.core.model;

import java.util.List;
import java.util.Map;
import java.util.Optional;

import org.dendrokin.core.Checks;

/**
 * One entry of the {@link ModelCatalogue}: everything the rest of the program knows about a built-in model
 * (simulation, fitting, model files, comparison, the command line and the ImageJ dialogs read it from here).
 * One-species models extend {@link ScalarModel}, which adds the reaction kernel and the fit's starting points;
 * multi-species models build a {@link ReactionNetwork}. Entries are immutable and thread-safe.
 */
public interface BuiltInModel {
    /** Which deterministic solver runs a model. */
    enum Engine {
        /** {@link ScalarRun}: one species, the reaction kernel of a {@link ScalarModel}. */
        SCALAR,
        /** {@link NetworkRun}: a reaction network (and the stochastic mode, unless refused). */
        NETWORK
    }

    /** The model's name as model files, summaries and results.json write it, e.g. {@code "nagumo"}. */
    String name();

    /** Its parameters, in the order every array of parameter values follows. */
    List<ModelParameter> parameters();

    /** The species a kymograph of the model shows. */
    String observedSpecies();

    /** Unit of the simulated values as written in outputs: {@code "u"} (dimensionless) or {@code "uM"}. */
    String signalUnit();

    /** Which solver runs it; {@link #realise} gives the matching {@link Realisation}. */
    Engine engine();

    /**
     * The fastest reaction rate a time step must resolve, 1/s: the scalar solver's step rule ({@link SolverSettings})
     * uses it, and a model file's fixed step may not exceed its inverse. 0 when the reactions are integrated
     * exactly or left to the L-stable Rosenbrock step. (A network runs with its own rate scale,
     * {@link ReactionNetwork#rateScalePerS()}.)
     *
     * @param parameters values in the order of {@link #parameters()}, already within their ranges
     */
    double stiffnessPerS(double[] parameters);

    /** Quantities the model gives in closed form (front speed, front width, length constant), for fits. */
    default List<ClosedForm> closedForms() {
        return List.of();
    }

    /** True for a model whose solutions are travelling fronts: it has a front speed or front width in closed form. */
    default boolean travellingWave() {
        return closedForms().stream().anyMatch(c -> c.name().equals("front_speed") || c.name().equals("front_width"));
    }

    /**
     * The length the simulation grid must resolve (a front width or length constant), if the model has one in
     * closed form: a model file's grid spacing must be at most half of it.
     */
    default Optional<ClosedForm> gridScale() {
        return Optional.empty();
    }

    /**
     * What the engine runs for these values.
     *
     * @param parameters values in the order of {@link #parameters()}. Not modified.
     * @param stimuli    the protocol
     * @throws IllegalArgumentException for values the model cannot run with
     */
    Realisation realise(double[] parameters, List<Stimulus> stimuli);

    /**
     * Why the stochastic mode cannot run this model, completing "stochastic is not available for NAME, ...", or
     * null when it can. It runs reaction networks only, so every {@link Engine#SCALAR} model is refused.
     */
    default String stochasticRefusal() {
        return engine() == Engine.SCALAR ? "which is a continuum model only" : null;
    }

    /** The parameter names, in order. */
    default List<String> parameterNames() {
        return parameters().stream().map(ModelParameter::name).toList();
    }

    /**
     * The values of a name-to-value map in the order of {@link #parameters()}.
     *
     * @throws IllegalArgumentException when a parameter is missing
     */
    default double[] values(Map<String, Double> byName) {
        List<ModelParameter> list = parameters();
        double[] p = new double[list.size()];
        for (int i = 0; i < p.length; i++) {
            Double v = byName.get(list.get(i).name());
            Checks.require(v != null, "parameter " + list.get(i).name() + " is missing");
            p[i] = v;
        }
        return p;
    }

    /**
     * Checks values against the parameters' ranges.
     *
     * @throws IllegalArgumentException naming the first parameter out of range, or for a wrong count
     */
    default void check(double[] parameters) {
        List<ModelParameter> list = parameters();
        Checks.require(parameters.length == list.size(), name() + " takes " + list.size() + " parameters "
                + parameterNames() + ", got " + parameters.length);
        for (int i = 0; i < parameters.length; i++) {
            list.get(i).check(parameters[i]);
        }
    }
}
