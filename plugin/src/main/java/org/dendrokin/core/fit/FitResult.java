package org.dendrokin.core.fit;

import java.util.List;
import java.util.Optional;

/**
 * The outcome of fitting one model. A fit that did not converge is still a result: {@code converged} is
 * false, {@code reason} says why in a plain sentence, and its numbers must not be reported as estimates.
 *
 * @param model          model name
 * @param converged      true if the optimiser converged and the covariance could be computed
 * @param reason         why the fit is not usable (empty when converged)
 * @param parameters     fitted parameters, in the model's order
 * @param derived        quantities computed from the parameters, with delta-method intervals
 * @param pointsUsed     n, the number of data points in the fit
 * @param chiSquare      weighted residual sum of squares, sum ((y - f) / sigma)^2
 * @param rmse           root mean square residual, signal units (unweighted)
 * @param aic            Akaike's criterion, n ln(chi^2 / n) + 2K with K = p + 1
 * @param aicc           AIC + 2K(K + 1) / (n - K - 1)
 * @param bic            n ln(chi^2 / n) + K ln n
 * @param correlation    parameter correlation matrix on the optimiser's scale (null if unavailable)
 * @param fitted         the model's prediction over the whole grid at the estimates (null if none)
 * @param warnings       plain-sentence warnings about this fit
 * @param evaluations    model evaluations used (all starts, profiles and bootstrap replicates)
 */
public record FitResult(String model, boolean converged, String reason, List<ParameterEstimate> parameters,
                        List<ParameterEstimate> derived, int pointsUsed, double chiSquare, double rmse,
                        double aic, double aicc, double bic, double[][] correlation, double[] fitted,
                        List<String> warnings, long evaluations) {
    public FitResult {
        parameters = List.copyOf(parameters);
        derived = List.copyOf(derived);
        warnings = List.copyOf(warnings);
    }

    /** The estimate of a parameter or derived quantity by name. */
    public Optional<ParameterEstimate> estimate(String name) {
        return java.util.stream.Stream.concat(parameters.stream(), derived.stream())
                .filter(e -> e.name().equals(name)).findFirst();
    }

    /** Natural parameter values in the model's order. */
    public double[] values() {
        return parameters.stream().mapToDouble(ParameterEstimate::value).toArray();
    }

    /** A criterion's value by name ("aic", "aicc" or "bic"). */
    public double criterion(String name) {
        switch (name) {
            case "aic":
                return aic;
            case "aicc":
                return aicc;
            case "bic":
                return bic;
            default:
                throw new IllegalArgumentException("unknown criterion " + name + "; use aic, aicc or bic");
        }
    }

    /** A result for a fit that could not be made at all. */
    static FitResult failed(String model, String reason, List<String> warnings) {
        return new FitResult(model, false, reason, List.of(), List.of(), 0, Double.NaN, Double.NaN, Double.NaN,
                Double.NaN, Double.NaN, null, null, warnings, 0);
    }
}
