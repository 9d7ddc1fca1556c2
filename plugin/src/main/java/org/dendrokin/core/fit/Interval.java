package org.dendrokin.core.fit;

/**
 * A 95% confidence interval and the method that made it. An end is infinite (or at the parameter's bound)
 * when the data do not close the interval on that side.
 *
 * @param lower  lower end, natural units
 * @param upper  upper end, natural units
 * @param method how it was made: {@link #WALD_T}, {@link #PROFILE}, {@link #BOOTSTRAP} or {@link #DELTA}
 */
public record Interval(double lower, double upper, String method) {
    /** Estimate +- t(0.975, n - p) standard errors on the optimiser's scale, mapped back. */
    public static final String WALD_T = "wald-t";
    /** Where the profiled chi-square rises by s^2 t(0.975, n - p)^2 above its minimum. */
    public static final String PROFILE = "profile-likelihood";
    /** 2.5th and 97.5th percentiles of refits to data simulated from the fitted model. */
    public static final String BOOTSTRAP = "parametric-bootstrap";
    /** Delta method from the parameter covariance (log scale for positive quantities), Student t. */
    public static final String DELTA = "delta-method";

    /** True when both ends are finite numbers. */
    public boolean isFinite() {
        return Double.isFinite(lower) && Double.isFinite(upper);
    }

    /** True if value lies inside [lower, upper]. */
    public boolean contains(double value) {
        return value >= lower && value <= upper;
    }

    public double width() {
        return upper - lower;
    }
}
