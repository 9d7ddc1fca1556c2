package org.dendrokin.core.analysis;

import org.dendrokin.core.calib.Calibration;
import org.dendrokin.core.calib.NoCalibration;
import org.dendrokin.core.calib.SaturationLimits;

/**
 * The calibration an analysis applies: the calibration itself (or {@link NoCalibration} for dF/F0), where
 * samples near saturation are flagged or dropped, and for the ratio method the fixed background of each
 * channel (null: the session's own background handling, applied per channel).
 *
 * @param calibration           the calibration
 * @param limits                saturation limits
 * @param numeratorBackground   background subtracted from the numerator channel (ratio method), or null
 * @param denominatorBackground background subtracted from the denominator channel (ratio method), or null
 */
public record CalibrationRequest(Calibration calibration, SaturationLimits limits, Double numeratorBackground,
                                 Double denominatorBackground) {
    /** dF/F0, no calibration. */
    public static final CalibrationRequest NONE = new CalibrationRequest(NoCalibration.INSTANCE,
            SaturationLimits.DEFAULT, null, null);

    /** True when the signal becomes a concentration (every method but none). */
    public boolean calibrates() {
        return !(calibration instanceof NoCalibration);
    }
}
