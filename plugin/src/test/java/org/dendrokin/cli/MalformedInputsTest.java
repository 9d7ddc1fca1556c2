package org.dendrokin.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.ByteArrayOutputStream;
import java.io.IOException;
import java.io.PrintStream;
import java.nio.ByteBuffer;
import java.nio.ByteOrder;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Arrays;
import java.util.List;
import java.util.stream.Stream;

import org.dendrokin.io.demo.DemoSessionGenerator;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

import com.google.gson.JsonObject;
import com.google.gson.JsonParser;

import ij.IJ;
import ij.ImagePlus;
import ij.ImageStack;
import ij.io.FileSaver;
import ij.measure.Calibration;
import ij.process.ShortProcessor;

/**
 * The malformed and unusual inputs users bring, one test each, run through the command line: each is refused with
 * exit status 2 and one sentence naming the file and the problem, before anything is written, or analysed with a
 * warning; never an internal error.
 */
class MalformedInputsTest {
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

    record Run(int status, String out, String err) {
    }

    static Run run(String... args) {
        ByteArrayOutputStream out = new ByteArrayOutputStream();
        ByteArrayOutputStream err = new ByteArrayOutputStream();
        int status = Main.run(args, new PrintStream(out, true, StandardCharsets.UTF_8),
                new PrintStream(err, true, StandardCharsets.UTF_8));
        return new Run(status, out.toString(StandardCharsets.UTF_8), err.toString(StandardCharsets.UTF_8));
    }

    /** Exit status 2 and the one sentence stderr ends with (the progress line, rewritten in place, left out). */
    static String refusal(String... args) {
        Run r = run(args);
        assertEquals(Main.BAD_INPUT, r.status(), "exit status; stderr: " + r.err());
        String message = Arrays.stream(r.err().split("\n")).map(l -> l.substring(l.lastIndexOf('\r') + 1))
                .filter(l -> !l.isBlank()).reduce("", (a, b) -> a.isEmpty() ? b : a + "\n" + b).trim();
        assertEquals(1, message.lines().count(), "one line: " + message);
        assertFalse(message.contains("Exception") || message.contains("Internal error"), message);
        return message;
    }

    static Path session(String name, String sessionJson) throws IOException {
        Path s = dir.resolve(name);
        Files.createDirectories(s);
        for (String f : new String[] {"dendrite.tif", "dendrite.roi"}) {
            Files.copy(good.resolve(f), s.resolve(f));
        }
        Files.writeString(s.resolve("session.json"), sessionJson);
        return s;
    }

    static List<String> listing(Path folder) throws IOException {
        try (Stream<Path> files = Files.walk(folder)) {
            return files.map(p -> folder.relativize(p).toString()).sorted().toList();
        }
    }

    // ---- --out and the session folder

    @Test
    void outEqualToInsideOrLinkedToTheSessionFolderIsRefusedBeforeAnythingIsWritten() throws IOException {
        Path s = session("out-session", "{}");
        List<String> before = listing(s);
        Path link = Files.createSymbolicLink(dir.resolve("link-to-session"), s);
        for (Path out : new Path[] {s, s.resolve("results"), link, link.resolve("results"), s.resolve(".")}) {
            String message = refusal("analyze", s.toString(), "--out", out.toString());
            assertTrue(message.startsWith(out + ": "), "names --out first: " + message);
            assertTrue(message.contains("session folder"), message);
            assertEquals(before, listing(s), "nothing written into the session folder for --out " + out);
        }
    }

    @Test
    void batchOutInsideASessionFolderIsRefusedBeforeAnythingIsWritten() throws IOException {
        Path root = dir.resolve("batch-root");
        Path s = root.resolve("cell1");
        Files.createDirectories(root);
        Files.copy(good, s);
        for (String f : new String[] {"dendrite.tif", "dendrite.roi", "session.json"}) {
            Files.copy(good.resolve(f), s.resolve(f));
        }
        List<String> before = listing(root);
        Path link = Files.createSymbolicLink(dir.resolve("link-to-cell1"), s);
        for (Path out : new Path[] {s, s.resolve("out"), link}) {
            String message = refusal("batch", root.toString(), "--out", out.toString());
            assertTrue(message.startsWith(out + ": ") && message.contains("cell1"), message);
            assertEquals(before, listing(root), "nothing written under the root for --out " + out);
        }
    }

    @Test
    void outThatIsAFileIsRefusedBeforeTheSessionIsRead() throws IOException {
        Path file = Files.writeString(dir.resolve("not-a-folder.txt"), "x");
        // The session is malformed too: the --out refusal coming first shows that --out is checked before reading.
        Path s = session("out-file", "{\"path_width_um\": -1}");
        String message = refusal("analyze", s.toString(), "--out", file.toString());
        assertTrue(message.startsWith(file + ": ") && message.contains("not a folder"), message);
        message = refusal("analyze", s.toString(), "--out", file.resolve("below").toString());
        assertTrue(message.contains(file.toString()) && message.contains("not a folder"), message);
        Path root = dir.resolve("out-file-root");
        Files.createDirectories(root.resolve("cell"));
        Files.writeString(root.resolve("cell/session.json"), "{}");
        message = refusal("batch", root.toString(), "--out", file.toString());
        assertTrue(message.startsWith(file + ": ") && message.contains("not a folder"), message);
    }

    @Test
    void aBatchIntoAnOutputFolderAnotherBatchWritesIsRefusedNamingTheLock() throws IOException {
        Path root = dir.resolve("locked-root");
        Files.createDirectories(root.resolve("cell1"));
        for (String f : new String[] {"dendrite.tif", "dendrite.roi", "session.json"}) {
            Files.copy(good.resolve(f), root.resolve("cell1").resolve(f));
        }
        Path out = Files.createDirectories(dir.resolve("locked-out"));
        // A lock as a running batch on this machine writes it: this very process, so it is alive.
        Path lock = Files.writeString(out.resolve("batch.lock"), "{\"pid\": " + ProcessHandle.current().pid()
                + ", \"host\": \"" + java.net.InetAddress.getLocalHost().getHostName()
                + "\", \"started\": \"2026-12-04T10:00:00Z\"}\n");
        String message = refusal("batch", root.toString(), "--out", out.toString());
        assertTrue(message.startsWith(lock + ": another batch is writing into this output folder (process "
                + ProcessHandle.current().pid()), message);
        assertEquals(List.of("", "batch.lock"), listing(out), "nothing else written");
    }

    // ---- paths and sizes

    @Test
    void aPathVertexFarOutsideTheMovieIsRefusedNamingThePathFile() throws IOException {
        for (String far : new String[] {"1e12", "1e300"}) {
            Path s = session("far-" + far, "{\"path\": \"path.csv\"}");
            Path csv = Files.writeString(s.resolve("path.csv"), "x,y\n10,10\n40,12\n" + far + ",20\n");
            String message = refusal("analyze", s.toString(), "--out", dir.resolve("o-far-" + far).toString());
            assertTrue(message.startsWith(csv + ": ") && message.contains("outside"), message);
            assertFalse(Files.exists(dir.resolve("o-far-" + far)), "nothing written");
        }
    }

    @Test
    void aPathWiderThanTheMovieIsRefusedNamingTheKey() throws IOException {
        Path s = session("wide", "{\"path_width_um\": 1e9}");
        String message = refusal("analyze", s.toString(), "--out", dir.resolve("o-wide").toString());
        assertTrue(message.startsWith(s.resolve("session.json") + ": ") && message.contains("\"path_width_um\""),
                message);
    }

    @Test
    void aStimulusBeyondTheEndOfThePathIsRefusedNamingTheKey() throws IOException {
        Path s = session("stim-far", "{\"stimulus\": {\"time_s\": 9.5, \"position_um\": 500}}");
        String message = refusal("analyze", s.toString(), "--out", dir.resolve("o-stim-far").toString());
        assertTrue(message.startsWith(s.resolve("session.json") + ": ")
                && message.contains("\"stimulus.position_um\"") && message.contains("um long"), message);
    }

    // ---- time

    @Test
    void aStimulusAfterTheLastFrameIsRefusedNamingTheKey() throws IOException {
        // TINY: 40 frames 1 s apart, the last at 39 s.
        for (String time : new String[] {"39", "500"}) {
            Path s = session("stim-late-" + time, "{\"stimulus\": {\"time_s\": " + time + ", \"position_um\": 6}}");
            String message = refusal("analyze", s.toString(), "--out", dir.resolve("o-late-" + time).toString());
            assertTrue(message.startsWith(s.resolve("session.json") + ": ")
                    && message.contains("\"stimulus.time_s\"") && message.contains("39 s"), message);
        }
    }

    @Test
    void aSingleFrameMovieIsRefusedNamingTheMovie() throws IOException {
        Path s = session("one-frame", "{}");
        ImagePlus movie = IJ.openImage(s.resolve("dendrite.tif").toString());
        ImagePlus first = new ImagePlus("one", movie.getStack().getProcessor(1));
        first.setCalibration(movie.getCalibration());
        new FileSaver(first).saveAsTiff(s.resolve("dendrite.tif").toString());
        String message = refusal("analyze", s.toString(), "--out", dir.resolve("o-one").toString());
        assertTrue(message.startsWith(s.resolve("dendrite.tif") + ": ") && message.contains("one frame"), message);
    }

    // ---- session.json and path files as editors save them

    @Test
    void aPathCsvWithAByteOrderMarkIsAnalysedAsTheSameCsvWithout() throws IOException {
        String csv = "x,y\n4.5,16.5\n30.5,12.5\n58.5,16.5\n";
        Path[] outs = new Path[2];
        String[] prefixes = {"", "\uFEFF"};
        for (int i = 0; i < 2; i++) {
            Path s = session("bom-" + i, "{\"path\": \"path.csv\"}");
            Files.writeString(s.resolve("path.csv"), prefixes[i] + csv);
            outs[i] = dir.resolve("o-bom-" + i);
            Run r = run("analyze", s.toString(), "--out", outs[i].toString());
            assertEquals(Main.OK, r.status(), r.err());
        }
        // REF: the same CSV without the mark, as the reference; RFC 8259 section 8.1 and the Unicode FAQ treat a
        // UTF-8 byte-order mark as a signature, not content [published]
        assertEquals(Files.readString(outs[0].resolve("kymograph.csv")), Files.readString(outs[1]
                .resolve("kymograph.csv")));
    }

    @Test
    void aKeyGivenTwiceInSessionJsonIsRefusedNamingTheKey() throws IOException {
        Path s = session("twice", "{\"path_width_um\": 1.0, \"path_width_um\": 2.0}");
        String message = refusal("analyze", s.toString(), "--out", dir.resolve("o-twice").toString());
        assertTrue(message.startsWith(s.resolve("session.json") + ": ") && message.contains("path_width_um"),
                message);
    }

    @Test
    void anUnknownModelNameInModelsIsRefusedNamingTheKey() throws IOException {
        Path s = session("unknown-model", "{\"models\": [\"diffusion-decay\", \"no-such-model\"]}");
        String message = refusal("analyze", s.toString(), "--out", dir.resolve("o-unknown-model").toString());
        assertTrue(message.startsWith(s.resolve("session.json") + ": ") && message.contains("\"models\"")
                && message.contains("no-such-model"), message);
        assertFalse(Files.exists(dir.resolve("o-unknown-model")), "nothing written");
    }

    // ---- acquisition keys that do not fit the movie

    @Test
    void aChannelTheMovieDoesNotHaveIsRefusedNamingTheKey() throws IOException {
        // TINY is a one-channel movie.
        Path s = session("channel-3", "{\"channel\": 3}");
        String message = refusal("analyze", s.toString(), "--out", dir.resolve("o-channel-3").toString());
        assertTrue(message.startsWith(s.resolve("session.json") + ": ") && message.contains("\"channel\"")
                && message.contains("1 channel"), message);
        assertFalse(Files.exists(dir.resolve("o-channel-3").resolve("results.json")), "no results");
    }

    @Test
    void aStimulusSpotOutsideTheImageIsRefusedNamingTheKeys() throws IOException {
        // TINY is 64 x 32 pixels.
        for (String spot : new String[] {"\"x_px\": 500, \"y_px\": 10", "\"x_px\": 20, \"y_px\": -3"}) {
            Path s = session("spot-" + spot.hashCode(), "{\"stimulus\": {\"time_s\": 9.5, " + spot + "}}");
            String message = refusal("analyze", s.toString(), "--out", dir.resolve("o-spot-" + spot.hashCode())
                    .toString());
            assertTrue(message.startsWith(s.resolve("session.json") + ": ") && message.contains("\"stimulus.x_px\"")
                    && message.contains("outside the 64 x 32 pixel movie"), message);
        }
    }

    @Test
    void aStimulusSpotOutsideTheImageGivenOnTheCommandLineIsRefusedNamingTheOption() throws IOException {
        Path s = session("spot-option", "{\"stimulus\": {\"time_s\": 9.5}}");
        String message = refusal("analyze", s.toString(), "--out", dir.resolve("o-spot-option").toString(),
                "--stimulus-xy", "500,10");
        assertTrue(message.startsWith(s.resolve("dendrite.tif") + ": ") && message.contains("--stimulus-xy")
                && message.contains("64 x 32"), message);
    }

    @Test
    void aNegativeLinePeriodIsRefusedNamingTheKey() throws IOException {
        Path s = session("line-negative", "{\"line_period_s\": -0.001}");
        String message = refusal("analyze", s.toString(), "--out", dir.resolve("o-line-negative").toString());
        assertTrue(message.startsWith(s.resolve("session.json") + ": ") && message.contains("\"line_period_s\""),
                message);
    }

    // ---- damaged movies

    @Test
    void aMovieMarkedDeflateWhoseDataDoNotInflateIsRefusedNamingTheMovie() throws IOException {
        Path s = session("not-deflate", "{}");
        Path movie = s.resolve("dendrite.tif");
        // The uncompressed file's Compression entries (tag 259) set to Deflate (8), the data left as they are.
        // REF: TIFF 6.0 specification, section 2 (image file directory), and Adobe's TIFF Technical Note 2 [published]
        byte[] b = Files.readAllBytes(movie);
        ByteBuffer buf = ByteBuffer.wrap(b).order(b[0] == 'I' ? ByteOrder.LITTLE_ENDIAN : ByteOrder.BIG_ENDIAN);
        int changed = 0;
        for (long ifd = buf.getInt(4) & 0xffffffffL; ifd != 0; ) {
            int count = buf.getShort((int) ifd) & 0xffff;
            for (int i = 0; i < count; i++) {
                int at = (int) ifd + 2 + 12 * i;
                if ((buf.getShort(at) & 0xffff) == 259) {
                    buf.putShort(at + 8, (short) 8);
                    changed++;
                }
            }
            ifd = buf.getInt((int) ifd + 2 + 12 * count) & 0xffffffffL;
        }
        assertTrue(changed > 0, "the movie has Compression entries");
        Files.write(movie, b);
        PrintStream systemOut = System.out;
        ByteArrayOutputStream stray = new ByteArrayOutputStream();
        System.setOut(new PrintStream(stray, true, StandardCharsets.UTF_8));
        String message;
        try {
            message = refusal("analyze", s.toString(), "--out", dir.resolve("o-not-deflate").toString());
        } finally {
            System.setOut(systemOut);
        }
        assertTrue(message.startsWith(movie + ": ") && message.contains("do not inflate"), message);
        assertEquals("", stray.toString(StandardCharsets.UTF_8), "nothing printed past the command line's streams");
    }

    // ---- model files that would not end or not fit

    @Test
    void aModelFileWhoseRunWouldTakeTrillionsOfStepsIsRefusedBeforeItStarts() throws IOException {
        // D = 1e12 um^2/s on a 1 um stimulus: the step rule's w^2 / D term asks for steps of 5e-13 s.
        Path model = Files.writeString(dir.resolve("huge-d.json"), """
                {"model": "diffusion-decay", "parameters": {"D": 1e12, "k": 0.5},
                 "domain": {"length_um": 10, "dx_um": 0.5}, "time": {"duration_s": 1, "output_interval_s": 0.25},
                 "stimuli": [{"kind": "pulse", "time_s": 0.1, "position_um": 5, "width_um": 1, "amount": 1}]}
                """);
        String message = refusal("simulate", model.toString(), "--out", dir.resolve("o-huge-d").toString());
        assertTrue(message.startsWith(model + ": ") && message.contains("time steps"), message);
        assertFalse(Files.exists(dir.resolve("o-huge-d").resolve("kymograph.csv")), "no kymograph written");
    }

    @Test
    void aModelFileWhoseGridCannotFitInTheHeapIsRefusedBeforeItAllocates() throws IOException {
        // Twelve species on two million nodes: about 15 GB of solver rows, beyond the test's heap.
        StringBuilder species = new StringBuilder();
        for (int i = 0; i < 12; i++) {
            species.append(i == 0 ? "" : ", ").append("{\"name\": \"S").append(i).append("\", \"D_um2_per_s\": 1}");
        }
        Path model = Files.writeString(dir.resolve("huge-grid.json"), "{\"model\": \"network\", \"network\":"
                + " {\"species\": [" + species + "], \"reactions\": [{\"reactants\": {\"S0\": 1}, \"products\":"
                + " {\"S1\": 1}, \"k\": 1}]}, \"domain\": {\"length_um\": 199999, \"dx_um\": 0.1},"
                + " \"time\": {\"duration_s\": 1, \"output_interval_s\": 0.5}, \"stimuli\": [{\"kind\": \"pulse\","
                + " \"time_s\": 0.1, \"position_um\": 5, \"width_um\": 1, \"amount\": 1}]}");
        String message = refusal("simulate", model.toString(), "--out", dir.resolve("o-huge-grid").toString());
        assertTrue(message.startsWith(model + ": ") && message.contains("MB") && message.contains("-Xmx"), message);
    }

    // ---- numerical trouble is a result with a warning

    @Test
    void ratioCalibrationOnFlatChannelsIsAnalysedWithAWarning() throws IOException {
        Path s = dir.resolve("flat-ratio");
        Files.createDirectories(s);
        int w = 32;
        int h = 16;
        int frames = 20;
        ImageStack stack = new ImageStack(w, h);
        for (int f = 0; f < frames; f++) {
            for (int value : new int[] {500, 400}) {
                ShortProcessor p = new ShortProcessor(w, h);
                p.setValue(value);
                p.fill();
                stack.addSlice(p);
            }
        }
        ImagePlus imp = new ImagePlus("flat", stack);
        imp.setDimensions(2, 1, frames);
        imp.setOpenAsHyperStack(true);
        Calibration cal = new Calibration();
        cal.pixelWidth = 0.25;
        cal.pixelHeight = 0.25;
        cal.setUnit("micron");
        cal.frameInterval = 0.5;
        cal.setTimeUnit("sec");
        imp.setCalibration(cal);
        new FileSaver(imp).saveAsTiffStack(s.resolve("flat.tif").toString());
        Files.writeString(s.resolve("path.csv"), "x,y\n2,8\n30,8\n");
        Files.writeString(s.resolve("session.json"), """
                {"movie": "flat.tif", "path": "path.csv", "background": {"value": 100},
                 "stimulus": {"time_s": 4, "position_um": 3},
                 "calibration": {"method": "ratio", "kd_uM": 0.224, "r_min": 0.3, "r_max": 6, "beta": 5}}
                """);
        Path out = dir.resolve("o-flat-ratio");
        Run r = run("analyze", s.toString(), "--out", out.toString());
        assertEquals(Main.OK, r.status(), r.err());
        JsonObject results = JsonParser.parseString(Files.readString(out.resolve("results.json"))).getAsJsonObject();
        assertTrue(results.getAsJsonArray("warnings").toString().contains("spread measures are not available"),
                results.getAsJsonArray("warnings").toString());
    }
}
