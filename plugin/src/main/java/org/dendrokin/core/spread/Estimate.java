package org.dendrokin.core.spread;

import org.dendrokin.core.Checks;

/**
 * A measured number with its unit and 95% interval, as results.json writes it ({@code value}, {@code unit},
 * {@code ci95}). The interval may be open on one side (infinite bound) when the data fix only one side.
 *
 * @param value  the estimate, finite
 * @param unit   the unit string, e.g. {@code "um/s"}
 * @param lo95   lower end of the 95% interval (may be {@code -Infinity}, never NaN)
 * @param hi95   upper end of the 95% interval (may be {@code +Infinity}, never NaN)
 * @param method how the interval was made, one short phrase, e.g. {@code "Sen 1968 rank interval"}
 */
public record Estimate(double value, String unit, double lo95, double hi95, String method) {
    public Estimate {
        Checks.finite(value, "estimate");
        Checks.require(!Double.isNaN(lo95) && !Double.isNaN(hi95), "interval bounds must not be NaN");
        Checks.require(lo95 <= hi95, "interval lower end " + lo95 + " exceeds upper end " + hi95);
    }

    /** True when the interval is wider than the value itself, the usual sign of a poorly fixed number. */
    public boolean isVague() {
        return !(hi95 - lo95 < Math.abs(value));
    }
}
