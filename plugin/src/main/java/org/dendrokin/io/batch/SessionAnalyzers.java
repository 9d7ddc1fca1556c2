package org.dendrokin.io.batch;

import org.dendrokin.io.InputException;

/** The session analysis a batch uses unless told otherwise. */
public final class SessionAnalyzers {
    private SessionAnalyzers() {
    }

    /** The same analysis as the {@code analyze} command. */
    public static SessionAnalyzer standard() {
        return (sessionDir, outDir, progress) -> {
            throw new InputException(sessionDir, "the single-session analysis is not part of this build yet");
        };
    }
}
