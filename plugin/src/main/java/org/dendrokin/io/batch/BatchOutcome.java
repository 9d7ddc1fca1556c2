package org.dendrokin.io.batch;

import java.nio.file.Path;

/**
 * How a batch run ended.
 *
 * @param total    sessions in the run (this shard's share when sharded)
 * @param analysed sessions analysed in this run
 * @param skipped  sessions whose earlier result was still current
 * @param failed   sessions whose result is a failure
 * @param summary  the summary.csv written, or null for a shard (the merge writes it)
 * @param index    the index.html written, or null for a shard
 * @param globalFit the global-fit.json written, or null when no joint fit was asked for (or every session failed)
 */
public record BatchOutcome(int total, int analysed, int skipped, int failed, Path summary, Path index,
                           Path globalFit) {
    /** True when there was at least one session and every one failed (the CLI's exit status 3). */
    public boolean allFailed() {
        return total > 0 && failed == total;
    }
}
