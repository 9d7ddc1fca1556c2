package org.dendrokin.ij1;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Files;
import java.nio.file.Path;

import ij.IJ;
import ij.ImagePlus;
import ij.WindowManager;
import ij.io.RoiDecoder;
import ij.measure.ResultsTable;
import ij.plugin.filter.Analyzer;

import org.dendrokin.core.Progress;
import org.dendrokin.io.SessionRunner;
import org.dendrokin.io.demo.DemoSessionGenerator;
import org.dendrokin.io.session.SessionConfig;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/** Save Session Folder, Analyze Session Folder and Analyze Many Sessions, run as a macro runs them. */
class SessionCommandsTest {
    /** A small generated session with known truth: 160 x 40 pixels, 120 frames. */
    static final DemoSessionGenerator.Scenario SMALL = new DemoSessionGenerator.Scenario(160, 40, 120, 0.2, 0.5,
            9.75, 14.0, 0.3, 0.05, 1.0, 1.5, 600, 120, 120, 3, 99L);

    @TempDir
    static Path dir;
    static Path original;
    static SessionRunner.Result direct;

    @BeforeAll
    static void generateAndAnalyseOnce() {
        HeadlessImageJ.start();
        original = dir.resolve("cell-1");
        DemoSessionGenerator.write(original, SMALL);
        fitOnlyDiffusionDecay(original);
        direct = SessionRunner.analyze(original, dir.resolve("direct"), Progress.NONE);
    }

    private static double decayTime(ResultsTable t) {
        for (int i = 0; i < t.size(); i++) {
            if (t.getStringValue("quantity", i).equals("decay time")) {
                return t.getValue("value", i);
            }
        }
        throw new AssertionError("no decay time row");
    }

    @Test
    void analyzeSessionFolderGivesTheRunnersResult() {
        Path out = dir.resolve("via-imagej");
        IJ.run("Analyze Session Folder...", "session=[" + original + "] output=[" + out + "]");
        assertTrue(Files.isRegularFile(out.resolve("results.json")), "results.json written");
        assertTrue(Files.isRegularFile(out.resolve("report.html")), "report written");
        assertNotNull(direct.spread().decayTime(), "the runner measured a decay time");
        assertEquals(direct.spread().decayTime().value(), decayTime(Analyzer.getResultsTable()), 1e-12,
                "decay time, s, same as SessionRunner.analyze");
        ImagePlus kymograph = WindowManager.getCurrentImage();
        assertEquals("dF/F0", kymograph.getCalibration().getValueUnit());
    }

    @Test
    void savedSessionFolderRunsAgainToTheSameResult() throws Exception {
        ImagePlus movie = IJ.openImage(original.resolve("dendrite.tif").toString());
        movie.setRoi(RoiDecoder.open(original.resolve("dendrite.roi").toString()));
        Path saved = dir.resolve("saved-from-imagej");
        WindowManager.setTempCurrentImage(movie);
        IJ.run("Save Session Folder...", "session=[" + saved + "] movie=[refer to its file] pixel=0.2 frame=0.5"
                + " band=1");
        WindowManager.setTempCurrentImage(null);
        SessionConfig config = SessionConfig.read(saved);
        assertEquals("../cell-1/dendrite.tif", config.movie());
        assertEquals("path.roi", config.path());
        assertEquals(1.0, config.pathWidthUm(), 0, "band width, um");
        fitOnlyDiffusionDecay(saved);
        SessionRunner.Result again = SessionRunner.analyze(saved, dir.resolve("again"), Progress.NONE);
        assertEquals(direct.spread().decayTime().value(), again.spread().decayTime().value(), 1e-9,
                "decay time, s, of the saved folder");
    }

    private static String readQuietly(Path file) {
        try {
            return Files.readString(file);
        } catch (java.io.IOException e) {
            return e.toString();
        }
    }

    @Test
    void analyzeManySessionsRunsTheBatchAndShowsItsSummary() {
        Path out = dir.resolve("batch-out");
        String printed = UserGuideTest.captureStdout(() -> IJ.run("Analyze Many Sessions...",
                "root=[" + original + "] output=[" + out + "] threads=1"));
        assertTrue(printed.contains("1 sessions, 1 analysed, 0 skipped as up to date"), printed);
        String summary = readQuietly(out.resolve("summary.csv"));
        if (summary.contains(",failed,")) {
            assertTrue(printed.contains("cell-1 failed: "), "a failed session's sentence is in the Log: " + printed);
        }
        assertTrue(Files.isRegularFile(out.resolve("summary.csv")), "summary.csv written");
        assertEquals(1, Analyzer.getResultsTable().size(), "one row a session");
    }

    /** Keeps the analysis quick: the session fits one model, the closed-form one. */
    static void fitOnlyDiffusionDecay(java.nio.file.Path dir) {
        try {
            java.nio.file.Path json = dir.resolve("session.json");
            String text = java.nio.file.Files.readString(json);
            java.nio.file.Files.writeString(json, text.replace("\"calibration\"",
                    "\"models\": [\"diffusion-decay\"],\n  \"calibration\""));
        } catch (java.io.IOException e) {
            throw new java.io.UncheckedIOException(e);
        }
    }
}
