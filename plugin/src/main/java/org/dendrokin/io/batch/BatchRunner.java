package org.dendrokin.io.batch;

import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.file.DirectoryStream;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Comparator;
import java.util.List;
import java.util.Map;
import java.util.concurrent.ExecutionException;
import java.util.concurrent.ExecutorService;
import java.util.concurrent.Executors;
import java.util.concurrent.Future;
import java.util.concurrent.Semaphore;
import java.util.concurrent.TimeUnit;
import java.util.concurrent.atomic.AtomicBoolean;
import java.util.concurrent.atomic.AtomicInteger;
import java.util.concurrent.atomic.AtomicLong;
import java.util.function.Consumer;
import java.util.stream.Stream;

import org.dendrokin.core.Progress;
import org.dendrokin.io.AtomicFiles;
import org.dendrokin.io.InputException;
import org.dendrokin.io.OutputFolder;
import org.dendrokin.io.json.JsonFiles;

/**
 * Runs the analysis of every session folder under a root, in parallel, and writes the summary table and
 * the index report. The entry point for the command line and ImageJ alike.
 *
 * <p>Layout of the output folder: {@code sessions/KEY/} holds one session's results (see
 * {@link SessionFolder#key()}) with its {@code batch.json}; {@code summary.csv} and {@code index.html} sit
 * at the top; {@code plots/} holds the group pictures; {@code slurm/} and {@code shards/} exist for
 * cluster runs. Each session is analysed into a hidden temporary folder that is renamed into place only
 * once it is complete, so a run stopped at any moment leaves complete session results only. A session
 * whose recorded input hashes, settings and tool version still match is not analysed again unless
 * forced. Session folders are only read; an output folder that is a session folder or lies inside one is refused
 * before anything is written, and a lock file keeps a second batch out of an output folder in use
 * ({@link BatchLock}).
 */
public final class BatchRunner {
    private static final String TMP = ".tmp-";
    private static final String OLD = ".old-";

    private BatchRunner() {
    }

    /** Runs the batch with the standard session analysis; {@code progress} may cancel it. */
    public static BatchOutcome run(BatchOptions options, Progress progress) {
        return run(options, SessionAnalyzers.standard(), progress, s -> { });
    }

    /**
     * Runs the batch.
     *
     * @param options  what to run
     * @param analyzer analyses one session
     * @param progress receives ("sessions", done, total) and may cancel the batch: sessions not yet started
     *                 are not started, running ones are stopped and leave nothing behind
     * @param listener receives a {@link BatchStatus} after each session (from worker threads, one at a time)
     * @throws InputException if the output folder is a file, a session folder or inside one, or is being written by
     *                        another batch (see {@link BatchLock}); if the root holds no session, or the shard does not fit the saved plan
     * @throws Progress.CancelledException if cancelled or the calling thread was interrupted
     */
    public static BatchOutcome run(BatchOptions options, SessionAnalyzer analyzer, Progress progress,
                                   Consumer<BatchStatus> listener) {
        OutputFolder.check(options.out());
        Path out = options.out().toAbsolutePath().normalize();
        Path root = options.root().toAbsolutePath().normalize();
        List<SessionFolder> found = SessionFolder.discover(root, out);
        List<SessionFolder> mine = found;
        if (options.shard() != null) {
            ShardPlan plan = ShardPlan.read(out);
            if (plan == null || !plan.root().equals(root.toString()) || plan.count() != options.shard().count()) {
                plan = ShardPlan.split(root, found, options.shard().count());
            }
            mine = plan.select(found, options.shard());
        }
        try {
            Files.createDirectories(out);
        } catch (IOException e) {
            throw new InputException(options.out(), "the output folder cannot be created (" + AtomicFiles.reason(e)
                    + ")", e);
        }
        try (BatchLock lock = BatchLock.acquire(out, options.shard())) {
            return runLocked(options, analyzer, progress, listener, out, found, mine);
        }
    }

    private static BatchOutcome runLocked(BatchOptions options, SessionAnalyzer analyzer, Progress progress,
                                          Consumer<BatchStatus> listener, Path out, List<SessionFolder> found,
                                          List<SessionFolder> mine) {
        Path sessionsDir = out.resolve("sessions");
        try {
            Files.createDirectories(sessionsDir);
        } catch (IOException e) {
            throw new UncheckedIOException("could not create " + sessionsDir + ": " + e.getMessage(), e);
        }
        for (SessionFolder s : mine) {
            removeLeftovers(sessionsDir, s.key());
        }
        String version = SessionRecord.currentToolVersion();
        long start = System.nanoTime();
        AtomicInteger done = new AtomicInteger();
        AtomicInteger analysed = new AtomicInteger();
        AtomicInteger skipped = new AtomicInteger();
        AtomicInteger failed = new AtomicInteger();
        AtomicBoolean stop = new AtomicBoolean();
        int total = mine.size();
        Semaphore movies = new Semaphore(options.moviesAtOnce(), true);
        Progress perSession = new Progress() {
            @Override
            public void report(String stage, long d, long t) {
            }

            @Override
            public boolean isCancelled() {
                return stop.get() || progress.isCancelled() || Thread.currentThread().isInterrupted();
            }
        };
        Object reporting = new Object();
        ExecutorService pool = Executors.newFixedThreadPool(options.threads(), r -> {
            Thread t = new Thread(r, "dendrokin-batch");
            t.setDaemon(true);
            return t;
        });
        List<Future<?>> futures = new ArrayList<>();
        progress.report("sessions", 0, total);
        for (SessionFolder s : mine) {
            futures.add(pool.submit(() -> {
                perSession.checkCancelled();
                Result r = runOne(s, sessionsDir, version, options.force(), analyzer, perSession, movies);
                done.incrementAndGet();
                if (r == Result.SKIPPED_OK || r == Result.SKIPPED_FAILED) {
                    skipped.incrementAndGet();
                } else {
                    analysed.incrementAndGet();
                }
                if (r == Result.FAILED || r == Result.SKIPPED_FAILED) {
                    failed.incrementAndGet();
                }
                synchronized (reporting) {
                    BatchStatus status = new BatchStatus(total, done.get(), analysed.get(), skipped.get(),
                            failed.get(), (System.nanoTime() - start) * 1e-9);
                    progress.report("sessions", status.done(), total);
                    listener.accept(status);
                }
                return null;
            }));
        }
        pool.shutdown();
        try {
            for (Future<?> f : futures) {
                waitFor(f, progress);
            }
        } catch (RuntimeException | Error e) {
            stop.set(true);
            pool.shutdownNow();
            awaitQuietly(pool);
            throw e;
        }
        if (options.shard() != null) {
            ShardLog.write(out, options.shard(), mine, sessionsDir);
            return new BatchOutcome(total, analysed.get(), skipped.get(), failed.get(), null, null, null);
        }
        List<String> ids = found.stream().map(SessionFolder::id).toList();
        boolean allFailed = total > 0 && failed.get() == total;
        return report(out, ids, allFailed ? null : options.globalFit(), progress,
                files -> new BatchOutcome(total, analysed.get(), skipped.get(), failed.get(), files.summary(),
                        files.index(), null));
    }

    /**
     * Writes summary.csv and index.html, after the joint fit of the sessions when one is asked for (its section then
     * goes into index.html). A joint fit refused for bad input still leaves the summary and the report written.
     */
    private static BatchOutcome report(Path out, List<String> ids, GlobalFitStudy.Request global, Progress progress,
                                       java.util.function.Function<BatchReport.Files, BatchOutcome> outcome) {
        if (global == null) {
            return outcome.apply(BatchReport.write(out, ids));
        }
        GlobalFitStudy.Outcome fitted;
        try {
            fitted = GlobalFitStudy.run(out, ids, global, out, true, progress);
        } catch (InputException e) {
            BatchReport.write(out, ids);
            throw e;
        }
        BatchOutcome o = outcome.apply(BatchReport.write(out, ids, fitted));
        return new BatchOutcome(o.total(), o.analysed(), o.skipped(), o.failed(), o.summary(), o.index(),
                fitted.json());
    }

    /**
     * Joins the results of a sharded run into one summary.csv and index.html. The sessions are those of the
     * saved plan ({@code OUT/slurm/plan.json}) or, without a plan, every complete result under
     * {@code OUT/sessions}; a planned session without a result shows as {@code missing}.
     */
    public static BatchOutcome merge(Path out) {
        return merge(out, null, Progress.NONE);
    }

    /**
     * As {@link #merge(Path)}, followed by the joint fit of the sessions when {@code global} is not null.
     *
     * @throws InputException if the folder holds no batch results, or the joint fit is refused
     */
    public static BatchOutcome merge(Path out, GlobalFitStudy.Request global, Progress progress) {
        Path o = out.toAbsolutePath().normalize();
        List<String> ids = sessionIds(o, out);
        int failed = 0;
        int present = 0;
        for (String id : ids) {
            SessionRecord r = SessionRecord.read(o.resolve("sessions").resolve(new SessionFolder(id, o).key()));
            if (r != null) {
                present++;
                failed += r.ok() ? 0 : 1;
            } else {
                failed++;
            }
        }
        int total = ids.size();
        int count = failed;
        int found = present;
        boolean allFailed = total > 0 && failed == total;
        return report(o, ids, allFailed ? null : global, progress,
                files -> new BatchOutcome(total, 0, found, count, files.summary(), files.index(), null));
    }

    /**
     * The sessions of a batch's output folder: those of the saved plan or, without a plan, every complete result.
     *
     * @param given the folder as the user named it, for the message
     * @throws InputException if the folder holds no batch results
     */
    public static List<String> sessionIds(Path o, Path given) {
        if (!Files.isDirectory(o.resolve("sessions"))) {
            throw new InputException(given, "this folder holds no batch results (no sessions folder inside)");
        }
        ShardPlan plan = ShardPlan.read(o);
        return plan != null ? plan.allIds() : completedIds(o.resolve("sessions"));
    }

    private static List<String> completedIds(Path sessionsDir) {
        List<String> ids = new ArrayList<>();
        try (DirectoryStream<Path> dirs = Files.newDirectoryStream(sessionsDir, p -> !p.getFileName().toString()
                .startsWith("."))) {
            for (Path d : dirs) {
                SessionRecord r = SessionRecord.read(d);
                if (r != null) {
                    ids.add(r.session());
                }
            }
        } catch (IOException e) {
            throw new UncheckedIOException("could not list " + sessionsDir + ": " + e.getMessage(), e);
        }
        ids.sort(SessionFolder.ORDER);
        return ids;
    }

    private enum Result { ANALYSED, FAILED, SKIPPED_OK, SKIPPED_FAILED }

    /**
     * True when an analysed session's results.json is still there and reads as one JSON object: a file deleted or
     * cut short since (a full disk, a copy stopped half way) makes the session be redone instead of being counted
     * with empty numbers.
     */
    private static boolean resultsReadable(Path target) {
        try {
            JsonFiles.readObject(target.resolve("results.json"), "the session's results");
            return true;
        } catch (InputException e) {
            return false;
        }
    }

    private static Result runOne(SessionFolder s, Path sessionsDir, String version, boolean force,
                                 SessionAnalyzer analyzer, Progress progress, Semaphore movies) throws IOException {
        Path target = sessionsDir.resolve(s.key());
        InputHashes hashes;
        String settings;
        String unreadable = null;
        try {
            hashes = InputHashes.of(s.dir());
            settings = SessionRecord.settingsHash(s.dir().resolve("session.json"));
        } catch (UncheckedIOException e) {
            hashes = new InputHashes(Map.of(), "", 0);
            settings = "";
            unreadable = e.getMessage() + ".";
        }
        SessionRecord existing = SessionRecord.read(target);
        if (!force && existing != null && existing.matches(hashes, settings, version)
                && !SessionRecord.ERROR.equals(existing.status()) && (!existing.ok() || resultsReadable(target))) {
            return existing.ok() ? Result.SKIPPED_OK : Result.SKIPPED_FAILED;
        }
        progress.checkCancelled();
        Path tmp = sessionsDir.resolve("." + s.key() + TMP + Long.toHexString(System.nanoTime()));
        boolean installed = false;
        try {
            Files.createDirectories(tmp);
            long t0 = System.nanoTime();
            String status = SessionRecord.OK;
            String error = "";
            try {
                if (unreadable != null) {
                    throw new InputException(s.dir(), unreadable);
                }
                movies.acquire();
                try {
                    analyzer.analyze(s.dir(), tmp, progress);
                } finally {
                    movies.release();
                }
            } catch (InputException e) {
                status = SessionRecord.FAILED;
                error = e.getMessage();
            } catch (InterruptedException e) {
                Thread.currentThread().interrupt();
                throw new Progress.CancelledException();
            } catch (Progress.CancelledException e) {
                throw e;
            } catch (RuntimeException | OutOfMemoryError | StackOverflowError e) {
                if (progress.isCancelled()) {
                    throw new Progress.CancelledException();
                }
                status = SessionRecord.ERROR;
                error = "Internal error while analysing this session: " + e + " (it is tried again on the next run).";
            }
            progress.checkCancelled();
            if (!SessionRecord.OK.equals(status)) {
                deleteTree(tmp);
                Files.createDirectories(tmp);
            }
            double elapsed = (System.nanoTime() - t0) * 1e-9;
            new SessionRecord(s.id(), s.dir().toString(), hashes.group(), status, error, hashes.sorted(), settings,
                    version, hashes.movieBytes(), elapsed).write(tmp);
            install(tmp, target, sessionsDir, s.key());
            installed = true;
            return SessionRecord.OK.equals(status) ? Result.ANALYSED : Result.FAILED;
        } finally {
            if (!installed) {
                deleteTree(tmp);
            }
        }
    }

    /** Puts a complete result folder in place of the old one; the old one is moved aside first, then deleted. */
    private static void install(Path tmp, Path target, Path sessionsDir, String key) throws IOException {
        Path old = null;
        if (Files.exists(target)) {
            old = sessionsDir.resolve("." + key + OLD + Long.toHexString(System.nanoTime()));
            Files.move(target, old);
        }
        Files.move(tmp, target);
        if (old != null) {
            deleteTree(old);
        }
    }

    /** Deletes temporary and old folders that an earlier run stopped half way left for this session. */
    private static void removeLeftovers(Path sessionsDir, String key) {
        try (DirectoryStream<Path> dirs = Files.newDirectoryStream(sessionsDir, p -> {
            String n = p.getFileName().toString();
            return n.startsWith("." + key + TMP) || n.startsWith("." + key + OLD);
        })) {
            for (Path d : dirs) {
                deleteTree(d);
            }
        } catch (IOException e) {
            throw new UncheckedIOException("could not tidy " + sessionsDir + ": " + e.getMessage(), e);
        }
    }

    static void deleteTree(Path dir) {
        if (!Files.exists(dir)) {
            return;
        }
        try (Stream<Path> walk = Files.walk(dir)) {
            for (Path p : walk.sorted(Comparator.reverseOrder()).toList()) {
                Files.deleteIfExists(p);
            }
        } catch (IOException e) {
            throw new UncheckedIOException("could not delete " + dir + ": " + e.getMessage(), e);
        }
    }

    private static void waitFor(Future<?> f, Progress progress) {
        while (true) {
            try {
                f.get(200, TimeUnit.MILLISECONDS);
                return;
            } catch (java.util.concurrent.TimeoutException e) {
                if (progress.isCancelled()) {
                    throw new Progress.CancelledException();
                }
            } catch (InterruptedException e) {
                Thread.currentThread().interrupt();
                throw new Progress.CancelledException();
            } catch (ExecutionException e) {
                Throwable c = e.getCause();
                if (c instanceof RuntimeException re) {
                    throw re;
                }
                if (c instanceof Error err) {
                    throw err;
                }
                throw new UncheckedIOException(c.getMessage(), c instanceof IOException io ? io : new IOException(c));
            }
        }
    }

    /** Waits for the workers to tidy up, even when this thread was interrupted (the flag is kept). */
    private static void awaitQuietly(ExecutorService pool) {
        boolean interrupted = Thread.interrupted();
        try {
            while (!pool.awaitTermination(1, TimeUnit.MINUTES)) {
                Thread.onSpinWait();  // a session slow to notice the cancellation: its folder must still go
            }
        } catch (InterruptedException e) {
            interrupted = true;
        } finally {
            if (interrupted) {
                Thread.currentThread().interrupt();
            }
        }
    }

    /** Counts of statuses in the records, for tests and callers that want them without reading files. */
    static Map<String, Long> statusCounts(Path out, List<String> ids) {
        return ids.stream().map(id -> SessionRecord.read(out.resolve("sessions").resolve(new SessionFolder(id, out)
                .key()))).map(r -> r == null ? "missing" : r.status())
                .collect(java.util.stream.Collectors.groupingBy(x -> x, java.util.stream.Collectors.counting()));
    }
}
