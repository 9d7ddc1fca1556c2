package org.dendrokin.core.model;

import org.dendrokin.core.Checks;

/**
 * How the deterministic solver chooses its internal time step. Between two consecutive event times
 * (output times, stimulus starts and ends) it takes n equal steps, n = ceil(gap / dtMax), with
 * <pre>
 *   dtMax = min(maxStepS, stepFactor * min(1 / rate, h / sqrt(D * rate), w^2 / D))
 * </pre>
 * where rate (1/s) is the model's fastest reaction rate for the given parameters (k for Nagumo, r for
 * Fisher-KPP, the largest rate constant of a network; linear decay is integrated exactly and does not
 * count), h the grid spacing (um), D the largest diffusion coefficient (um^2/s) and w the narrowest
 * stimulus width or h, whichever is larger (um). The three terms keep the reaction sub-step, the distance
 * a front travels in one step (relative to h) and the spread of the sharpest stimulus in one step small;
 * with the default factor the time error stays below the spatial error of the grid (see docs/models.md).
 * If {@code fixedStepS} is positive it replaces the rule (rounded down so that it divides every gap),
 * which makes the result a smooth function of the parameters, as a fit may prefer.
 *
 * @param stepFactor  the factor in the rule above, dimensionless, positive (default 0.5)
 * @param maxStepS    an upper bound on the step, s, positive (default: unbounded)
 * @param fixedStepS  a fixed step, s, or 0 to use the rule
 * @param smoothing   after a pulse or the start or end of a clamp, replace the next Crank-Nicolson step by
 *                    two backward-Euler half steps (Rannacher start-up), which damps the grid-scale
 *                    oscillations that Crank-Nicolson leaves on a sharp change (default true)
 */
public record SolverSettings(double stepFactor, double maxStepS, double fixedStepS, boolean smoothing) {
    /** The defaults: factor 0.5, no upper bound, no fixed step, smoothing on. */
    public static final SolverSettings DEFAULT = new SolverSettings(0.5, Double.POSITIVE_INFINITY, 0, true);

    public SolverSettings {
        Checks.positiveFinite(stepFactor, "step factor");
        Checks.require(maxStepS > 0, "the largest time step must be positive, got " + maxStepS);
        Checks.nonNegativeFinite(fixedStepS, "fixed time step (s)");
    }

    public SolverSettings withStepFactor(double factor) {
        return new SolverSettings(factor, maxStepS, fixedStepS, smoothing);
    }

    public SolverSettings withMaxStepS(double step) {
        return new SolverSettings(stepFactor, step, fixedStepS, smoothing);
    }

    public SolverSettings withFixedStepS(double step) {
        return new SolverSettings(stepFactor, maxStepS, step, smoothing);
    }

    public SolverSettings withSmoothing(boolean on) {
        return new SolverSettings(stepFactor, maxStepS, fixedStepS, on);
    }

    /** The step limit of the rule, s, for the given rate (1/s), spacing (um), D (um^2/s) and width (um). */
    public double maxStep(double ratePerS, double hUm, double dUm2PerS, double widthUm) {
        double limit = maxStepS;
        if (ratePerS > 0) {
            limit = Math.min(limit, stepFactor / ratePerS);
            if (dUm2PerS > 0) {
                limit = Math.min(limit, stepFactor * hUm / Math.sqrt(dUm2PerS * ratePerS));
            }
        }
        if (dUm2PerS > 0) {
            double w = Math.max(widthUm, hUm);
            limit = Math.min(limit, stepFactor * w * w / dUm2PerS);
        }
        return limit;
    }
}
