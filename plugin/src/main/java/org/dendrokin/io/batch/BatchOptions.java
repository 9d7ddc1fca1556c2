package org.dendrokin.io.batch;

import java.nio.file.Path;

import org.dendrokin.core.Checks;

/**
 * What a batch run is asked to do.
 *
 * @param root          folder searched (at any depth) for session folders, i.e. folders holding session.json
 * @param out           output folder; created if missing
 * @param threads       sessions analysed at once (hashing, analysis, writing)
 * @param moviesAtOnce  at most this many sessions read their movie at the same time, so that memory stays
 *                      bounded whatever {@code threads} is; at most {@code threads}
 * @param force         analyse every session again even when an earlier result matches its inputs
 * @param shard         the part of the sessions this run does, or null for all of them
 * @param globalFit     a joint fit of the sessions after their analyses (not by a shard), or null for none
 */
public record BatchOptions(Path root, Path out, int threads, int moviesAtOnce, boolean force, Shard shard,
                           GlobalFitStudy.Request globalFit) {
    public BatchOptions {
        Checks.require(root != null, "a batch needs a root folder");
        Checks.require(out != null, "a batch needs an output folder");
        Checks.positive(threads, "threads");
        Checks.positive(moviesAtOnce, "moviesAtOnce");
        moviesAtOnce = Math.min(moviesAtOnce, threads);
    }

    /** All sessions under {@code root}, {@code threads} at once, movies limited by the heap, no forcing. */
    public static BatchOptions of(Path root, Path out, int threads) {
        return new BatchOptions(root, out, threads, defaultMoviesAtOnce(threads), false, null, null);
    }

    public BatchOptions withForce(boolean f) {
        return new BatchOptions(root, out, threads, moviesAtOnce, f, shard, globalFit);
    }

    public BatchOptions withShard(Shard s) {
        return new BatchOptions(root, out, threads, moviesAtOnce, force, s, globalFit);
    }

    public BatchOptions withMoviesAtOnce(int m) {
        return new BatchOptions(root, out, threads, m, force, shard, globalFit);
    }

    public BatchOptions withGlobalFit(GlobalFitStudy.Request request) {
        return new BatchOptions(root, out, threads, moviesAtOnce, force, shard, request);
    }

    /**
     * Movies read at once by default: {@code threads}, but no more than one per 768 MB of maximum heap, since
     * reading a large movie frame by frame still holds a few frames, the kymograph and the fit's work space.
     */
    public static int defaultMoviesAtOnce(int threads) {
        long perMovie = 768L << 20;
        int byHeap = (int) Math.max(1, Runtime.getRuntime().maxMemory() / perMovie);
        return Math.max(1, Math.min(threads, byHeap));
    }
}
