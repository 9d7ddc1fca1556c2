package org.dendrokin.io.fit;

import java.util.List;
import java.util.Locale;

import org.dendrokin.core.analysis.SkippedModel;
import org.dendrokin.core.fit.FitResult;
import org.dendrokin.core.fit.Interval;
import org.dendrokin.core.fit.KymographFits;
import org.dendrokin.core.fit.Misfit;
import org.dendrokin.core.fit.ParameterEstimate;
import org.dendrokin.io.text.Html;
import org.dendrokin.io.text.Numbers;

/**
 * The report's model-fit section: a comparison table (criteria, Akaike
 * weights, RMS residual), then one table per converged model with every parameter, its unit, its 95% interval
 * and the method that made it, the quantities derived from them, and the fit's warnings in plain words.
 */
public final class FitReportHtml {
    private FitReportHtml() {
    }

    /**
     * The HTML of the section (an h2 and what follows).
     *
     * @param outcome the fits and their comparison, or null when none ran
     * @param skipped models not fitted because the data do not call for them
     */
    public static String section(KymographFits.Outcome outcome, List<SkippedModel> skipped) {
        StringBuilder h = new StringBuilder("<h2>Model fits</h2>\n");
        if (outcome == null || outcome.fits().isEmpty()) {
            return h.append("<p>No reaction-diffusion model was fitted in this run; the numbers above do not depend on "
                    + "any model.</p>\n").toString();
        }
        String bestModel = outcome.bestModel();
        h.append("<p>Each model was fitted by weighted least squares (weights from the noise of each position's "
                + "baseline frames). Lower AIC, AICc and BIC are better; the Akaike weight (from ")
                .append(esc(outcome.criterion().toUpperCase(Locale.ROOT).replace("AICC", "AICc")))
                .append(") is the relative support for each model among those listed. ")
                .append(bestModel == null ? "No fit converged, so no model is preferred."
                        : "Preferred: <b>" + esc(bestModel) + "</b>.")
                .append("</p>\n");
        h.append("<table>\n<tr><th>Model</th><th>Converged</th><th>AIC</th><th>AICc</th><th>BIC</th>"
                + "<th>Akaike weight</th><th>RMS residual</th><th>Residuals</th></tr>\n");
        for (FitResult f : outcome.fits()) {
            boolean ok = f.converged();
            double weight = ok ? outcome.weights().getOrDefault(f.model(), Double.NaN) : Double.NaN;
            h.append("<tr><td>").append(esc(f.model())).append(f.model().equals(bestModel) ? " (preferred)" : "")
                    .append("</td><td>").append(ok ? "yes" : "no: " + esc(f.reason()))
                    .append("</td><td>").append(num(ok ? f.aic() : Double.NaN)).append("</td><td>")
                    .append(num(ok ? f.aicc() : Double.NaN)).append("</td><td>").append(num(ok ? f.bic() : Double.NaN))
                    .append("</td><td>").append(num(weight)).append("</td><td>").append(num(ok ? f.rmse() : Double.NaN))
                    .append("</td><td>").append(outcome.misfit(f.model()).map(FitReportHtml::residuals).orElse(""))
                    .append("</td></tr>\n");
        }
        for (SkippedModel m : skipped) {
            h.append("<tr><td>").append(esc(m.model())).append("</td><td colspan=\"7\">not tried: ")
                    .append(esc(m.reason())).append("</td></tr>\n");
        }
        h.append("</table>\n");
        for (FitResult f : outcome.fits()) {
            if (!f.converged()) {
                continue;
            }
            h.append("<h3>").append(esc(f.model())).append("</h3>\n<table>\n<tr><th>Quantity</th><th>Value</th>"
                    + "<th>Unit</th><th>95% interval</th><th>Interval made by</th><th>Determined by the data</th>"
                    + "</tr>\n");
            rows(h, f.parameters());
            rows(h, f.derived());
            h.append("</table>\n");
            outcome.misfit(f.model()).ifPresent(m -> h.append("<p>").append(esc(m.sentence(f.model())))
                    .append("</p>\n"));
            if (!f.warnings().isEmpty()) {
                h.append("<div class=\"warn\"><ul>\n");
                for (String w : f.warnings()) {
                    h.append("<li>").append(esc(w)).append("</li>\n");
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

    /** The residual verdict for the comparison table: the verdict, the figure and, when structured, where. */
    private static String residuals(Misfit.Result m) {
        String text = m.verdict().label() + String.format(Locale.ROOT, " (%.2f)", m.temporalCorrelation());
        if (m.pattern() != Misfit.Pattern.NONE) {
            text += ": " + m.pattern().label();
        }
        return m.verdict() == Misfit.Verdict.MISFIT ? "<b>" + esc(text) + "</b>" : esc(text);
    }

    private static void rows(StringBuilder h, List<ParameterEstimate> estimates) {
        for (ParameterEstimate p : estimates) {
            Interval i = p.ci95();
            String ci = i == null ? "" : end(i.lower(), "-infinity") + " to " + end(i.upper(), "infinity");
            StringBuilder others = new StringBuilder();
            for (Interval o : p.otherIntervals()) {
                others.append("<br><small>").append(esc(o.method())).append(": ")
                        .append(end(o.lower(), "-infinity")).append(" to ").append(end(o.upper(), "infinity"))
                        .append("</small>");
            }
            h.append("<tr><td>").append(esc(p.name())).append("</td><td>").append(num(p.value()))
                    .append("</td><td>").append(esc(p.unit().symbol())).append("</td><td>").append(ci)
                    .append("</td><td>").append(i == null ? "" : esc(i.method())).append(others).append("</td><td>")
                    .append(p.identifiable() ? "yes" : "<b>no</b>").append("</td></tr>\n");
        }
    }

    private static String end(double v, String open) {
        return Double.isFinite(v) ? num(v) : "(open: " + open + ")";
    }

    private static String num(double v) {
        return Double.isFinite(v) ? Numbers.forPeople(v) : "";
    }

    private static String esc(String s) {
        return Html.esc(s);
    }
}
