package org.dendrokin.io.movie;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.ByteArrayOutputStream;
import java.io.IOException;
import java.io.PrintStream;
import java.nio.ByteOrder;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Arrays;
import java.util.Locale;

import ij.IJ;
import ij.ImagePlus;

import org.dendrokin.cli.Main;
import org.dendrokin.io.demo.DemoSessionGenerator;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * The demo movie re-encoded as TIFF variants and analysed by the command line as a user would: the same
 * kymograph.csv as the plain file, or exit status 2 with one sentence naming the movie.
 */
class AnalyzeTiffVariantsTest {
    private static final DemoSessionGenerator.Scenario TINY = new DemoSessionGenerator.Scenario(64, 32, 40, 0.25, 1.0,
            9.5, 6.0, 0.5, 0.05, 1.0, 1.5, 600, 100, 200, 3, 5L);

    @TempDir
    static Path dir;
    static Path demo;
    static double[][][] frames;

    @BeforeAll
    static void makeDemo() {
        demo = dir.resolve("demo");
        DemoSessionGenerator.write(demo, TINY);
        ImagePlus imp = IJ.openImage(demo.resolve("dendrite.tif").toString());
        int n = TINY.widthPx() * TINY.heightPx();
        frames = new double[imp.getStackSize()][1][n];
        for (int i = 0; i < frames.length; i++) {
            for (int p = 0; p < n; p++) {
                frames[i][0][p] = imp.getStack().getProcessor(i + 1).getf(p);
            }
        }
    }

    /** A session folder with the demo's path and the given movie; calibration and no fits in session.json. */
    private static Path session(String name, Path movie) throws IOException {
        Path s = dir.resolve(name);
        Files.createDirectories(s);
        Files.copy(demo.resolve("dendrite.roi"), s.resolve("dendrite.roi"));
        Files.move(movie, s.resolve("dendrite.tif"));
        Files.writeString(s.resolve("session.json"), String.format(Locale.ROOT, """
                {"movie": "dendrite.tif", "path": "dendrite.roi", "path_width_um": 1.0,
                 "pixel_size_um": %s, "frame_interval_s": %s, "models": [], "calibration": {"method": "none"}}
                """, TINY.pixelSizeUm(), TINY.frameIntervalS()));
        return s;
    }

    private record Run(int status, String err) {
    }

    private static Run analyze(Path session, Path out) {
        ByteArrayOutputStream o = new ByteArrayOutputStream();
        ByteArrayOutputStream e = new ByteArrayOutputStream();
        int status = Main.run(new String[] {"analyze", session.toString(), "--out", out.toString()},
                new PrintStream(o, true, StandardCharsets.UTF_8), new PrintStream(e, true, StandardCharsets.UTF_8));
        return new Run(status, e.toString(StandardCharsets.UTF_8));
    }

    @Test
    void tiledLzwMovieGivesThePlainKymograph() throws IOException {
        Path plainCopy = Files.copy(demo.resolve("dendrite.tif"), dir.resolve("plain.tif"));
        Path plain = session("plain", plainCopy);
        Path tiled = session("tiled", JavaTiffWriter.write(TINY.widthPx(), TINY.heightPx(), dir.resolve("tiled.tif"),
                16, "LZW", true, ByteOrder.BIG_ENDIAN, false, null, frames));
        Run a = analyze(plain, dir.resolve("out-plain"));
        Run b = analyze(tiled, dir.resolve("out-tiled"));
        assertEquals(Main.OK, a.status(), a.err());
        assertEquals(Main.OK, b.status(), b.err());
        // REF: the plain ImageJ-written movie, read through the memory map, as the reference [common practice]
        assertEquals(Files.readString(dir.resolve("out-plain/kymograph.csv")),
                Files.readString(dir.resolve("out-tiled/kymograph.csv")), "kymograph.csv");
    }

    @Test
    void floatMovieWithTheFloatingPointPredictorExitsTwoNamingTheMovie() throws IOException {
        SmallTiffWriter.Format f = SmallTiffWriter.Format.of(32, 3).compressed(SmallTiffWriter.DEFLATE, 3);
        Path s = session("predictor3", SmallTiffWriter.write(dir.resolve("p3.tif"), f, TINY.widthPx(), TINY.heightPx(),
                frames));
        Path out = dir.resolve("out-p3");
        Run r = analyze(s, out);
        assertEquals(Main.BAD_INPUT, r.status(), r.err());
        // what a terminal finally shows: the part after the last carriage return of each line
        String message = Arrays.stream(r.err().split("\n")).map(l -> l.substring(l.lastIndexOf('\r') + 1))
                .filter(l -> !l.isBlank()).reduce("", (x, y) -> x.isEmpty() ? y : x + "\n" + y).trim();
        assertEquals(1, message.lines().count(), "one line: " + message);
        assertTrue(message.contains(s.resolve("dendrite.tif").toString()), message);
        assertTrue(message.contains("TIFF predictor 3"), message);
        assertFalse(message.contains("Exception"), message);
        assertFalse(Files.exists(out.resolve("results.json")), "no results for a refused movie");
    }
}
