package org.dendrokin.io.batch;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertNotNull;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.io.Reader;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Collections;
import java.util.List;
import java.util.Map;
import java.util.concurrent.CountDownLatch;
import java.util.concurrent.TimeUnit;
import java.util.concurrent.atomic.AtomicInteger;
import java.util.concurrent.atomic.AtomicReference;
import java.util.stream.Stream;

import org.apache.commons.csv.CSVFormat;
import org.apache.commons.csv.CSVRecord;
import org.dendrokin.core.Progress;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

class BatchRunnerTest {
    private static final SessionAnalyzer FAKE = BatchFixtures::fakeAnalyze;

    private static BatchOutcome run(Path root, Path out, int threads, SessionAnalyzer a) {
        return BatchRunner.run(BatchOptions.of(root, out, threads), a, Progress.NONE, s -> { });
    }

    static List<CSVRecord> summary(Path out) throws IOException {
        try (Reader r = Files.newBufferedReader(out.resolve("summary.csv"))) {
            return CSVFormat.DEFAULT.builder().setHeader().setSkipHeaderRecord(true).get().parse(r).getRecords();
        }
    }

    @Test
    void goodSessionsAreAnalysedAndBrokenOnesReportedInOneSentence(@TempDir Path tmp) throws IOException {
        Path root = tmp.resolve("study");
        BatchFixtures.session(root, "control/cell1", "control", 0.5, 0.2);
        BatchFixtures.session(root, "control/cell2", "control", 0.6, 0.25);
        BatchFixtures.session(root, "drug/cell1", "drug", 0.3, 0.2);
        BatchFixtures.truncatedMovie(root, "broken/truncated");
        BatchFixtures.missingPath(root, "broken/nopath");
        BatchFixtures.badJson(root, "broken/badjson");
        Path out = tmp.resolve("out");

        BatchOutcome o = run(root, out, 2, FAKE);

        assertEquals(6, o.total(), "sessions found");
        assertEquals(3, o.failed(), "broken sessions");
        assertFalse(o.allFailed(), "some sessions succeeded, so the batch did not fail as a whole");
        List<CSVRecord> rows = summary(out);
        assertEquals(6, rows.size(), "one summary row a session");
        for (CSVRecord r : rows) {
            boolean broken = r.get("session").startsWith("broken/");
            assertEquals(broken ? "failed" : "ok", r.get("status"), r.get("session"));
            if (broken) {
                String error = r.get("error");
                assertTrue(error.contains(r.get("session").replace("broken/", "")), "names the file: " + error);
                assertTrue(error.endsWith(".") && error.indexOf(". ") < 0, "one sentence: " + error);
            }
        }
        CSVRecord cell1 = rows.stream().filter(r -> r.get("session").equals("control/cell1")).findFirst().orElseThrow();
        assertEquals("0.5", cell1.get("diffusion-decay D [um^2/s]"), "fitted D copied from results.json");
        assertEquals("0.45", cell1.get("diffusion-decay D ci95 low [um^2/s]"), "lower end of D's interval");
        assertEquals("diffusion-decay", cell1.get("best_model"), "best model");
        assertEquals("1", cell1.get("warnings"), "warnings counted");
        assertTrue(cell1.get("inputs_sha256").contains("movie.tif="), "movie hash recorded");
        assertTrue(cell1.get("inputs_sha256").contains("path.csv="), "path hash recorded");
        String index = BatchFixtures.read(out.resolve("index.html"));
        assertTrue(index.contains("sessions/control__cell1/kymograph.png"), "thumbnail of a kymograph");
        assertTrue(index.contains("control vs drug"), "group comparison in the report");
        assertTrue(Files.isRegularFile(out.resolve("sessions/broken__badjson/batch.json")), "failure recorded");
    }

    @Test
    void aBatchWhereEverySessionFailsSaysSo(@TempDir Path tmp) {
        Path root = tmp.resolve("study");
        BatchFixtures.truncatedMovie(root, "a");
        BatchFixtures.badJson(root, "b");
        BatchOutcome o = run(root, tmp.resolve("out"), 2, FAKE);
        assertTrue(o.allFailed(), "every session failed");
    }

    @Test
    void aSecondRunSkipsEverythingAndAChangedSessionIsRedoneAlone(@TempDir Path tmp) throws IOException {
        Path root = tmp.resolve("study");
        for (int i = 0; i < 5; i++) {
            BatchFixtures.session(root, "s" + i, i % 2 == 0 ? "a" : "b", 0.5 + i * 0.1, 0.2);
        }
        BatchFixtures.badJson(root, "s5");
        Path out = tmp.resolve("out");
        AtomicInteger calls = new AtomicInteger();
        SessionAnalyzer counting = (s, o, p) -> {
            calls.incrementAndGet();
            FAKE.analyze(s, o, p);
        };
        BatchOutcome first = run(root, out, 2, counting);
        assertEquals(6, first.analysed(), "first run analyses all");
        BatchOutcome second = run(root, out, 2, counting);
        assertEquals(6, second.skipped(), "second run skips every session, failed ones included");
        assertEquals(0, second.analysed(), "second run analyses nothing");
        assertEquals(6, calls.get(), "the analysis ran once per session in all");
        assertEquals(1, second.failed(), "the failed session stays failed");

        Path json = root.resolve("s3/session.json");
        Files.writeString(json, BatchFixtures.read(json).replace("\"pixel_size_um\": 0.2", "\"pixel_size_um\": 0.25"));
        BatchOutcome third = run(root, out, 2, counting);
        assertEquals(1, third.analysed(), "only the changed session is redone");
        assertEquals(5, third.skipped(), "the others are skipped");

        BatchOutcome forced = BatchRunner.run(BatchOptions.of(root, out, 2).withForce(true), counting, Progress.NONE,
                s -> { });
        assertEquals(6, forced.analysed(), "--force redoes every session");
    }

    @Test
    void aResultsFileCutShortOrDeletedSinceIsRedoneNotCountedEmpty(@TempDir Path tmp) throws IOException {
        Path root = tmp.resolve("study");
        for (int i = 0; i < 3; i++) {
            BatchFixtures.session(root, "s" + i, "a", 0.5 + i * 0.1, 0.2);
        }
        Path out = tmp.resolve("out");
        run(root, out, 1, FAKE);
        Path cut = out.resolve("sessions/s0/results.json");
        String whole = BatchFixtures.read(cut);
        Files.writeString(cut, whole.substring(0, whole.length() / 2));
        Files.delete(out.resolve("sessions/s1/results.json"));
        BatchOutcome again = run(root, out, 1, FAKE);
        assertEquals(2, again.analysed(), "the two sessions with damaged results are redone");
        assertEquals(1, again.skipped(), "the intact one is kept");
        assertEquals(whole, BatchFixtures.read(cut), "results.json written again in full");
        assertEquals("0.6", summary(out).get(1).get("diffusion-decay D [um^2/s]"), "s1 is back in the table");
    }

    @Test
    void aNewVersionOfTheMovieIsNoticed(@TempDir Path tmp) throws IOException {
        Path root = tmp.resolve("study");
        BatchFixtures.session(root, "s0", "a", 0.5, 0.2);
        BatchFixtures.session(root, "s1", "a", 0.5, 0.2);
        Path out = tmp.resolve("out");
        run(root, out, 1, FAKE);
        Path movie = root.resolve("s1/movie.tif");
        byte[] bytes = Files.readAllBytes(movie);
        bytes[bytes.length - 1] ^= 1;  // one pixel changed, same size and name
        Files.write(movie, bytes);
        BatchOutcome again = run(root, out, 1, FAKE);
        assertEquals(1, again.analysed(), "the session whose movie changed is redone");
    }

    @Test
    void inputsAreNeverWritten(@TempDir Path tmp) {
        Path root = tmp.resolve("study");
        BatchFixtures.session(root, "a/1", "a", 0.5, 0.2);
        BatchFixtures.session(root, "b/1", "b", 0.7, 0.2);
        BatchFixtures.truncatedMovie(root, "c");
        Map<String, String> before = BatchFixtures.treeHashes(root);
        run(root, tmp.resolve("out"), 2, FAKE);
        run(root, root.resolve("results-inside-root"), 2, FAKE);
        Map<String, String> after = BatchFixtures.treeHashes(root);
        after.keySet().removeIf(k -> k.startsWith("results-inside-root"));
        assertEquals(before, after, "every input file has the same name and content after the batch");
    }

    @Test
    void noMoreMoviesAreReadAtOnceThanAllowed(@TempDir Path tmp) {
        Path root = tmp.resolve("study");
        for (int i = 0; i < 8; i++) {
            BatchFixtures.session(root, "s" + i, "a", 0.5, 0.2);
        }
        AtomicInteger now = new AtomicInteger();
        AtomicInteger most = new AtomicInteger();
        SessionAnalyzer watched = (s, o, p) -> {
            most.accumulateAndGet(now.incrementAndGet(), Math::max);
            try {
                Thread.sleep(30);
                FAKE.analyze(s, o, p);
            } catch (InterruptedException e) {
                Thread.currentThread().interrupt();
            } finally {
                now.decrementAndGet();
            }
        };
        BatchOptions options = BatchOptions.of(root, tmp.resolve("out"), 4).withMoviesAtOnce(2);
        BatchOutcome o = BatchRunner.run(options, watched, Progress.NONE, s -> { });
        assertEquals(8, o.analysed(), "all analysed");
        assertTrue(most.get() <= 2, "at most two analyses at once, saw " + most.get());
    }

    @Test
    void anInterruptedBatchLeavesOnlyCompleteResults(@TempDir Path tmp) throws Exception {
        Path root = tmp.resolve("study");
        for (int i = 0; i < 12; i++) {
            BatchFixtures.session(root, String.format("s%02d", i), "a", 0.5, 0.2);
        }
        Path out = tmp.resolve("out");
        CountDownLatch fourStarted = new CountDownLatch(4);
        SessionAnalyzer slow = (s, o, p) -> {
            FAKE.analyze(s, o, p);  // results.json is written first: a kill now would leave a partial folder
            fourStarted.countDown();
            try {
                Files.writeString(o.resolve("half-written.csv"), "time_s,0\n");
                for (int i = 0; i < 400; i++) {
                    Thread.sleep(5);
                    p.checkCancelled();
                }
            } catch (InterruptedException e) {
                Thread.currentThread().interrupt();
                throw new Progress.CancelledException();
            } catch (IOException e) {
                throw new java.io.UncheckedIOException(e);
            }
        };
        AtomicReference<Throwable> thrown = new AtomicReference<>();
        Thread batch = new Thread(() -> {
            try {
                BatchRunner.run(BatchOptions.of(root, out, 2), slow, Progress.NONE, st -> { });
            } catch (Throwable t) {
                thrown.set(t);
            }
        });
        batch.start();
        assertTrue(fourStarted.await(60, TimeUnit.SECONDS), "sessions started");
        batch.interrupt();
        batch.join(60_000);
        assertFalse(batch.isAlive(), "the batch stopped");
        assertTrue(thrown.get() instanceof Progress.CancelledException, "reported as cancelled: " + thrown.get());
        List<Path> left = new ArrayList<>();
        try (Stream<Path> s = Files.list(out.resolve("sessions"))) {
            s.forEach(left::add);
        }
        for (Path d : left) {
            assertFalse(d.getFileName().toString().startsWith("."), "no temporary folder left: " + d);
            assertNotNull(SessionRecord.read(d), "every result folder is complete: " + d);
        }
        assertTrue(left.size() < 12, "the batch was stopped before the end (" + left.size() + " done)");
        assertFalse(Files.exists(out.resolve("summary.csv")), "no summary of a batch that did not finish");
    }

    @Test
    void cancellingThroughProgressStopsTheBatchCleanly(@TempDir Path tmp) throws IOException {
        Path root = tmp.resolve("study");
        for (int i = 0; i < 10; i++) {
            BatchFixtures.session(root, "s" + i, "a", 0.5, 0.2);
        }
        Path out = tmp.resolve("out");
        AtomicInteger finished = new AtomicInteger();
        Progress cancelAfterThree = new Progress() {
            @Override
            public void report(String stage, long done, long total) {
                finished.set((int) done);
            }

            @Override
            public boolean isCancelled() {
                return finished.get() >= 3;
            }
        };
        assertThrows(Progress.CancelledException.class, () -> BatchRunner.run(BatchOptions.of(root, out, 1), FAKE,
                cancelAfterThree, s -> { }));
        List<String> names = new ArrayList<>();
        try (Stream<Path> s = Files.list(out.resolve("sessions"))) {
            s.forEach(p -> names.add(p.getFileName().toString()));
        }
        Collections.sort(names);
        assertTrue(names.stream().noneMatch(n -> n.startsWith(".")), "no temporary folder left: " + names);
        assertTrue(names.size() >= 3 && names.size() < 10, "stopped part way: " + names);
        BatchOutcome resumed = run(root, out, 2, FAKE);
        assertEquals(names.size(), resumed.skipped(), "finished sessions are kept and skipped on resume");
        assertEquals(10 - names.size(), resumed.analysed(), "the rest is analysed on resume");
    }

    @Test
    void progressLineCountsDoneFailedAndSkipped(@TempDir Path tmp) {
        Path root = tmp.resolve("study");
        BatchFixtures.session(root, "a", "g", 0.5, 0.2);
        BatchFixtures.badJson(root, "b");
        List<BatchStatus> seen = Collections.synchronizedList(new ArrayList<>());
        BatchRunner.run(BatchOptions.of(root, tmp.resolve("out"), 1), FAKE, Progress.NONE, seen::add);
        BatchStatus last = seen.get(seen.size() - 1);
        assertEquals(2, last.done(), "done");
        assertEquals(1, last.failed(), "failed");
        assertTrue(last.line().startsWith("2/2 sessions done (1 failed, 0 skipped)"), last.line());
    }
}
