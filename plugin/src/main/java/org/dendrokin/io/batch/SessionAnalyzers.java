package org.dendrokin.io.batch;

import org.dendrokin.io.SessionRunner;

/** The session analysis a batch uses unless told otherwise. */
public final class SessionAnalyzers {
    private SessionAnalyzers() {
    }

    /**
     * The same analysis as the {@code analyze} command ({@link SessionRunner#analyze}), followed by the session's
     * {@code global-fit-input.json} (its fit settings, for a later joint fit of many sessions).
     */
    public static SessionAnalyzer standard() {
        return (sessionDir, outDir, progress) -> {
            SessionRunner.Result r = SessionRunner.analyze(sessionDir, outDir, progress);
            org.dendrokin.core.kymo.Kymograph signal = r.analysis().signal();
            GlobalFitInput.write(outDir, r.inputs().config().fit(), signal.hasSampleDelays() ? signal.sampleDelaysS()
                    : null);
        };
    }
}
