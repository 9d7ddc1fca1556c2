package org.dendrokin.core.fit;

import org.dendrokin.core.Checks;
import org.dendrokin.core.units.Unit;

/**
 * One fitted parameter: its name as written in results.json, its unit, and the scale on which the optimiser
 * moves it. On {@link Scale#LOG} the optimiser sees u = ln(theta), so theta stays positive; on
 * {@link Scale#LOGISTIC} it sees u with theta = lower + (upper - lower) / (1 + exp(-u)), so theta stays
 * strictly inside (lower, upper); on {@link Scale#LINEAR} u = theta. Intervals are made on the u scale and
 * mapped back, which keeps them inside the allowed range.
 *
 * @param name  key in results.json, e.g. {@code "D"}
 * @param unit  unit of the natural value
 * @param scale how the optimiser sees the parameter
 * @param lower lower bound of a LOGISTIC parameter (ignored otherwise)
 * @param upper upper bound of a LOGISTIC parameter (ignored otherwise)
 */
public record ParameterSpec(String name, Unit unit, Scale scale, double lower, double upper) {
    /** How the optimiser sees a parameter. */
    public enum Scale { LINEAR, LOG, LOGISTIC }

    public ParameterSpec {
        Checks.require(name != null && !name.isBlank(), "a parameter needs a name");
        Checks.require(unit != null && scale != null, "parameter " + name + " needs a unit and a scale");
        if (scale == Scale.LOGISTIC) {
            Checks.finite(lower, name + " lower bound");
            Checks.finite(upper, name + " upper bound");
            Checks.require(upper > lower, name + ": upper bound must exceed lower bound");
        }
    }

    public static ParameterSpec linear(String name, Unit unit) {
        return new ParameterSpec(name, unit, Scale.LINEAR, Double.NaN, Double.NaN);
    }

    public static ParameterSpec positive(String name, Unit unit) {
        return new ParameterSpec(name, unit, Scale.LOG, 0, Double.POSITIVE_INFINITY);
    }

    public static ParameterSpec bounded(String name, Unit unit, double lower, double upper) {
        return new ParameterSpec(name, unit, Scale.LOGISTIC, lower, upper);
    }

    /** The optimiser's coordinate u for a natural value theta. */
    public double toInternal(double theta) {
        switch (scale) {
            case LOG:
                Checks.require(theta > 0, name + " must be positive, got " + theta);
                return Math.log(theta);
            case LOGISTIC:
                Checks.require(theta > lower && theta < upper,
                        name + " must lie strictly between " + lower + " and " + upper + ", got " + theta);
                double f = (theta - lower) / (upper - lower);
                return Math.log(f / (1 - f));
            default:
                return theta;
        }
    }

    /** The natural value theta for an optimiser coordinate u. */
    public double toNatural(double u) {
        switch (scale) {
            case LOG:
                return Math.exp(u);
            case LOGISTIC:
                return lower + (upper - lower) * logistic(u);
            default:
                return u;
        }
    }

    /** d theta / d u at u. */
    public double derivative(double u) {
        switch (scale) {
            case LOG:
                return Math.exp(u);
            case LOGISTIC:
                double s = logistic(u);
                return (upper - lower) * s * (1 - s);
            default:
                return 1;
        }
    }

    /** The natural range of the parameter (lower, upper); (-inf, inf) for LINEAR, (0, inf) for LOG. */
    public double[] naturalRange() {
        switch (scale) {
            case LOG:
                return new double[] {0, Double.POSITIVE_INFINITY};
            case LOGISTIC:
                return new double[] {lower, upper};
            default:
                return new double[] {Double.NEGATIVE_INFINITY, Double.POSITIVE_INFINITY};
        }
    }

    private static double logistic(double u) {
        return u >= 0 ? 1 / (1 + Math.exp(-u)) : Math.exp(u) / (1 + Math.exp(u));
    }
}
