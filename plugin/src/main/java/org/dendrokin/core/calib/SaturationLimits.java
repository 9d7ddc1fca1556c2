package org.dendrokin.core.calib;

import org.dendrokin.core.Checks;

/**
 * Where a calibration stops being trustworthy, as fractional saturation f = (F - Fmin) / (Fmax - Fmin)
 * of the indicator's range. Differentiating c = Kd (F - Fmin) / (Fmax - F) gives the error amplification
 * d ln c / d ln F = F (Fmax - Fmin) / ((F - Fmin)(Fmax - F)), at least 1 / (n (1 - f)) when Fmin &gt;= 0: 5 at
 * f = 0.8, 20 at f = 0.95 for n = 1 (reference sheet s1.5). Samples above {@code flagAbove} keep their
 * concentration but are flagged and counted; samples above {@code rejectAbove} become NaN, as do signals at
 * or beyond either end of the range.
 *
 * @param flagAbove   fraction of the range above which samples are flagged, in (0, 1]; default 0.8
 * @param rejectAbove fraction above which samples are set to NaN, in [flagAbove, 1]; default 0.95
 *                    (1 rejects only signals at or beyond the saturated end)
 */
public record SaturationLimits(double flagAbove, double rejectAbove) {
    /** The defaults of reference sheet s1.5 [common practice]: flag above 0.8, NaN above 0.95. */
    public static final SaturationLimits DEFAULT = new SaturationLimits(0.8, 0.95);

    public SaturationLimits {
        Checks.require(flagAbove > 0 && flagAbove <= 1, "flag_saturation_above must be in (0, 1], got " + flagAbove);
        Checks.require(rejectAbove >= flagAbove && rejectAbove <= 1,
                "reject_saturation_above must be between flag_saturation_above (" + flagAbove + ") and 1, got "
                        + rejectAbove);
    }
}
