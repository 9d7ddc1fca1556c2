package org.dendrokin.io.fit;

import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;

import org.dendrokin.core.Progress;
import org.dendrokin.core.kymo.Kymograph;
import org.dendrokin.core.model.Boundary;
import org.dendrokin.core.model.ModelCatalogue;
import org.dendrokin.core.model.Stimulus;
import org.dendrokin.core.spread.Estimate;
import org.dendrokin.core.spread.SpreadAnalysis;
import org.dendrokin.io.AtomicFiles;
import org.dendrokin.io.InputException;
import org.dendrokin.io.KymographCsv;
import org.dendrokin.io.compare.ModelComparison;
import org.dendrokin.io.json.JsonFiles;
import org.dendrokin.io.session.ResultsJson;

import com.google.gson.Gson;
import com.google.gson.GsonBuilder;
import com.google.gson.JsonArray;
import com.google.gson.JsonElement;
import com.google.gson.JsonObject;
import com.google.gson.JsonParseException;
import com.google.gson.JsonParser;

/**
 * Puts a user's own model, with parameters the user chose (no fitting), beside a measured kymograph: simulates
 * the model on the kymograph's grid, and reports the residual norm and RMS and the model-free front speed and
 * peak decay length of each, with the comparison pictures. The measured numbers come from the data alone, timed
 * from the data's own stimulus: given on the command line, else read from the results.json that {@code analyze}
 * wrote beside the kymograph, else found in the kymograph. The model file:
 * <pre>
 * {"model": "nagumo", "parameters": {"D": 1.0, "k": 0.5, "a": 0.2},
 *  "stimuli": [{"time_s": 5, "position_um": 5, "width_um": 2, "amount": 1}],
 *  "amplitude": 1.5, "baseline": 0.0, "dx_um": 0.1, "boundary": "no-flux"}
 * </pre>
 * The signal predicted is baseline + amplitude u (amplitude 1 and baseline 0 if absent); positions of stimuli are
 * in um along the path, as in the kymograph.
 */
public final class ModelComparisonRun {
    public static final String RESULT_JSON = "comparison.json";

    private ModelComparisonRun() {
    }

    /** What the comparison found. */
    public record Result(String model, double residualNorm, double rmse, Estimate measuredSpeed,
                         Estimate modelSpeed, Estimate measuredPeakDecayLength, Estimate modelPeakDecayLength,
                         ModelComparison.DataStimulus dataStimulus, List<String> warnings) {
    }

    /** As {@link #run(Path, Path, String, double[], Path)} with the data's stimulus read or found, not given. */
    public static Result run(Path kymographCsv, Path modelJson, String signalUnit, Path outDir) {
        return run(kymographCsv, modelJson, signalUnit, null, outDir);
    }

    /**
     * @param kymographCsv measured kymograph (kymograph.csv format). Not changed.
     * @param modelJson    the user's model file. Not changed.
     * @param signalUnit   unit of the kymograph's values
     * @param stimulus     the data's stimulus {time s, position um along the path}, or null to read it from the
     *                     results.json beside the kymograph or, failing that, find it in the kymograph
     * @param outDir       output folder (created if missing)
     */
    public static Result run(Path kymographCsv, Path modelJson, String signalUnit, double[] stimulus, Path outDir) {
        Kymograph measured = KymographCsv.read(kymographCsv, signalUnit);
        ModelComparison.DataStimulus data = dataStimulus(kymographCsv, measured, stimulus);
        JsonObject root;
        try {
            root = JsonParser.parseString(Files.readString(modelJson, StandardCharsets.UTF_8)).getAsJsonObject();
        } catch (IOException e) {
            throw new InputException(modelJson, "cannot be read (" + e.getMessage() + ")", e);
        } catch (JsonParseException | IllegalStateException e) {
            throw new InputException(modelJson, "is not a JSON object (" + e.getMessage() + ")", e);
        }
        String model = string(root, "model", modelJson);
        if (ModelCatalogue.findScalar(model).isEmpty()) {
            throw new InputException(modelJson, "key \"model\": unknown model '" + model + "'; known: "
                    + ModelCatalogue.scalarNames());
        }
        JsonArray st = root.has("stimuli") && root.get("stimuli").isJsonArray() ? root.getAsJsonArray("stimuli")
                : null;
        if (st == null || st.isEmpty()) {
            throw new InputException(modelJson, "key \"stimuli\": give at least one stimulus, e.g. [{\"time_s\": 5, "
                    + "\"position_um\": 10, \"width_um\": 2, \"amount\": 1}]");
        }
        ModelComparison.GivenModel given;
        ModelComparison.Comparison c;
        try {
            List<Stimulus> stimuli = new ArrayList<>();
            for (JsonElement e : st) {
                JsonObject s = e.getAsJsonObject();
                stimuli.add(Stimulus.pulse(number(s, "time_s", modelJson), number(s, "position_um", modelJson),
                        number(s, "width_um", modelJson), number(s, "amount", modelJson)));
            }
            List<String> names = ModelComparison.parameterNames(model);
            JsonObject p = root.has("parameters") && root.get("parameters").isJsonObject()
                    ? root.getAsJsonObject("parameters") : new JsonObject();
            double[] theta = new double[names.size()];
            for (int i = 0; i < theta.length; i++) {
                if (!p.has(names.get(i))) {
                    throw new InputException(modelJson, "key \"parameters\": the " + model + " model needs "
                            + names + ", \"" + names.get(i) + "\" is missing");
                }
                theta[i] = number(p, names.get(i), modelJson);
            }
            Boundary boundary = root.has("boundary") && string(root, "boundary", modelJson).equals("fixed")
                    ? Boundary.FIXED : Boundary.NO_FLUX;
            given = new ModelComparison.GivenModel(model, theta, stimuli,
                    root.has("amplitude") ? number(root, "amplitude", modelJson) : 1,
                    root.has("baseline") ? number(root, "baseline", modelJson) : 0, boundary,
                    root.has("dx_um") ? number(root, "dx_um", modelJson) : Double.NaN);
            c = ModelComparison.compare(measured, given, data, Progress.NONE);
        } catch (IllegalArgumentException | IllegalStateException e) {
            throw new InputException(modelJson, e.getMessage(), e);
        }
        SpreadAnalysis.Result sm = c.measuredSpread();
        SpreadAnalysis.Result ss = c.simulatedSpread();
        List<String> warnings = new ArrayList<>(c.mismatches());
        warnings.addAll(extentMismatches(root, measured));
        sm.warnings().forEach(w -> warnings.add("measured: " + w));
        ss.warnings().forEach(w -> warnings.add("model: " + w));
        double norm = c.residualNorm();
        double rmse = c.rmse();
        double t0 = data.timeS();
        double xs = data.positionUm();
        double noise = c.noiseSd();
        Kymograph simulated = c.simulated();
        try {
            Files.createDirectories(outDir);
        } catch (IOException e) {
            throw new InputException(outDir, "cannot be created (" + e.getMessage() + ")", e);
        }
        FitPictures.write(outDir, "compare-" + model, model + " (given)", measured, null, simulated, t0, xs,
                noise);
        Result r = new Result(model, norm, rmse, sm.frontSpeed(), ss.frontSpeed(), sm.peakDecayLength(),
                ss.peakDecayLength(), data, warnings);
        JsonObject out = new JsonObject();
        out.addProperty("model", model);
        out.add("residual_norm", ResultsJson.finiteOrNull(norm));
        out.add("rmse", ResultsJson.finiteOrNull(rmse));
        out.addProperty("signal_unit", signalUnit);
        JsonObject stim = new JsonObject();
        stim.add("time_s", ResultsJson.finiteOrNull(data.timeS()));
        stim.add("position_um", ResultsJson.finiteOrNull(data.positionUm()));
        stim.addProperty("source", data.source());
        out.add("data_stimulus", stim);
        JsonObject speed = new JsonObject();
        speed.add("measured", estimate(sm.frontSpeed()));
        speed.add("model", estimate(ss.frontSpeed()));
        out.add("front_speed", speed);
        JsonObject lambda = new JsonObject();
        lambda.add("measured", estimate(sm.peakDecayLength()));
        lambda.add("model", estimate(ss.peakDecayLength()));
        out.add("peak_decay_length", lambda);
        JsonArray w = new JsonArray();
        warnings.forEach(w::add);
        out.add("warnings", w);
        Gson gson = new GsonBuilder().setPrettyPrinting().serializeSpecialFloatingPointValues().create();
        AtomicFiles.writeString(outDir.resolve(RESULT_JSON), gson.toJson(out) + "\n");
        return r;
    }

    /** A one-paragraph summary for the terminal. */
    public static String summary(Result r, String unit) {
        return String.format(Locale.ROOT, "model %s: residual norm %.4g %s, RMS %.4g %s; front speed measured %s, "
                + "model %s; peak decay length measured %s, model %s; the data's stimulus at t = %.3g s, %.3g um (%s)",
                r.model(), r.residualNorm(), unit, r.rmse(), unit, fmt(r.measuredSpeed(), "um/s"),
                fmt(r.modelSpeed(), "um/s"), fmt(r.measuredPeakDecayLength(), "um"),
                fmt(r.modelPeakDecayLength(), "um"), r.dataStimulus().timeS(), r.dataStimulus().positionUm(),
                r.dataStimulus().source());
    }

    /**
     * The data's stimulus: as given, else from the results.json of the analysis that wrote the kymograph (the
     * same folder), else found in the kymograph.
     */
    private static ModelComparison.DataStimulus dataStimulus(Path kymographCsv, Kymograph measured, double[] given) {
        if (given != null) {
            return new ModelComparison.DataStimulus(given[0], given[1], "given on the command line");
        }
        Path parent = kymographCsv.toAbsolutePath().getParent();
        Path results = parent == null ? null : parent.resolve(ResultsJson.FILE_NAME);
        if (results != null && Files.isRegularFile(results)) {
            JsonObject root = JsonFiles.readObject(results, "the results of an analysis");
            JsonElement st = root.get("stimulus");
            if (st != null && st.isJsonObject() && isNumber(st.getAsJsonObject(), "time_s")
                    && isNumber(st.getAsJsonObject(), "position_um")) {
                return new ModelComparison.DataStimulus(st.getAsJsonObject().get("time_s").getAsDouble(),
                        st.getAsJsonObject().get("position_um").getAsDouble(), "from " + results.getFileName()
                        + " beside the kymograph");
            }
        }
        try {
            return ModelComparison.detectStimulus(measured);
        } catch (IllegalArgumentException e) {
            throw new InputException(kymographCsv, e.getMessage() + " (--stimulus TIME_S,POSITION_UM)", e);
        }
    }

    private static boolean isNumber(JsonObject o, String key) {
        return o.has(key) && o.get(key).isJsonPrimitive() && o.get(key).getAsJsonPrimitive().isNumber();
    }

    /**
     * Sentences for a model file that states its own extent ({@code domain.length_um}, {@code time.duration_s},
     * as a simulate model file does) unlike the kymograph's by more than one distance step or frame interval:
     * the comparison runs the model on the kymograph's grid, not on its own.
     */
    private static List<String> extentMismatches(JsonObject root, Kymograph measured) {
        List<String> out = new ArrayList<>();
        double length = measured.distanceUm(measured.positionCount() - 1) - measured.distanceUm(0);
        double span = measured.timeS(measured.frameCount() - 1) - measured.timeS(0);
        double modelLength = nested(root, "domain", "length_um");
        if (Double.isFinite(modelLength) && Math.abs(modelLength - length) > measured.distanceStepUm()) {
            out.add(String.format(Locale.ROOT, "The model file's domain is %.4g um long but the kymograph covers "
                    + "%.4g um; the model was run on the kymograph's length, so its ends are not where the file puts "
                    + "them.", modelLength, length));
        }
        double duration = nested(root, "time", "duration_s");
        if (Double.isFinite(duration) && Math.abs(duration - span) > measured.timeStepS()) {
            out.add(String.format(Locale.ROOT, "The model file runs for %.4g s but the kymograph spans %.4g s; the "
                    + "model was run over the kymograph's frames.", duration, span));
        }
        return out;
    }

    private static double nested(JsonObject root, String object, String key) {
        JsonElement o = root.get(object);
        return o != null && o.isJsonObject() && isNumber(o.getAsJsonObject(), key)
                ? o.getAsJsonObject().get(key).getAsDouble() : Double.NaN;
    }

    private static String fmt(Estimate e, String unit) {
        return e == null ? "not available" : String.format(Locale.ROOT, "%.3g %s (95%% %.3g to %.3g)", e.value(), unit,
                e.lo95(), e.hi95());
    }

    private static JsonElement estimate(Estimate e) {
        if (e == null) {
            return com.google.gson.JsonNull.INSTANCE;
        }
        JsonObject o = new JsonObject();
        o.add("value", ResultsJson.finiteOrNull(e.value()));
        o.addProperty("unit", e.unit());
        JsonArray ci = new JsonArray();
        ci.add(ResultsJson.finiteOrNull(e.lo95()));
        ci.add(ResultsJson.finiteOrNull(e.hi95()));
        o.add("ci95", ci);
        o.addProperty("ci_method", e.method());
        return o;
    }

    private static String string(JsonObject o, String key, Path file) {
        if (!o.has(key) || !o.get(key).isJsonPrimitive()) {
            throw new InputException(file, "key \"" + key + "\" is missing or not a string");
        }
        return o.get(key).getAsString();
    }

    private static double number(JsonObject o, String key, Path file) {
        try {
            double v = o.get(key).getAsDouble();
            if (!Double.isFinite(v)) {
                throw new NumberFormatException();
            }
            return v;
        } catch (RuntimeException e) {
            throw new InputException(file, "key \"" + key + "\" must be a finite number");
        }
    }

}
