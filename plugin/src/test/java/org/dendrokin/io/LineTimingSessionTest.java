package org.dendrokin.io;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.ByteArrayOutputStream;
import java.io.IOException;
import java.io.PrintStream;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;

import org.dendrokin.cli.Main;
import org.dendrokin.core.Progress;
import org.dendrokin.core.fit.FitResult;
import org.dendrokin.core.spread.Estimate;
import org.dendrokin.synth.SessionGenerator;
import org.dendrokin.synth.SessionSpec;
import org.junit.jupiter.api.Tag;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * Scan-line timing through the whole session: a fast front running down a vertical dendrite, imaged by a raster
 * scan that takes the whole frame interval to cover the frame, so the bottom of each frame is a frame later than
 * its top.
 */
@Tag("slow")
class LineTimingSessionTest {
    @TempDir
    Path dir;

    // McKean's front: c = sqrt(2 D k) (1/2 - a) = sqrt(2 * 200 * 25) * 0.4 = 40 um/s, width sqrt(2 D / k) = 4 um
    private static final double D = 200;
    private static final double K = 25;
    private static final double A = 0.1;
    private static final double SPEED = Math.sqrt(2 * D * K) * (0.5 - A);

    private static SessionSpec rasterFront() {
        SessionSpec.Imaging imaging = new SessionSpec.Imaging(32, 200, 40, 0.25, 0.2, 1, 0, 0.2 / 200, 2);
        return SessionSpec.clean(5).withImaging(imaging)
                .withDendrite(new SessionSpec.Dendrite(3, 0, 90, 0.6, 0, 5))
                .withSignal(new SessionSpec.NagumoFront(D, K, A, 1.0, 2.0))
                .withSession(new SessionSpec.SessionFile(java.util.List.of(), true, true, false));
    }

    private SessionRunner.Result analyse(String name, String extraKeys) throws IOException {
        SessionGenerator.write(rasterFront(), dir.resolve(name));
        Path json = dir.resolve(name).resolve("session.json");
        Files.writeString(json, Files.readString(json).replaceFirst("\\{", "{\"motion\": \"off\", "
                + extraKeys.replaceFirst("^, ", "") + (extraKeys.isEmpty() ? "" : ", ")));
        return SessionRunner.analyze(dir.resolve(name), dir.resolve(name + "-out"), Progress.NONE);
    }

    @Test
    void aFrontImagedByASlowRasterComesBackAtItsSpeedOnlyWithTheLinePeriod() throws IOException {
        SessionRunner.Result frames = analyse("frames", "");
        SessionRunner.Result lines = analyse("lines", ", \"line_period_s\": 0.001");
        Estimate frameTimed = frames.analysis().spread().frontSpeed();
        Estimate lineTimed = lines.analysis().spread().frontSpeed();
        assertNotNull(lineTimed, "a front is measured with the line period");
        // REF: McKean's exact travelling wave of the Nagumo equation, c = sqrt(2 D k)(1/2 - a) (McKean 1970) [published]
        assertEquals(SPEED, lineTimed.value(), 0.05 * SPEED, "front speed with the line period (um/s)");
        // Without it the samples lower in the frame count as a frame interval early: the front looks
        // c / (1 -/+ c * line period / pixel) = 40 / (1 -/+ 0.16) fast, 34 or 48 um/s.
        assertNotNull(frameTimed, "a front is measured without the line period too");
        double off = frameTimed.value();
        assertTrue(Math.abs(off / SPEED - 1) > 0.1, "front speed without the line period: " + off);
        // The nagumo fit (fitted because the arrival times show a front) reads its model at the samples' own times.
        FitResult nagumo = lines.analysis().fits().fit("nagumo").orElseThrow();
        assertTrue(nagumo.converged(), nagumo.reason());
        // REF: McKean (1970): c = sqrt(2 D k)(1/2 - a), width w = sqrt(2 D / k) = 4 um [published]
        assertEquals(SPEED, nagumo.estimate("front_speed").orElseThrow().value(), 0.02 * SPEED, "model front speed");
        assertEquals(Math.sqrt(2 * D / K), nagumo.estimate("front_width").orElseThrow().value(),
                0.05 * Math.sqrt(2 * D / K), "model front width (um)");
        double frameWidth = frames.analysis().fits().fit("nagumo").orElseThrow().estimate("front_width").orElseThrow()
                .value();
        assertTrue(frameWidth > 1.1 * Math.sqrt(2 * D / K), "front width without the line period: " + frameWidth);
    }

    @Test
    void linesPerFrameGiveTheSameTimesAndBadValuesAreRefused() throws IOException {
        SessionRunner.Result byPeriod = analyse("period", ", \"line_period_s\": 0.001");
        SessionRunner.Result byLines = analyse("lines", ", \"lines_per_frame\": 200");
        assertEquals(byPeriod.analysis().movie().linePeriodS(), byLines.analysis().movie().linePeriodS(), 1e-15);
        assertEquals(byPeriod.analysis().spread().frontSpeed().value(),
                byLines.analysis().spread().frontSpeed().value(), 1e-9);
        for (String bad : new String[] {", \"line_period_s\": -0.001", ", \"line_period_s\": 0.01"}) {
            Path session = dir.resolve("bad" + bad.length());
            SessionGenerator.write(rasterFront(), session);
            Path json = session.resolve("session.json");
            Files.writeString(json, Files.readString(json).replaceFirst("\\{", "{\"motion\": \"off\"" + bad + ", "));
            ByteArrayOutputStream err = new ByteArrayOutputStream();
            int status = Main.run(new String[] {"analyze", session.toString(), "--out",
                dir.resolve("bad-out" + bad.length()).toString()}, new PrintStream(new ByteArrayOutputStream()),
                    new PrintStream(err, true, StandardCharsets.UTF_8));
            String message = err.toString(StandardCharsets.UTF_8);
            assertEquals(Main.BAD_INPUT, status, message);
            assertTrue(message.contains("session.json") && message.contains("line"), message);
        }
    }
}
