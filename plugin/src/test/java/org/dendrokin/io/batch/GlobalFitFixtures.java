package org.dendrokin.io.batch;

import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.Random;

import com.google.gson.GsonBuilder;
import com.google.gson.JsonArray;
import com.google.gson.JsonObject;

import org.dendrokin.core.Progress;
import org.dendrokin.core.fit.DiffusionDecayPulse;
import org.dendrokin.core.fit.FitData;
import org.dendrokin.core.fit.FitResult;
import org.dendrokin.core.fit.ModelFit;
import org.dendrokin.core.fit.NoiseEstimate;
import org.dendrokin.core.kymo.Kymograph;
import org.dendrokin.core.units.Unit;
import org.dendrokin.io.AtomicFiles;
import org.dendrokin.io.InputException;
import org.dendrokin.io.KymographCsv;
import org.dendrokin.io.json.JsonFiles;
import org.dendrokin.io.session.FitSettings;
import org.dendrokin.io.session.ResultsJson;

/**
 * Sessions for the batch tests of the joint fit, and a stand-in analysis that needs no movie: it makes the session's
 * kymograph from the closed-form diffusion-decay pulse (Crank 1975) with the D in session.json plus seeded noise, fits
 * it with the per-session fitter and writes kymograph.csv, results.json (its fit written by {@link ResultsJson#fit})
 * and global-fit-input.json as the standard analysis would. Invented numbers, for tests only.
 */
final class GlobalFitFixtures {
    static final double K = 0.05;
    static final double T0_S = 4.75;
    static final double X0_UM = 10;

    private GlobalFitFixtures() {
    }

    /**
     * A session folder whose session.json tells the stand-in what to make.
     *
     * @param kind "ok", "fail" (bad input), "no-fit", "not-converged" or "misfit"
     * @param unit "dF/F0" or "uM"
     */
    static void session(Path root, String id, String group, double d, String unit, String kind, long seed) {
        Path dir = root.resolve(id);
        try {
            Files.createDirectories(dir);
            Files.writeString(dir.resolve("session.json"), String.format(Locale.ROOT, "{\"group\": \"%s\", "
                    + "\"test_truth\": {\"D\": %s, \"unit\": \"%s\", \"kind\": \"%s\", \"seed\": %d}}%n", group, d,
                    unit, kind, seed));
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
    }

    /** The stand-in analysis. */
    static SessionAnalyzer analyzer() {
        return (dir, out, progress) -> {
            JsonObject truth = JsonFiles.readObject(dir.resolve("session.json"), "settings").getAsJsonObject(
                    "test_truth");
            String kind = truth.get("kind").getAsString();
            if (kind.equals("fail")) {
                throw new InputException(dir.resolve("session.json"), "the stand-in analysis rejects this session");
            }
            String unit = truth.get("unit").getAsString();
            Random r = new Random(truth.get("seed").getAsLong());
            double noise = 0.02 * Math.exp(0.3 * r.nextGaussian());
            double amplitude = noise * (10 + 20 * r.nextDouble());
            double width = 1 + 0.3 * r.nextDouble();
            double baseline = 0.05 * r.nextGaussian();
            double[] x = grid(0.5, 40);
            double[] t = grid(0.5, 50);
            DiffusionDecayPulse model = new DiffusionDecayPulse(x, t, T0_S, X0_UM, null, Unit.DF_F0);
            double[] v = new double[model.size()];
            model.evaluate(model.pack(truth.get("D").getAsDouble(), K, amplitude, X0_UM, width, baseline, T0_S), v,
                    null);
            for (int i = 0; i < v.length; i++) {
                v[i] += noise * r.nextGaussian();
            }
            Kymograph k = new Kymograph(x, t, v, unit);
            KymographCsv.write(k, out.resolve("kymograph.csv"));
            double[] sigma = NoiseEstimate.perPosition(k, 0, 9, new ArrayList<>());
            FitResult fit = ModelFit.fit(model, FitData.of(k, sigma), List.of(model.pack(0.7, 0.04, amplitude,
                    X0_UM, 1.1, 0, T0_S)), ModelFit.Options.defaults(), Progress.NONE);
            JsonObject results = new JsonObject();
            results.addProperty("signal_unit", unit);
            JsonObject stimulus = new JsonObject();
            stimulus.addProperty("time_s", T0_S);
            stimulus.addProperty("position_um", X0_UM);
            results.add("stimulus", stimulus);
            JsonArray baselineFrames = new JsonArray();
            baselineFrames.add(0);
            baselineFrames.add(9);
            results.add("baseline_frames", baselineFrames);
            JsonArray fits = new JsonArray();
            if (!kind.equals("no-fit")) {
                JsonObject f = ResultsJson.fit(fit);
                if (kind.equals("not-converged")) {
                    f.addProperty("converged", false);
                    f.addProperty("reason", "the stand-in says so");
                    f.add("parameters", new JsonObject());
                }
                JsonObject misfit = new JsonObject();
                misfit.addProperty("verdict", kind.equals("misfit") ? "misfit" : "noise-like");
                f.add("misfit", misfit);
                fits.add(f);
            }
            results.add("fits", fits);
            results.add("warnings", new JsonArray());
            AtomicFiles.writeString(out.resolve("results.json"), new GsonBuilder().setPrettyPrinting()
                    .serializeNulls().create().toJson(results) + "\n");
            GlobalFitInput.write(out, FitSettings.DEFAULT, null);
        };
    }

    private static double[] grid(double step, int n) {
        double[] g = new double[n];
        for (int i = 0; i < n; i++) {
            g[i] = i * step;
        }
        return g;
    }
}
