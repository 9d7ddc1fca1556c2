package org.dendrokin.ij1;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Locale;
import java.util.Random;

import ij.IJ;
import ij.ImagePlus;
import ij.WindowManager;
import ij.measure.ResultsTable;
import ij.plugin.filter.Analyzer;

import org.dendrokin.core.calib.Calibration;
import org.dendrokin.core.calib.Standards;
import org.dendrokin.core.calib.StandardsFit;
import org.dendrokin.core.kymo.Kymograph;
import org.dendrokin.io.calib.CalibrationFile;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

class CalibrationFromStandardsTest {
    private static final double K = 0.5;
    private static final double N = 1.5;
    private static final double FMIN = 100;
    private static final double FMAX = 1000;

    @BeforeAll
    static void imagej() {
        HeadlessImageJ.start();
    }

    private static double hill(double c) {
        // REF: Hill form F = Fmin + (Fmax - Fmin) c^n / (c^n + K^n) [published: Hill 1910]; sheet s1.3
        return FMIN + (FMAX - FMIN) * Math.pow(c, N) / (Math.pow(c, N) + Math.pow(K, N));
    }

    /** Synthetic standards with known truth: 8 concentrations in duplicate, 1% noise, fixed seed. */
    private static Path table(Path dir) throws IOException {
        Random random = new Random(20261201);
        StringBuilder csv = new StringBuilder("concentration_uM,intensity\n");
        for (double c : new double[] {0, 0.05, 0.1, 0.25, 0.5, 1, 2.5, 10}) {
            for (int r = 0; r < 2; r++) {
                csv.append(String.format(Locale.ROOT, "%s,%s%n", c, hill(c) * (1 + 0.01 * random.nextGaussian())));
            }
        }
        Path file = dir.resolve("standards.csv");
        Files.writeString(file, csv);
        return file;
    }

    @Test
    void fitRecoversTheTruthAndItsFileConvertsAKymograph(@TempDir Path dir) throws IOException {
        Path table = table(dir);
        Path json = dir.resolve("indicator.json");
        IJ.run("Calibration from Standards...", "standards=table table=[" + table + "] save=[" + json + "]");
        ResultsTable t = Analyzer.getResultsTable();
        int row = -1;
        for (int i = 0; i < t.size(); i++) {
            if (t.getStringValue("quantity", i).equals("k_half_uM")) {
                row = i;
            }
        }
        assertTrue(row >= 0, "k_half_uM in the table");
        assertTrue(t.getValue("ci95_low", row) < K && K < t.getValue("ci95_high", row),
                "true K inside the 95% interval");
        // parameter recovery at 1% noise: within 5%
        assertEquals(K, t.getValue("value", row), 0.05 * K, "fitted K, uM");
        StandardsFit.Result core = StandardsFit.fit(readBack(table));
        assertEquals(core.estimates().get(2).value(), t.getValue("value", row), 1e-12, "same as the core's fit");
        assertTrue(Files.isRegularFile(dir.resolve("indicator.png")), "picture of the curve saved");

        Calibration saved = CalibrationFile.read(json);
        Kymograph k = new Kymograph(new double[] {0, 1}, new double[] {0}, new double[] {hill(0.2), hill(2)},
                "intensity");
        WindowManager.setTempCurrentImage(KymographImage.toImage(k, "k"));
        IJ.run("Convert to Concentration...", "method=[calibration file] background=0 flag=0.8 reject=0.95"
                + " calibration=[" + json + "]");
        ImagePlus out = WindowManager.getCurrentImage();
        Kymograph c = KymographImage.fromImage(out);
        assertEquals(saved.concentrationMicromolar((float) hill(0.2)), c.value(0, 0), 1e-6, "uM via the file");
        assertEquals(0.2, c.value(0, 0), 0.02, "close to the true 0.2 uM");
    }

    private static Standards readBack(Path table) {
        return org.dendrokin.io.calib.StandardsCsv.read(table);
    }
}
