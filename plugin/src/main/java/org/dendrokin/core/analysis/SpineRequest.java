package org.dendrokin.core.analysis;

import java.util.List;

import org.dendrokin.core.Checks;
import org.dendrokin.core.spines.SpineSettings;
import org.dendrokin.core.spines.SpineSite;

/**
 * What a session asks of its spines: how they are found and fitted, and the heads the user gave (already read and
 * checked to lie inside the image).
 *
 * @param settings detection and fit settings
 * @param given    heads given as point or oval ROIs, ImageJ pixel coordinates; may be empty
 * @param source   where the given heads came from (a file name), or empty
 * @param fittedShaft drive the neck fits by the session's fitted model of the shaft when it describes the
 *                 kymograph (otherwise, and when false, by the measured kymograph)
 */
public record SpineRequest(SpineSettings settings, List<SpineSite> given, String source, boolean fittedShaft) {
    /** A request whose neck fits use the shaft's fitted model where it describes the kymograph. */
    public SpineRequest(SpineSettings settings, List<SpineSite> given, String source) {
        this(settings, given, source, true);
    }

    public SpineRequest {
        Checks.require(settings != null, "spine settings are needed");
        given = given == null ? List.of() : List.copyOf(given);
        source = source == null ? "" : source;
        Checks.require(settings.detect() || !given.isEmpty(),
                "a spine analysis needs detection switched on or at least one given head");
    }
}
