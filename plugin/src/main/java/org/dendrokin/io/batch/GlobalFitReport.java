package org.dendrokin.io.batch;

import static org.dendrokin.io.text.Html.esc;

import java.nio.file.Path;
import java.util.List;
import java.util.Locale;
import java.util.Optional;

import org.dendrokin.core.fit.GlobalFit;
import org.dendrokin.core.fit.Interval;
import org.dendrokin.core.fit.ParameterEstimate;
import org.dendrokin.io.AtomicFiles;
import org.dendrokin.io.plot.Pictures;
import org.dendrokin.io.plot.SharedEstimatePlot;
import org.dendrokin.io.text.Numbers;

/**
 * The joint fit in HTML: a section for the batch's index.html (shared constants per group with both intervals, the
 * group comparisons, a picture per constant of the sessions' own values beside the shared one, and the sessions left
 * out with the reason), or the same section as a page of its own. The pictures go to {@code plots/} beside the page.
 */
final class GlobalFitReport {
    static final String PAGE = "global-fit.html";

    private GlobalFitReport() {
    }

    /** Writes the pictures under {@code out/plots} and returns the section, with links relative to {@code out}. */
    static String section(Path out, GlobalFitStudy.Outcome o) {
        StringBuilder html = new StringBuilder();
        html.append("<h2 id=\"global-fit\">Shared constants: one fit of all sessions per group</h2>\n")
                .append("<p>Model ").append(esc(o.request().model())).append(", signal in ").append(esc(o.unit()))
                .append(". Each group's D and k were fitted to all of its sessions at once; each session kept its own ")
                .append("amplitude, width, baseline and noise level, and weighs by its own noise. The interval given ")
                .append("is the wider of the profile-likelihood interval (which takes the constant as exactly shared) ")
                .append("and the bootstrap over sessions (which also sees how much the sessions differ); both are in ")
                .append("<a href=\"").append(esc(GlobalFitStudy.FILE)).append("\">").append(esc(GlobalFitStudy.FILE))
                .append("</a>.</p>\n");
        o.warnings().forEach(w -> html.append("<p class=\"failed\">").append(esc(w)).append("</p>\n"));
        html.append("<table><tr><th>group</th><th>sessions</th>");
        for (String c : GlobalFit.SHARED) {
            html.append("<th>").append(esc(c)).append(" (95% interval, method)</th><th>").append(esc(c))
                    .append(" profile</th><th>").append(esc(c)).append(" bootstrap</th>");
        }
        html.append("</tr>\n");
        for (GlobalFit.GroupResult g : o.result().groups()) {
            long used = o.sessions().stream().filter(s -> s.used() && s.group().equals(g.group())).count();
            html.append("<tr><td>").append(esc(g.group())).append("</td><td class=\"num\">").append(used)
                    .append("</td>");
            if (!g.converged()) {
                html.append("<td colspan=\"").append(3 * GlobalFit.SHARED.size()).append("\" class=\"failed\">")
                        .append("no joint fit: ").append(esc(g.reason())).append("</td></tr>\n");
                continue;
            }
            for (String c : GlobalFit.SHARED) {
                ParameterEstimate e = g.estimate(c).orElseThrow();
                html.append("<td class=\"num\">").append(Numbers.forPeople(e.value())).append(" ")
                        .append(interval(e.ci95())).append(" ").append(esc(e.unit().symbol())).append(", ")
                        .append(esc(e.ci95().method())).append("</td><td class=\"num\">")
                        .append(interval(find(e, Interval.PROFILE))).append("</td><td class=\"num\">")
                        .append(interval(find(e, GlobalFit.BOOTSTRAP))).append("</td>");
            }
            html.append("</tr>\n");
        }
        html.append("</table>\n");
        for (GlobalFit.GroupResult g : o.result().groups()) {
            if (!g.warnings().isEmpty()) {
                html.append("<p>").append(esc(g.group())).append(": ").append(esc(String.join(" ", g.warnings())))
                        .append("</p>\n");
            }
        }
        if (!o.result().comparisons().isEmpty()) {
            html.append("<h3>Do the groups differ?</h3>\n<p>Likelihood-ratio test of each constant: the groups fitted ")
                    .append("with the constant in common against fitted apart (chi-square, 1 degree of freedom), and ")
                    .append("the difference with its interval. A difference is called real when the test and the ")
                    .append("bootstrap over sessions both reject equality at 5%, i.e. when the interval given excludes ")
                    .append("0.")
                    .append("</p>\n<table><tr><th>groups</th><th>constant</th><th>difference (95% interval)</th>")
                    .append("<th>likelihood ratio</th><th>p</th><th>p (bootstrap)</th><th>differ?</th></tr>\n");
            for (GlobalFit.Comparison c : o.result().comparisons()) {
                ParameterEstimate d = c.difference();
                html.append("<tr><td>").append(esc(c.groupB())).append(" minus ").append(esc(c.groupA()))
                        .append("</td><td>").append(esc(c.constant())).append("</td><td class=\"num\">")
                        .append(d == null ? "" : Numbers.forPeople(d.value()) + " " + interval(d.ci95()) + " "
                                + esc(d.unit().symbol()))
                        .append("</td><td class=\"num\">").append(cell(c.statistic())).append("</td><td class=\"num\">")
                        .append(p(c.pValue())).append("</td><td class=\"num\">").append(p(c.pValueBootstrap()))
                        .append("</td><td>").append(c.differs() ? "yes" : "no").append("</td></tr>\n");
            }
            html.append("</table>\n");
            o.result().comparisons().stream().flatMap(c -> c.warnings().stream()).distinct()
                    .forEach(w -> html.append("<p>").append(esc(w)).append("</p>\n"));
        }
        html.append("<div class=\"pair\">");
        for (String c : GlobalFit.SHARED) {
            String png = "plots/global-" + c + ".png";
            picture(o, c).map(p -> {
                Pictures.savePng(p.render(Math.max(620, 190 * o.result().groups().size() + 130), 400),
                        out.resolve(png));
                return png;
            }).ifPresent(f -> html.append("<div><img src=\"").append(esc(f)).append("\" alt=\"").append(esc(c))
                    .append(" of each session beside the shared ").append(esc(c)).append("\"></div>"));
        }
        html.append("</div>\n");
        List<GlobalFitStudy.SessionInput> left = o.sessions().stream().filter(s -> !s.used()).toList();
        if (!left.isEmpty()) {
            html.append("<h3>Sessions left out of the joint fit</h3>\n<table><tr><th>session</th><th>group</th>")
                    .append("<th>why</th></tr>\n");
            for (GlobalFitStudy.SessionInput s : left) {
                html.append("<tr><td>").append(esc(s.id())).append("</td><td>").append(esc(s.group()))
                        .append("</td><td>").append(esc(s.excluded())).append("</td></tr>\n");
            }
            html.append("</table>\n");
        }
        return html.toString();
    }

    /** The section as a page of its own, {@code out/global-fit.html}. */
    static Path page(Path out, GlobalFitStudy.Outcome o) {
        String body = section(out, o);
        String html = "<!DOCTYPE html>\n<html lang=\"en\"><head><meta charset=\"utf-8\">\n<title>Global fit</title>\n"
                + "<style>body{font-family:sans-serif;margin:24px;max-width:1400px}"
                + "table{border-collapse:collapse;margin:8px 0 20px}td,th{border:1px solid #ccc;padding:3px 7px;"
                + "text-align:left;vertical-align:top;font-size:13px}th{background:#f1f1f1}.failed{color:#a01818}"
                + ".num{text-align:right;font-variant-numeric:tabular-nums}"
                + ".pair{display:flex;flex-wrap:wrap;gap:24px;align-items:flex-start}</style></head><body>\n"
                + body + "</body></html>\n";
        Path page = out.resolve(PAGE);
        AtomicFiles.writeString(page, html);
        return page;
    }

    /** The picture of one constant, or empty when no group converged. */
    private static Optional<SharedEstimatePlot> picture(GlobalFitStudy.Outcome o, String constant) {
        SharedEstimatePlot plot = null;
        for (GlobalFit.GroupResult g : o.result().groups()) {
            if (!g.converged()) {
                continue;
            }
            ParameterEstimate e = g.estimate(constant).orElseThrow();
            if (plot == null) {
                plot = new SharedEstimatePlot(constant + ": sessions' own fits and the shared value",
                        constant + " (" + e.unit().symbol() + ")");
            }
            List<GlobalFitStudy.SessionInput> in = o.sessions().stream()
                    .filter(s -> s.used() && s.group().equals(g.group())).toList();
            double[] v = in.stream().mapToDouble(s -> s.own(constant)[0]).toArray();
            double[] lo = in.stream().mapToDouble(s -> s.own(constant)[1]).toArray();
            double[] hi = in.stream().mapToDouble(s -> s.own(constant)[2]).toArray();
            plot.group(g.group(), v, lo, hi, e.value(), e.ci95().lower(), e.ci95().upper());
        }
        return Optional.ofNullable(plot);
    }

    private static Interval find(ParameterEstimate e, String method) {
        if (e.ci95() != null && e.ci95().method().equals(method)) {
            return e.ci95();
        }
        return e.otherIntervals().stream().filter(i -> i.method().equals(method)).findFirst().orElse(null);
    }

    private static String interval(Interval i) {
        if (i == null) {
            return "";
        }
        return "[" + end(i.lower()) + ", " + end(i.upper()) + "]";
    }

    private static String end(double v) {
        return Double.isFinite(v) ? Numbers.forPeople(v) : "open";
    }

    private static String cell(double v) {
        return Double.isFinite(v) ? Numbers.forPeople(v) : "";
    }

    private static String p(double v) {
        if (!Double.isFinite(v)) {
            return "";
        }
        return v < 1e-4 ? "&lt; 0.0001" : String.format(Locale.ROOT, "%.4f", v);
    }
}
