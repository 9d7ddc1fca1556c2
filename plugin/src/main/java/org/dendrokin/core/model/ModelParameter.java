package org.dendrokin.core.model;

import java.util.Objects;

import org.dendrokin.core.Checks;
import org.dendrokin.core.units.Unit;

/**
 * One parameter of a built-in model: its key in model files, summaries and results.json, its unit, the values a
 * simulation accepts, and the open range a fit keeps it in. The fit range also sets the scale the optimiser
 * moves the parameter on: (0, infinity) the log scale, a finite (lower, upper) a logistic map onto it, anything
 * else the plain value.
 *
 * @param name     key, e.g. {@code "D"}
 * @param unit     unit of the value
 * @param label    words for messages, with the key and the unit, e.g. {@code "diffusion coefficient D (um^2/s)"}
 * @param range    the values a simulation accepts
 * @param fitLower lower end of the open range a fit keeps the value in
 * @param fitUpper upper end of that range
 */
public record ModelParameter(String name, Unit unit, String label, Range range, double fitLower, double fitUpper) {
    /** The values a simulation accepts. */
    public enum Range {
        /** Any finite value (thresholds). */
        ANY,
        /** Zero or positive (diffusion coefficients, rates, concentrations). */
        NON_NEGATIVE,
        /** Strictly positive (a constant that divides, such as a dissociation constant). */
        POSITIVE
    }

    public ModelParameter {
        Checks.require(name != null && !name.isBlank(), "a model parameter needs a name");
        Objects.requireNonNull(unit, "unit");
        Objects.requireNonNull(label, "label");
        Objects.requireNonNull(range, "range");
        Checks.require(fitUpper > fitLower, name + ": the fit range must not be empty");
    }

    /** A diffusion coefficient (um^2/s), zero or positive; fitted on the log scale. */
    public static ModelParameter diffusion(String name, String meaning) {
        return new ModelParameter(name, Unit.DIFFUSION, meaning + " " + name + " (um^2/s)", Range.NON_NEGATIVE, 0,
                Double.POSITIVE_INFINITY);
    }

    /** A first-order rate (1/s), zero or positive; fitted on the log scale. */
    public static ModelParameter rate(String name, String meaning) {
        return new ModelParameter(name, Unit.RATE, meaning + " " + name + " (1/s)", Range.NON_NEGATIVE, 0,
                Double.POSITIVE_INFINITY);
    }

    /** A quantity in the given unit, zero or positive (or strictly positive); fitted on the log scale. */
    public static ModelParameter nonNegative(String name, Unit unit, String meaning, boolean strictly) {
        String suffix = unit == Unit.DIMENSIONLESS ? "" : " (" + unit.symbol() + ")";
        return new ModelParameter(name, unit, meaning + " " + name + suffix,
                strictly ? Range.POSITIVE : Range.NON_NEGATIVE, 0, Double.POSITIVE_INFINITY);
    }

    /** A dimensionless value that may take any sign, which a fit keeps inside (fitLower, fitUpper). */
    public static ModelParameter signed(String name, String meaning, double fitLower, double fitUpper) {
        return new ModelParameter(name, Unit.DIMENSIONLESS, meaning + " " + name, Range.ANY, fitLower, fitUpper);
    }

    /**
     * Checks a value for a simulation.
     *
     * @return the value
     * @throws IllegalArgumentException naming the parameter when the value lies outside {@link #range()}
     */
    public double check(double value) {
        return switch (range) {
            case ANY -> Checks.finite(value, label);
            case NON_NEGATIVE -> Checks.nonNegativeFinite(value, label);
            case POSITIVE -> Checks.positiveFinite(value, label);
        };
    }
}
