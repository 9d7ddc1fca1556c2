package org.dendrokin.core.analysis;

/**
 * The inputs of an analysis cannot be analysed as given: a path that lies mostly outside the movie, baseline
 * frames outside it, a background that cannot be estimated. The message is one plain sentence; the caller knows
 * which file holds the input named by {@link #subject()} and reports it with that file's name.
 */
public final class AnalysisInputException extends RuntimeException {
    private static final long serialVersionUID = 1L;

    /** Which input is at fault. */
    public enum Subject {
        /** The session's settings (baseline frames, stimulus, background). */
        SETTINGS,
        /** The path drawn along the dendrite. */
        PATH,
        /** The movie itself (a single frame, say). */
        MOVIE
    }

    private final Subject subject;

    public AnalysisInputException(Subject subject, String sentence, Throwable cause) {
        super(sentence, cause);
        this.subject = subject;
    }

    public AnalysisInputException(Subject subject, String sentence) {
        this(subject, sentence, null);
    }

    public Subject subject() {
        return subject;
    }
}
