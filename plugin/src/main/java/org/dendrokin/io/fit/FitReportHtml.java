package org.dendrokin.io.fit;

import java.util.List;
import java.util.Locale;
import java.util.Map;

import com.google.gson.JsonArray;
import com.google.gson.JsonElement;
import com.google.gson.JsonObject;

/**
 * The report's model-fit section, from the results.json fit objects: a comparison table (criteria, Akaike
 * weights, RMS residual), then one table per converged model with every parameter, its unit, its 95% interval
 * and the method that made it, the quantities derived from them, and the fit's warnings in plain words.
 */
public final class FitReportHtml {
    private FitReportHtml() {
    }

    /** The HTML of the section (an h2 and what follows). */
    public static String section(List<JsonObject> fits, String bestModel) {
        StringBuilder h = new StringBuilder("<h2>Model fits</h2>\n");
        if (fits.isEmpty()) {
            return h.append("<p>No reaction-diffusion model was fitted in this run; the numbers above do not depend on "
                    + "any model.</p>\n").toString();
        }
        String criterion = fits.get(0).has("weight_criterion") ? fits.get(0).get("weight_criterion").getAsString()
                : "aicc";
        h.append("<p>Each model was fitted by weighted least squares (weights from the noise of each position's "
                + "baseline frames). Lower AIC, AICc and BIC are better; the Akaike weight (from ")
                .append(esc(criterion.toUpperCase(Locale.ROOT).replace("AICC", "AICc")))
                .append(") is the relative support for each model among those listed. ")
                .append(bestModel == null ? "No fit converged, so no model is preferred."
                        : "Preferred: <b>" + esc(bestModel) + "</b>.")
                .append("</p>\n");
        h.append("<table>\n<tr><th>Model</th><th>Converged</th><th>AIC</th><th>AICc</th><th>BIC</th>"
                + "<th>Akaike weight</th><th>RMS residual</th></tr>\n");
        for (JsonObject f : fits) {
            String name = str(f, "model");
            boolean ok = f.has("converged") && f.get("converged").getAsBoolean();
            h.append("<tr><td>").append(esc(name)).append(name.equals(bestModel) ? " (preferred)" : "")
                    .append("</td><td>").append(ok ? "yes" : "no: " + esc(str(f, "reason")))
                    .append("</td><td>").append(num(f.get("aic"))).append("</td><td>").append(num(f.get("aicc")))
                    .append("</td><td>").append(num(f.get("bic"))).append("</td><td>")
                    .append(num(f.get("akaike_weight"))).append("</td><td>").append(num(f.get("rmse")))
                    .append("</td></tr>\n");
        }
        h.append("</table>\n");
        for (JsonObject f : fits) {
            if (!f.has("converged") || !f.get("converged").getAsBoolean()) {
                continue;
            }
            h.append("<h3>").append(esc(str(f, "model"))).append("</h3>\n<table>\n<tr><th>Quantity</th><th>Value</th>"
                    + "<th>Unit</th><th>95% interval</th><th>Interval made by</th><th>Determined by the data</th>"
                    + "</tr>\n");
            rows(h, f.getAsJsonObject("parameters"));
            if (f.has("derived")) {
                rows(h, f.getAsJsonObject("derived"));
            }
            h.append("</table>\n");
            JsonArray w = f.has("warnings") ? f.getAsJsonArray("warnings") : new JsonArray();
            if (!w.isEmpty()) {
                h.append("<div class=\"warn\"><ul>\n");
                for (JsonElement e : w) {
                    h.append("<li>").append(esc(e.getAsString())).append("</li>\n");
                }
                h.append("</ul></div>\n");
            }
        }
        h.append("<p class=\"caution\">Intervals: <i>profile-likelihood</i> (where the fit gets significantly worse "
                + "as the value is moved, the others refitted; can be asymmetric and is the one to quote), "
                + "<i>wald-t</i> (estimate plus or minus Student t standard errors on the fitted scale), "
                + "<i>delta-method</i> (for quantities computed from the parameters), <i>parametric-bootstrap</i> "
                + "(2.5th to 97.5th percentile of refits to simulated data, when session.json asks for replicates; "
                + "shown in small type under the method). A quantity marked "
                + "\"no\" under \"Determined by the data\" should not be quoted; the warnings say why.</p>\n");
        return h.toString();
    }

    private static void rows(StringBuilder h, JsonObject params) {
        for (Map.Entry<String, JsonElement> e : params.entrySet()) {
            JsonObject p = e.getValue().getAsJsonObject();
            String ci = "";
            if (p.has("ci95") && p.get("ci95").isJsonArray()) {
                JsonArray a = p.getAsJsonArray("ci95");
                ci = end(a.get(0), "-infinity") + " to " + end(a.get(1), "infinity");
            }
            StringBuilder others = new StringBuilder();
            if (p.has("other_intervals") && p.get("other_intervals").isJsonArray()) {
                for (JsonElement o : p.getAsJsonArray("other_intervals")) {
                    JsonObject io = o.getAsJsonObject();
                    JsonArray a = io.getAsJsonArray("ci95");
                    others.append("<br><small>").append(esc(str(io, "ci_method"))).append(": ")
                            .append(end(a.get(0), "-infinity")).append(" to ").append(end(a.get(1), "infinity"))
                            .append("</small>");
                }
            }
            boolean id = !p.has("identifiable") || p.get("identifiable").getAsBoolean();
            h.append("<tr><td>").append(esc(e.getKey())).append("</td><td>").append(num(p.get("value")))
                    .append("</td><td>").append(esc(str(p, "unit"))).append("</td><td>").append(ci)
                    .append("</td><td>").append(esc(str(p, "ci_method"))).append(others).append("</td><td>")
                    .append(id ? "yes" : "<b>no</b>").append("</td></tr>\n");
        }
    }

    private static String end(JsonElement e, String open) {
        return e == null || e.isJsonNull() ? "(open: " + open + ")" : num(e);
    }

    private static String num(JsonElement e) {
        if (e == null || e.isJsonNull()) {
            return "";
        }
        return String.format(Locale.ROOT, "%.4g", e.getAsDouble());
    }

    private static String str(JsonObject o, String key) {
        return o.has(key) && !o.get(key).isJsonNull() ? o.get(key).getAsString() : "";
    }

    private static String esc(String s) {
        return s.replace("&", "&amp;").replace("<", "&lt;").replace(">", "&gt;").replace("\"", "&quot;");
    }
}
