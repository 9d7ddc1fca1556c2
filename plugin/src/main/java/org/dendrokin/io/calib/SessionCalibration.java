package org.dendrokin.io.calib;

import java.nio.file.Path;
import java.util.Locale;

import org.dendrokin.core.analysis.CalibrationRequest;
import org.dendrokin.io.InputException;

/**
 * The link between a session's calibration as configured ({@link CalibrationSetup}) and the analysis: checks
 * that the movie can feed the method, and gives the analysis its {@link CalibrationRequest}. The calibration
 * itself is applied by {@link org.dendrokin.core.analysis.CalibrationStage}.
 */
public final class SessionCalibration {
    private SessionCalibration() {
    }

    /** The calibration as the analysis takes it. */
    public static CalibrationRequest request(CalibrationSetup setup) {
        CalibrationSetup.RatioChannels channels = setup.channels();
        return new CalibrationRequest(setup.calibration(), setup.limits(),
                channels == null ? null : channels.numeratorBackground(),
                channels == null ? null : channels.denominatorBackground());
    }

    /**
     * The calibration as the analysis takes it, with the lifetime method's movies.
     *
     * @param lifetime the movies opened by {@link SessionLifetime#open}, or null for every other method
     */
    public static CalibrationRequest request(CalibrationSetup setup, SessionLifetime lifetime) {
        CalibrationRequest r = request(setup);
        return lifetime == null ? r : r.withLifetime(lifetime.request());
    }

    /**
     * Checks, before any work, that the movie can feed the method: the ratio and ratio-change methods need the
     * numerator and denominator channels. The sentence names the method and the channel key at fault.
     *
     * @param setup        the parsed calibration
     * @param sessionFile  session.json, named in the message
     * @param movieFile    the movie, named in the message
     * @param channelCount channels in the movie
     */
    public static void requireChannels(CalibrationSetup setup, Path sessionFile, Path movieFile, int channelCount) {
        if (setup.channels() == null) {
            return;
        }
        int num = setup.channels().numerator();
        int den = setup.channels().denominator();
        int need = Math.max(num, den);
        if (channelCount < need) {
            throw new InputException(sessionFile, String.format(Locale.ROOT, "key \"calibration.method\" is \"%s\", "
                    + "which needs a movie with %d channels (numerator channel %d over denominator channel %d, key "
                    + "\"calibration.%s\"), but %s has %d channel%s", setup.calibration().method(), need, num, den,
                    num > den ? "numerator_channel" : "denominator_channel", movieFile.getFileName(), channelCount,
                    channelCount == 1 ? "" : "s"));
        }
    }
}
