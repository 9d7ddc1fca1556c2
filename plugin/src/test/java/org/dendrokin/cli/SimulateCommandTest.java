package org.dendrokin.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.ByteArrayOutputStream;
import java.io.PrintStream;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.stream.Stream;

import org.dendrokin.core.kymo.Kymograph;
import org.dendrokin.core.model.BuiltInModel;
import org.dendrokin.core.model.ModelCatalogue;
import org.dendrokin.io.KymographCsv;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

import com.google.gson.JsonObject;
import com.google.gson.JsonParser;

import ij.IJ;
import ij.ImagePlus;

class SimulateCommandTest {
    private static final String NAGUMO = """
            {"model": "nagumo", "parameters": {"D": 1.0, "k": 2.0, "a": 0.2},
             "domain": {"length_um": 60, "dx_um": 0.25, "boundary": "no-flux"},
             "time": {"duration_s": 20, "output_interval_s": 0.2},
             "stimuli": [{"time_s": 0, "position_um": 5, "width_um": 2, "amount": 1.0}]%s}
            """;

    private record Outcome(int status, String out, String err) {
    }

    private static Outcome run(String... args) {
        ByteArrayOutputStream out = new ByteArrayOutputStream();
        ByteArrayOutputStream err = new ByteArrayOutputStream();
        int status = Main.run(args, new PrintStream(out, true, StandardCharsets.UTF_8),
                new PrintStream(err, true, StandardCharsets.UTF_8));
        return new Outcome(status, out.toString(StandardCharsets.UTF_8), err.toString(StandardCharsets.UTF_8));
    }

    private static Path write(Path dir, String name, String text) throws Exception {
        Path p = dir.resolve(name);
        Files.writeString(p, text);
        return p;
    }

    @Test
    void writesKymographPictureSummaryAndMovie(@TempDir Path dir) throws Exception {
        Path model = write(dir, "front.json", NAGUMO.formatted(", \"movie\": {\"file\": \"sim.tif\", \"path_px\":"
                + " [[4, 20], [60, 10], [120, 30]], \"pixel_size_um\": 0.5, \"width_px\": 128, \"height_px\": 40}"));
        Path out = dir.resolve("out/nested");
        Outcome o = run("simulate", model.toString(), "--out", out.toString());
        assertEquals(0, o.status(), o.err());
        Kymograph k = KymographCsv.read(out.resolve("kymograph.csv"), "u");
        assertEquals(101, k.frameCount(), "frames: 0 to 20 s every 0.2 s");
        assertEquals(241, k.positionCount(), "one column per grid node");
        assertEquals(0.2, k.timeS(1), 1e-12, "frame 1 time (s)");
        assertTrue(Files.size(out.resolve("kymograph.png")) > 1000, "picture written");
        JsonObject summary = JsonParser.parseString(Files.readString(out.resolve("summary.json"))).getAsJsonObject();
        double speed = summary.getAsJsonObject("front_speed").get("value").getAsDouble();
        // REF: McKean 1970, c = sqrt(D k / 2)(1 - 2a) = 0.6 um/s [published formula]; sheet s5.2
        assertEquals(0.6, speed, 0.01 * 0.6, "front speed in summary.json (um/s)");
        ImagePlus movie = IJ.openImage(out.resolve("sim.tif").toString());
        assertEquals(101, movie.getStackSize(), "movie frames");
        assertEquals(0.5, movie.getCalibration().pixelWidth, 1e-12, "movie pixel size (um)");
        assertEquals(0.2, movie.getCalibration().frameInterval, 1e-9, "movie frame interval (s)");
        try (Stream<Path> files = Files.list(dir)) {
            assertEquals(List.of("front.json", "out"), files.map(p -> p.getFileName().toString()).sorted().toList(),
                    "nothing written beside the model file");
        }
    }

    @Test
    void helpListsTheBuiltInModelsWithTheirParameters() {
        Outcome o = run("simulate", "--help");
        assertEquals(0, o.status(), o.err());
        for (BuiltInModel m : ModelCatalogue.all()) {
            assertTrue(o.out().contains("  " + m.name() + ": "), m.name() + " listed: " + o.out());
        }
        assertTrue(o.out().contains("nagumo: D (um^2/s), k (1/s), a"), o.out());
        assertTrue(o.out().contains("kon (1/(uM s))"), o.out());
    }

    @Test
    void timeToleranceIsReportedInTheSummary(@TempDir Path dir) throws Exception {
        Path model = write(dir, "front.json", NAGUMO.formatted(", \"solver\": {\"time_tolerance\": 1e-3}"));
        Path out = dir.resolve("out");
        Outcome o = run("simulate", model.toString(), "--out", out.toString());
        assertEquals(0, o.status(), o.err());
        JsonObject summary = JsonParser.parseString(Files.readString(out.resolve("summary.json"))).getAsJsonObject();
        JsonObject solver = summary.getAsJsonObject("solver");
        assertEquals(1e-3, solver.get("time_tolerance").getAsDouble(), 0, "tolerance echoed");
        double estimate = solver.get("time_error_estimate").getAsDouble();
        assertTrue(estimate > 0 && estimate <= solver.get("time_error_allowed").getAsDouble(), "estimate " + estimate);
        double step = solver.get("mean_time_step_s").getAsDouble();
        assertEquals(20.0 / solver.get("time_steps").getAsLong(), step, 1e-12, "mean step = duration / steps (s)");
        assertEquals(0, summary.getAsJsonArray("warnings").size(), "no warning: " + summary.get("warnings"));
    }

    private static void assertBadInput(Path dir, String json, String... fragments) throws Exception {
        assertBadInputNaming(dir, "bad.json", json, fragments);
    }

    private static void assertBadInputNaming(Path dir, String culprit, String json, String... fragments)
            throws Exception {
        Path model = write(dir, "bad.json", json);
        Outcome o = run("simulate", model.toString(), "--out", dir.resolve("o").toString());
        assertEquals(2, o.status(), "exit status for bad input; stderr: " + o.err());
        String line = o.err().strip();
        assertFalse(line.contains("\n"), "one sentence only: " + line);
        assertFalse(line.contains("Exception"), "no stack trace: " + line);
        assertTrue(line.contains(culprit), "names the file " + culprit + ": " + line);
        for (String f : fragments) {
            assertTrue(line.contains(f), "mentions '" + f + "': " + line);
        }
    }

    @Test
    void badInputsGiveStatusTwoAndOneSentence(@TempDir Path dir) throws Exception {
        assertBadInput(dir, NAGUMO.formatted("").replace("\"D\": 1.0", "\"D\": -1.0"), "parameters.D", "positive");
        assertBadInput(dir, NAGUMO.formatted("").replace("\"nagumo\"", "\"cable-wave\""), "cable-wave", "not known");
        assertBadInput(dir, NAGUMO.formatted("").replace("\"dx_um\": 0.25", "\"dx_um\": 2"), "domain.dx_um",
                "front width");
        assertBadInput(dir, NAGUMO.formatted("").replace("\"width_um\": 2", "\"width_um\": 0.05"),
                "stimuli[0].width_um");
        assertBadInput(dir, NAGUMO.formatted(", \"colour\": 1"), "unknown key colour");
        assertBadInput(dir, NAGUMO.formatted(", \"solver\": {\"fixed_step_s\": 2}"), "solver.fixed_step_s",
                "too long");
        assertBadInput(dir, NAGUMO.formatted(", \"solver\": {\"time_tolerance\": -1e-4}"),
                "solver.time_tolerance", "positive");
        assertBadInput(dir, NAGUMO.formatted(", \"solver\": {\"time_tolerance\": \"tight\"}"),
                "solver.time_tolerance", "number");
        assertBadInput(dir, NAGUMO.formatted(", \"solver\": {\"time_tolerance\": 0}"), "solver.time_tolerance",
                "positive");
        assertBadInput(dir, """
                {"model": "network",
                 "network": {"species": [{"name": "A", "D_um2_per_s": 1}, {"name": "B", "D_um2_per_s": 0}],
                             "reactions": [{"reactants": {"A": 1}, "products": {"B": 1}, "k": 1}]},
                 "domain": {"length_um": 10, "dx_um": 0.5}, "time": {"duration_s": 1, "output_interval_s": 0.1},
                 "solver": {"time_tolerance": 1e-4}, "stochastic": {"runs": 2}}
                """, "solver.time_tolerance", "deterministic");
        assertBadInput(dir, """
                {"model": "network",
                 "network": {"species": [{"name": "A", "D_um2_per_s": 1}, {"name": "B"}],
                             "reactions": [{"reactants": {"A": 1}, "products": {"B": 1}, "k": 1}]},
                 "domain": {"length_um": 10, "dx_um": 0.5}, "time": {"duration_s": 1, "output_interval_s": 0.1}}
                """, "network.species[1]", "B", "D_um2_per_s");
        write(dir, "events.xml", SbmlFixtures.withEvent());
        assertBadInputNaming(dir, "events.xml", """
                {"model": "network", "sbml": {"file": "events.xml", "diffusion_um2_per_s": {"A": 1, "B": 1}},
                 "domain": {"length_um": 10, "dx_um": 0.5}, "time": {"duration_s": 1, "output_interval_s": 0.1}}
                """, "events.xml", "event");
        assertFalse(Files.exists(dir.resolve("jsbml.log")), "JSBML wrote no log file");
        assertFalse(Files.exists(Path.of("jsbml.log")), "JSBML wrote no log file in the working folder");
    }
}
