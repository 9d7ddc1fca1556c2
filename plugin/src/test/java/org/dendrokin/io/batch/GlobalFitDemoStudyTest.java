package org.dendrokin.io.batch;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.ByteArrayOutputStream;
import java.io.IOException;
import java.io.PrintStream;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import java.util.regex.Matcher;
import java.util.regex.Pattern;
import java.util.stream.Stream;

import com.google.gson.JsonElement;
import com.google.gson.JsonObject;
import com.google.gson.JsonParser;

import org.dendrokin.cli.Main;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * The joint fit end to end: a demo study of rendered movies (spiny dendrites, blur, bleaching, camera noise; each
 * cell's own D and k written in its session.json) through the command line's batch with the real session analysis.
 */
class GlobalFitDemoStudyTest {
    private static final Pattern TRUE_D = Pattern.compile("true D ([0-9.]+) um\\^2/s");

    @Test
    void eachGroupsSharedDLiesAmongItsCellsTrueValues(@TempDir Path tmp) throws IOException {
        Path root = tmp.resolve("study");
        DemoStudy.write(root, 4, 128, 64, 40, 11L);
        Map<String, List<Double>> truth = new HashMap<>();
        try (Stream<Path> files = Files.walk(root)) {
            for (Path f : files.filter(p -> p.getFileName().toString().equals("session.json")).toList()) {
                JsonObject s = JsonParser.parseString(Files.readString(f)).getAsJsonObject();
                Matcher m = TRUE_D.matcher(s.get("notes").getAsString());
                assertTrue(m.find(), s.toString());
                truth.computeIfAbsent(s.get("group").getAsString(), g -> new ArrayList<>())
                        .add(Double.parseDouble(m.group(1)));
            }
        }
        Path out = tmp.resolve("out");
        PrintStream quiet = new PrintStream(new ByteArrayOutputStream(), true, StandardCharsets.UTF_8);
        assertEquals(Main.OK, Main.run(new String[] {"batch", root.toString(), "--out", out.toString(), "--threads",
            "2", "--global-fit", "diffusion-decay"}, quiet, quiet));
        JsonObject json = JsonParser.parseString(Files.readString(out.resolve("global-fit.json"))).getAsJsonObject();
        Map<String, Double> shared = new HashMap<>();
        for (JsonElement e : json.getAsJsonArray("groups")) {
            JsonObject g = e.getAsJsonObject();
            String name = g.get("group").getAsString();
            assertTrue(g.get("converged").getAsBoolean(), name);
            assertEquals(2, g.get("sessions_used").getAsInt(), name);
            double d = g.getAsJsonObject("shared").getAsJsonObject("D").get("value").getAsDouble();
            double lo = truth.get(name).stream().mapToDouble(Double::doubleValue).min().orElseThrow();
            double hi = truth.get(name).stream().mapToDouble(Double::doubleValue).max().orElseThrow();
            // REF: each rendered cell's true D (DemoSessionGenerator draws Crank's pulse with it) [published formula];
            // 20% for what the analysis of a rendered movie adds (blur, spines in the band, a fitted background)
            assertTrue(d > 0.8 * lo && d < 1.2 * hi, name + ": shared D " + d + " against the cells' " + truth.get(name));
            shared.put(name, d);
        }
        assertTrue(shared.get("drug") < shared.get("control"), "the drug halves D in this study: " + shared);
        assertTrue(Files.readString(out.resolve("index.html")).contains("Shared constants: one fit of all sessions"));
    }
}
