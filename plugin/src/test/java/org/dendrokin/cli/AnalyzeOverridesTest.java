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
import java.util.Arrays;
import java.util.Locale;

import org.dendrokin.io.demo.DemoSessionGenerator;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

import com.google.gson.JsonObject;
import com.google.gson.JsonParser;

import ij.IJ;
import ij.ImagePlus;
import ij.ImageStack;
import ij.gui.Roi;
import ij.io.FileSaver;
import ij.io.RoiDecoder;
import ij.process.FloatPolygon;
import ij.process.ShortProcessor;

/**
 * {@code analyze --channel, --motion, --stimulus-xy}: a run with the options gives the numbers of a run whose
 * session.json was edited to say the same, states the options as overrides, and refuses bad values with one
 * sentence naming the option.
 */
class AnalyzeOverridesTest {
    private static final DemoSessionGenerator.Scenario TINY = new DemoSessionGenerator.Scenario(64, 32, 40, 0.25, 1.0,
            9.5, 6.0, 0.5, 0.05, 1.0, 1.5, 600, 100, 200, 3, 5L);

    @TempDir
    static Path dir;
    /** The demo movie as channel 2 of a hyperstack whose channel 1 is a flat structural image. */
    static Path twoChannels;
    static double spotX;
    static double spotY;

    @BeforeAll
    static void makeSessions() throws IOException {
        Path one = dir.resolve("one");
        DemoSessionGenerator.write(one, TINY);
        twoChannels = dir.resolve("two");
        Files.createDirectories(twoChannels);
        ImagePlus movie = IJ.openImage(one.resolve("dendrite.tif").toString());
        ImageStack both = new ImageStack(movie.getWidth(), movie.getHeight());
        for (int f = 1; f <= movie.getStackSize(); f++) {
            ShortProcessor flat = new ShortProcessor(movie.getWidth(), movie.getHeight());
            flat.set(700);
            both.addSlice(flat);
            both.addSlice(movie.getStack().getProcessor(f).duplicate());
        }
        ImagePlus hyper = new ImagePlus("two", both);
        hyper.setDimensions(2, 1, movie.getStackSize());
        hyper.setOpenAsHyperStack(true);
        hyper.setCalibration(movie.getCalibration().copy());
        new FileSaver(hyper).saveAsTiff(twoChannels.resolve("dendrite.tif").toString());
        Files.copy(one.resolve("dendrite.roi"), twoChannels.resolve("dendrite.roi"));
        Files.copy(one.resolve("session.json"), twoChannels.resolve("session.json"));
        // a spot a little off the path near its middle vertex, as acquisition software would record it
        Roi roi = RoiDecoder.open(one.resolve("dendrite.roi").toString());
        FloatPolygon p = roi.getFloatPolygon();
        spotX = p.xpoints[p.npoints / 2] + 0.5;
        spotY = p.ypoints[p.npoints / 2] + 1.0;
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

    /** The session folder {@code two} with session.json extended by {@code keys}. */
    private static Path edited(String name, String keys) throws IOException {
        Path s = dir.resolve(name);
        Files.createDirectories(s);
        for (String f : new String[] {"dendrite.tif", "dendrite.roi"}) {
            Files.copy(twoChannels.resolve(f), s.resolve(f));
        }
        Files.writeString(s.resolve("session.json"), Files.readString(twoChannels.resolve("session.json"))
                .replaceFirst("\\{", "{" + keys + ", "));
        return s;
    }

    private static JsonObject results(Path out) throws IOException {
        return JsonParser.parseString(Files.readString(out.resolve("results.json"))).getAsJsonObject();
    }

    @Test
    void optionsGiveTheNumbersOfTheEditedSessionJsonAndAreStatedAsOverrides() throws IOException {
        Path byFile = edited("by-file", String.format(Locale.ROOT, "\"channel\": 2, \"motion\": \"off\", "
                + "\"stimulus\": {\"x_px\": %s, \"y_px\": %s}", spotX, spotY));
        Path fileOut = dir.resolve("by-file-out");
        Run a = run("analyze", byFile.toString(), "--out", fileOut.toString());
        assertEquals(Main.OK, a.status(), a.err());
        Path optionOut = dir.resolve("by-options-out");
        Run b = run("analyze", twoChannels.toString(), "--out", optionOut.toString(), "--channel", "2", "--motion",
                "off", "--stimulus-xy", spotX + "," + spotY);
        assertEquals(Main.OK, b.status(), b.err());

        JsonObject fromFile = results(fileOut);
        JsonObject fromOptions = results(optionOut);
        JsonObject overrides = fromOptions.remove("overrides").getAsJsonObject();
        assertFalse(fromFile.has("overrides"), "an edited session.json is no override");
        assertEquals(2, overrides.get("channel").getAsInt());
        assertEquals("off", overrides.get("motion").getAsString());
        assertEquals(spotX, overrides.getAsJsonArray("stimulus_xy_px").get(0).getAsDouble(), 0);
        assertEquals(spotY, overrides.getAsJsonArray("stimulus_xy_px").get(1).getAsDouble(), 0);
        // REF: an option that takes precedence over session.json must act as the same key written there
        // [common practice]; every number, warning and section of results.json is the same but the folder's name
        assertEquals("by-file", fromFile.remove("session").getAsString());
        assertEquals("two", fromOptions.remove("session").getAsString());
        assertTrue(fromFile.equals(fromOptions), "results.json differs:\n" + fromFile + "\n" + fromOptions);
        assertEquals(Files.readString(fileOut.resolve("kymograph.csv")),
                Files.readString(optionOut.resolve("kymograph.csv")), "the same kymograph");
        String report = Files.readString(optionOut.resolve("report.html"));
        assertTrue(report.contains("Set in the command line for this run, over session.json: signal channel 2; "
                + "motion off; stimulus spot at x"), "the report states the overrides");
    }

    /** Exit status 2 and one sentence on stderr, without a stack trace. */
    private static String refused(String... args) {
        Run r = run(args);
        assertEquals(Main.BAD_INPUT, r.status(), r.err());
        String message = Arrays.stream(r.err().split("\n")).map(l -> l.substring(l.lastIndexOf('\r') + 1))
                .filter(l -> !l.isBlank()).reduce("", (x, y) -> x.isEmpty() ? y : x + "\n" + y).trim();
        assertEquals(1, message.lines().count(), "one line: " + message);
        assertFalse(message.contains("Exception"), message);
        return message;
    }

    @Test
    void badValuesAreRefusedNamingTheOption() {
        String s = twoChannels.toString();
        String out = dir.resolve("refused").toString();
        assertTrue(refused("analyze", s, "--out", out, "--channel", "0").contains("--channel"));
        assertTrue(refused("analyze", s, "--out", out, "--channel", "two").contains("--channel"));
        assertTrue(refused("analyze", s, "--out", out, "--channel", "3").contains("--channel asks for channel 3"));
        assertTrue(refused("analyze", s, "--out", out, "--motion", "sideways").contains("--motion"));
        assertTrue(refused("analyze", s, "--out", out, "--stimulus-xy", "12").contains("--stimulus-xy"));
        assertTrue(refused("analyze", s, "--out", out, "--stimulus-xy", "12,NaN").contains("--stimulus-xy"));
        assertFalse(Files.exists(dir.resolve("refused").resolve("results.json")), "nothing analysed");
    }
}
