package org.dendrokin.io.session;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.ByteArrayOutputStream;
import java.io.IOException;
import java.io.PrintStream;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Arrays;

import org.dendrokin.cli.Main;
import org.dendrokin.io.demo.DemoTreeSessionGenerator;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

import com.google.gson.JsonArray;
import com.google.gson.JsonObject;
import com.google.gson.JsonParser;

/** A branched session from the movie to results.json, and the ways its lines can fail to form a tree. */
class TreeSessionTest {
    @TempDir
    static Path dir;
    private static Path session;

    @BeforeAll
    static void makeSession() {
        session = dir.resolve("tree");
        DemoTreeSessionGenerator.write(session);
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

    @Test
    void theFitOnAllBranchesRecoversTheTrueDAndK() throws IOException {
        Path out = dir.resolve("out");
        Run r = run("analyze", session.toString(), "--out", out.toString());
        assertEquals(Main.OK, r.status(), r.err());
        JsonObject results = JsonParser.parseString(Files.readString(out.resolve("results.json"))).getAsJsonObject();
        JsonObject tree = results.getAsJsonObject("tree");
        JsonArray lines = tree.getAsJsonArray("lines");
        assertEquals(4, lines.size(), "four lines");
        for (var l : lines) {
            String file = l.getAsJsonObject().get("kymograph").getAsString();
            assertTrue(Files.isRegularFile(out.resolve(file)), file);
        }
        assertEquals(2, tree.getAsJsonArray("branch_points").size(), "two branch points found");
        JsonObject p = tree.getAsJsonObject("fit").getAsJsonObject("parameters");
        double d = p.getAsJsonObject("D").get("value").getAsDouble();
        double k = p.getAsJsonObject("k").get("value").getAsDouble();
        // REF: the generator's truth (its movie is made from du/dt = D u'' - k u on the same tree) [derived in the
        // generator]; 10% as the issue asks
        assertEquals(DemoTreeSessionGenerator.D, d, 0.1 * DemoTreeSessionGenerator.D, "D (um^2/s)");
        assertEquals(DemoTreeSessionGenerator.K, k, 0.1 * DemoTreeSessionGenerator.K, "k (1/s)");
        // The intervals are the robust ones (neighbouring positions share their noise) widened by the background's
        // uncertainty, and hold the truth; Student t's alone is kept beside them.
        for (String name : new String[] {"D", "k"}) {
            JsonObject e = p.getAsJsonObject(name);
            assertEquals("robust-wald-t+background+stimulus", e.get("ci_method").getAsString(), name);
            JsonArray ci = e.getAsJsonArray("ci95");
            double truth = name.equals("D") ? DemoTreeSessionGenerator.D : DemoTreeSessionGenerator.K;
            // REF: the generator's truth [derived in the generator]
            assertTrue(ci.get(0).getAsDouble() <= truth && truth <= ci.get(1).getAsDouble(), name + " interval " + ci);
            assertTrue(e.getAsJsonArray("other_intervals").toString().contains("\"wald-t\""), name);
        }
        // the side line next to the stimulus carries a clear signal: what entered it is what the model carries
        JsonObject nearSide = tree.getAsJsonArray("entered_side_branches").get(0).getAsJsonObject();
        assertEquals("side_a", nearSide.get("line").getAsString());
        // REF: the generator's dye fills every branch evenly (one amplitude), so data / model is 1 [derived in the
        // generator]; 10% for the bleaching correction's error
        assertEquals(1.0, nearSide.get("data_over_model").getAsDouble(), 0.1, "side_a data / model");
        String report = Files.readString(out.resolve("report.html"));
        assertTrue(report.contains("tree.png") && report.contains("Branches"), "the report shows the tree");
        assertTrue(Files.isRegularFile(out.resolve("tree.png")), "tree.png");
    }

    /** Exit status 2, one line on stderr that names the file, no stack trace. */
    private static String badInput(Path sessionDir) {
        Run r = run("analyze", sessionDir.toString(), "--out", dir.resolve("bad-out").toString());
        assertEquals(Main.BAD_INPUT, r.status(), r.err());
        String message = Arrays.stream(r.err().split("\n")).map(l -> l.substring(l.lastIndexOf('\r') + 1))
                .filter(l -> !l.isBlank()).reduce("", (a, b) -> a.isEmpty() ? b : a + "\n" + b).trim();
        assertEquals(1, message.lines().count(), "one line: " + message);
        assertFalse(message.contains("Exception"), message);
        return message;
    }

    private static Path withCsvLines(String name, double[][] lines) throws IOException {
        Path s = dir.resolve(name);
        Files.createDirectories(s);
        Files.copy(session.resolve("branches.tif"), s.resolve("branches.tif"));
        StringBuilder paths = new StringBuilder();
        for (int i = 0; i < lines.length; i++) {
            double[] l = lines[i];
            String file = "line" + (i + 1) + ".csv";
            Files.writeString(s.resolve(file), "x,y\n" + l[0] + "," + l[1] + "\n" + l[2] + "," + l[3] + "\n");
            paths.append(i == 0 ? "" : ", ").append('"').append(file).append('"');
        }
        Files.writeString(s.resolve("session.json"), "{\"movie\": \"branches.tif\", \"stimulus\": {\"time_s\": 5, "
                + "\"position_um\": 14}, \"tree\": {\"paths\": [" + paths + "], \"join_tolerance_um\": 1.0}}");
        return s;
    }

    @Test
    void linesThatDoNotMeetAreRefusedWithOneSentence() throws IOException {
        Path s = withCsvLines("apart", new double[][] {{8, 48, 120, 48}, {60, 60, 100, 90}});
        String m = badInput(s);
        assertTrue(m.contains("session.json") && m.contains("line2") && m.contains("does not meet"), m);
    }

    @Test
    void linesThatCloseALoopAreRefusedWithOneSentence() throws IOException {
        Path s = withCsvLines("loop", new double[][] {{10, 10, 90, 10}, {90, 10, 50, 70}, {50, 70, 10, 10}});
        String m = badInput(s);
        assertTrue(m.contains("session.json") && m.contains("loop"), m);
    }
}
