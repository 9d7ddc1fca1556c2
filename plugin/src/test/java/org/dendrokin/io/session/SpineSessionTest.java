package org.dendrokin.io.session;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.ByteArrayOutputStream;
import java.io.PrintStream;
import java.io.Reader;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;

import org.apache.commons.csv.CSVFormat;
import org.apache.commons.csv.CSVRecord;
import org.dendrokin.cli.Main;
import org.dendrokin.core.Progress;
import org.dendrokin.io.InputException;
import org.dendrokin.io.SessionRunner;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

import com.google.gson.JsonArray;
import com.google.gson.JsonObject;
import com.google.gson.JsonParser;

import ij.gui.OvalRoi;
import ij.gui.PointRoi;
import ij.gui.Roi;
import ij.io.RoiEncoder;

/** The spine demo session analysed through the session runner, and spine ROIs that are wrong. */
class SpineSessionTest {
    private static final Path DEMO = Path.of("..", "test-images", "demo-spines");

    @TempDir
    static Path out;
    private static SessionRunner.Result result;

    @BeforeAll
    static void analyse() {
        result = SessionRunner.analyze(DEMO, out.resolve("demo"), Progress.NONE);
    }

    private static List<CSVRecord> table() throws Exception {
        try (Reader r = Files.newBufferedReader(out.resolve("demo").resolve(SpineOutputs.SPINES_CSV))) {
            return CSVFormat.DEFAULT.builder().setHeader().setSkipHeaderRecord(true).get().parse(r).getRecords();
        }
    }

    @Test
    void theStimulatedSpineIsFoundWhereTheGeneratorPutItWithItsNeckTimeConstant() throws Exception {
        JsonObject truth = JsonParser.parseString(Files.readString(DEMO.resolve("truth.json"))).getAsJsonObject();
        int stimulatedId = truth.getAsJsonObject("stimulus").get("stimulated_spine_id").getAsInt();
        JsonObject head = null;
        for (var e : truth.getAsJsonArray("spines")) {
            if (e.getAsJsonObject().get("id").getAsInt() == stimulatedId) {
                head = e.getAsJsonObject();
            }
        }
        List<CSVRecord> rows = table();
        List<CSVRecord> stimulated = rows.stream().filter(r -> r.get("stimulated").equals("true")).toList();
        assertEquals(1, stimulated.size(), "one spine is the stimulated one");
        CSVRecord s = stimulated.get(0);
        // REF: the generator's own head position and neck time constant (truth.json) [common practice: synthetic
        // data with known truth]
        double dx = Double.parseDouble(s.get("x_px")) - head.get("head_x_px").getAsDouble();
        double dy = Double.parseDouble(s.get("y_px")) - head.get("head_y_px").getAsDouble();
        assertTrue(Math.hypot(dx, dy) < 1, "stimulated head within a pixel of the truth: " + Math.hypot(dx, dy));
        double tau = head.get("tau_neck_s").getAsDouble();
        double low = Double.parseDouble(s.get("tau_neck_ci_low_s"));
        double high = Double.parseDouble(s.get("tau_neck_ci_high_s"));
        assertTrue(low <= tau && tau <= high, "interval " + low + " to " + high + " holds " + tau);
        assertEquals(tau, Double.parseDouble(s.get("tau_neck_s")), 0.2 * tau, "tau_neck (s)");
        assertTrue(Math.abs(Double.parseDouble(s.get("distance_from_stimulus_um"))) < 1.5,
                "the stimulated spine lies near the stimulus");
    }

    @Test
    void tableJsonReportAndPictureAgree() throws Exception {
        List<CSVRecord> rows = table();
        assertFalse(rows.isEmpty(), "spines found");
        assertEquals(List.of(SpineOutputs.HEADER), rows.get(0).getParser().getHeaderNames());
        JsonObject results = JsonParser.parseString(Files.readString(out.resolve("demo").resolve("results.json")))
                .getAsJsonObject();
        JsonArray spines = results.getAsJsonObject("spines").getAsJsonArray("spines");
        assertEquals(rows.size(), spines.size(), "one JSON object a spine");
        for (int i = 0; i < rows.size(); i++) {
            JsonObject j = spines.get(i).getAsJsonObject();
            assertEquals(rows.get(i).get("id"), j.get("id").getAsString());
            assertEquals(rows.get(i).get("side"), j.get("side").getAsString());
            if (!rows.get(i).get("tau_neck_s").isEmpty()) {
                assertEquals(Double.parseDouble(rows.get(i).get("tau_neck_s")),
                        j.getAsJsonObject("tau_neck").get("value").getAsDouble(), 0, "tau_neck of spine " + (i + 1));
                assertEquals("s", j.getAsJsonObject("tau_neck").get("unit").getAsString());
            }
        }
        String report = Files.readString(out.resolve("demo").resolve("report.html"));
        assertTrue(report.contains("<h2>Spines</h2>"), "the report has a spine section");
        assertTrue(Files.size(out.resolve("demo").resolve(SpineOutputs.SPINES_PNG)) > 1000, "spines.png written");
        assertTrue(Files.isRegularFile(out.resolve("demo").resolve(SpineOutputs.TRACES_CSV)), "traces written");
        // Every side is left or right of the path's direction.
        rows.forEach(r -> assertTrue(r.get("side").equals("left") || r.get("side").equals("right")));
    }

    /** A copy of the demo's session.json with the spines key replaced, and copies of its movie and path. */
    private static Path sessionWith(Path dir, String spines, Roi... rois) throws Exception {
        Files.createDirectories(dir);
        for (String f : List.of("dendrite.tif", "dendrite.roi")) {
            Files.copy(DEMO.resolve(f), dir.resolve(f));
        }
        JsonObject s = JsonParser.parseString(Files.readString(DEMO.resolve("session.json"))).getAsJsonObject();
        s.add("spines", JsonParser.parseString(spines));
        Files.writeString(dir.resolve("session.json"), s.toString());
        if (rois.length == 1) {
            Files.write(dir.resolve("spines.roi"), RoiEncoder.saveAsByteArray(rois[0]));
        }
        return dir;
    }

    @Test
    void theNeckFitsAreDrivenByTheShaftsFittedModelUnlessAskedOtherwise(@TempDir Path tmp) throws Exception {
        JsonObject results = JsonParser.parseString(Files.readString(out.resolve("demo").resolve("results.json")))
                .getAsJsonObject();
        // the demo's diffusion-decay fit describes its kymograph, so it drives the heads
        assertEquals("fitted diffusion-decay model", results.getAsJsonObject("spines").get("shaft_signal")
                .getAsString());
        assertTrue(Files.readString(out.resolve("demo").resolve("report.html"))
                .contains("as the fitted diffusion-decay model describes it"), "the report says what drove the fits");

        Path measured = sessionWith(tmp.resolve("measured"), "{\"head_decay_per_s\": 0.0336, \"fitted_shaft\": false}");
        SessionRunner.analyze(measured, tmp.resolve("measured-out"), Progress.NONE);
        JsonObject m = JsonParser.parseString(Files.readString(tmp.resolve("measured-out").resolve("results.json")))
                .getAsJsonObject().getAsJsonObject("spines");
        assertEquals("measured kymograph", m.get("shaft_signal").getAsString());
        assertFalse(m.getAsJsonObject("settings").get("fitted_shaft").getAsBoolean());
        // the same heads, fitted against another input: the stimulated spine's tau_neck moves, but both hold the
        // generator's truth (REF: truth.json [common practice: synthetic data with known truth])
        JsonObject truth = JsonParser.parseString(Files.readString(DEMO.resolve("truth.json"))).getAsJsonObject();
        int stimulatedId = truth.getAsJsonObject("stimulus").get("stimulated_spine_id").getAsInt();
        double tau = Double.NaN;
        for (var e : truth.getAsJsonArray("spines")) {
            if (e.getAsJsonObject().get("id").getAsInt() == stimulatedId) {
                tau = e.getAsJsonObject().get("tau_neck_s").getAsDouble();
            }
        }
        for (JsonObject spines : List.of(results.getAsJsonObject("spines"), m)) {
            for (var e : spines.getAsJsonArray("spines")) {
                JsonObject sp = e.getAsJsonObject();
                if (sp.get("stimulated").getAsBoolean()) {
                    JsonArray ci = sp.getAsJsonObject("tau_neck").getAsJsonArray("ci95");
                    assertTrue(ci.get(0).getAsDouble() <= tau && tau <= ci.get(1).getAsDouble(),
                            spines.get("shaft_signal").getAsString() + ": " + ci + " holds " + tau);
                }
            }
        }
    }

    @Test
    void aCalibratedSessionDrivesTheNecksByTheMeasuredKymographAndSaysWhy(@TempDir Path tmp) throws Exception {
        // the fits describe the concentration, not the dF/F0 the heads are compared with
        Path calibrated = sessionWith(tmp.resolve("calibrated"), "{\"head_decay_per_s\": 0.0336}");
        JsonObject s = JsonParser.parseString(Files.readString(calibrated.resolve("session.json"))).getAsJsonObject();
        s.add("calibration", JsonParser.parseString("{\"method\": \"dynamic-range\", \"kd_uM\": 0.345, "
                + "\"rf\": 100, \"resting_uM\": 0.05}"));
        Files.writeString(calibrated.resolve("session.json"), s.toString());
        SessionRunner.analyze(calibrated, tmp.resolve("calibrated-out"), Progress.NONE);
        JsonObject spines = JsonParser.parseString(Files.readString(tmp.resolve("calibrated-out")
                .resolve("results.json"))).getAsJsonObject().getAsJsonObject("spines");
        assertEquals("measured kymograph", spines.get("shaft_signal").getAsString());
        assertTrue(spines.getAsJsonArray("warnings").toString().contains("calibrated or normalised signal"),
                spines.getAsJsonArray("warnings").toString());
    }

    @Test
    void aSpineRoiOutsideTheImageIsBadInputNamingTheFile(@TempDir Path tmp) throws Exception {
        Path session = sessionWith(tmp.resolve("s"), "{\"rois\": \"spines.roi\"}", new PointRoi(500, 10));
        InputException e = assertThrows(InputException.class,
                () -> SessionRunner.analyze(session, tmp.resolve("o"), Progress.NONE));
        assertTrue(e.getMessage().contains("spines.roi") && e.getMessage().contains("outside"), e.getMessage());
        ByteArrayOutputStream err = new ByteArrayOutputStream();
        int status = Main.run(new String[] {"analyze", "--out", tmp.resolve("o2").toString(), session.toString()},
                new PrintStream(new ByteArrayOutputStream(), true, StandardCharsets.UTF_8),
                new PrintStream(err, true, StandardCharsets.UTF_8));
        assertEquals(2, status, "exit status for bad input; stderr: " + err);
        assertTrue(err.toString(StandardCharsets.UTF_8).contains("spines.roi"), err.toString(StandardCharsets.UTF_8));
    }

    @Test
    void distancesTheWrongWayRoundAreBadInputNamingTheKey(@TempDir Path tmp) throws Exception {
        Path session = sessionWith(tmp.resolve("s"), "{\"min_distance_um\": 2, \"max_distance_um\": 1}");
        InputException e = assertThrows(InputException.class,
                () -> SessionRunner.analyze(session, tmp.resolve("o"), Progress.NONE));
        assertTrue(e.getMessage().contains("max_distance_um") && e.getMessage().contains("session.json"),
                e.getMessage());
    }

    @Test
    void anOvalRoiGivesAHeadOfItsOwnRadius(@TempDir Path tmp) throws Exception {
        OvalRoi oval = new OvalRoi(86.0, 16.5, 4, 4);
        oval.setName("mine");
        Path session = sessionWith(tmp.resolve("s"), "{\"rois\": \"spines.roi\"}", oval);
        SpineConfig config = SpineConfig.read(session);
        var request = config.request(session, 160, 64);
        assertEquals(1, request.given().size());
        assertEquals(88.0, request.given().get(0).xPx(), 1e-9, "centre x (px)");
        assertEquals(18.5, request.given().get(0).yPx(), 1e-9, "centre y (px)");
        assertEquals(2.0, request.given().get(0).radiusPx(), 1e-9, "radius (px)");
        assertEquals("mine", request.given().get(0).label());
        assertFalse(request.settings().detect(), "with ROIs given, detection is off unless asked");
    }
}
