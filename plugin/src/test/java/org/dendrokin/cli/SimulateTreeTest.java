package org.dendrokin.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.ByteArrayOutputStream;
import java.io.PrintStream;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.stream.Stream;

import org.dendrokin.core.kymo.Kymograph;
import org.dendrokin.io.KymographCsv;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

import com.google.gson.JsonObject;
import com.google.gson.JsonParser;

/** {@code simulate} with a tree in the model file: one kymograph per branch, the tree picture, the summary. */
class SimulateTreeTest {
    private static final String TREE = """
            {"model": "diffusion-decay", "parameters": {"D": 0.5, "k": 0.1},
             "tree": {"dx_um": 0.25,
                      "branches": [{"name": "trunk", "length_um": 20, "radius_um": 0.6, "start": "fixed"},
                                   {"name": "a", "length_um": 15, "radius_um": 0.6},
                                   {"name": "b", "length_um": 10, "radius_um": 0.6}],
                      "junctions": [{"at": ["trunk:end", "a:start", "b:start"]}]},
             "time": {"duration_s": 10, "output_interval_s": 0.5},
             "stimuli": [{"branch": "trunk", "time_s": 0, "position_um": 17, "width_um": 1, "amount": 1.0}]%s}
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

    @Test
    void writesOneKymographPerBranchTheTreePictureAndTheSummary(@TempDir Path dir) throws Exception {
        Path model = dir.resolve("tree.json");
        Files.writeString(model, TREE.formatted(""));
        Path out = dir.resolve("out");
        Outcome o = run("simulate", model.toString(), "--out", out.toString());
        assertEquals(0, o.status(), o.err());
        Kymograph trunk = KymographCsv.read(out.resolve("kymograph-trunk.csv"), "u");
        Kymograph a = KymographCsv.read(out.resolve("kymograph-a.csv"), "u");
        Kymograph b = KymographCsv.read(out.resolve("kymograph-b.csv"), "u");
        assertEquals(21, trunk.frameCount(), "frames: 0 to 10 s every 0.5 s");
        assertEquals(81, trunk.positionCount(), "one column per grid node of the trunk");
        assertEquals(61, a.positionCount(), "one column per grid node of a");
        assertEquals(41, b.positionCount(), "one column per grid node of b");
        int last = trunk.frameCount() - 1;
        // Identity: the branch point is one node, so every branch starts from the value at the trunk's end.
        assertEquals(trunk.value(last, 80), a.value(last, 0), 1e-12, "trunk end and a's start share the junction");
        assertEquals(trunk.value(last, 80), b.value(last, 0), 1e-12, "trunk end and b's start share the junction");
        assertEquals(0, trunk.value(last, 0), 0, "the open start of the trunk stays at rest");
        // Equal radii, equal daughters near the junction: symmetry derived here, a and b see the same profile
        // until the shorter one's sealed end (10 um) matters, which it does not at 2 um within 10 s.
        assertEquals(a.value(last, 8), b.value(last, 8), 1e-6 * a.value(last, 8), "a and b 2 um from the junction");
        assertTrue(Files.size(out.resolve("tree.png")) > 1000, "tree picture written");
        assertTrue(Files.size(out.resolve("kymograph-a.png")) > 1000, "branch picture written");
        JsonObject summary = JsonParser.parseString(Files.readString(out.resolve("summary.json"))).getAsJsonObject();
        assertEquals(3, summary.getAsJsonObject("tree").getAsJsonArray("branches").size());
        assertEquals("kymograph-b.csv", summary.getAsJsonObject("kymographs").get("b").getAsString());
        assertEquals("fixed", summary.getAsJsonObject("tree").getAsJsonArray("branches").get(0).getAsJsonObject()
                .get("start").getAsString());
        try (Stream<Path> files = Files.list(dir)) {
            assertEquals(List.of("out", "tree.json"), files.map(p -> p.getFileName().toString()).sorted().toList(),
                    "nothing written beside the model file");
        }
    }

    @Test
    void theShippedTreeExampleRuns(@TempDir Path dir) {
        Path example = Path.of("..").toAbsolutePath().normalize().resolve("docs/examples/branched-dendrite.json");
        Outcome o = run("simulate", example.toString(), "--out", dir.toString());
        assertEquals(0, o.status(), o.err());
        for (String b : List.of("trunk", "a", "b", "b1", "b2")) {
            assertTrue(Files.isRegularFile(dir.resolve("kymograph-" + b + ".csv")), "kymograph of " + b);
        }
    }

    @Test
    void stochasticNetworksRunOnATreeToo(@TempDir Path dir) throws Exception {
        Path model = dir.resolve("net.json");
        Files.writeString(model, """
                {"model": "network",
                 "network": {"species": [{"name": "X", "D_um2_per_s": 1.0}],
                             "reactions": [{"reactants": {"X": 1}, "k": 0.2}]},
                 "tree": {"dx_um": 0.5,
                          "branches": [{"name": "p", "length_um": 6}, {"name": "q", "length_um": 4},
                                       {"name": "r", "length_um": 4}],
                          "junctions": [{"at": ["p:end", "q:start", "r:start"]}]},
                 "time": {"duration_s": 2, "output_interval_s": 0.5},
                 "stimuli": [{"branch": "p", "time_s": 0, "position_um": 5, "width_um": 1, "amount": 5.0}],
                 "output": {"branches": ["q", "p"]},
                 "stochastic": {"runs": 4, "seed": 3, "threads": 1}}
                """);
        Outcome o = run("simulate", model.toString(), "--out", dir.resolve("out").toString());
        assertEquals(0, o.status(), o.err());
        assertTrue(Files.isRegularFile(dir.resolve("out/kymograph_sd-q.csv")), "spread of q");
        assertTrue(Files.notExists(dir.resolve("out/kymograph-r.csv")), "r is not shown");
    }

    private static void assertBadInput(Path dir, String json, String... fragments) throws Exception {
        Path model = dir.resolve("bad.json");
        Files.writeString(model, json);
        Outcome o = run("simulate", model.toString(), "--out", dir.resolve("bad-out").toString());
        assertEquals(2, o.status(), "bad input exits with 2: " + o.err());
        assertTrue(o.err().contains("bad.json"), "names the file: " + o.err());
        for (String f : fragments) {
            assertTrue(o.err().contains(f), "message mentions '" + f + "': " + o.err());
        }
        assertEquals(1, o.err().strip().lines().count(), "one sentence: " + o.err());
    }

    @Test
    void badTreesGiveStatusTwoAndOneSentence(@TempDir Path dir) throws Exception {
        String loop = TREE.formatted("").replace("[{\"at\": [\"trunk:end\", \"a:start\", \"b:start\"]}]",
                "[{\"at\": [\"trunk:end\", \"a:start\"]}, {\"at\": [\"a:end\", \"b:start\"]},"
                        + " {\"at\": [\"b:end\", \"trunk:start\"]}]").replace(", \"start\": \"fixed\"", "");
        assertBadInput(dir, loop, "form a loop");
        String apart = TREE.formatted("").replace("\"a:start\", \"b:start\"", "\"a:start\"");
        assertBadInput(dir, apart, "branch b is not joined");
        assertBadInput(dir, TREE.formatted("").replace("\"b:start\"]", "\"b:middle\"]"), "tree.junctions[0].at",
                "b:middle");
        assertBadInput(dir, TREE.formatted("").replace("\"branch\": \"trunk\", ", ""), "stimuli[0].branch is missing");
        assertBadInput(dir, TREE.formatted("").replace("\"branch\": \"trunk\"", "\"branch\": \"c\""),
                "stimuli[0].branch names c");
        assertBadInput(dir, TREE.formatted("").replace("\"position_um\": 17", "\"position_um\": 25"),
                "stimuli[0].position_um", "outside the branch");
        assertBadInput(dir, TREE.formatted(", \"domain\": {\"length_um\": 10, \"dx_um\": 0.5}"),
                "either domain", "or tree");
        assertBadInput(dir, TREE.formatted("").replace("\"length_um\": 10, \"radius_um\": 0.6}", "\"length_um\": 10}"),
                "branch b has no radius");
        assertBadInput(dir, TREE.formatted("").replace("\"start\": \"fixed\"", "\"end\": \"fixed\""),
                "trunk:end lies in a junction");
        assertBadInput(dir, TREE.formatted(", \"output\": {\"branches\": [\"trunk\", \"z\"]}"),
                "output.branches names z");
        assertBadInput(dir, TREE.formatted(", \"movie\": {\"file\": \"m.tif\", \"path_px\": [[0, 0], [9, 0]],"
                + " \"pixel_size_um\": 1, \"width_px\": 10, \"height_px\": 5}"), "movie");
    }
}
