package org.dendrokin.core.analysis;

import org.dendrokin.core.Checks;

/**
 * One plain sentence for the user about something that limits the results, and the stage it comes from.
 * Warnings are values of the analysis result: every writer (results.json, the report, the ImageJ log, the
 * terminal) shows the same sentences in the same order.
 *
 * @param topic where the warning arose
 * @param text  the sentence, ending with a full stop
 */
public record Warning(Topic topic, String text) {
    /** The stage a warning comes from. */
    public enum Topic {
        /** The session's settings (unknown keys, options that were ignored). */
        SETTINGS,
        /** The movie file and its channels. */
        MOVIE,
        /** The path and the kymograph taken along it. */
        PATH,
        /** Background, stimulus, baseline, bleaching and dF/F0. */
        PREPROCESSING,
        /** The calibration to concentration. */
        CALIBRATION,
        /** The model-free spread measures. */
        SPREAD,
        /** Model fits and their comparison. */
        FIT,
        /** The choice of the numbers shown first. */
        HEADLINE
    }

    public Warning {
        Checks.require(topic != null, "a warning needs a topic");
        Checks.require(text != null && !text.isBlank(), "a warning needs a sentence");
    }
}
