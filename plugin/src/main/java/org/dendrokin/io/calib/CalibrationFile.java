package org.dendrokin.io.calib;

import java.nio.file.Path;
import java.util.List;
import java.util.Locale;

import org.dendrokin.core.calib.Calibration;
import org.dendrokin.core.calib.FittedHill;
import org.dendrokin.core.calib.HillCurve;
import org.dendrokin.core.calib.MonotoneTable;
import org.dendrokin.core.calib.StandardsFit;
import org.dendrokin.io.AtomicFiles;
import org.dendrokin.io.json.JsonFields;
import org.dendrokin.io.json.JsonFiles;

import com.google.gson.GsonBuilder;
import com.google.gson.JsonArray;
import com.google.gson.JsonElement;
import com.google.gson.JsonNull;
import com.google.gson.JsonObject;
import com.google.gson.JsonPrimitive;

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
        JsonFields root = JsonFiles.readFields(file, "a calibration written by the calibrate command");
        double version = root.number("dendrokin_calibration");
        if (version != FORMAT_VERSION) {
            throw root.fail(String.format(Locale.ROOT, "key \"dendrokin_calibration\" is %s, but this version reads "
                    + "calibration files of format %d", root.get("dendrokin_calibration"), FORMAT_VERSION));
        }
        String form = root.string("form");
        try {
            if (form.equals("hill")) {
                JsonFields c = root.object("constants");
                HillCurve curve = new HillCurve(c.number("f_min"), c.number("f_max"), c.number("k_half_uM"),
                        c.number("n"));
                double[][] cov = null;
                if (root.get("covariance") != null) {
                    cov = matrix(root.object("covariance"), COVARIANCE_ORDER.size());
                }
                return new FittedHill(curve, cov);
            }
            if (form.equals("monotone")) {
                JsonFields t = root.object("table");
                double[] c = t.numbers("concentration_uM");
                double[] f = t.numbers("mean_intensity");
                if (c.length != f.length) {
                    throw root.fail("keys \"table.concentration_uM\" and \"table.mean_intensity\" must have the "
                            + "same length");
                }
                return new MonotoneTable(c, f);
            }
        } catch (IllegalArgumentException e) {
            throw root.fail("holds an unusable calibration: " + e.getMessage(), e);
        }
        throw root.bad("form", "must be \"hill\" or \"monotone\"");
    }

    /** The {@code matrix} of the covariance block: {@code size} lists of {@code size} numbers. */
    private static double[][] matrix(JsonFields covariance, int size) {
        String requirement = "must be a " + size + " x " + size + " list of lists of numbers";
        JsonArray rows = covariance.array("matrix");
        if (rows.size() != size) {
            throw covariance.bad("matrix", requirement);
        }
        double[][] m = new double[size][size];
        for (int i = 0; i < size; i++) {
            JsonElement row = rows.get(i);
            if (!row.isJsonArray() || row.getAsJsonArray().size() != size) {
                throw covariance.bad("matrix", requirement);
            }
            for (int j = 0; j < size; j++) {
                JsonElement x = row.getAsJsonArray().get(j);
                if (!x.isJsonPrimitive() || !x.getAsJsonPrimitive().isNumber() || !Double.isFinite(x.getAsDouble())) {
                    throw covariance.bad("matrix", requirement);
                }
                m[i][j] = x.getAsDouble();
            }
        }
        return m;
    }
}
