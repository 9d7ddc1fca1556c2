package org.dendrokin.io.calib;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertInstanceOf;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;

import org.dendrokin.core.analysis.CalibrationStage;
import org.dendrokin.core.calib.MeanLifetime;
import org.dendrokin.core.calib.RatioChange;
import org.dendrokin.core.calib.TwoStateLifetime;
import org.dendrokin.core.kymo.Kymograph;
import org.dendrokin.io.InputException;
import org.dendrokin.io.session.ReportHtml;
import org.dendrokin.io.session.ResultsJson;
import org.junit.jupiter.api.BeforeEach;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

import com.google.gson.JsonObject;
import com.google.gson.JsonParser;

/** The calibration block's ratio-change and lifetime methods. */
class ReporterConfigTest {
    @TempDir
    Path dir;

    @BeforeEach
    void files() throws IOException {
        Files.writeString(dir.resolve("tau.tif"), "not read here");
        Files.writeString(dir.resolve("counts.tif"), "not read here");
    }

    private CalibrationSetup parse(String block) {
        return CalibrationConfig.parse(JsonParser.parseString(block).getAsJsonObject(), dir.resolve("session.json"));
    }

    /** The one-line message for a bad block; it names session.json and every fragment. */
    private void bad(String block, String... fragments) {
        InputException e = assertThrows(InputException.class, () -> parse(block));
        String m = e.getMessage();
        assertEquals(1, m.split("\n").length, "one line: " + m);
        assertTrue(m.contains("session.json"), m);
        for (String f : fragments) {
            assertTrue(m.contains(f), "'" + f + "' in: " + m);
        }
    }

    @Test
    void readsTheRatioChangeMethod() {
        CalibrationSetup s = parse("{\"method\": \"ratio-change\"}");
        RatioChange r = assertInstanceOf(RatioChange.class, s.calibration());
        assertEquals(RatioChange.Output.CHANGE, r.output(), "dR/R0 unless asked otherwise");
        assertEquals(1, s.channels().numerator());
        assertEquals(2, s.channels().denominator());
        assertNull(s.channels().numeratorBackground(), "the session's background handling per channel");
        CalibrationSetup t = parse("{\"method\": \"ratio-change\", \"output\": \"R/R0\", \"numerator_channel\": 2, "
                + "\"denominator_channel\": 1, \"numerator_background\": 95, \"denominator_background\": 102}");
        assertEquals(RatioChange.Output.RATIO, ((RatioChange) t.calibration()).output());
        assertEquals(2, t.channels().numerator());
        assertEquals(102.0, t.channels().denominatorBackground(), 0);
        assertTrue(parse("{\"method\": \"ratio-change\", \"kd_uM\": 0.2}").warnings().get(0)
                .contains("calibration.kd_uM"), "a dye constant is not used and is said to be ignored");
    }

    @Test
    void namesTheKeyOfEachBadRatioChangeValue() {
        bad("{\"method\": \"ratio-change\", \"output\": \"percent\"}", "calibration.output", "dR/R0");
        bad("{\"method\": \"ratio-change\", \"numerator_channel\": 0}", "calibration.numerator_channel");
        bad("{\"method\": \"ratio-change\", \"denominator_channel\": 1.5}", "calibration.denominator_channel");
        bad("{\"method\": \"ratio-change\", \"numerator_channel\": 2, \"denominator_channel\": 2}",
                "calibration.denominator_channel", "calibration.numerator_channel");
        bad("{\"method\": \"ratio-change\", \"numerator_background\": \"dark\"}", "calibration.numerator_background");
    }

    @Test
    void readsTheLifetimeMethod() {
        CalibrationSetup s = parse("{\"method\": \"lifetime\", \"movie\": \"tau.tif\", \"photons\": \"counts.tif\", "
                + "\"tau_free_ns\": 2.6, \"tau_bound_ns\": 1.1, \"tau_bound_ns_sd\": 0.05}");
        TwoStateLifetime p = assertInstanceOf(TwoStateLifetime.class, s.calibration(),
                "both reference lifetimes: the fraction bound");
        assertEquals(0.05, p.constants().get("tau_bound_ns_sd"), 0);
        assertEquals(new CalibrationSetup.LifetimeInput("tau.tif", 1, "counts.tif", 0), s.lifetime());
        assertTrue(s.lifetime().weighted());
        assertTrue(s.warnings().isEmpty(), s.warnings().toString());

        CalibrationSetup plain = parse("{\"method\": \"lifetime\", \"lifetime_channel\": 2, \"photon_channel\": 1}");
        assertInstanceOf(MeanLifetime.class, plain.calibration(), "no reference lifetimes: the lifetime in ns");
        assertEquals(new CalibrationSetup.LifetimeInput(null, 2, null, 1), plain.lifetime(),
                "both from the session's movie");

        CalibrationSetup kept = parse("{\"method\": \"lifetime\", \"movie\": \"tau.tif\", \"output\": \"lifetime\", "
                + "\"tau_free_ns\": 2.6, \"tau_bound_ns\": 1.1}");
        assertInstanceOf(MeanLifetime.class, kept.calibration());
        assertTrue(kept.warnings().get(0).contains("calibration.tau_free_ns"), kept.warnings().toString());
        assertFalse(parse("{\"method\": \"lifetime\", \"movie\": \"tau.tif\"}").lifetime().weighted(),
                "no photon counts named");
    }

    @Test
    void namesTheKeyOfEachBadLifetimeValue() {
        bad("{\"method\": \"lifetime\"}", "calibration.movie", "calibration.lifetime_channel");
        bad("{\"method\": \"lifetime\", \"movie\": \"elsewhere.tif\"}", "calibration.movie", "elsewhere.tif");
        bad("{\"method\": \"lifetime\", \"movie\": \"tau.tif\", \"photons\": \"none.tif\"}", "calibration.photons");
        bad("{\"method\": \"lifetime\", \"movie\": \"tau.tif\", \"tau_free_ns\": -2.6, \"tau_bound_ns\": 1.1}",
                "calibration.tau_free_ns", "positive");
        bad("{\"method\": \"lifetime\", \"movie\": \"tau.tif\", \"tau_free_ns\": 2.6, \"tau_bound_ns\": 0}",
                "calibration.tau_bound_ns", "positive");
        bad("{\"method\": \"lifetime\", \"movie\": \"tau.tif\", \"tau_free_ns\": 1.1, \"tau_bound_ns\": 2.6}",
                "calibration.tau_bound_ns", "calibration.tau_free_ns", "shorter");
        bad("{\"method\": \"lifetime\", \"movie\": \"tau.tif\", \"tau_free_ns\": 2.6, \"tau_bound_ns\": 2.6}",
                "calibration.tau_bound_ns", "shorter");
        bad("{\"method\": \"lifetime\", \"movie\": \"tau.tif\", \"output\": \"fraction-bound\", \"tau_free_ns\": 2.6}",
                "calibration.tau_bound_ns", "needed");
        bad("{\"method\": \"lifetime\", \"movie\": \"tau.tif\", \"output\": \"FRET\"}", "calibration.output",
                "fraction-bound");
        bad("{\"method\": \"lifetime\", \"movie\": \"tau.tif\", \"photon_channel\": 1}", "calibration.photon_channel",
                "channel 1 of tau.tif");
        bad("{\"method\": \"lifetime\", \"lifetime_channel\": 2, \"photon_channel\": 2}", "calibration.photon_channel",
                "session's movie");
        bad("{\"method\": \"lifetime\", \"lifetime_channel\": 0}", "calibration.lifetime_channel");
        bad("{\"method\": \"lifetime\", \"movie\": \"tau.tif\", \"tau_free_ns\": 2.6, \"tau_bound_ns\": 1.1, "
                + "\"tau_free_ns_sd\": -0.1}", "calibration.tau_free_ns_sd");
    }

    @Test
    void resultsAndReportStateTheLifetimeMethodAndItsUnit() {
        CalibrationSetup s = parse("{\"method\": \"lifetime\", \"movie\": \"tau.tif\", \"photons\": \"counts.tif\", "
                + "\"tau_free_ns\": 2.6, \"tau_bound_ns\": 1.1}");
        double[] d = {0, 0.2};
        double[] t = {0, 0.1, 0.2};
        CalibrationStage.Lifetime lifetime = new CalibrationStage.Lifetime(
                new Kymograph(d, t, new double[] {2.6, 2.6, 2.5, 2.6, 2.2, 2.4}, "ns"),
                new Kymograph(d, t, new double[] {900, 900, 900, 900, 900, 900}, "photons"), List.of());
        CalibrationStage.Calibrated a = CalibrationStage.apply(SessionCalibration.request(s), null, null, null, lifetime,
                0, 1);
        JsonObject json = ResultsJson.calibration(s, a);
        assertEquals("lifetime", json.get("method").getAsString());
        assertEquals("fraction bound", json.get("unit").getAsString());
        assertTrue(json.get("signal_in").getAsString().contains("lifetime (ns)"), json.toString());
        assertEquals(2.6, json.getAsJsonObject("constants").get("tau_free_ns").getAsDouble(), 0);
        assertFalse(json.has("thresholds"), "no saturation thresholds for a fraction");
        assertTrue(json.get("uncertainty_propagated").getAsBoolean(), "photon-limited SD propagated");
        assertEquals("counts.tif", json.getAsJsonObject("lifetime").get("photons").getAsString());
        assertTrue(json.getAsJsonObject("lifetime").get("photon_weighted").getAsBoolean());
        String sentence = ReportHtml.calibrationSentence(s, a);
        assertTrue(sentence.startsWith("Fraction of bound sensor") && sentence.contains("concentration_sd.csv"),
                sentence);
        assertEquals("fraction bound", a.signal().signalUnit());
    }
}
