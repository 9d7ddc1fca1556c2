package org.dendrokin.core.model;

import java.util.Objects;
import java.util.function.ToDoubleFunction;

import org.dendrokin.core.units.Unit;

/**
 * A quantity a built-in model gives in closed form from its parameters, such as a bistable front's speed
 * sqrt(k D / 2)(1 - 2a). Fits report it with an interval (delta method); model files use the length scales to
 * check that the grid resolves the model.
 *
 * @param name        key in results.json, e.g. {@code "front_speed"}
 * @param description words and formula for messages, e.g. {@code "front width sqrt(2 D / k)"}
 * @param unit        unit of the value
 * @param positive    true when the value is positive wherever a fit keeps the parameters (its interval is then
 *                    made on the log scale)
 * @param formula     the model's parameter values, in the order of {@link BuiltInModel#parameters()}, to the value
 */
public record ClosedForm(String name, String description, Unit unit, boolean positive,
        ToDoubleFunction<double[]> formula) {
    public ClosedForm {
        Objects.requireNonNull(name, "name");
        Objects.requireNonNull(description, "description");
        Objects.requireNonNull(unit, "unit");
        Objects.requireNonNull(formula, "formula");
    }

    /** The value at the given parameters (in the model's order). */
    public double value(double[] parameters) {
        return formula.applyAsDouble(parameters);
    }
}
