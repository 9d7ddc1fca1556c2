package org.dendrokin.io;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertNotNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.security.MessageDigest;
import java.security.NoSuchAlgorithmException;
import java.util.HexFormat;
import java.util.List;
import java.util.Map;
import java.util.TreeMap;
import java.util.stream.Stream;

import org.dendrokin.core.Progress;
import org.dendrokin.io.demo.DemoSessionGenerator;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

import com.google.gson.JsonObject;
import com.google.gson.JsonParser;

class SessionRunnerTest {
    /** A small scenario with known truth: 160 x 40 pixels, 120 frames; the spread stays well inside the path. */
    static final DemoSessionGenerator.Scenario SMALL = new DemoSessionGenerator.Scenario(160, 40, 120, 0.2, 0.5,
            9.75, 14.0, 0.3, 0.05, 1.0, 1.5, 600, 120, 120, 3, 99L);

    @TempDir
    static Path shared;
    static Path session;
    static Path out;
    static SessionRunner.Result result;
    static Map<String, String> before;

    @BeforeAll
    static void analyseOnce() throws IOException {
        session = shared.resolve("session");
        DemoSessionGenerator.write(session, SMALL);
        before = hashes(session);
        out = shared.resolve("results/nested/deeper");
        result = SessionRunner.analyze(session, out, Progress.NONE);
    }

    static Map<String, String> hashes(Path dir) throws IOException {
        Map<String, String> map = new TreeMap<>();
        try (Stream<Path> files = Files.walk(dir)) {
            for (Path p : files.sorted().toList()) {
                String key = dir.relativize(p).toString();
                if (Files.isDirectory(p)) {
                    map.put(key + "/", "dir");
                } else {
                    map.put(key, sha256(Files.readAllBytes(p)) + " " + Files.getLastModifiedTime(p));
                }
            }
        }
        return map;
    }

    private static String sha256(byte[] bytes) {
        try {
            return HexFormat.of().formatHex(MessageDigest.getInstance("SHA-256").digest(bytes));
        } catch (NoSuchAlgorithmException e) {
            throw new IllegalStateException(e);
        }
    }

    @Test
    void theSessionFolderIsUnchanged() throws IOException {
        assertEquals(before, hashes(session), "names, contents and times of every file in the session folder");
    }

    @Test
    void writesEveryOutputIntoTheNewFolder() {
        for (String name : List.of("kymograph.csv", "kymograph.png", "kymograph-raw.png", "path.png",
                "front-arrival.png", "peak-vs-distance.png", "integrated-signal.png", "results.json", "report.html")) {
            assertTrue(Files.isRegularFile(out.resolve(name)), name);
        }
    }

    @Test
    void resultsJsonHoldsTheContractKeys() throws IOException {
        JsonObject r = JsonParser.parseString(Files.readString(out.resolve("results.json"))).getAsJsonObject();
        for (String key : List.of("tool_version", "session", "signal_unit", "kymograph", "fits", "best_model", "spread",
                "warnings")) {
            assertTrue(r.has(key), key);
        }
        assertEquals("session", r.get("session").getAsString());
        assertEquals("dF/F0", r.get("signal_unit").getAsString());
        assertEquals("kymograph.csv", r.getAsJsonObject("kymograph").get("file").getAsString());
        assertEquals(0.2, r.getAsJsonObject("kymograph").get("distance_step_um").getAsDouble(), 1e-12);
        assertEquals(0.5, r.getAsJsonObject("kymograph").get("time_step_s").getAsDouble(), 1e-12);
        assertTrue(r.get("fits").isJsonArray());
        JsonObject spread = r.getAsJsonObject("spread");
        for (String key : List.of("front_speed", "length_constant", "peak_decay_length", "decay_time")) {
            assertTrue(spread.has(key), key);
        }
        for (String key : List.of("length_constant", "peak_decay_length", "decay_time")) {
            JsonObject e = spread.getAsJsonObject(key);
            assertTrue(e.has("value") && e.has("unit") && e.getAsJsonArray("ci95").size() == 2, key);
        }
        assertEquals("um", spread.getAsJsonObject("length_constant").get("unit").getAsString());
        assertEquals("model:diffusion-decay", spread.getAsJsonObject("length_constant").get("source").getAsString());
        // A spreading pulse has no front of constant speed: no figure, and the reason instead.
        assertTrue(spread.get("front_speed").isJsonNull(), "no front speed for a diffusing pulse");
        JsonObject front = spread.getAsJsonObject("front");
        assertFalse(front.get("present").getAsBoolean());
        assertFalse(front.get("reason").getAsString().isBlank(), front.toString());
        // Where there is no front, the default travelling-wave model is listed as not tried, not as a failure.
        JsonObject nagumo = null;
        for (var f : r.getAsJsonArray("fits")) {
            if (f.getAsJsonObject().get("model").getAsString().equals("nagumo")) {
                nagumo = f.getAsJsonObject();
            }
        }
        assertNotNull(nagumo, "the default wave model is listed");
        assertFalse(nagumo.get("tried").getAsBoolean(), nagumo.toString());
        assertTrue(nagumo.get("reason").getAsString().contains("no front"), nagumo.toString());
        assertTrue(result.warnings().stream().noneMatch(w -> w.contains("did not converge")), result.warnings()
                .toString());
    }

    @Test
    void recoversTheGeneratorsKnownValues() {
        // REF: the generator's own truth (synthetic data with known values) [common practice]
        assertEquals("detected", result.stimulus().source());
        assertEquals(SMALL.stimulusTimeS(), result.stimulus().timeS(), 1e-9, "stimulus time, s");
        assertEquals(SMALL.stimulusPositionUm(), result.stimulus().positionUm(), 0.3, "stimulus position, um");
        assertNotNull(result.spread().apparentD(), result.warnings().toString());
        assertNotNull(result.spread().decayTime(), result.warnings().toString());
        // Gaussian pulse: variance s0^2 + 2 D t [published formula: Crank 1975]; sheet s2.2. Noise allows 20%.
        assertEquals(SMALL.dUm2PerS(), result.spread().apparentD().value(), 0.2 * SMALL.dUm2PerS(), "apparent D");
        // Mass decays as exp(-k t) [published: Crank 1975]; sheet s2.3. Noise, a little loss off the path ends and
        // spreading signal in the bleach reference allow 20%.
        assertEquals(1 / SMALL.kPerS(), result.spread().decayTime().value(), 0.2 / SMALL.kPerS(), "decay time, s");
    }

    @Test
    void reportShowsThePicturesAndTheCautions() throws IOException {
        String html = Files.readString(out.resolve("report.html"));
        assertTrue(html.contains("<img src=\"kymograph.png\""));
        assertTrue(html.contains("not for clinical use") || html.contains("It is not for clinical"), "caution");
        assertTrue(html.contains("0.2 um"), "pixel size shown with its unit");
    }
}
