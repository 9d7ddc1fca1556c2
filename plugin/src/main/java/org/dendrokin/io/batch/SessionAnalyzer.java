package org.dendrokin.io.batch;

import java.nio.file.Path;

import org.dendrokin.core.Progress;

/**
 * Analyses one session folder into an output folder (results.json, kymograph, pictures, report), as the
 * {@code analyze} command does. Bad input is reported by throwing {@link org.dendrokin.io.InputException};
 * cancellation by {@link Progress.CancelledException}. The batch gives each call a fresh, empty output folder.
 */
@FunctionalInterface
public interface SessionAnalyzer {
    void analyze(Path sessionDir, Path outDir, Progress progress);
}
