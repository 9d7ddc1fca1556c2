package org.dendrokin.core.fit;

import java.util.List;

import org.dendrokin.core.units.Unit;

/**
 * A fitted value with its intervals.
 *
 * @param name          parameter or derived-quantity name, e.g. {@code "D"} or {@code "front_speed"}
 * @param unit          unit of the value and the interval ends
 * @param value         the estimate, natural units
 * @param standardError linearised standard error on the natural scale (NaN if unavailable)
 * @param ci95          the interval to report (profile likelihood when made, else Student t); null if none
 * @param otherIntervals further intervals made by other methods, each naming its method
 * @param atBound       true if the optimiser pushed the value to the edge of its allowed range
 * @param identifiable  false if the data do not pin this value down (see the fit's warnings for why)
 */
public record ParameterEstimate(String name, Unit unit, double value, double standardError, Interval ci95,
                                List<Interval> otherIntervals, boolean atBound, boolean identifiable) {
    public ParameterEstimate {
        otherIntervals = List.copyOf(otherIntervals);
    }
}
