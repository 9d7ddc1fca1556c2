package org.dendrokin.io.session;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Path;

import org.dendrokin.io.InputException;
import org.junit.jupiter.api.Test;

class SessionConfigTest {
    private static final Path FILE = Path.of("s1", "session.json");

    private static String error(String text) {
        return assertThrows(InputException.class, () -> SessionConfig.parse(FILE, text)).getMessage();
    }

    @Test
    void readsEveryContractKey() {
        SessionConfig c = SessionConfig.parse(FILE, """
                {"movie": "cell.tif", "path": "dendrite.roi", "path_width_um": 1.5,
                 "pixel_size_um": 0.2, "frame_interval_s": 0.5,
                 "stimulus": {"time_s": 10, "position_um": 12.5},
                 "baseline_frames": [0, 18],
                 "background": {"value": 101.5},
                 "calibration": {"method": "single-wavelength", "kd_uM": 0.3, "f_min": 10, "f_max": 900},
                 "models": ["diffusion-decay", "nagumo"],
                 "bleach_correction": false}
                """);
        assertEquals("cell.tif", c.movie());
        assertEquals("dendrite.roi", c.path());
        assertEquals(1.5, c.pathWidthUm());
        assertEquals(0.2, c.pixelSizeUm());
        assertEquals(0.5, c.frameIntervalS());
        assertEquals(10.0, c.stimulusTimeS());
        assertEquals(12.5, c.stimulusPositionUm());
        assertArrayEquals(new int[] {0, 18}, c.baselineFrames());
        assertEquals(101.5, c.backgroundValue());
        assertNull(c.backgroundRoi());
        assertEquals("single-wavelength", c.calibrationMethod());
        assertEquals(0.3, c.calibration().get("kd_uM").getAsDouble());
        assertEquals(java.util.List.of("diffusion-decay", "nagumo"), c.models());
        assertFalse(c.bleachCorrection());
        assertTrue(c.warnings().isEmpty());
    }

    @Test
    void defaultsWhenKeysAreAbsent() {
        SessionConfig c = SessionConfig.parse(FILE, "{}");
        assertNull(c.movie());
        assertEquals(1.0, c.pathWidthUm(), "default band width, um");
        assertNull(c.pixelSizeUm());
        assertNull(c.stimulusTimeS());
        assertNull(c.baselineFrames());
        assertNull(c.backgroundValue());
        assertEquals("none", c.calibrationMethod());
        assertTrue(c.bleachCorrection());
    }

    @Test
    void unknownKeysAreWarningsNotErrors() {
        SessionConfig c = SessionConfig.parse(FILE, "{\"pixel_size\": 0.2, \"stimulus\": {\"time_s\": 1, \"x\": 2}}");
        assertEquals(2, c.warnings().size());
        assertTrue(c.warnings().get(0).contains("\"pixel_size\""), c.warnings().toString());
    }

    @Test
    void aBadValueNamesTheKey() {
        assertEquals(FILE + ": key \"path_width_um\" must be zero or a positive number, got -1.",
                error("{\"path_width_um\": -1}"));
        assertEquals(FILE + ": key \"pixel_size_um\" must be a positive number, got \"0.2\".",
                error("{\"pixel_size_um\": \"0.2\"}"));
        assertTrue(error("{\"stimulus\": {\"time_s\": \"soon\"}}").contains("key \"stimulus.time_s\""));
        assertTrue(error("{\"baseline_frames\": [5, 2]}").contains("key \"baseline_frames\""));
        assertTrue(error("{\"baseline_frames\": [0.5, 2]}").contains("key \"baseline_frames\""));
        assertTrue(error("{\"background\": {\"value\": 1, \"roi\": \"b.roi\"}}").contains("key \"background\""));
        assertTrue(error("{\"calibration\": {\"method\": \"magic\"}}").contains("key \"calibration.method\""));
        assertTrue(error("{\"bleach_correction\": \"no\"}").contains("key \"bleach_correction\""));
        assertTrue(error("{\"models\": \"nagumo\"}").contains("key \"models\""));
    }

    @Test
    void readsTheFitSettingsAndRefusesBadOnes() {
        SessionConfig c = SessionConfig.parse(FILE, "{\"fit\": {\"criterion\": \"bic\", \"profiles\": false, "
                + "\"bootstrap_replicates\": 50, \"seed\": 9, \"free_stimulus\": true, \"sealed_ends\": true}}");
        assertEquals(new FitSettings("bic", false, 50, 9L, true, true), c.fit());
        assertEquals(FitSettings.DEFAULT, SessionConfig.parse(FILE, "{}").fit());
        assertTrue(error("{\"fit\": {\"criterion\": \"r2\"}}").contains("key \"fit.criterion\""));
        assertTrue(error("{\"fit\": {\"bootstrap_replicates\": 2.5}}").contains("key \"fit.bootstrap_replicates\""));
        assertTrue(error("{\"fit\": {\"bootstrap_replicates\": -1}}").contains("key \"fit.bootstrap_replicates\""));
        assertTrue(error("{\"fit\": {\"profiles\": \"yes\"}}").contains("key \"fit.profiles\""));
        assertTrue(error("{\"fit\": 3}").contains("key \"fit\""));
        assertTrue(error("{\"fit\": {\"sealed_ends\": 1}}").contains("key \"fit.sealed_ends\""));
        SessionConfig odd = SessionConfig.parse(FILE, "{\"fit\": {\"bootstrap\": 5}}");
        assertTrue(odd.warnings().get(0).contains("\"fit.bootstrap\""), odd.warnings().toString());
    }

    @Test
    void malformedJsonNamesTheLine() {
        String missingComma = "{\n  \"movie\": \"a.tif\"\n  \"path\": \"p.roi\"\n}";
        String message = error(missingComma);
        assertTrue(message.startsWith(FILE + ": is not valid JSON"), message);
        assertTrue(message.contains("line 3"), message);
        assertTrue(error("{\n \"movie\": \"a.tif\",\n}").contains("line 3"), "trailing comma");
        assertTrue(error("{\n // comment\n \"movie\": \"a.tif\"}").contains("line 2"), "comment");
        assertTrue(error("{\"movie\": \"a.tif\"").contains("ends too early"), "truncated");
        assertTrue(error("[1, 2]").contains("one JSON object"), "not an object");
        assertTrue(error(" \n").contains("is empty"), "empty file");
        assertEquals(1, message.split("\n").length, "one line");
    }

    @Test
    void anUnknownModelNameAKeyGivenTwiceAndTextAfterTheObjectAreRefused() {
        String model = error("{\"models\": [\"diffusion-decay\", \"cable-wave\"]}");
        assertTrue(model.contains("key \"models\"") && model.contains("cable-wave") && model.contains("nagumo"),
                model);
        String twice = error("{\"path_width_um\": 1,\n \"path_width_um\": 2}");
        assertTrue(twice.startsWith(FILE + ": ") && twice.contains("key \"path_width_um\"") && twice.contains("twice"),
                twice);
        assertTrue(error("{\"movie\": \"a.tif\"}\n{\"movie\": \"b.tif\"}").contains("text after the end"));
        assertTrue(error("{\"stimulus\": {\"time_s\": NaN}}").contains("key \"stimulus.time_s\""));
        assertEquals(2.0, SessionConfig.parse(FILE, "\uFEFF{\"path_width_um\": 2}").pathWidthUm(), 0.0,
                "a byte-order mark is ignored");
    }
}
