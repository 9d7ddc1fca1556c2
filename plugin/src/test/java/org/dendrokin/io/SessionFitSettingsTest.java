package org.dendrokin.io;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;

import org.dendrokin.core.Progress;
import org.dendrokin.io.demo.DemoSessionGenerator;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

import com.google.gson.JsonArray;
import com.google.gson.JsonElement;
import com.google.gson.JsonObject;
import com.google.gson.JsonParser;

/** session.json's {@code fit} object reaches the fits: the criterion, and bootstrap intervals in results.json. */
class SessionFitSettingsTest {
    @Test
    void bootstrapIntervalsAndTheCriterionComeFromSessionJson(@TempDir Path dir) throws IOException {
        Path session = dir.resolve("session");
        DemoSessionGenerator.write(session, SessionRunnerTest.SMALL);
        Path file = session.resolve("session.json");
        JsonObject config = JsonParser.parseString(Files.readString(file)).getAsJsonObject();
        JsonObject fit = new JsonObject();
        fit.addProperty("criterion", "bic");
        fit.addProperty("bootstrap_replicates", 40);
        fit.addProperty("seed", 5);
        config.add("fit", fit);
        JsonArray models = new JsonArray();
        models.add("diffusion-decay");
        config.add("models", models);
        Files.writeString(file, config.toString());

        SessionRunner.analyze(session, dir.resolve("out"), Progress.NONE);
        JsonObject r = JsonParser.parseString(Files.readString(dir.resolve("out/results.json"))).getAsJsonObject();
        JsonObject f = r.getAsJsonArray("fits").get(0).getAsJsonObject();
        assertTrue(f.get("converged").getAsBoolean(), f.toString());
        assertEquals("bic", f.get("weight_criterion").getAsString());
        JsonObject d = f.getAsJsonObject("parameters").getAsJsonObject("D");
        double value = d.get("value").getAsDouble();
        // the profile-likelihood interval is the reported one, or beside it when the robust interval is reported
        JsonArray main = d.get("ci_method").getAsString().equals("profile-likelihood") ? d.getAsJsonArray("ci95")
                : null;
        JsonArray boot = null;
        for (JsonElement e : d.getAsJsonArray("other_intervals")) {
            if (e.getAsJsonObject().get("ci_method").getAsString().equals("parametric-bootstrap")) {
                boot = e.getAsJsonObject().getAsJsonArray("ci95");
            }
            if (e.getAsJsonObject().get("ci_method").getAsString().equals("profile-likelihood")) {
                main = e.getAsJsonObject().getAsJsonArray("ci95");
            }
        }
        assertTrue(main != null, "a profile-likelihood interval for D: " + d);
        assertTrue(boot != null, "a bootstrap interval for D: " + d);
        double lo = boot.get(0).getAsDouble();
        double hi = boot.get(1).getAsDouble();
        assertTrue(lo < value && value < hi, "the bootstrap interval brackets the estimate: " + boot);
        // REF: in a well-identified fit the bootstrap and profile-likelihood intervals agree to within sampling
        // error of 40 replicates (Efron & Tibshirani 1993, from memory) [common practice]
        double profileWidth = main.get(1).getAsDouble() - main.get(0).getAsDouble();
        double ratio = (hi - lo) / profileWidth;
        assertTrue(ratio > 0.5 && ratio < 2, "bootstrap / profile interval width " + ratio);
        assertTrue(Files.readString(dir.resolve("out/report.html")).contains("parametric-bootstrap"),
                "the report shows the bootstrap interval");
    }
}
