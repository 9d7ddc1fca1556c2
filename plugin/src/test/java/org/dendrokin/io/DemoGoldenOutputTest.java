package org.dendrokin.io;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;
import static org.junit.jupiter.api.Assertions.fail;

import java.io.IOException;
import java.io.InputStream;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.regex.Matcher;
import java.util.regex.Pattern;
import java.util.zip.GZIPInputStream;

import org.dendrokin.core.Progress;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

import com.google.gson.JsonArray;
import com.google.gson.JsonElement;
import com.google.gson.JsonObject;
import com.google.gson.JsonParser;
import com.google.gson.JsonPrimitive;

/**
 * The outputs of the shipped demo session, compared with a recorded copy (src/test/resources/golden): a change
 * of the code's structure must not change what users get. Only key order and the formatting of the same numbers
 * may differ. When a change is meant to alter the results, regenerate the copy deliberately (see
 * {@code golden/README.md}) and say why in the commit.
 */
class DemoGoldenOutputTest {
    private static final Path DEMO = Path.of("..", "test-images", "demo-session");
    private static final Pattern NUMBER = Pattern.compile("-?\\d+(\\.\\d+)?([eE][-+]?\\d+)?");
    /** Relative difference below which two numbers are the same number written differently. */
    private static final double SAME = 1e-9;

    @TempDir
    static Path out;

    @BeforeAll
    static void analyse() {
        SessionRunner.analyze(DEMO, out, Progress.NONE);
    }

    @Test
    void resultsJsonIsUnchanged() throws IOException {
        JsonElement expected = JsonParser.parseString(golden("results.json"));
        JsonElement actual = JsonParser.parseString(Files.readString(out.resolve("results.json")));
        List<String> differences = new ArrayList<>();
        compare("", expected, actual, differences);
        assertTrue(differences.isEmpty(), () -> "results.json differs from the recorded demo output:\n"
                + String.join("\n", differences.subList(0, Math.min(20, differences.size()))));
    }

    @Test
    void kymographCsvIsUnchanged() throws IOException {
        String[] expected = golden("kymograph.csv.gz").split("\n");
        String[] actual = Files.readString(out.resolve("kymograph.csv")).split("\n");
        assertEquals(expected.length, actual.length, "lines in kymograph.csv");
        for (int i = 0; i < expected.length; i++) {
            String[] e = expected[i].split(",", -1);
            String[] a = actual[i].split(",", -1);
            assertEquals(e.length, a.length, "cells in line " + (i + 1));
            for (int c = 0; c < e.length; c++) {
                sameCell(e[c], a[c], "kymograph.csv line " + (i + 1) + " cell " + (c + 1));
            }
        }
    }

    @Test
    void reportHtmlIsUnchanged() throws IOException {
        String session = DEMO.toAbsolutePath().normalize().toString();
        String expected = golden("report.html").replace("@SESSION_DIR@", session);
        String actual = Files.readString(out.resolve("report.html"));
        List<String> e = tokens(expected);
        List<String> a = tokens(actual);
        for (int i = 0; i < Math.min(e.size(), a.size()); i++) {
            String x = e.get(i);
            String y = a.get(i);
            if (NUMBER.matcher(x).matches() && NUMBER.matcher(y).matches()) {
                sameNumber(Double.parseDouble(x), Double.parseDouble(y), "report.html token " + i);
            } else if (!x.equals(y)) {
                fail("report.html differs at token " + i + ": expected \"" + x + "\" but found \"" + y + "\"\n"
                        + "context: ..." + String.join("", a.subList(Math.max(0, i - 12), Math.min(a.size(), i + 6))));
            }
        }
        assertEquals(e.size(), a.size(), "number of text and number tokens in report.html");
    }

    private static List<String> tokens(String text) {
        List<String> out = new ArrayList<>();
        Matcher m = NUMBER.matcher(text);
        int last = 0;
        while (m.find()) {
            if (m.start() > last) {
                out.add(text.substring(last, m.start()));
            }
            out.add(m.group());
            last = m.end();
        }
        out.add(text.substring(last));
        return out;
    }

    private static void compare(String where, JsonElement e, JsonElement a, List<String> differences) {
        if (e.isJsonObject() && a.isJsonObject()) {
            JsonObject eo = e.getAsJsonObject();
            JsonObject ao = a.getAsJsonObject();
            if (!eo.keySet().equals(ao.keySet())) {
                differences.add(where + ": keys " + eo.keySet() + " became " + ao.keySet());
            }
            for (Map.Entry<String, JsonElement> entry : eo.entrySet()) {
                if (ao.has(entry.getKey())) {
                    compare(where + "." + entry.getKey(), entry.getValue(), ao.get(entry.getKey()), differences);
                }
            }
        } else if (e.isJsonArray() && a.isJsonArray()) {
            JsonArray ea = e.getAsJsonArray();
            JsonArray aa = a.getAsJsonArray();
            if (ea.size() != aa.size()) {
                differences.add(where + ": " + ea.size() + " elements became " + aa.size());
            }
            for (int i = 0; i < Math.min(ea.size(), aa.size()); i++) {
                compare(where + "[" + i + "]", ea.get(i), aa.get(i), differences);
            }
        } else if (e.isJsonPrimitive() && a.isJsonPrimitive() && ((JsonPrimitive) e).isNumber()
                && ((JsonPrimitive) a).isNumber()) {
            double x = e.getAsDouble();
            double y = a.getAsDouble();
            if (!same(x, y)) {
                differences.add(where + ": " + x + " became " + y);
            }
        } else if (!e.equals(a)) {
            differences.add(where + ": " + e + " became " + a);
        }
    }

    private static void sameCell(String e, String a, String where) {
        if (e.equals(a)) {
            return;
        }
        try {
            sameNumber(Double.parseDouble(e), Double.parseDouble(a), where);
        } catch (NumberFormatException ex) {
            fail(where + ": \"" + e + "\" became \"" + a + "\"");
        }
    }

    private static void sameNumber(double e, double a, String where) {
        assertTrue(same(e, a), () -> where + ": " + e + " became " + a);
    }

    private static boolean same(double e, double a) {
        return e == a || (Double.isNaN(e) && Double.isNaN(a))
                || Math.abs(e - a) <= SAME * Math.max(Math.abs(e), Math.abs(a));
    }

    private static String golden(String name) throws IOException {
        try (InputStream in = DemoGoldenOutputTest.class.getResourceAsStream("/golden/demo-session/" + name)) {
            if (in == null) {
                throw new IOException("the recorded demo output " + name + " is missing from the test resources");
            }
            byte[] bytes = name.endsWith(".gz") ? new GZIPInputStream(in).readAllBytes() : in.readAllBytes();
            return new String(bytes, StandardCharsets.UTF_8);
        }
    }
}
