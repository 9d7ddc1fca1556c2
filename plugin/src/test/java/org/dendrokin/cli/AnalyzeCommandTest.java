package org.dendrokin.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.ByteArrayOutputStream;
import java.io.IOException;
import java.io.PrintStream;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;

import org.dendrokin.io.demo.DemoSessionGenerator;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

import com.google.gson.JsonObject;
import com.google.gson.JsonParser;

class AnalyzeCommandTest {
    private static final DemoSessionGenerator.Scenario TINY = new DemoSessionGenerator.Scenario(64, 32, 40, 0.25, 1.0,
            9.5, 6.0, 0.5, 0.05, 1.0, 1.5, 600, 100, 200, 3, 5L);

    @TempDir
    static Path dir;
    static Path good;

    @BeforeAll
    static void makeSession() {
        good = dir.resolve("good");
        DemoSessionGenerator.write(good, TINY);
    }

    private record Run(int status, String out, String err) {
    }

    private static Run run(String... args) {
        ByteArrayOutputStream out = new ByteArrayOutputStream();
        ByteArrayOutputStream err = new ByteArrayOutputStream();
        int status = Main.run(args, new PrintStream(out, true, StandardCharsets.UTF_8),
                new PrintStream(err, true, StandardCharsets.UTF_8));
        return new Run(status, out.toString(StandardCharsets.UTF_8), err.toString(StandardCharsets.UTF_8));
    }

    private static Path copyWithSession(String name, String sessionJson) throws IOException {
        Path s = dir.resolve(name);
        Files.createDirectories(s);
        for (String f : new String[] {"dendrite.tif", "dendrite.roi"}) {
            Files.copy(good.resolve(f), s.resolve(f));
        }
        Files.writeString(s.resolve("session.json"), sessionJson);
        return s;
    }

    /** Exit status 2, one sentence on stderr naming the file, no stack trace. */
    private static String badInput(String... args) {
        Run r = run(args);
        assertEquals(Main.BAD_INPUT, r.status(), r.err());
        // The progress line rewrites itself with carriage returns; what a terminal finally shows is what follows
        // the last one on each line.
        String message = java.util.Arrays.stream(r.err().split("\n")).map(l -> l.substring(l.lastIndexOf('\r') + 1)).filter(l -> !l.isBlank())
                .reduce("", (a, b) -> a.isEmpty() ? b : a + "\n" + b).trim();
        assertEquals(1, message.lines().count(), "one line: " + message);
        assertFalse(message.contains("Exception"), message);
        return message;
    }

    @Test
    void analyzeWritesTheReportAndSaysWhere() {
        Path out = dir.resolve("out-good");
        Run r = run("analyze", good.toString(), "--out", out.toString());
        assertEquals(Main.OK, r.status(), r.err());
        assertTrue(r.out().contains("Report: " + out.resolve("report.html").toAbsolutePath().normalize()), r.out());
        assertTrue(Files.isRegularFile(out.resolve("results.json")));
    }

    @Test
    void malformedSessionJsonNamesTheFileAndTheLine() throws IOException {
        Path s = copyWithSession("malformed", "{\n  \"movie\": \"dendrite.tif\"\n  \"path\": \"dendrite.roi\"\n}\n");
        String message = badInput("analyze", s.toString(), "--out", dir.resolve("o1").toString());
        assertTrue(message.contains("session.json") && message.contains("line 3"), message);
        assertFalse(Files.exists(dir.resolve("o1")), "nothing written for a bad session");
    }

    @Test
    void aBadValueNamesTheKey() throws IOException {
        Path s = copyWithSession("badkey", "{\"path_width_um\": -1}");
        String message = badInput("analyze", s.toString(), "--out", dir.resolve("o2").toString());
        assertTrue(message.contains("session.json") && message.contains("\"path_width_um\""), message);
    }

    @Test
    void anUnknownModelAndAKeyGivenTwiceAreBadInputNotInternalErrors() throws IOException {
        Path s = copyWithSession("unknownmodel", "{\"models\": [\"no-such-model\"]}");
        String message = badInput("analyze", s.toString(), "--out", dir.resolve("o5").toString());
        assertTrue(message.contains("\"models\"") && message.contains("no-such-model"), message);
        Path twice = copyWithSession("twice", "{\"path_width_um\": 1,\n\"path_width_um\": 3}");
        message = badInput("analyze", twice.toString(), "--out", dir.resolve("o6").toString());
        assertTrue(message.contains("\"path_width_um\"") && message.contains("line 2"), message);
    }

    @Test
    void aMissingMovieNamesTheKey() throws IOException {
        Path s = copyWithSession("nomovie", "{\"movie\": \"absent.tif\"}");
        String message = badInput("analyze", s.toString(), "--out", dir.resolve("o3").toString());
        assertTrue(message.contains("\"movie\"") && message.contains("absent.tif"), message);
    }

    @Test
    void aFolderWithoutSessionJsonIsRefused() throws IOException {
        Path s = dir.resolve("empty");
        Files.createDirectories(s);
        String message = badInput("analyze", s.toString(), "--out", dir.resolve("o4").toString());
        assertTrue(message.contains("session.json"), message);
    }

    @Test
    void aBackgroundThatIsNotAnAreaRoiIsRefused() throws IOException {
        Path s = copyWithSession("bgline",
                "{\"path\": \"dendrite.roi\", \"background\": {\"roi\": \"dendrite.roi\"}}");
        String message = badInput("analyze", s.toString(), "--out", dir.resolve("o5").toString());
        assertTrue(message.contains("dendrite.roi") && message.contains("area ROI"), message);
    }

    @Test
    void demoRunsFromTheCopyInsideTheBuild() {
        // The tests run in plugin/, where test-images/ is not found, so the bundled copy is used.
        Path out = dir.resolve("demo-out");
        Run r = run("demo", "--out", out.toString());
        assertEquals(Main.OK, r.status(), r.err());
        assertTrue(r.out().contains("Report: "), r.out());
        // The terminal names the preferred model as results.json does, with its constants and units.
        JsonObject json;
        try {
            json = JsonParser.parseString(Files.readString(out.resolve("results.json"))).getAsJsonObject();
        } catch (IOException e) {
            throw new java.io.UncheckedIOException(e);
        }
        assertTrue(json.get("best_model").isJsonPrimitive(), "the demo has a preferred model");
        String best = json.get("best_model").getAsString();
        assertTrue(r.out().contains("best model        " + best), r.out());
        assertTrue(r.out().contains("um^2/s") && r.out().contains("1/s"), r.out());
        assertTrue(Files.isRegularFile(out.resolve("report.html")));
        assertTrue(Files.isRegularFile(out.resolve("demo-session/session.json")), "inputs unpacked inside --out");
    }

    @Test
    void settingsFromSessionJsonAreUsedAndReported() throws IOException {
        Path s = copyWithSession("given", "{\"stimulus\": {\"time_s\": 9.5, \"position_um\": 6.0}, "
                + "\"background\": {\"value\": 100}, \"baseline_frames\": [2, 8], \"bleach_correction\": false, "
                + "\"colour\": \"green\"}");
        Path out = dir.resolve("o-given");
        Run r = run("analyze", s.toString(), "--out", out.toString());
        assertEquals(Main.OK, r.status(), r.err());
        JsonObject json = JsonParser.parseString(Files.readString(out.resolve("results.json"))).getAsJsonObject();
        assertEquals("session.json", json.getAsJsonObject("stimulus").get("source").getAsString());
        assertEquals(9.5, json.getAsJsonObject("stimulus").get("time_s").getAsDouble());
        assertEquals(100.0, json.getAsJsonObject("background").get("value").getAsDouble());
        assertEquals(2, json.getAsJsonArray("baseline_frames").get(0).getAsInt());
        assertEquals(8, json.getAsJsonArray("baseline_frames").get(1).getAsInt());
        assertFalse(json.getAsJsonObject("bleach_correction").get("applied").getAsBoolean());
        assertTrue(json.getAsJsonArray("warnings").toString().contains("\\\"colour\\\""),
                "unknown key reported: " + json.getAsJsonArray("warnings"));
    }

    @Test
    void aBackgroundRoiIsMeasuredFrameByFrame() throws IOException {
        Path s = copyWithSession("bgroi", "{\"background\": {\"roi\": \"corner.roi\"}}");
        byte[] roi = ij.io.RoiEncoder.saveAsByteArray(new ij.gui.Roi(0, 0, 10, 6));
        Files.write(s.resolve("corner.roi"), roi);
        Path out = dir.resolve("o-bgroi");
        Run r = run("analyze", s.toString(), "--out", out.toString());
        assertEquals(Main.OK, r.status(), r.err());
        JsonObject bg = JsonParser.parseString(Files.readString(out.resolve("results.json"))).getAsJsonObject()
                .getAsJsonObject("background");
        // REF: the generator's background of 100 counts with read noise 3 (synthetic truth) [common practice];
        // the median over 40 frames of 60-pixel means has an SD near 3 / sqrt(60) = 0.4.
        assertEquals(100.0, bg.get("value").getAsDouble(), 1.0, "background from the ROI, grey values");
        assertTrue(bg.get("how").getAsString().contains("corner.roi"));
    }
}
