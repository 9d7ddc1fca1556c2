package org.dendrokin.io.batch;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.Locale;

import org.apache.commons.csv.CSVRecord;
import org.dendrokin.core.Progress;
import org.dendrokin.io.AtomicFiles;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/** A study mixing sessions in dF/F0 and in uM: nothing in the signal's unit is pooled across the two. */
class BatchUnitsTest {
    /** Writes results.json with a diffusion-decay fit whose amplitude is in the session's signal unit. */
    private static void analyse(Path sessionDir, Path outDir, Progress progress) {
        boolean calibrated = sessionDir.getParent().getFileName().toString().equals("calibrated");
        String unit = calibrated ? "uM" : "dF/F0";
        double amplitude = calibrated ? 0.8 : 1.5;
        AtomicFiles.writeString(outDir.resolve("results.json"), String.format(Locale.ROOT, "{\"tool_version\": "
                + "\"test\", \"session\": \"%s\", \"signal_unit\": \"%s\", \"best_model\": \"diffusion-decay\", "
                + "\"fits\": [{\"model\": \"diffusion-decay\", \"converged\": true, \"aic\": -1, \"bic\": -1, "
                + "\"rmse\": 0.01, \"points\": 100, \"parameters\": {"
                + "\"D\": {\"value\": 0.5, \"unit\": \"um^2/s\", \"ci95\": [0.4, 0.6]}, "
                + "\"amplitude\": {\"value\": %s, \"unit\": \"%s\", \"ci95\": [%s, %s]}}}], "
                + "\"spread\": {\"positions_with_arrival\": 12, \"front_speed\": null}, \"warnings\": []}",
                sessionDir.getFileName(), unit, amplitude, unit, 0.9 * amplitude, 1.1 * amplitude));
    }

    @Test
    void quantitiesInTheSignalUnitAreKeptApartByUnit(@TempDir Path tmp) throws IOException {
        Path root = tmp.resolve("study");
        for (String group : List.of("plain", "calibrated")) {
            for (int i = 1; i <= 3; i++) {
                BatchFixtures.session(root, group + "/cell" + i, group, 0.5, 0.1);
            }
        }
        Path out = tmp.resolve("out");
        BatchRunner.run(BatchOptions.of(root, out, 1), BatchUnitsTest::analyse, Progress.NONE, s -> { });

        SummaryTable table = SummaryTable.read(out, List.of("plain/cell1", "plain/cell2", "plain/cell3",
                "calibrated/cell1", "calibrated/cell2", "calibrated/cell3"));
        List<String> titles = table.quantities().stream().map(SummaryTable.Quantity::title).toList();
        assertTrue(titles.contains("diffusion-decay amplitude (dF/F0)"), titles.toString());
        assertTrue(titles.contains("diffusion-decay amplitude (uM)"), titles.toString());
        for (SummaryTable.Quantity q : table.quantities()) {
            if (q.label().endsWith("amplitude")) {
                assertEquals(3, q.values().size(), q.title() + ": only the sessions of its own unit");
            }
        }
        assertEquals(6, table.quantities().stream().filter(q -> q.label().endsWith(" D")).findFirst().orElseThrow()
                .values().size(), "D is in um^2/s in every session and pooled");

        List<CSVRecord> rows = BatchRunnerTest.summary(out);
        List<String> header = List.copyOf(rows.get(0).toMap().keySet());
        assertTrue(header.contains("diffusion-decay amplitude [dF/F0]") && header.contains(
                "diffusion-decay amplitude [uM]"), header.toString());
        for (CSVRecord r : rows) {
            boolean calibrated = r.get("session").startsWith("calibrated/");
            assertEquals(calibrated ? "" : "1.5", r.get("diffusion-decay amplitude [dF/F0]"), r.get("session"));
            assertEquals(calibrated ? "0.8" : "", r.get("diffusion-decay amplitude [uM]"), r.get("session"));
        }
        assertTrue(header.contains("positions_with_arrival"), header.toString());
        assertFalse(header.stream().anyMatch(h -> h.startsWith("positions_with_arrival ci95")),
                "a count has no interval columns: " + header);

        String index = Files.readString(out.resolve("index.html"));
        assertTrue(index.contains("different signal units") && index.contains("never pooled"), "index.html says so");
    }
}
