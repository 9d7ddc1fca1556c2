package org.dendrokin.io.calib;

import java.nio.file.Path;
import java.util.List;

import org.dendrokin.core.calib.Calibration;
import org.dendrokin.core.calib.MonotoneTable;
import org.dendrokin.core.calib.Standards;
import org.dendrokin.core.calib.StandardsFit;
import org.dendrokin.io.InputException;

import com.google.gson.JsonObject;

/**
 * Builds a calibration from a table of standards, the Hill fit or the monotone interpolant, turning every
 * problem into an {@link InputException} that names the table. Shared by the {@code calibrate} command, the
 * session's {@code standards} method and the ImageJ commands.
 */
public final class CalibrationBuilder {
    private CalibrationBuilder() {
    }

    /**
     * The result of building from standards.
     *
     * @param calibration the calibration to apply
     * @param fit         the Hill fit with its intervals, or null for the monotone form
     * @param json        the calibration file's content ({@link CalibrationFile#write})
     * @param warnings    sentences about the fit
     */
    public record Built(Calibration calibration, StandardsFit.Result fit, JsonObject json, List<String> warnings) {
        public Built {
            warnings = List.copyOf(warnings);
        }
    }

    /**
     * @param standards  the table's contents
     * @param monotone   true for monotone (Fritsch-Carlson) interpolation instead of the Hill fit
     * @param table      the table's file, named in messages
     * @param sourceName the name recorded in the calibration file (e.g. the table's file name)
     * @param askedBy    what asked for the monotone method, for the message when the table is not monotone
     *                   (e.g. "--monotone"), or null
     */
    public static Built fromStandards(Standards standards, boolean monotone, Path table, String sourceName,
                                      String askedBy) {
        if (monotone) {
            MonotoneTable t;
            try {
                t = MonotoneTable.of(standards);
            } catch (IllegalArgumentException e) {
                throw new InputException(table, e.getMessage() + (askedBy == null ? "" : " (asked for by " + askedBy
                        + ")"), e);
            }
            return new Built(t, null, CalibrationFile.toJson(t, sourceName), List.of());
        }
        StandardsFit.Result fit;
        try {
            fit = StandardsFit.fit(standards);
        } catch (IllegalArgumentException e) {
            throw new InputException(table, e.getMessage(), e);
        }
        if (fit.calibration() == null || !fit.converged()) {
            String why = fit.warnings().isEmpty() ? "" : " (" + stripDot(fit.warnings().get(0)) + ")";
            throw new InputException(table, "the Hill form could not be fitted to these standards" + why
                    + "; check the table, or use monotone interpolation instead");
        }
        return new Built(fit.calibration(), fit, CalibrationFile.toJson(fit, sourceName), fit.warnings());
    }

    private static String stripDot(String s) {
        return s.endsWith(".") ? s.substring(0, s.length() - 1) : s;
    }
}
