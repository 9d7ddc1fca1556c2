package org.dendrokin.ij1;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.awt.event.KeyEvent;
import java.io.ByteArrayOutputStream;
import java.io.PrintStream;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;

import ij.IJ;
import ij.ImagePlus;
import ij.ImageStack;
import ij.gui.Line;
import ij.process.FloatProcessor;

import org.dendrokin.cli.Main;
import org.dendrokin.core.Progress;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

class ErrorsAndCancelTest {
    @BeforeAll
    static void imagej() {
        HeadlessImageJ.start();
    }

    @Test
    void imageJShowsTheSameSentenceAsTheCommandLine(@TempDir Path dir) {
        Path missing = dir.resolve("no-such-session");
        ByteArrayOutputStream err = new ByteArrayOutputStream();
        int status = Main.run(new String[] {"analyze", missing.toString(), "--out", dir.resolve("out").toString()},
                new PrintStream(new ByteArrayOutputStream()), new PrintStream(err, true, StandardCharsets.UTF_8));
        assertEquals(Main.BAD_INPUT, status);
        String cli = err.toString(StandardCharsets.UTF_8).trim();
        String shown = UserGuideTest.captureStdout(() -> IJ.run("Analyze Session Folder...",
                "session=[" + missing + "] output=[" + dir.resolve("out2") + "]")).trim();
        // without a display, IJ.error prints its message; with one it is the error dialog's text
        assertEquals(cli, shown);
        assertFalse(shown.contains("Exception"), "no stack trace");
    }

    @Test
    void escStopsTheWorkAndNothingIsWritten(@TempDir Path dir) {
        ImageStack stack = new ImageStack(20, 20);
        for (int i = 0; i < 5; i++) {
            stack.addSlice(new FloatProcessor(20, 20));
        }
        ImagePlus movie = new ImagePlus("movie", stack);
        movie.setRoi(new Line(2, 10, 18, 10));
        IjProgress progress = new IjProgress("test");
        assertFalse(progress.isCancelled(), "not cancelled before Esc");
        IJ.setKeyDown(KeyEvent.VK_ESCAPE);
        try {
            assertTrue(progress.isCancelled(), "Esc cancels");
            Kymograph_Along_Line.Settings s = new Kymograph_Along_Line.Settings(0.2, 0.5, 0.2, 0.2, 1,
                    LineSelection.Source.SELECTION, dir.toString());
            assertThrows(Progress.CancelledException.class, () -> Kymograph_Along_Line.extract(movie,
                    LineSelection.of(movie.getRoi(), "line"), s, progress));
            assertEquals(0, dir.toFile().list().length, "nothing written");
        } finally {
            IJ.resetEscape();
        }
        assertTrue(Files.isDirectory(dir));
    }
}
