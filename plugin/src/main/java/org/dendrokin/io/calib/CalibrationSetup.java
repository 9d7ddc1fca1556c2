package org.dendrokin.io.calib;

import java.util.List;

import org.dendrokin.core.calib.Calibration;
import org.dendrokin.core.calib.NoCalibration;
import org.dendrokin.core.calib.SaturationLimits;

/**
 * The calibration a session asked for, ready to apply: the calibration itself, the saturation limits, the
 * file it came from (a standards table or a calibration file, or null), the channel choice of the ratio and
 * ratio-change methods (or null), the movies of the lifetime method (or null), and sentences about keys that were
 * ignored.
 *
 * @param calibration the calibration; {@link NoCalibration#INSTANCE} for {@code none}
 * @param limits      where samples are flagged and where they become NaN
 * @param sourceFile  file name as written in session.json, or null
 * @param channels    channel choice for the ratio and ratio-change methods, null for every other method
 * @param lifetime    where the lifetime method finds its movies, null for every other method
 * @param warnings    plain sentences
 */
public record CalibrationSetup(Calibration calibration, SaturationLimits limits, String sourceFile,
                               RatioChannels channels, LifetimeInput lifetime, List<String> warnings) {
    public CalibrationSetup {
        warnings = List.copyOf(warnings);
    }

    /** A setup of a method that reads no lifetime movie. */
    public CalibrationSetup(Calibration calibration, SaturationLimits limits, String sourceFile,
                            RatioChannels channels, List<String> warnings) {
        this(calibration, limits, sourceFile, channels, null, warnings);
    }

    /** The method {@code none} with default limits. */
    public static final CalibrationSetup NONE = new CalibrationSetup(NoCalibration.INSTANCE, SaturationLimits.DEFAULT,
            null, null, List.of());

    /** True when the signal must become a concentration (every method but {@code none}). */
    public boolean calibrates() {
        return !(calibration instanceof NoCalibration);
    }

    /**
     * Where the lifetime method finds its movies, as written in session.json. The lifetime is channel
     * {@code lifetimeChannel} of {@code movie} (null: of the session's movie); the photon counts are channel
     * {@code photonChannel} of {@code photons} (null: of the lifetime's movie), or absent when neither
     * {@code photons} nor {@code photonChannel} is given.
     *
     * @param movie           file of mean lifetimes (ns per pixel), relative to the session folder, or null
     * @param lifetimeChannel 1-based channel of that movie holding the lifetime
     * @param photons         file of photon counts per pixel, relative to the session folder, or null
     * @param photonChannel   1-based channel holding the photon counts, or 0 when not given
     */
    public record LifetimeInput(String movie, int lifetimeChannel, String photons, int photonChannel) {
        public LifetimeInput {
            if (lifetimeChannel < 1 || photonChannel < 0) {
                throw new IllegalArgumentException("lifetime_channel and photon_channel are counted from 1");
            }
        }

        /** True when photon counts were named (as a file, a channel, or both). */
        public boolean weighted() {
            return photons != null || photonChannel > 0;
        }

        /** The photon counts' channel, 1-based (1 when only a file was named). */
        public int photonChannelOrFirst() {
            return photonChannel > 0 ? photonChannel : 1;
        }
    }

    /**
     * Channel choice of the ratio and ratio-change methods: 1-based channel numbers of the hyperstack, and optional fixed
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
