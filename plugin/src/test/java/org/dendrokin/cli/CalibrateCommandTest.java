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
import java.util.Locale;
import java.util.Random;

import javax.imageio.ImageIO;

import org.dendrokin.core.calib.Calibration;
import org.dendrokin.core.calib.FittedHill;
import org.dendrokin.io.calib.CalibrationFile;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

class CalibrateCommandTest {
    @TempDir
    Path dir;

    private final ByteArrayOutputStream out = new ByteArrayOutputStream();
    private final ByteArrayOutputStream err = new ByteArrayOutputStream();

    private int run(String... args) {
        return Main.run(args, new PrintStream(out, true, StandardCharsets.UTF_8),
                new PrintStream(err, true, StandardCharsets.UTF_8));
    }

    private String stderr() {
        return err.toString(StandardCharsets.UTF_8);
    }

    private Path table(String name, double k, double n, double noise) throws IOException {
        Random random = new Random(11);
        StringBuilder csv = new StringBuilder("concentration_uM,intensity\n");
        for (double c : new double[] {0, 0.03, 0.1, 0.3, 1, 3, 30}) {
            for (int r = 0; r < 3; r++) {
                double bound = Math.pow(c, n) / (Math.pow(c, n) + Math.pow(k, n));
                double f = 200 + 1800 * bound + noise * random.nextGaussian();
                csv.append(String.format(Locale.ROOT, "%s,%.4f%n", c, f));
            }
        }
        Path p = dir.resolve(name);
        Files.writeString(p, csv);
        return p;
    }

    @Test
    void writesACalibrationFileAndPictureThatGiveTheCurveBack() throws IOException {
        Path t = table("standards.csv", 0.4, 1.5, 15);
        byte[] before = Files.readAllBytes(t);
        Path outDir = dir.resolve("out/nested");
        assertEquals(0, run("calibrate", t.toString(), "--out", outDir.toString()), stderr());
        Calibration cal = CalibrationFile.read(outDir.resolve("calibration.json"));
        FittedHill hill = (FittedHill) cal;
        // Synthetic standards with known truth K = 0.4 uM, n = 1.5 and 0.8% noise: recovery within 10%.
        assertEquals(0.4, hill.curve().kHalfMicromolar(), 0.04, "K (uM)");
        assertEquals(1.5, hill.curve().n(), 0.15, "n");
        assertTrue(ImageIO.read(outDir.resolve("calibration.png").toFile()).getWidth() > 100, "a picture");
        assertTrue(out.toString(StandardCharsets.UTF_8).contains("k_half_uM"), out.toString(StandardCharsets.UTF_8));
        assertArrayEquals(before, Files.readAllBytes(t), "the table is not changed");
    }

    @Test
    void monotoneFormIsWrittenToo() throws IOException {
        Path t = table("standards.csv", 0.4, 1.5, 0);
        assertEquals(0, run("calibrate", t.toString(), "--out", dir.resolve("o").toString(), "--monotone"), stderr());
        assertTrue(Files.readString(dir.resolve("o/calibration.json")).contains("\"monotone\""));
    }

    @Test
    void tooFewStandardsIsExitTwoWithOneSentence() throws IOException {
        Path t = dir.resolve("few.csv");
        Files.writeString(t, "concentration_uM,intensity\n0,1\n0.1,4\n1,9\n");
        assertEquals(2, run("calibrate", t.toString(), "--out", dir.resolve("o").toString()));
        String e = stderr().trim();
        assertTrue(e.contains("few.csv") && e.contains("at least 5 standards"), e);
        assertEquals(1, e.split("\n").length, "one line: " + e);
        assertTrue(Files.notExists(dir.resolve("o/calibration.json")), "nothing written");
    }

    @Test
    void nonMonotoneTableWithTheMonotoneMethodIsExitTwo() throws IOException {
        Path t = dir.resolve("bumpy.csv");
        Files.writeString(t, "concentration_uM,intensity\n0,1\n1,5\n2,4\n3,9\n4,9.5\n");
        assertEquals(2, run("calibrate", t.toString(), "--out", dir.resolve("o").toString(), "--monotone"));
        String e = stderr().trim();
        assertTrue(e.contains("bumpy.csv") && e.contains("not monotone") && e.contains("--monotone"), e);
        assertEquals(1, e.split("\n").length, "one line: " + e);
    }

    @Test
    void missingTableIsExitTwo() {
        assertEquals(2, run("calibrate", dir.resolve("nope.csv").toString(), "--out", dir.toString()));
        assertTrue(stderr().contains("nope.csv"), stderr());
    }
}
