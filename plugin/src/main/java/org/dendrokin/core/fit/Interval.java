package org.dendrokin.core.fit;

import java.util.Objects;

/**
 * A 95% confidence interval and the method that made it. An end is infinite (or at the parameter's bound)
 * when the data do not close the interval on that side.
 *
 * @param lower  lower end, natural units
 * @param upper  upper end, natural units
 * @param method how it was made: {@link #WALD_T}, {@link #PROFILE}, {@link #BOOTSTRAP}, {@link #DELTA},
 *               {@link #ROBUST_PROFILE}, {@link #ROBUST_WALD_T} or {@link #ROBUST_DELTA}
 * @param note   a plain sentence with what the method needed to know (e.g. the kernel and the variance ratio of a
 *               robust interval), or empty
 */
public record Interval(double lower, double upper, String method, String note) {
    /** Estimate +- t(0.975, n - p) standard errors on the optimiser's scale, mapped back. */
    public static final String WALD_T = "wald-t";
    /** Where the profiled chi-square rises by s^2 t(0.975, n - p)^2 above its minimum. */
    public static final String PROFILE = "profile-likelihood";
    /** 2.5th and 97.5th percentiles of refits to data simulated from the fitted model. */
    public static final String BOOTSTRAP = "parametric-bootstrap";
    /** Delta method from the parameter covariance (log scale for positive quantities), Student t. */
    public static final String DELTA = "delta-method";
    /**
     * The profile-likelihood interval widened, on the optimiser's scale, by the ratio of the robust (sandwich)
     * standard error to the model's, and by the robust t quantile: see {@link Sandwich}.
     */
    public static final String ROBUST_PROFILE = "robust-profile";
    /** Estimate +- t(0.975, nu) robust (sandwich) standard errors on the optimiser's scale, mapped back. */
    public static final String ROBUST_WALD_T = "robust-wald-t";
    /** Delta method from the robust (sandwich) covariance, Student t with the robust degrees of freedom. */
    public static final String ROBUST_DELTA = "robust-delta";

    public Interval {
        Objects.requireNonNull(method, "method");
        note = note == null ? "" : note;
    }

    /** An interval without a note. */
    public Interval(double lower, double upper, String method) {
        this(lower, upper, method, "");
    }

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

    /** True if the method accounts for correlated and unequal residuals (a sandwich covariance). */
    public boolean isRobust() {
        String base = baseMethod();
        return base.equals(ROBUST_PROFILE) || base.equals(ROBUST_WALD_T) || base.equals(ROBUST_DELTA);
    }

    /** The method without the name of an input whose uncertainty widened the interval. */
    public String baseMethod() {
        int plus = method.indexOf('+');
        return plus < 0 ? method : method.substring(0, plus);
    }

    /** True when the interval was widened for the uncertainty of an input ({@link InputUncertainty}). */
    public boolean includesInput() {
        return method.indexOf('+') >= 0;
    }
}
