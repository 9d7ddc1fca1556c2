package org.dendrokin.io.batch;

import java.util.List;

import com.google.gson.GsonBuilder;
import com.google.gson.JsonArray;
import com.google.gson.JsonElement;
import com.google.gson.JsonNull;
import com.google.gson.JsonObject;
import com.google.gson.JsonPrimitive;

import org.dendrokin.core.fit.GlobalFit;
import org.dendrokin.core.fit.Interval;
import org.dendrokin.core.fit.ParameterEstimate;
import org.dendrokin.io.AtomicFiles;
import org.dendrokin.io.ToolVersion;

/**
 * Writes {@code global-fit.json}, the one place that knows its layout:
 * <pre>
 *   {"tool_version", "model", "signal_unit", "shared": ["D", "k"], "interval_rule", "bootstrap_replicates", "seed",
 *    "groups": [{"group", "converged", "reason", "sessions_used", "points",
 *                "shared": {NAME: {"value", "unit", "ci95": [lo, hi], "ci_method", "standard_error", "identifiable",
 *                                  "other_intervals": [{"ci95", "ci_method"}]}},
 *                "sessions": [{"session", "noise_sd", "noise_scale", "points", "parameters": {NAME: {...}},
 *                              "own_fit": {"D": {"value", "ci95"}, "k": {...}}}],
 *                "warnings": [...]}],
 *    "comparisons": [{"groups": [A, B], "constant", "difference_of": "B minus A", "likelihood_ratio", "p_value",
 *                     "p_value_bootstrap", "differs", "difference": {...}, "warnings": [...]}],
 *    "excluded": [{"session", "group", "reason"}], "warnings": [...]}
 * </pre>
 * Non-finite numbers and open interval ends are written as null.
 */
final class GlobalFitJson {
    private GlobalFitJson() {
    }

    static void write(GlobalFitStudy.Outcome o) {
        JsonObject root = new JsonObject();
        root.addProperty("tool_version", ToolVersion.get());
        root.addProperty("model", o.request().model());
        root.addProperty("signal_unit", o.unit());
        JsonArray shared = new JsonArray();
        GlobalFit.SHARED.forEach(shared::add);
        root.add("shared", shared);
        root.addProperty("interval_rule", "ci95 is the wider of the profile-likelihood interval and the bootstrap over "
                + "sessions; both are listed, with the Wald-t interval");
        root.addProperty("bootstrap_replicates", o.request().bootstrapReplicates());
        root.addProperty("seed", o.request().seed());
        JsonArray groups = new JsonArray();
        for (GlobalFit.GroupResult g : o.result().groups()) {
            groups.add(group(g, o.sessions()));
        }
        root.add("groups", groups);
        JsonArray comparisons = new JsonArray();
        for (GlobalFit.Comparison c : o.result().comparisons()) {
            JsonObject x = new JsonObject();
            JsonArray pair = new JsonArray();
            pair.add(c.groupA());
            pair.add(c.groupB());
            x.add("groups", pair);
            x.addProperty("constant", c.constant());
            x.addProperty("difference_of", c.groupB() + " minus " + c.groupA());
            x.add("likelihood_ratio", number(c.statistic()));
            x.add("p_value", number(c.pValue()));
            x.add("p_value_bootstrap", number(c.pValueBootstrap()));
            x.addProperty("differs", c.differs());
            x.add("difference", c.difference() == null ? JsonNull.INSTANCE : estimate(c.difference()));
            x.add("warnings", strings(c.warnings()));
            comparisons.add(x);
        }
        root.add("comparisons", comparisons);
        JsonArray excluded = new JsonArray();
        for (GlobalFitStudy.SessionInput s : o.sessions()) {
            if (!s.used()) {
                JsonObject x = new JsonObject();
                x.addProperty("session", s.id());
                x.addProperty("group", s.group());
                x.addProperty("reason", s.excluded());
                excluded.add(x);
            }
        }
        root.add("excluded", excluded);
        root.add("warnings", strings(o.warnings()));
        AtomicFiles.writeString(o.json(), new GsonBuilder().setPrettyPrinting().serializeNulls().disableHtmlEscaping()
                .create().toJson(root) + "\n");
    }

    private static JsonObject group(GlobalFit.GroupResult g, List<GlobalFitStudy.SessionInput> inputs) {
        JsonObject x = new JsonObject();
        x.addProperty("group", g.group());
        x.addProperty("converged", g.converged());
        x.add("reason", g.converged() ? JsonNull.INSTANCE : new JsonPrimitive(g.reason()));
        x.addProperty("sessions_used", inputs.stream().filter(s -> s.used() && s.group().equals(g.group())).count());
        x.addProperty("points", g.points());
        JsonObject shared = new JsonObject();
        for (ParameterEstimate e : g.shared()) {
            shared.add(e.name(), estimate(e));
        }
        x.add("shared", shared);
        JsonArray sessions = new JsonArray();
        for (GlobalFit.SessionEstimate s : g.sessions()) {
            JsonObject so = new JsonObject();
            so.addProperty("session", s.id());
            so.add("noise_sd", number(s.noiseSd()));
            so.add("noise_scale", number(s.noiseScale()));
            so.addProperty("points", s.points());
            JsonObject p = new JsonObject();
            for (ParameterEstimate e : s.parameters()) {
                p.add(e.name(), estimate(e));
            }
            so.add("parameters", p);
            GlobalFitStudy.SessionInput in = inputs.stream().filter(i -> i.id().equals(s.id())).findFirst()
                    .orElseThrow();
            JsonObject own = new JsonObject();
            for (String name : GlobalFit.SHARED) {
                double[] v = in.own(name);
                JsonObject e = new JsonObject();
                e.add("value", number(v[0]));
                e.add("ci95", pair(v[1], v[2]));
                own.add(name, e);
            }
            so.add("own_fit", own);
            sessions.add(so);
        }
        x.add("sessions", sessions);
        x.add("warnings", strings(g.warnings()));
        return x;
    }

    private static JsonObject estimate(ParameterEstimate e) {
        JsonObject p = new JsonObject();
        p.add("value", number(e.value()));
        p.addProperty("unit", e.unit().symbol());
        p.add("ci95", interval(e.ci95()));
        p.add("ci_method", e.ci95() == null ? JsonNull.INSTANCE : new JsonPrimitive(e.ci95().method()));
        p.add("standard_error", number(e.standardError()));
        p.addProperty("identifiable", e.identifiable());
        if (!e.otherIntervals().isEmpty()) {
            JsonArray others = new JsonArray();
            for (Interval i : e.otherIntervals()) {
                JsonObject io = new JsonObject();
                io.add("ci95", interval(i));
                io.addProperty("ci_method", i.method());
                others.add(io);
            }
            p.add("other_intervals", others);
        }
        return p;
    }

    private static JsonElement interval(Interval i) {
        return i == null ? JsonNull.INSTANCE : pair(i.lower(), i.upper());
    }

    private static JsonArray pair(double lo, double hi) {
        JsonArray a = new JsonArray();
        a.add(number(lo));
        a.add(number(hi));
        return a;
    }

    private static JsonArray strings(List<String> list) {
        JsonArray a = new JsonArray();
        list.forEach(a::add);
        return a;
    }

    private static JsonElement number(double v) {
        return Double.isFinite(v) ? new JsonPrimitive(v) : JsonNull.INSTANCE;
    }
}
