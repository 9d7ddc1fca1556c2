package org.dendrokin.core.analysis;

import java.util.List;

import org.dendrokin.core.spines.SpineAnalysis;

/**
 * The spines of one session, as typed values, from which spines.csv, the spine picture, the report's spine section
 * and the {@code spines} part of results.json are written.
 *
 * @param request  what was asked
 * @param result   the heads, their time courses, response measures and neck exchange fits
 * @param warnings plain sentences about the spines, in the order they arose
 */
public record SpineOutcome(SpineRequest request, SpineAnalysis.Result result, List<String> warnings) {
    public SpineOutcome {
        warnings = List.copyOf(warnings);
    }
}
