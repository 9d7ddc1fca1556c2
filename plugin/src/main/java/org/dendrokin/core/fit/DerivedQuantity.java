package org.dendrokin.core.fit;

import java.util.function.ToDoubleFunction;

import org.dendrokin.core.model.ClosedForm;
import org.dendrokin.core.units.Unit;

/**
 * A quantity computed from fitted parameters, e.g. a bistable front's speed sqrt(k D / 2)(1 - 2a). Its
 * interval comes from the parameter covariance by the delta method (on the log scale when the quantity is
 * positive). The built-in models' closed forms come from the model catalogue ({@link #of}).
 *
 * @param name     key in results.json, e.g. {@code "front_speed"}
 * @param unit     unit of the value
 * @param positive true if the quantity is always positive (its interval is then made on the log scale)
 * @param function natural parameter values to the quantity
 */
public record DerivedQuantity(String name, Unit unit, boolean positive, ToDoubleFunction<double[]> function) {
    /** A catalogue entry's closed form, for a fit model whose parameters start with the entry's, in its order. */
    public static DerivedQuantity of(ClosedForm form) {
        return new DerivedQuantity(form.name(), form.unit(), form.positive(), form.formula());
    }

    public double value(double[] parameters) {
        return function.applyAsDouble(parameters);
    }
}
