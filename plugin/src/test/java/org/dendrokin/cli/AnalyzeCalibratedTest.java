package org.dendrokin.cli;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.ByteArrayOutputStream;
import java.io.IOException;
import java.io.PrintStream;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Arrays;

import org.dendrokin.core.kymo.Kymograph;
import org.dendrokin.io.KymographCsv;
import org.dendrokin.io.calib.CalibratedSessionGenerator;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

import com.google.gson.JsonObject;
import com.google.gson.JsonParser;

/** The analyze command with a calibration: the shipped calibrated session, a ratio session, and bad settings. */
class AnalyzeCalibratedTest {
    private static final Path SHIPPED = Path.of("..", "test-images", "calibrated-session");

    @TempDir
    Path dir;

    private final ByteArrayOutputStream out = new ByteArrayOutputStream();
    private final ByteArrayOutputStream err = new ByteArrayOutputStream();

    private int run(String... args) {
        return Main.run(args, new PrintStream(out, true, StandardCharsets.UTF_8),
                new PrintStream(err, true, StandardCharsets.UTF_8));
    }

    private String stderr() {
        return err.toString(StandardCharsets.UTF_8).trim();
    }

    /** A copy of the shipped calibrated session whose calibration block is replaced. */
    private Path session(String calibrationBlock) throws IOException {
        Path s = dir.resolve("session");
        Files.createDirectories(s);
        for (String f : new String[] {"dendrite.tif", "dendrite.roi", "standards.csv"}) {
            Files.copy(SHIPPED.resolve(f), s.resolve(f));
        }
        String json = Files.readString(SHIPPED.resolve("session.json"));
        json = json.replaceFirst("\"calibration\": \\{[^}]*\\}", "\"calibration\": " + calibrationBlock);
        Files.writeString(s.resolve("session.json"), json);
        return s;
    }

    private static double restingMedian(Kymograph k, int lastBaselineFrame) {
        double[] v = new double[(lastBaselineFrame + 1) * k.positionCount()];
        int n = 0;
        for (int f = 0; f <= lastBaselineFrame; f++) {
            for (double x : k.row(f)) {
                if (Double.isFinite(x)) {
                    v[n++] = x;
                }
            }
        }
        double[] s = Arrays.copyOf(v, n);
        Arrays.sort(s);
        return s[n / 2];
    }

    @Test
    void shippedCalibratedSessionGivesMicromolarAndItsRestingLevel() throws IOException {
        byte[] before = Files.readAllBytes(SHIPPED.resolve("dendrite.tif"));
        Path o = dir.resolve("out");
        assertEquals(0, run("analyze", SHIPPED.toString(), "--out", o.toString()), stderr());
        JsonObject r = JsonParser.parseString(Files.readString(o.resolve("results.json"))).getAsJsonObject();
        assertEquals("uM", r.get("signal_unit").getAsString());
        JsonObject cal = r.getAsJsonObject("calibration");
        assertEquals("standards", cal.get("method").getAsString());
        assertEquals("standards.csv", cal.get("source_file").getAsString());
        assertEquals(0.8, cal.getAsJsonObject("thresholds").get("flag_saturation_above").getAsDouble(), 0.0);
        assertTrue(cal.get("fraction_flagged").getAsDouble() > 0, "the peak of the response is flagged");
        assertTrue(r.getAsJsonArray("warnings").toString().contains("f > 0.8"), r.getAsJsonArray("warnings").toString());
        Kymograph k = KymographCsv.read(o.resolve("kymograph.csv"), "uM");
        // The generator's resting level is 0.06 uM (frames before 1.0 s); noise and the fitted calibration allow 10%.
        assertEquals(0.06, restingMedian(k, 18), 0.006, "resting concentration (uM)");
        assertTrue(Files.isRegularFile(o.resolve("concentration_sd.csv")), "per-sample SD written");
        assertTrue(Files.readString(o.resolve("report.html")).contains("Hill form fitted"), "report states it");
        assertArrayEquals(before, Files.readAllBytes(SHIPPED.resolve("dendrite.tif")), "session left unchanged");
    }

    @Test
    void ratioMethodUsesBothChannels() throws IOException {
        Path s = dir.resolve("ratio");
        CalibratedSessionGenerator.writeRatio(s);
        Path o = dir.resolve("out");
        assertEquals(0, run("analyze", s.toString(), "--out", o.toString()), stderr());
        JsonObject r = JsonParser.parseString(Files.readString(o.resolve("results.json"))).getAsJsonObject();
        assertEquals("uM", r.get("signal_unit").getAsString());
        assertEquals("ratio", r.getAsJsonObject("calibration").get("method").getAsString());
        Kymograph k = KymographCsv.read(o.resolve("kymograph.csv"), "uM");
        // REF: Grynkiewicz 1985 ratio form, exact for the generator's two-state dye [published formula]; sheet s1.2
        assertEquals(0.06, restingMedian(k, 8), 0.009, "resting concentration (uM) through the ratio");
    }

    @Test
    void aSavedCalibrationFileIsUsedByReference() throws IOException {
        Path s = session("{\"method\": \"file\", \"file\": \"calibration.json\"}");
        assertEquals(0, run("calibrate", s.resolve("standards.csv").toString(), "--out", s.toString()), stderr());
        Path o = dir.resolve("out");
        assertEquals(0, run("analyze", s.toString(), "--out", o.toString()), stderr());
        JsonObject cal = JsonParser.parseString(Files.readString(o.resolve("results.json"))).getAsJsonObject()
                .getAsJsonObject("calibration");
        assertEquals("calibration.json", cal.get("source_file").getAsString());
        // Same fit as from the table itself (K = 0.399 uM on the shipped standards), read back from the file.
        assertEquals(0.399, cal.getAsJsonObject("constants").get("k_half_uM").getAsDouble(), 0.001);
        assertTrue(cal.get("uncertainty_propagated").getAsBoolean(), "covariance read from the file");
    }

    private void assertBad(Path session, String... fragments) {
        assertEquals(2, run("analyze", session.toString(), "--out", dir.resolve("bad-out").toString()), stderr());
        String e = stderr();
        assertEquals(1, e.split("\n").length, "one sentence: " + e);
        for (String f : fragments) {
            assertTrue(e.contains(f), "'" + f + "' in: " + e);
        }
    }

    @Test
    void fMaxNotAboveFMinIsExitTwo() throws IOException {
        assertBad(session("{\"method\": \"single-wavelength\", \"kd_uM\": 0.4, \"f_min\": 1500, \"f_max\": 60}"),
                "session.json", "calibration.f_max", "calibration.f_min");
    }

    @Test
    void kdNotPositiveIsExitTwo() throws IOException {
        assertBad(session("{\"method\": \"single-wavelength\", \"kd_uM\": -0.4, \"f_min\": 60, \"f_max\": 1500}"),
                "session.json", "calibration.kd_uM");
    }

    @Test
    void tooFewStandardsIsExitTwo() throws IOException {
        Path s = session("{\"method\": \"standards\", \"table\": \"few.csv\"}");
        Files.writeString(s.resolve("few.csv"), "concentration_uM,intensity\n0,60\n0.4,780\n39,1490\n");
        assertBad(s, "few.csv", "at least 5 standards");
    }

    @Test
    void nonMonotoneTableWithTheMonotoneMethodIsExitTwo() throws IOException {
        Path s = session("{\"method\": \"standards\", \"table\": \"bumpy.csv\", \"monotone\": true}");
        Files.writeString(s.resolve("bumpy.csv"), "concentration_uM,intensity\n0,60\n0.1,300\n0.2,250\n1,900\n");
        assertBad(s, "bumpy.csv", "not monotone", "calibration.monotone");
    }

    @Test
    void ratioOnASingleChannelMovieIsExitTwo() throws IOException {
        assertBad(session("{\"method\": \"ratio\", \"kd_uM\": 0.224, \"r_min\": 0.3, \"r_max\": 6, \"beta\": 5}"),
                "session.json", "calibration.method", "dendrite.tif has 1 channel");
    }
}
