package org.dendrokin.io.batch;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertNotNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.File;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.concurrent.TimeUnit;
import java.util.stream.Stream;

import org.dendrokin.core.Progress;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/** A batch whose process is killed outright (SIGKILL, no chance to tidy up) leaves only complete results. */
class KilledBatchTest {

    /** Runs a batch of slow stand-in analyses; started in its own JVM by the test. */
    public static void main(String[] args) {
        SessionAnalyzer slow = (s, o, p) -> {
            BatchFixtures.fakeAnalyze(s, o, p);
            try {
                Files.writeString(o.resolve("half-written.csv"), "time_s,0\n");
                Thread.sleep(300);
            } catch (Exception e) {
                throw new IllegalStateException(e);
            }
        };
        BatchRunner.run(BatchOptions.of(Path.of(args[0]), Path.of(args[1]), 2), slow, Progress.NONE, st -> { });
    }

    @Test
    void aKilledProcessLeavesCompleteResultsOnlyAndTheNextRunFinishesTheRest(@TempDir Path tmp) throws Exception {
        Path root = tmp.resolve("study");
        for (int i = 0; i < 30; i++) {
            BatchFixtures.session(root, String.format("s%02d", i), "a", 0.5, 0.2);
        }
        Path out = tmp.resolve("out");
        String java = Path.of(System.getProperty("java.home"), "bin", "java").toString();
        Process p = new ProcessBuilder(java, "-Djava.awt.headless=true", "-cp", System.getProperty("java.class.path"),
                KilledBatchTest.class.getName(), root.toString(), out.toString())
                .redirectErrorStream(true).redirectOutput(tmp.resolve("child.log").toFile()).start();
        try {
            long deadline = System.nanoTime() + TimeUnit.SECONDS.toNanos(300);
            while (completed(out) < 4 && p.isAlive() && System.nanoTime() < deadline) {
                Thread.sleep(20);
            }
            assertTrue(p.isAlive(), "the batch was still running when it was killed");
        } finally {
            p.destroyForcibly();  // SIGKILL on Linux: no shutdown hooks, no finally blocks
            p.waitFor(30, TimeUnit.SECONDS);
        }
        int done = completed(out);
        assertTrue(done >= 4 && done < 30, "killed part way: " + done + " complete");
        try (Stream<Path> dirs = Files.list(out.resolve("sessions"))) {
            for (Path d : dirs.filter(d -> !d.getFileName().toString().startsWith(".")).toList()) {
                assertNotNull(SessionRecord.read(d), "a visible result folder is complete: " + d);
                assertTrue(Files.isRegularFile(d.resolve("results.json")), "with its results: " + d);
            }
        }
        assertFalse(Files.exists(out.resolve("summary.csv")), "no summary from a run that did not finish");

        BatchOutcome resumed = BatchRunner.run(BatchOptions.of(root, out, 2), BatchFixtures::fakeAnalyze,
                Progress.NONE, s -> { });
        assertEquals(done, resumed.skipped(), "complete results are kept");
        assertEquals(30 - done, resumed.analysed(), "the rest is analysed");
        try (Stream<Path> dirs = Files.list(out.resolve("sessions"))) {
            List<String> hidden = dirs.map(d -> d.getFileName().toString()).filter(n -> n.startsWith(".")).toList();
            assertTrue(hidden.isEmpty(), "the killed run's temporary folders are gone: " + hidden);
        }
        assertEquals(31, Files.readAllLines(out.resolve("summary.csv")).size(), "header and 30 rows");
    }

    private static int completed(Path out) {
        File[] dirs = out.resolve("sessions").toFile().listFiles(f -> !f.getName().startsWith("."));
        if (dirs == null) {
            return 0;
        }
        int n = 0;
        for (File d : dirs) {
            n += new File(d, SessionRecord.FILE).isFile() ? 1 : 0;
        }
        return n;
    }
}
