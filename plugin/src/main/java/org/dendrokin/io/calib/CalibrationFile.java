package org.dendrokin.io.calib;

import java.io.IOException;
import java.io.StringReader;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.NoSuchFileException;
import java.nio.file.Path;
import java.util.List;
import java.util.Locale;

import org.dendrokin.core.calib.Calibration;
import org.dendrokin.core.calib.FittedHill;
import org.dendrokin.core.calib.HillCurve;
import org.dendrokin.core.calib.MonotoneTable;
import org.dendrokin.core.calib.StandardsFit;
import org.dendrokin.io.AtomicFiles;
import org.dendrokin.io.InputException;

import com.google.gson.GsonBuilder;
import com.google.gson.JsonArray;
import com.google.gson.JsonElement;
import com.google.gson.JsonNull;
import com.google.gson.JsonObject;
import com.google.gson.JsonParseException;
import com.google.gson.JsonParser;
import com.google.gson.JsonPrimitive;
import com.google.gson.Strictness;
import com.google.gson.stream.JsonReader;

/**
 * A reusable calibration file (JSON), written by {@code calibrate} from a table of standards and referenced
 * from session.json as {@code {"method": "standards", "file": "calibration.json"}}. Two forms:
 * <pre>
 * {"dendrokin_calibration": 1, "method": "standards", "form": "hill", "source_table": "standards.csv",
 *  "constants": {"f_min": .., "f_max": .., "k_half_uM": .., "n": ..},
 *  "ci95": {"f_min": [lo, hi], ...},
 *  "covariance": {"order": ["f_min", "f_max", "ln_k_half_uM", "ln_n"], "matrix": [[..], ..]},
 *  "fit": {"converged": true, "standards": m, "dof": m - 4, "residual_sd": s, "t975": t}, "warnings": [..]}
 *
 * {"dendrokin_calibration": 1, "method": "standards", "form": "monotone", "source_table": "standards.csv",
 *  "table": {"concentration_uM": [..], "mean_intensity": [..]}}
 * </pre>
 * Numbers are written with Locale.ROOT by Gson; {@code covariance} may be absent (no uncertainty propagated).
 */
public final class CalibrationFile {
    public static final int FORMAT_VERSION = 1;
    static final List<String> COVARIANCE_ORDER = List.of("f_min", "f_max", "ln_k_half_uM", "ln_n");

    private CalibrationFile() {
    }

    /** The JSON of a Hill fit to standards. */
    public static JsonObject toJson(StandardsFit.Result fit, String sourceTable) {
        FittedHill cal = fit.calibration();
        if (cal == null) {
            throw new IllegalArgumentException("a fit without a calibration cannot be saved");
        }
        JsonObject root = header("hill", sourceTable);
        JsonObject constants = new JsonObject();
        JsonObject ci = new JsonObject();
        for (StandardsFit.Estimate e : fit.estimates()) {
            constants.addProperty(e.name(), e.value());
            JsonArray pair = new JsonArray();
            pair.add(finiteOrNull(e.ci95Low()));
            pair.add(finiteOrNull(e.ci95High()));
            ci.add(e.name(), pair);
        }
        root.add("constants", constants);
        root.add("ci95", ci);
        double[][] cov = cal.covariance();
        if (cov != null) {
            JsonObject c = new JsonObject();
            JsonArray order = new JsonArray();
            COVARIANCE_ORDER.forEach(order::add);
            c.add("order", order);
            JsonArray matrix = new JsonArray();
            for (double[] row : cov) {
                JsonArray r = new JsonArray();
                for (double v : row) {
                    r.add(v);
                }
                matrix.add(r);
            }
            c.add("matrix", matrix);
            root.add("covariance", c);
        }
        JsonObject f = new JsonObject();
        f.addProperty("converged", fit.converged());
        f.addProperty("standards", fit.dof() + StandardsFit.PARAMETERS);
        f.addProperty("dof", fit.dof());
        f.add("residual_sd", finiteOrNull(fit.residualSd()));
        f.addProperty("t975", fit.tQuantile());
        root.add("fit", f);
        JsonArray w = new JsonArray();
        fit.warnings().forEach(w::add);
        root.add("warnings", w);
        return root;
    }

    /** The JSON of a monotone table. */
    public static JsonObject toJson(MonotoneTable table, String sourceTable) {
        JsonObject root = header("monotone", sourceTable);
        JsonObject t = new JsonObject();
        JsonArray c = new JsonArray();
        JsonArray f = new JsonArray();
        double[] levels = table.levelsMicromolar();
        double[] means = table.meanIntensities();
        for (int i = 0; i < levels.length; i++) {
            c.add(levels[i]);
            f.add(means[i]);
        }
        t.add("concentration_uM", c);
        t.add("mean_intensity", f);
        root.add("table", t);
        return root;
    }

    private static JsonObject header(String form, String sourceTable) {
        JsonObject root = new JsonObject();
        root.addProperty("dendrokin_calibration", FORMAT_VERSION);
        root.addProperty("method", "standards");
        root.addProperty("form", form);
        if (sourceTable != null) {
            root.addProperty("source_table", sourceTable);
        }
        return root;
    }

    private static JsonElement finiteOrNull(double v) {
        return Double.isFinite(v) ? new JsonPrimitive(v) : JsonNull.INSTANCE;
    }

    /** Writes the JSON through a temporary file. */
    public static void write(JsonObject json, Path target) {
        AtomicFiles.writeString(target, new GsonBuilder().setPrettyPrinting().create().toJson(json) + "\n");
    }

    /** Reads a calibration file written by {@link #write}; every problem names the file and the key. */
    public static Calibration read(Path file) {
        String text;
        try {
            text = Files.readString(file, StandardCharsets.UTF_8);
        } catch (NoSuchFileException e) {
            throw new InputException(file, "does not exist", e);
        } catch (IOException e) {
            throw new InputException(file, "cannot be read (" + e.getMessage() + ")", e);
        }
        JsonObject root;
        try (JsonReader reader = new JsonReader(new StringReader(text))) {
            reader.setStrictness(Strictness.STRICT);
            JsonElement e = JsonParser.parseReader(reader);
            if (!e.isJsonObject()) {
                throw new InputException(file, "must hold one JSON object, a calibration written by the calibrate "
                        + "command");
            }
            root = e.getAsJsonObject();
        } catch (JsonParseException | IOException e) {
            throw new InputException(file, "is not valid JSON (" + e.getMessage() + ")", e);
        }
        Json j = new Json(file);
        double version = j.number(root, "dendrokin_calibration");
        if (version != FORMAT_VERSION) {
            throw new InputException(file, String.format(Locale.ROOT, "key \"dendrokin_calibration\" is %s, but this "
                    + "version reads calibration files of format %d", root.get("dendrokin_calibration"),
                    FORMAT_VERSION));
        }
        String form = j.string(root, "form");
        try {
            if (form.equals("hill")) {
                JsonObject c = j.object(root, "constants");
                HillCurve curve = new HillCurve(j.number(c, "f_min", "constants.f_min"),
                        j.number(c, "f_max", "constants.f_max"), j.number(c, "k_half_uM", "constants.k_half_uM"),
                        j.number(c, "n", "constants.n"));
                double[][] cov = null;
                if (root.has("covariance")) {
                    cov = j.matrix(j.object(root, "covariance"), "covariance.matrix", 4);
                }
                return new FittedHill(curve, cov);
            }
            if (form.equals("monotone")) {
                JsonObject t = j.object(root, "table");
                double[] c = j.array(t, "concentration_uM", "table.concentration_uM");
                double[] f = j.array(t, "mean_intensity", "table.mean_intensity");
                if (c.length != f.length) {
                    throw new InputException(file, "keys \"table.concentration_uM\" and \"table.mean_intensity\" must "
                            + "have the same length");
                }
                return new MonotoneTable(c, f);
            }
        } catch (IllegalArgumentException e) {
            throw new InputException(file, "holds an unusable calibration: " + e.getMessage(), e);
        }
        throw new InputException(file, "key \"form\" must be \"hill\" or \"monotone\", got \"" + form + "\"");
    }

    /** Typed access that names the file and key in every complaint. */
    static final class Json {
        private final Path file;

        Json(Path file) {
            this.file = file;
        }

        InputException bad(String key, String requirement, JsonElement got) {
            return new InputException(file,
                    "key \"" + key + "\" " + requirement + ", got " + (got == null ? "nothing" : got.toString()));
        }

        double number(JsonObject o, String name) {
            return number(o, name, name);
        }

        double number(JsonObject o, String name, String key) {
            JsonElement e = o.get(name);
            if (e == null || !e.isJsonPrimitive() || !e.getAsJsonPrimitive().isNumber()
                    || !Double.isFinite(e.getAsDouble())) {
                throw bad(key, "must be a number", e);
            }
            return e.getAsDouble();
        }

        String string(JsonObject o, String name) {
            JsonElement e = o.get(name);
            if (e == null || !e.isJsonPrimitive() || !e.getAsJsonPrimitive().isString()) {
                throw bad(name, "must be text in quotes", e);
            }
            return e.getAsString();
        }

        JsonObject object(JsonObject o, String name) {
            JsonElement e = o.get(name);
            if (e == null || !e.isJsonObject()) {
                throw bad(name, "must be an object {...}", e);
            }
            return e.getAsJsonObject();
        }

        double[] array(JsonObject o, String name, String key) {
            JsonElement e = o.get(name);
            if (e == null || !e.isJsonArray()) {
                throw bad(key, "must be a list of numbers [...]", e);
            }
            JsonArray a = e.getAsJsonArray();
            double[] out = new double[a.size()];
            for (int i = 0; i < out.length; i++) {
                JsonElement x = a.get(i);
                if (!x.isJsonPrimitive() || !x.getAsJsonPrimitive().isNumber() || !Double.isFinite(x.getAsDouble())) {
                    throw bad(key, "must be a list of numbers [...]", e);
                }
                out[i] = x.getAsDouble();
            }
            return out;
        }

        double[][] matrix(JsonObject o, String key, int size) {
            JsonElement e = o.get("matrix");
            if (e == null || !e.isJsonArray() || e.getAsJsonArray().size() != size) {
                throw bad(key, "must be a " + size + " x " + size + " list of lists of numbers", e);
            }
            double[][] m = new double[size][];
            for (int i = 0; i < size; i++) {
                JsonObject row = new JsonObject();
                row.add("r", e.getAsJsonArray().get(i));
                m[i] = array(row, "r", key);
                if (m[i].length != size) {
                    throw bad(key, "must be a " + size + " x " + size + " list of lists of numbers", e);
                }
            }
            return m;
        }
    }
}
