package org.dendrokin.io.calib;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertSame;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Path;

import org.dendrokin.core.analysis.CalibrationStage;
import org.dendrokin.core.kymo.Kymograph;
import org.dendrokin.io.InputException;
import org.dendrokin.io.session.ReportHtml;
import org.dendrokin.io.session.ResultsJson;
import org.junit.jupiter.api.Test;

import com.google.gson.JsonObject;
import com.google.gson.JsonParser;

class SessionCalibrationTest {
    private static final Path SESSION = Path.of("some", "session.json");

    private static CalibrationSetup setup(String block) {
        return CalibrationConfig.parse(JsonParser.parseString(block).getAsJsonObject(), SESSION);
    }

    private static Kymograph kymograph(double... values) {
        return new Kymograph(new double[] {0, 0.2}, new double[] {0, 0.1, 0.2, 0.3}, values, "a.u.");
    }

    @Test
    void intensityMethodsUseTheCorrectedIntensityAndReportCounts() {
        CalibrationSetup s = setup("{\"method\": \"single-wavelength\", \"kd_uM\": 0.345, \"f_min\": 100, "
                + "\"f_max\": 1000, \"kd_uM_sd\": 0.03}");
        Kymograph intensity = kymograph(400, 400, 410, 390, 400, 400, 960, 1200);
        Kymograph df = kymograph(0, 0, 0, 0, 0, 0, 1, 2);
        CalibrationStage.Calibrated a = CalibrationStage.apply(SessionCalibration.request(s), intensity, df, null, 0,
                2);
        assertEquals("uM", a.signal().signalUnit());
        // REF: GPT85 worked example: Kd 0.345 uM, Fmin 100, Fmax 1000, F 400 gives 0.1725 uM [published formula]; sheet s1.1
        assertEquals(0.1725, a.signal().value(0, 0), 1e-12);
        assertTrue(Double.isNaN(a.signal().value(3, 1)), "F above Fmax is NaN");
        JsonObject json = ResultsJson.calibration(s, a);
        assertEquals("single-wavelength", json.get("method").getAsString());
        assertEquals(0.345, json.getAsJsonObject("constants").get("kd_uM").getAsDouble(), 0.0);
        assertEquals(0.8, json.getAsJsonObject("thresholds").get("flag_saturation_above").getAsDouble(), 0.0);
        assertEquals(1, json.getAsJsonObject("counts").get("nan_near_saturation").getAsLong(),
                "F = 960 is f = 0.956 > 0.95");
        assertTrue(json.get("uncertainty_propagated").getAsBoolean());
        assertTrue(ReportHtml.calibrationSentence(s, a).startsWith("Single-wavelength calibration"));
    }

    @Test
    void dynamicRangeUsesDeltaFAndNoneLeavesItAlone() {
        CalibrationSetup dr = setup("{\"method\": \"dynamic-range\", \"kd_uM\": 0.170, \"rf\": 8.5, "
                + "\"resting_uM\": 0.0175}");
        Kymograph df = kymograph(0, 0, 0, 0, 0, 0, 1, 1);
        CalibrationStage.Calibrated a = CalibrationStage.apply(SessionCalibration.request(dr), null, df, null, 0, 2);
        // REF: Maravall et al. 2000 worked example B: dF/F0 = 1 gives 80 nM; resting 17.5 nM [published method; forms derived]; sheet s1.4
        assertEquals(0.080, a.signal().value(3, 0), 1e-12);
        assertEquals(0.0175, a.signal().value(0, 0), 1e-12);
        CalibrationStage.Calibrated none = CalibrationStage.apply(SessionCalibration.request(CalibrationSetup.NONE),
                null, df, null, 0, 2);
        assertSame(df, none.signal());
        assertNull(none.summary());
    }

    @Test
    void ratioNeedsTwoChannels() {
        CalibrationSetup r = setup("{\"method\": \"ratio\", \"kd_uM\": 0.224, \"r_min\": 0.3, \"r_max\": 6, "
                + "\"beta\": 5}");
        InputException e = assertThrows(InputException.class,
                () -> SessionCalibration.requireChannels(r, SESSION, Path.of("movie.tif"), 1));
        assertTrue(e.getMessage().contains("session.json") && e.getMessage().contains("calibration.method")
                && e.getMessage().contains("movie.tif has 1 channel"), e.getMessage());
        SessionCalibration.requireChannels(r, SESSION, Path.of("movie.tif"), 2);
        Kymograph ratio = kymograph(1.5, 1.5, 1.5, 1.5, 1.5, 1.5, 1.5, 1.5);
        // REF: GPT85 ratio worked example, R = 1.5 gives 298.6667 nM [published formula]; sheet s1.2
        assertEquals(0.2986667, CalibrationStage.apply(SessionCalibration.request(r), null, null, ratio, 0, 2)
                .signal().value(1, 1), 1e-6);
    }
}
