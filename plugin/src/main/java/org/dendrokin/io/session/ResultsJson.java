package org.dendrokin.io.session;

import java.util.List;

import org.dendrokin.core.spread.Estimate;
import org.dendrokin.io.AtomicFiles;

import com.google.gson.GsonBuilder;
import com.google.gson.JsonArray;
import com.google.gson.JsonElement;
import com.google.gson.JsonNull;
import com.google.gson.JsonObject;

/**
 * Builds and writes {@code results.json}. The contract's keys ({@code tool_version}, {@code session},
 * {@code signal_unit}, {@code kymograph}, {@code fits}, {@code best_model}, {@code spread}, {@code warnings})
 * come first; extra sections follow. Fits are passed in as ready JSON objects, so a fitting module adds its
 * entries without this class knowing their structure. Infinite interval ends are written as null.
 */
public final class ResultsJson {
    private ResultsJson() {
    }

    /** {@code {"value": v, "unit": u, "ci95": [lo, hi], "method": m}}, or JSON null for a null estimate. */
    public static JsonElement estimate(Estimate e) {
        if (e == null) {
            return JsonNull.INSTANCE;
        }
        JsonObject o = new JsonObject();
        o.addProperty("value", e.value());
        o.addProperty("unit", e.unit());
        JsonArray ci = new JsonArray();
        ci.add(finiteOrNull(e.lo95()));
        ci.add(finiteOrNull(e.hi95()));
        o.add("ci95", ci);
        o.addProperty("interval_method", e.method());
        return o;
    }

    /** A finite number, or JSON null for NaN and infinities (which JSON cannot hold). */
    public static JsonElement finiteOrNull(double v) {
        return Double.isFinite(v) ? new com.google.gson.JsonPrimitive(v) : JsonNull.INSTANCE;
    }

    /**
     * Assembles the document.
     *
     * @param toolVersion    the tool's version
     * @param session        the session folder's name
     * @param signalUnit     {@code "dF/F0"} or {@code "uM"}
     * @param kymographFile  file name of the kymograph CSV
     * @param distanceStepUm column spacing, um
     * @param timeStepS      row spacing, s
     * @param fits           one JSON object per fitted model (may be empty)
     * @param bestModel      name of the preferred fit, or null
     * @param spread         the {@code spread} object
     * @param extra          further top-level sections, in order (name, value pairs as a JSON object)
     * @param warnings       plain sentences
     */
    public static JsonObject build(String toolVersion, String session, String signalUnit, String kymographFile,
            double distanceStepUm, double timeStepS, List<JsonObject> fits, String bestModel, JsonObject spread,
            JsonObject extra, List<String> warnings) {
        JsonObject root = new JsonObject();
        root.addProperty("tool_version", toolVersion);
        root.addProperty("session", session);
        root.addProperty("signal_unit", signalUnit);
        JsonObject kymo = new JsonObject();
        kymo.addProperty("file", kymographFile);
        kymo.addProperty("distance_step_um", distanceStepUm);
        kymo.addProperty("time_step_s", timeStepS);
        root.add("kymograph", kymo);
        JsonArray fitArray = new JsonArray();
        fits.forEach(fitArray::add);
        root.add("fits", fitArray);
        root.add("best_model", bestModel == null ? JsonNull.INSTANCE : new com.google.gson.JsonPrimitive(bestModel));
        root.add("spread", spread);
        for (String key : extra.keySet()) {
            root.add(key, extra.get(key));
        }
        JsonArray w = new JsonArray();
        warnings.forEach(w::add);
        root.add("warnings", w);
        return root;
    }

    /** Writes the document, pretty-printed, through a temporary file. */
    public static void write(JsonObject results, java.nio.file.Path target) {
        String text = new GsonBuilder().setPrettyPrinting().serializeNulls().disableHtmlEscaping().create()
                .toJson(results);
        AtomicFiles.writeString(target, text + "\n");
    }
}
