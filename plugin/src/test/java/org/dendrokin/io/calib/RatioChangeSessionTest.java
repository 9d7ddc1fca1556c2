package org.dendrokin.io.calib;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Collections;
import java.util.List;

import org.dendrokin.core.Progress;
import org.dendrokin.core.kymo.Kymograph;
import org.dendrokin.io.SessionRunner;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

import com.google.gson.JsonElement;
import com.google.gson.JsonObject;
import com.google.gson.JsonParser;

/** A two-channel session analysed as dR/R0: the numbers against the scene's truth, and the unit in every output. */
class RatioChangeSessionTest {
    @TempDir
    Path dir;

    /** The ratio of the generator's two-state dye at a concentration (uM): brightness of channel 1 over channel 2. */
    private static double dyeRatio(double concentrationMicromolar) {
        double s = concentrationMicromolar / (concentrationMicromolar + CalibratedSessionGenerator.RATIO_KD_UM);
        return (CalibratedSessionGenerator.FREE_1 * (1 - s) + CalibratedSessionGenerator.BOUND_1 * s)
                / (CalibratedSessionGenerator.FREE_2 * (1 - s) + CalibratedSessionGenerator.BOUND_2 * s);
    }

    private static double median(List<Double> v) {
        List<Double> s = new ArrayList<>(v);
        Collections.sort(s);
        return s.get(s.size() / 2);
    }

    @Test
    void dROverR0FollowsTheSceneAndEveryOutputStatesItsUnit() throws IOException {
        Path session = dir.resolve("ratio");
        CalibratedSessionGenerator.writeRatio(session);
        Path json = session.resolve("session.json");
        Files.writeString(json, Files.readString(json).replaceFirst("\"calibration\": \\{[^}]*\\}",
                "\"calibration\": {\"method\": \"ratio-change\", \"output\": \"dR/R0\"}"));
        Path out = dir.resolve("out");
        SessionRunner.Result r = SessionRunner.analyze(session, out, Progress.NONE);
        Kymograph k = r.analysis().signal();
        assertEquals("dR/R0", k.signalUnit());

        double stimulusS = CalibratedSessionGenerator.STIMULUS_S;
        double r0 = dyeRatio(CalibratedSessionGenerator.RESTING_UM);
        List<Double> rest = new ArrayList<>();
        List<Double> error = new ArrayList<>();
        double peak = 0;
        for (int f = 0; f < k.frameCount(); f++) {
            for (int p = 0; p < k.positionCount(); p++) {
                double v = k.value(f, p);
                if (!Double.isFinite(v)) {
                    continue;
                }
                double truth = dyeRatio(CalibratedSessionGenerator.concentrationMicromolar(k.distanceUm(p),
                        k.timeS(f))) / r0 - 1;
                peak = Math.max(peak, truth);
                if (k.timeS(f) < stimulusS) {
                    rest.add(v);
                } else {
                    error.add(Math.abs(v - truth));
                }
            }
        }
        // REF: the generator's dye, R(c) = (F1 (1 - s) + B1 s) / (F2 (1 - s) + B2 s) with s = c / (c + Kd), and its
        // concentration field [common practice: the scene's own definition]; photon noise of a few hundred counts per
        // pixel gives a few percent per sample, and the path drawn half a pixel off the scene's axis blurs the peak
        assertEquals(0.0, median(rest), 0.005, "median dR/R0 before the stimulus");
        assertTrue(median(error) < 0.01 * peak, "median error " + median(error) + " against a peak of " + peak);

        JsonObject results = JsonParser.parseString(Files.readString(out.resolve("results.json"))).getAsJsonObject();
        assertEquals("dR/R0", results.get("signal_unit").getAsString());
        JsonObject cal = results.getAsJsonObject("calibration");
        assertEquals("ratio-change", cal.get("method").getAsString());
        assertEquals("dR/R0", cal.get("unit").getAsString());
        assertEquals(2, cal.getAsJsonObject("channels").get("denominator_channel").getAsInt());
        assertFalse(cal.has("thresholds"), "no saturation thresholds for a relative change");
        for (JsonElement fit : results.getAsJsonArray("fits")) {
            JsonObject params = fit.getAsJsonObject().getAsJsonObject("parameters");
            if (params.has("amplitude")) {
                assertEquals("dR/R0", params.getAsJsonObject("amplitude").get("unit").getAsString(),
                        "a fitted amplitude is in the signal's unit");
            }
        }
        String report = Files.readString(out.resolve("report.html"));
        assertTrue(report.contains("The analysed signal is in dR/R0"), "the report states the unit");
    }
}
