package org.dendrokin.io.batch;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.ByteArrayOutputStream;
import java.io.IOException;
import java.io.PrintStream;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.Map;

import org.apache.commons.csv.CSVRecord;
import org.dendrokin.cli.Main;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/** The batch command end to end with the real session analysis, through the command line. */
class StandardAnalysisBatchTest {

    private static int cli(String... args) {
        PrintStream quiet = new PrintStream(new ByteArrayOutputStream(), true, StandardCharsets.UTF_8);
        return Main.run(args, quiet, quiet);
    }

    @Test
    void goodSessionsAreAnalysedBrokenOnesReportedAndInputsUntouched(@TempDir Path tmp) throws IOException {
        Path root = tmp.resolve("study");
        DemoStudy.write(root, 2, 128, 64, 40, 3L);
        Path truncated = root.resolve("broken/truncated");
        copy(root.resolve("control/cell001"), truncated);
        byte[] movie = Files.readAllBytes(truncated.resolve("dendrite.tif"));
        Files.write(truncated.resolve("dendrite.tif"), java.util.Arrays.copyOf(movie, movie.length / 2));
        Path noPath = root.resolve("broken/nopath");
        copy(root.resolve("drug/cell002"), noPath);
        Files.delete(noPath.resolve("dendrite.roi"));
        Path badJson = root.resolve("broken/badjson");
        copy(root.resolve("control/cell001"), badJson);
        Files.writeString(badJson.resolve("session.json"), "{\"movie\": \"dendrite.tif\",\n \"path\": }\n");
        Map<String, String> before = BatchFixtures.treeHashes(root);

        Path out = tmp.resolve("out");
        int status = cli("batch", root.toString(), "--out", out.toString(), "--threads", "2");
        assertEquals(Main.OK, status, () -> "a batch with some failures exits 0; summary:\n"
                + BatchFixtures.read(out.resolve("summary.csv")));

        List<CSVRecord> rows = BatchRunnerTest.summary(out);
        assertEquals(5, rows.size(), "one row a session");
        for (CSVRecord r : rows) {
            boolean broken = r.get("session").startsWith("broken/");
            assertEquals(broken ? "failed" : "ok", r.get("status"), r.get("session") + ": " + r.get("error"));
            if (!broken) {
                assertTrue(Files.isRegularFile(out.resolve("sessions").resolve(r.get("session").replace("/", "__"))
                        .resolve("results.json")), "results.json of " + r.get("session"));
            }
        }
        assertTrue(rows.stream().filter(r -> r.get("session").equals("broken/truncated")).findFirst().orElseThrow()
                .get("error").contains("dendrite.tif"), "the truncated movie is named");
        assertEquals(before, BatchFixtures.treeHashes(root), "inputs unchanged");

        assertEquals(Main.OK, cli("batch", root.toString(), "--out", out.toString()), "second run");
        String csv = BatchFixtures.read(out.resolve("summary.csv"));
        assertTrue(csv.contains("control/cell001,control,ok"), "kept the first run's result");

        Path allBroken = tmp.resolve("all-broken");
        copy(badJson, allBroken.resolve("a"));
        copy(truncated, allBroken.resolve("b"));
        assertEquals(Main.ALL_FAILED, cli("batch", allBroken.toString(), "--out", tmp.resolve("out2").toString()),
                "every session failed");
    }

    private static void copy(Path from, Path to) throws IOException {
        Files.createDirectories(to);
        try (var files = Files.list(from)) {
            for (Path f : files.toList()) {
                Files.copy(f, to.resolve(f.getFileName()));
            }
        }
    }
}
