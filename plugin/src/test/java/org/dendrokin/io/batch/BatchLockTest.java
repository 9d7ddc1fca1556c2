package org.dendrokin.io.batch;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.attribute.FileTime;
import java.time.Instant;
import java.util.concurrent.CountDownLatch;
import java.util.concurrent.TimeUnit;
import java.util.concurrent.atomic.AtomicReference;

import org.dendrokin.core.Progress;
import org.dendrokin.io.InputException;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/** Two batches into one output folder: the second is refused while the first runs; a stale lock is taken over. */
class BatchLockTest {
    private static final SessionAnalyzer FAKE = BatchFixtures::fakeAnalyze;

    private static Path study(Path tmp) {
        Path root = tmp.resolve("study");
        BatchFixtures.session(root, "cell1", "a", 0.5, 0.2);
        BatchFixtures.session(root, "cell2", "a", 0.6, 0.2);
        return root;
    }

    private static BatchOutcome run(Path root, Path out, Shard shard) {
        BatchOptions options = BatchOptions.of(root, out, 1);
        return BatchRunner.run(shard == null ? options : options.withShard(shard), FAKE, Progress.NONE, s -> { });
    }

    private static Path lock(Path out, String name, long pid, String host, Instant touched) throws IOException {
        Files.createDirectories(out);
        Path lock = Files.writeString(out.resolve(name), "{\"pid\": " + pid + ", \"host\": \"" + host
                + "\", \"started\": \"2026-12-04T10:00:00Z\"}\n");
        Files.setLastModifiedTime(lock, FileTime.from(touched));
        return lock;
    }

    @Test
    void aSecondBatchIntoTheSameFolderIsRefusedWhileTheFirstRuns(@TempDir Path tmp) throws Exception {
        Path root = study(tmp);
        Path out = tmp.resolve("out");
        CountDownLatch inside = new CountDownLatch(1);
        CountDownLatch release = new CountDownLatch(1);
        SessionAnalyzer waiting = (s, o, p) -> {
            inside.countDown();
            try {
                release.await(60, TimeUnit.SECONDS);
            } catch (InterruptedException e) {
                Thread.currentThread().interrupt();
            }
            FAKE.analyze(s, o, p);
        };
        AtomicReference<Throwable> firstFailed = new AtomicReference<>();
        Thread first = new Thread(() -> {
            try {
                BatchRunner.run(BatchOptions.of(root, out, 1), waiting, Progress.NONE, s -> { });
            } catch (Throwable t) {
                firstFailed.set(t);
            }
        });
        first.start();
        try {
            assertTrue(inside.await(60, TimeUnit.SECONDS), "the first batch started");
            InputException e = assertThrows(InputException.class, () -> run(root, out, null));
            assertTrue(e.getMessage().startsWith(out.resolve("batch.lock") + ": another batch is writing"),
                    e.getMessage());
            assertTrue(e.getMessage().contains("process " + ProcessHandle.current().pid() + " on host "
                    + BatchLock.host()), "names the owner: " + e.getMessage());
        } finally {
            release.countDown();
            first.join(60_000);
        }
        assertNull(firstFailed.get(), "the first batch was not disturbed");
        assertFalse(Files.exists(out.resolve("batch.lock")), "the lock is removed when the batch ends");
        assertEquals(0, run(root, out, null).failed(), "a batch after the first one ends runs");
    }

    @Test
    void aLockWhoseProcessIsGoneIsTakenOver(@TempDir Path tmp) throws Exception {
        Path root = study(tmp);
        Path out = tmp.resolve("out");
        Process gone = new ProcessBuilder(ProcessHandle.current().info().command().orElse("java"), "-version")
                .redirectErrorStream(true).redirectOutput(ProcessBuilder.Redirect.DISCARD).start();
        assertTrue(gone.waitFor(60, TimeUnit.SECONDS), "the short process ended");
        lock(out, "batch.lock", gone.pid(), BatchLock.host(), Instant.now());
        BatchOutcome o = run(root, out, null);
        assertEquals(2, o.total());
        assertEquals(0, o.failed());
        assertFalse(Files.exists(out.resolve("batch.lock")));
    }

    @Test
    void aLockFromAnotherHostHoldsUntilItIsTenMinutesOld(@TempDir Path tmp) throws IOException {
        Path root = study(tmp);
        Path out = tmp.resolve("out");
        lock(out, "batch.lock", 4242, "another-node", Instant.now().minusSeconds(60));
        InputException e = assertThrows(InputException.class, () -> run(root, out, null));
        assertTrue(e.getMessage().contains("process 4242 on host another-node"), e.getMessage());
        lock(out, "batch.lock", 4242, "another-node", Instant.now().minus(BatchLock.STALE_AFTER).minusSeconds(60));
        assertEquals(0, run(root, out, null).failed(), "a lock not touched for ten minutes is stale");
    }

    @Test
    void theShardsOfOnePlanRunSideBySideButNotBesideAWholeRun(@TempDir Path tmp) throws IOException {
        Path root = study(tmp);
        Path out = tmp.resolve("out");
        long me = ProcessHandle.current().pid();
        Path shard1 = lock(out, BatchLock.fileName(new Shard(1, 2)), me, BatchLock.host(), Instant.now());
        assertEquals(0, run(root, out, new Shard(2, 2)).failed(), "shard 2/2 runs beside shard 1/2");
        assertThrows(InputException.class, () -> run(root, out, new Shard(1, 2)), "shard 1/2 is running");
        InputException e = assertThrows(InputException.class, () -> run(root, out, null));
        assertTrue(e.getMessage().startsWith(shard1 + ": "), "a whole run waits for every shard: " + e.getMessage());
    }
}
