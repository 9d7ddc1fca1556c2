package org.dendrokin.core.model;

import org.dendrokin.core.Checks;

/**
 * How the deterministic solver chooses its internal time step. Between two consecutive event times
 * (time 0, stimulus starts and ends, the last output time) it takes n equal steps, n = ceil(gap / dtMax),
 * and samples outputs that fall between two steps by linear interpolation in time (second order, like the
 * scheme), so dense imaging frames do not force small steps. dtMax is
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
 * @param spatialOrder 2 for the standard 3-point Laplacian, 4 for the compact fourth-order (Numerov-type)
 *                    form (I + h^2/12 d2) u_t = D d2 u, which keeps the Crank-Nicolson system tridiagonal and
 *                    divides the spatial error of smooth fronts by roughly (h / width)^2 x 20. Order 4 is used
 *                    only on cables of uniform cross-section; elsewhere the solver falls back to order 2.
 *                    Default 4.
 * @param timeTolerance 0 (default) to run once with the rule; if positive, {@link Simulation} halves the step
 *                    (all of stepFactor, maxStepS and fixedStepS) until the Richardson estimate of the time
 *                    error of the observed output is at most timeTolerance * max(1, max |u|), dimensionless.
 *                    The single runs ({@link ScalarRun}, {@link NetworkRun}) ignore it.
 */
public record SolverSettings(double stepFactor, double maxStepS, double fixedStepS, boolean smoothing,
        int spatialOrder, double timeTolerance) {
    /** The defaults: factor 0.5, no upper bound, no fixed step, smoothing on, compact fourth order in space. */
    public static final SolverSettings DEFAULT = new SolverSettings(0.5, Double.POSITIVE_INFINITY, 0, true, 4, 0);

    public SolverSettings {
        Checks.positiveFinite(stepFactor, "step factor");
        Checks.require(maxStepS > 0, "the largest time step must be positive, got " + maxStepS);
        Checks.nonNegativeFinite(fixedStepS, "fixed time step (s)");
        Checks.require(spatialOrder == 2 || spatialOrder == 4, "the spatial order must be 2 or 4, got " + spatialOrder);
        Checks.nonNegativeFinite(timeTolerance, "time tolerance");
    }

    /** Settings without time-error control. */
    public SolverSettings(double stepFactor, double maxStepS, double fixedStepS, boolean smoothing, int spatialOrder) {
        this(stepFactor, maxStepS, fixedStepS, smoothing, spatialOrder, 0);
    }

    /** Settings with the default spatial order (4). */
    public SolverSettings(double stepFactor, double maxStepS, double fixedStepS, boolean smoothing) {
        this(stepFactor, maxStepS, fixedStepS, smoothing, 4);
    }

    public SolverSettings withSpatialOrder(int order) {
        return new SolverSettings(stepFactor, maxStepS, fixedStepS, smoothing, order, timeTolerance);
    }

    public SolverSettings withStepFactor(double factor) {
        return new SolverSettings(factor, maxStepS, fixedStepS, smoothing, spatialOrder, timeTolerance);
    }

    public SolverSettings withMaxStepS(double step) {
        return new SolverSettings(stepFactor, step, fixedStepS, smoothing, spatialOrder, timeTolerance);
    }

    public SolverSettings withFixedStepS(double step) {
        return new SolverSettings(stepFactor, maxStepS, step, smoothing, spatialOrder, timeTolerance);
    }

    public SolverSettings withSmoothing(boolean on) {
        return new SolverSettings(stepFactor, maxStepS, fixedStepS, on, spatialOrder, timeTolerance);
    }

    public SolverSettings withTimeTolerance(double tolerance) {
        return new SolverSettings(stepFactor, maxStepS, fixedStepS, smoothing, spatialOrder, tolerance);
    }

    /** These settings with every step bound (factor, largest step, fixed step) divided by 2^halvings. */
    public SolverSettings halved(int halvings) {
        double f = Math.scalb(1.0, -halvings);
        return new SolverSettings(stepFactor * f, maxStepS * f, fixedStepS * f, smoothing, spatialOrder, timeTolerance);
    }

    /**
     * Number of equal steps across a gap between two event times: enough that none is longer than the fixed
     * step, if one is set, or else than {@code dtMaxS} (from {@link #maxStep}); at least one.
     */
    public long stepCount(double gapS, double dtMaxS) {
        double target = fixedStepS > 0 ? fixedStepS : dtMaxS;
        return Math.max(1, (long) Math.ceil(gapS / target - 1e-9));
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
