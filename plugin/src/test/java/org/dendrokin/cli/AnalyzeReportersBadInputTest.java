package org.dendrokin.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.ByteArrayOutputStream;
import java.io.IOException;
import java.io.PrintStream;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/** Bad settings of the ratio-change and lifetime methods stop analyze with status 2 and one sentence. */
class AnalyzeReportersBadInputTest {
    private static final Path SHIPPED = Path.of("..", "test-images", "calibrated-session");

    @TempDir
    Path dir;

    private final ByteArrayOutputStream err = new ByteArrayOutputStream();
    private int sessions;

    /** A copy of the shipped one-channel session whose calibration block is replaced. */
    private Path session(String calibrationBlock) throws IOException {
        Path s = Files.createDirectories(dir.resolve("session" + ++sessions));
        for (String f : new String[] {"dendrite.tif", "dendrite.roi"}) {
            Files.copy(SHIPPED.resolve(f), s.resolve(f));
        }
        Files.writeString(s.resolve("tau.tif"), "a file named by the block; the block is refused before it is read");
        String json = Files.readString(SHIPPED.resolve("session.json"));
        Files.writeString(s.resolve("session.json"), json.replaceFirst("\"calibration\": \\{[^}]*\\}",
                "\"calibration\": " + calibrationBlock));
        return s;
    }

    private void assertBad(String calibrationBlock, String... fragments) throws IOException {
        Path s = session(calibrationBlock);
        int status = Main.run(new String[] {"analyze", s.toString(), "--out", dir.resolve("out").toString()},
                new PrintStream(new ByteArrayOutputStream(), true, StandardCharsets.UTF_8),
                new PrintStream(err, true, StandardCharsets.UTF_8));
        String e = err.toString(StandardCharsets.UTF_8).trim();
        err.reset();
        assertEquals(2, status, e);
        assertEquals(1, e.split("\n").length, "one sentence: " + e);
        assertTrue(e.contains("session.json"), e);
        for (String f : fragments) {
            assertTrue(e.contains(f), "'" + f + "' in: " + e);
        }
    }

    @Test
    void aRatioChangeChannelBeyondTheMovieIsExitTwo() throws IOException {
        assertBad("{\"method\": \"ratio-change\"}", "calibration.denominator_channel", "dendrite.tif has 1 channel");
        assertBad("{\"method\": \"ratio-change\", \"numerator_channel\": 3, \"denominator_channel\": 1}",
                "calibration.numerator_channel", "dendrite.tif has 1 channel");
    }

    @Test
    void aNegativeOrMisorderedLifetimeIsExitTwo() throws IOException {
        assertBad("{\"method\": \"lifetime\", \"movie\": \"tau.tif\", \"tau_free_ns\": -2.6, \"tau_bound_ns\": 1.1}",
                "calibration.tau_free_ns");
        assertBad("{\"method\": \"lifetime\", \"movie\": \"tau.tif\", \"tau_free_ns\": 1.1, \"tau_bound_ns\": 2.6}",
                "calibration.tau_bound_ns", "shorter");
        assertBad("{\"method\": \"lifetime\", \"movie\": \"missing.tif\"}", "calibration.movie", "missing.tif");
    }
}
