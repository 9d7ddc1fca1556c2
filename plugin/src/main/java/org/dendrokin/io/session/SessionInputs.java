package org.dendrokin.io.session;

import java.nio.file.Path;
import java.util.List;

import org.dendrokin.core.analysis.Warning;
import org.dendrokin.io.calib.CalibrationSetup;

/**
 * What a session folder held, as the outputs describe it: the files, the settings, the movie's format, the
 * calibration as configured, and the sentences about the inputs themselves (ignored keys, extra channels).
 *
 * @param sessionDir   the session folder
 * @param sessionName  the folder's name
 * @param config       session.json
 * @param movieFile    the movie
 * @param pathFile     the path file
 * @param bitDepth     bits per sample of the movie
 * @param channelCount channels of the movie
 * @param calibration  the calibration as configured
 * @param warnings     sentences about the inputs, shown before the analysis' own
 * @param overrides    settings given for this run over session.json ({@code config} has them in place)
 */
public record SessionInputs(Path sessionDir, String sessionName, SessionConfig config, Path movieFile, Path pathFile,
                            int bitDepth, int channelCount, CalibrationSetup calibration, List<Warning> warnings,
                            SessionOverrides overrides) {
    public SessionInputs {
        warnings = List.copyOf(warnings);
        overrides = overrides == null ? SessionOverrides.NONE : overrides;
    }

    /** A file of the session folder as named in the outputs: relative to the folder. */
    public String relative(Path file) {
        return sessionDir.relativize(file).toString();
    }
}
