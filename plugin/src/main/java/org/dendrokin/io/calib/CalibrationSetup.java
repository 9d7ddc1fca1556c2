package org.dendrokin.io.calib;

import java.util.List;

import org.dendrokin.core.calib.Calibration;
import org.dendrokin.core.calib.NoCalibration;
import org.dendrokin.core.calib.SaturationLimits;

/**
 * The calibration a session asked for, ready to apply: the calibration itself, the saturation limits, the
 * file it came from (a standards table or a calibration file, or null), the channel choice of the ratio
 * method (or null), and sentences about keys that were ignored.
 *
 * @param calibration the calibration; {@link NoCalibration#INSTANCE} for {@code none}
 * @param limits      where samples are flagged and where they become NaN
 * @param sourceFile  file name as written in session.json, or null
 * @param channels    channel choice for the ratio method, null for every other method
 * @param warnings    plain sentences
 */
public record CalibrationSetup(Calibration calibration, SaturationLimits limits, String sourceFile,
                               RatioChannels channels, List<String> warnings) {
    public CalibrationSetup {
        warnings = List.copyOf(warnings);
    }

    /** The method {@code none} with default limits. */
    public static final CalibrationSetup NONE = new CalibrationSetup(NoCalibration.INSTANCE, SaturationLimits.DEFAULT,
            null, null, List.of());

    /** True when the signal must become a concentration (every method but {@code none}). */
    public boolean calibrates() {
        return !(calibration instanceof NoCalibration);
    }

    /**
     * Channel choice of the ratio method: 1-based channel numbers of the hyperstack, and optional fixed
     * background values per channel (null: the session's own background handling, applied per channel).
     *
     * @param numerator              channel of the ratio's numerator (e.g. 340 nm excitation for fura-2)
     * @param denominator            channel of the ratio's denominator (e.g. 380 nm)
     * @param numeratorBackground    background subtracted from the numerator channel, or null
     * @param denominatorBackground  background subtracted from the denominator channel, or null
     */
    public record RatioChannels(int numerator, int denominator, Double numeratorBackground,
                                Double denominatorBackground) {
        public RatioChannels {
            if (numerator < 1 || denominator < 1 || numerator == denominator) {
                throw new IllegalArgumentException("numerator_channel and denominator_channel must be two different "
                        + "channel numbers counted from 1");
            }
        }
    }
}
