package org.dendrokin.io.batch;

import org.dendrokin.io.SessionRunner;

/** The session analysis a batch uses unless told otherwise. */
public final class SessionAnalyzers {
    private SessionAnalyzers() {
    }

    /** The same analysis as the {@code analyze} command ({@link SessionRunner#analyze}). */
    public static SessionAnalyzer standard() {
        return SessionRunner::analyze;
    }
}
