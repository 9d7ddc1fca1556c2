package org.dendrokin.io.fit;

import java.util.List;
import java.util.Map;

import org.dendrokin.core.fit.FitResult;
import org.dendrokin.core.fit.Interval;
import org.dendrokin.core.fit.KymographFits;
import org.dendrokin.core.fit.ParameterEstimate;
import org.dendrokin.core.fit.VarianceModel;

import com.google.gson.JsonArray;
import com.google.gson.JsonElement;
import com.google.gson.JsonNull;
import com.google.gson.JsonObject;
import com.google.gson.JsonPrimitive;

/**
 * Fit results as the JSON objects of results.json's {@code fits} list:
 * {@code {"model", "converged", "aic", "aicc", "bic", "rmse", "akaike_weight", "parameters": {NAME: {"value",
 * "unit", "ci95": [lo, hi], "ci_method", "ci_note", "other_intervals", ...}}, "derived": {...}, "warnings": [...],
 * "noise_model": {...}}. A fit that did not
 * converge has {@code "converged": false} and a {@code "reason"}, and no parameters (its numbers are not
 * estimates). Non-finite numbers, and interval ends the data leave open, are written as null.
 */
public final class FitJson {
    private FitJson() {
    }

    /**
     * One JSON object per fit, in the outcome's order, each with its Akaike weight (null for a fit that did not
     * converge: it takes no part in the comparison).
     */
    public static List<JsonObject> fits(KymographFits.Outcome outcome) {
        Map<String, Double> weights = outcome.weights();
        return outcome.fits().stream().map(f -> {
            JsonObject o = fit(f);
            o.add("akaike_weight", number(f.converged() ? weights.getOrDefault(f.model(), Double.NaN) : Double.NaN));
            o.addProperty("weight_criterion", outcome.criterion());
            if (outcome.noiseModel() != null) {
                o.add("noise_model", noiseModel(outcome.noiseModel()));
            }
            return o;
        }).toList();
    }

    /** One fit. */
    public static JsonObject fit(FitResult f) {
        JsonObject o = new JsonObject();
        o.addProperty("model", f.model());
        o.addProperty("converged", f.converged());
        if (!f.converged()) {
            o.addProperty("reason", f.reason());
        }
        o.add("aic", number(f.converged() ? f.aic() : Double.NaN));
        o.add("aicc", number(f.converged() ? f.aicc() : Double.NaN));
        o.add("bic", number(f.converged() ? f.bic() : Double.NaN));
        o.add("rmse", number(f.converged() ? f.rmse() : Double.NaN));
        o.addProperty("points", f.pointsUsed());
        if (f.converged()) {
            o.add("parameters", estimates(f.parameters()));
            o.add("derived", estimates(f.derived()));
        } else {
            o.add("parameters", new JsonObject());
        }
        JsonArray w = new JsonArray();
        f.warnings().forEach(w::add);
        o.add("warnings", w);
        return o;
    }

    private static JsonObject estimates(List<ParameterEstimate> list) {
        JsonObject o = new JsonObject();
        for (ParameterEstimate e : list) {
            JsonObject p = new JsonObject();
            p.add("value", number(e.value()));
            p.addProperty("unit", e.unit().symbol());
            p.add("ci95", interval(e.ci95()));
            p.add("ci_method", e.ci95() == null ? JsonNull.INSTANCE : new JsonPrimitive(e.ci95().method()));
            if (e.ci95() != null && !e.ci95().note().isEmpty()) {
                p.addProperty("ci_note", e.ci95().note());
            }
            p.add("standard_error", number(e.standardError()));
            p.addProperty("identifiable", e.identifiable());
            if (e.atBound()) {
                p.addProperty("at_bound", true);
            }
            if (!e.otherIntervals().isEmpty()) {
                JsonArray others = new JsonArray();
                for (Interval i : e.otherIntervals()) {
                    JsonObject io = new JsonObject();
                    io.add("ci95", interval(i));
                    io.addProperty("ci_method", i.method());
                    if (!i.note().isEmpty()) {
                        io.addProperty("ci_note", i.note());
                    }
                    others.add(io);
                }
                p.add("other_intervals", others);
            }
            o.add(e.name(), p);
        }
        return o;
    }

    /** The weights' noise model: the signal-dependent gain g with its standard error, and a sentence. */
    private static JsonObject noiseModel(VarianceModel m) {
        JsonObject o = new JsonObject();
        o.addProperty("signal_dependent", m.signalDependent());
        o.add("signal_gain", number(m.gain()));
        o.add("signal_gain_se", number(m.gainStandardError()));
        o.addProperty("description", m.describe());
        return o;
    }

    private static JsonElement interval(Interval i) {
        if (i == null) {
            return JsonNull.INSTANCE;
        }
        JsonArray a = new JsonArray();
        a.add(number(i.lower()));
        a.add(number(i.upper()));
        return a;
    }

    static JsonElement number(double v) {
        return Double.isFinite(v) ? new JsonPrimitive(v) : JsonNull.INSTANCE;
    }
}
