package org.dendrokin.core.analysis;

import org.dendrokin.core.calib.Calibration;
import org.dendrokin.core.calib.NoCalibration;
import org.dendrokin.core.calib.SaturationLimits;

/**
 * The calibration an analysis applies: the calibration itself (or {@link NoCalibration} for dF/F0), where
 * samples near saturation are flagged or dropped, for the ratio and ratio-change methods the fixed background of
 * each channel (null: the session's own background handling, applied per channel), and for the lifetime method its
 * movies.
 *
 * @param calibration           the calibration
 * @param limits                saturation limits
 * @param numeratorBackground   background subtracted from the numerator channel (ratio methods), or null
 * @param denominatorBackground background subtracted from the denominator channel (ratio methods), or null
 * @param lifetime              the lifetime and photon-count movies (lifetime method), or null
 */
public record CalibrationRequest(Calibration calibration, SaturationLimits limits, Double numeratorBackground,
                                 Double denominatorBackground, LifetimeRequest lifetime) {
    /** dF/F0, no calibration. */
    public static final CalibrationRequest NONE = new CalibrationRequest(NoCalibration.INSTANCE,
            SaturationLimits.DEFAULT, null, null);

    /** A calibration that reads no lifetime movie. */
    public CalibrationRequest(Calibration calibration, SaturationLimits limits, Double numeratorBackground,
                              Double denominatorBackground) {
        this(calibration, limits, numeratorBackground, denominatorBackground, null);
    }

    /** The same calibration with the lifetime method's movies. */
    public CalibrationRequest withLifetime(LifetimeRequest movies) {
        return new CalibrationRequest(calibration, limits, numeratorBackground, denominatorBackground, movies);
    }

    /** True when the signal becomes a concentration (every method but none). */
    public boolean calibrates() {
        return !(calibration instanceof NoCalibration);
    }
}
