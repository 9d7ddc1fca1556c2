package org.dendrokin.io.batch;

import static org.dendrokin.io.text.Html.esc;

import java.io.IOException;
import java.nio.file.DirectoryStream;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.TreeMap;

import org.dendrokin.core.stats.GroupComparison;
import org.dendrokin.core.stats.GroupSummary;
import org.dendrokin.io.AtomicFiles;
import org.dendrokin.io.plot.Pictures;
import org.dendrokin.io.plot.StripPlot;
import org.dendrokin.io.text.Numbers;

/**
 * Writes a batch's {@code summary.csv}, the group pictures in {@code plots/} and {@code index.html}: the
 * group comparisons of every quantity (per-group n, mean, SD, median, 95% interval; between each pair of
 * groups Hedges' g, Welch's t test and the Mann-Whitney test), then the table of sessions with thumbnails
 * of each session's pictures linking to its own report.
 */
public final class BatchReport {
    static final String NO_GROUP = "(no group)";

    private BatchReport() {
    }

    /** Paths of what was written. */
    public record Files(Path summary, Path index) {
    }

    /** Writes the summary and the report for the sessions {@code ids} whose results are under {@code out}. */
    public static Files write(Path out, List<String> ids) {
        return write(out, ids, null);
    }

    /**
     * Writes the summary and the report, with the section of a joint fit of the sessions when {@code global} is not
     * null (its pictures go to {@code plots/} too).
     */
    public static Files write(Path out, List<String> ids, GlobalFitStudy.Outcome global) {
        SummaryTable table = SummaryTable.read(out, ids);
        Path summary = out.resolve("summary.csv");
        table.writeCsv(summary);
        StringBuilder html = new StringBuilder();
        html.append("<!DOCTYPE html>\n<html lang=\"en\"><head><meta charset=\"utf-8\">\n<title>Batch report</title>\n")
                .append("<style>body{font-family:sans-serif;margin:24px;max-width:1400px}")
                .append("table{border-collapse:collapse;margin:8px 0 20px}td,th{border:1px solid #ccc;padding:3px 7px;")
                .append("text-align:left;vertical-align:top;font-size:13px}th{background:#f1f1f1}")
                .append(".failed,.error,.missing{color:#a01818}.num{text-align:right;font-variant-numeric:tabular-nums}")
                .append("img.thumb{width:180px;border:1px solid #ddd;margin:0 4px 4px 0}")
                .append(".pair{display:flex;flex-wrap:wrap;gap:24px;align-items:flex-start}</style></head><body>\n");
        List<SummaryTable.SessionEntry> entries = table.entries();
        long ok = entries.stream().filter(e -> "ok".equals(e.status())).count();
        html.append("<h1>Batch report</h1>\n<p>").append(entries.size()).append(" sessions: ").append(ok)
                .append(" analysed, ").append(entries.size() - ok).append(" failed or missing. Tool version ")
                .append(esc(SessionRecord.currentToolVersion())).append(". The full table, with every fitted parameter, ")
                .append("its 95% interval and the input hashes, is in <a href=\"summary.csv\">summary.csv</a>.</p>\n");
        if (global != null) {
            html.append(GlobalFitReport.section(out, global));
        }
        groupSection(html, out, table);
        sessionSection(html, out, table);
        html.append("</body></html>\n");
        Path index = out.resolve("index.html");
        AtomicFiles.writeString(index, html.toString());
        return new Files(summary, index);
    }

    private static void groupSection(StringBuilder html, Path out, SummaryTable table) {
        html.append("<h2>Across sessions, by group</h2>\n");
        if (table.quantities().isEmpty()) {
            html.append("<p>No session gave a fitted parameter or spread measure yet.</p>\n");
            return;
        }
        html.append("<p>Groups come from the <code>group</code> key of each session.json. Only sessions that were ")
                .append("analysed, and fits that converged, count. p values are two-sided and not corrected for ")
                .append("the number of comparisons; with few sessions per group, read the effect size and the ")
                .append("picture rather than the p value.</p>\n");
        Map<String, Long> units = table.entries().stream().filter(e -> e.results() != null)
                .map(e -> e.results().has("signal_unit") ? e.results().get("signal_unit").getAsString() : "")
                .collect(java.util.stream.Collectors.groupingBy(u -> u, TreeMap::new,
                        java.util.stream.Collectors.counting()));
        if (units.size() > 1) {
            html.append("<p><b>The sessions were analysed in different signal units</b> (")
                    .append(esc(units.entrySet().stream().map(e -> e.getValue() + " in " + e.getKey())
                            .collect(java.util.stream.Collectors.joining(", "))))
                    .append("). A quantity in the signal's unit, such as an amplitude or a baseline, is listed and ")
                    .append("compared separately for each unit and never pooled across them; D, k and the other ")
                    .append("constants carry their own units.</p>\n");
        }
        Map<String, String> groupOf = new TreeMap<>();
        for (SummaryTable.SessionEntry e : table.entries()) {
            groupOf.put(e.id(), e.group().isEmpty() ? NO_GROUP : e.group());
        }
        int figure = 0;
        for (SummaryTable.Quantity q : table.quantities()) {
            Map<String, List<Double>> byGroup = new TreeMap<>();
            q.values().forEach((id, v) -> byGroup.computeIfAbsent(groupOf.getOrDefault(id, NO_GROUP),
                    g -> new ArrayList<>()).add(v));
            StripPlot plot = new StripPlot(q.label().replace('_', ' ') + ", one value per session",
                    q.title().replace('_', ' '));
            html.append("<h3>").append(esc(q.title().replace('_', ' '))).append("</h3>\n<div class=\"pair\"><div>");
            html.append("<table><tr><th>group</th><th>n</th><th>mean</th><th>SD</th><th>median</th>")
                    .append("<th>95% interval of the mean</th></tr>\n");
            for (Map.Entry<String, List<Double>> g : byGroup.entrySet()) {
                double[] v = g.getValue().stream().mapToDouble(Double::doubleValue).toArray();
                GroupSummary s = GroupSummary.of(v);
                plot.group(g.getKey(), v, s.mean(), s.ciLow(), s.ciHigh());
                html.append("<tr><td>").append(esc(g.getKey())).append("</td><td class=\"num\">").append(s.n())
                        .append("</td><td class=\"num\">").append(cell(s.mean())).append("</td><td class=\"num\">")
                        .append(cell(s.sd())).append("</td><td class=\"num\">").append(cell(s.median()))
                        .append("</td><td class=\"num\">").append(Double.isFinite(s.ciLow())
                                ? "[" + cell(s.ciLow()) + ", " + cell(s.ciHigh()) + "]" : "")
                        .append("</td></tr>\n");
            }
            html.append("</table>\n");
            String png = "plots/" + (++figure) + "-" + slug(q.label()) + ".png";
            Pictures.savePng(plot.render(Math.max(420, 170 * byGroup.size() + 120), 380), out.resolve(png));
            StringBuilder figureHtml = new StringBuilder("<div><img src=\"").append(esc(png)).append("\" alt=\"")
                    .append(esc(q.title())).append(" by group\"></div>");
            List<String> groups = new ArrayList<>(byGroup.keySet());
            if (groups.size() >= 2) {
                html.append("<table><tr><th>comparison</th><th>n</th><th>difference of means</th>")
                        .append("<th>Hedges' g</th><th>Welch t (df)</th><th>p (Welch)</th>")
                        .append("<th>Mann-Whitney U</th><th>p (Mann-Whitney)</th></tr>\n");
                for (int i = 0; i < groups.size(); i++) {
                    for (int j = i + 1; j < groups.size(); j++) {
                        double[] a = byGroup.get(groups.get(i)).stream().mapToDouble(Double::doubleValue).toArray();
                        double[] b = byGroup.get(groups.get(j)).stream().mapToDouble(Double::doubleValue).toArray();
                        GroupComparison c = GroupComparison.of(groups.get(i), a, groups.get(j), b);
                        html.append("<tr><td>").append(esc(c.groupA())).append(" vs ").append(esc(c.groupB()))
                                .append("</td><td class=\"num\">").append(c.nA()).append(" vs ").append(c.nB())
                                .append("</td><td class=\"num\">").append(cell(c.meanA() - c.meanB()))
                                .append("</td><td class=\"num\">").append(cell(c.hedgesG()))
                                .append("</td><td class=\"num\">").append(cell(c.welchT()))
                                .append(Double.isFinite(c.welchDf()) ? " (" + cell(c.welchDf()) + ")" : "")
                                .append("</td><td class=\"num\">").append(p(c.welchP()))
                                .append("</td><td class=\"num\">").append(cell(c.mannWhitneyU()))
                                .append("</td><td class=\"num\">").append(p(c.mannWhitneyP())).append("</td></tr>\n");
                    }
                }
                html.append("</table>\n");
                if (byGroup.values().stream().anyMatch(v -> v.size() < 2)) {
                    html.append("<p>Empty cells: a group has fewer than two sessions.</p>\n");
                }
            }
            html.append("</div>").append(figureHtml).append("</div>\n");
        }
    }

    private static void sessionSection(StringBuilder html, Path out, SummaryTable table) {
        html.append("<h2 id=\"sessions\">Sessions</h2>\n<table><tr><th>session</th><th>group</th><th>status</th>")
                .append("<th>best model</th><th>its parameters (95% interval)</th><th>front speed (95% interval)</th>")
                .append("<th>length constant (95% interval)</th><th>warnings</th><th>kymograph and fits</th></tr>\n");
        Map<String, Map<String, String>> rowsById = new TreeMap<>();
        for (Map<String, String> r : table.rows()) {
            rowsById.put(r.get("session"), r);
        }
        for (SummaryTable.SessionEntry e : table.entries()) {
            Map<String, String> row = rowsById.get(e.id());
            String base = "sessions/" + e.key() + "/";
            Path dir = out.resolve("sessions").resolve(e.key());
            boolean hasReport = java.nio.file.Files.isRegularFile(dir.resolve("report.html"));
            html.append("<tr><td>").append(hasReport ? "<a href=\"" + esc(base + "report.html") + "\">" : "")
                    .append(esc(e.id())).append(hasReport ? "</a>" : "").append("</td><td>").append(esc(e.group()))
                    .append("</td><td class=\"").append(esc(e.status())).append("\">").append(esc(e.status()));
            if (!"ok".equals(e.status())) {
                html.append(": ").append(esc(row.get("error")));
            }
            String best = row.getOrDefault("best_model", "");
            html.append("</td><td>").append(esc(best)).append("</td><td>").append(bestParameters(row, best))
                    .append("</td><td class=\"num\">").append(estimateCell(row, "front_speed"))
                    .append("</td><td class=\"num\">").append(estimateCell(row, "length_constant"))
                    .append("</td><td class=\"num\">").append(esc(row.getOrDefault("warnings", "")))
                    .append("</td><td>");
            for (String png : pictures(dir)) {
                html.append("<a href=\"").append(esc(base + png)).append("\"><img class=\"thumb\" loading=\"lazy\" src=\"")
                        .append(esc(base + png)).append("\" alt=\"").append(esc(png)).append("\"></a>");
            }
            html.append("</td></tr>\n");
        }
        html.append("</table>\n");
    }

    private static String bestParameters(Map<String, String> row, String model) {
        if (model.isEmpty()) {
            return "";
        }
        StringBuilder s = new StringBuilder();
        String prefix = model + " ";
        for (Map.Entry<String, String> c : row.entrySet()) {
            String name = c.getKey();
            if (name.startsWith(prefix) && !name.contains(" ci95 ") && !c.getValue().isEmpty()
                    && !name.endsWith(" converged") && !name.endsWith(" aic") && !name.endsWith(" bic")
                    && !name.endsWith(" rmse")) {
                String rest = name.substring(prefix.length());
                String unit = "";
                int b = rest.indexOf(" [");
                if (b >= 0) {
                    unit = rest.substring(b + 2, rest.length() - 1);
                    rest = rest.substring(0, b);
                }
                String suffix = unit.isEmpty() ? "" : " [" + unit + "]";
                String lo = row.getOrDefault(prefix + rest + " ci95 low" + suffix, "");
                String hi = row.getOrDefault(prefix + rest + " ci95 high" + suffix, "");
                s.append(esc(rest)).append(" = ").append(shortNumber(c.getValue()));
                if (!lo.isEmpty()) {
                    s.append(" (").append(shortNumber(lo)).append(", ").append(shortNumber(hi)).append(")");
                }
                s.append(unit.isEmpty() ? "" : " " + esc(unit)).append("<br>");
            }
        }
        return s.toString();
    }

    private static String estimateCell(Map<String, String> row, String name) {
        for (Map.Entry<String, String> c : row.entrySet()) {
            if ((c.getKey().equals(name) || c.getKey().startsWith(name + " [")) && !c.getValue().isEmpty()) {
                int b = c.getKey().indexOf(" [");
                String unit = b >= 0 ? c.getKey().substring(b + 2, c.getKey().length() - 1) : "";
                String suffix = unit.isEmpty() ? "" : " [" + unit + "]";
                String lo = row.getOrDefault(name + " ci95 low" + suffix, "");
                String hi = row.getOrDefault(name + " ci95 high" + suffix, "");
                return shortNumber(c.getValue()) + (lo.isEmpty() ? "" : " (" + shortNumber(lo) + ", "
                        + shortNumber(hi) + ")") + (unit.isEmpty() ? "" : " " + esc(unit));
            }
        }
        return "";
    }

    /**
     * A number from the table as the session reports write numbers
     * ({@link Numbers#forPeople}); anything else as it is.
     */
    private static String shortNumber(String text) {
        try {
            double v = Double.parseDouble(text);
            return Double.isFinite(v) ? Numbers.forPeople(v) : esc(text);
        } catch (NumberFormatException e) {
            return esc(text);
        }
    }

    /**
     * The pictures shown as thumbnails: the session's kymograph ({@code kymograph.png}) and every picture of a
     * fit (a name containing "fit"); the session's own report shows the rest.
     */
    static List<String> pictures(Path dir) {
        List<String> all = allPictures(dir);
        List<String> shown = new ArrayList<>();
        for (String name : all) {
            if (name.equals("kymograph.png") || name.contains("fit")) {
                shown.add(name);
            }
        }
        if (shown.isEmpty() && !all.isEmpty()) {
            shown.add(all.get(0));
        }
        return shown;
    }

    /** PNG files of a session's results, the kymograph first. */
    static List<String> allPictures(Path dir) {
        List<String> names = new ArrayList<>();
        if (!java.nio.file.Files.isDirectory(dir)) {
            return names;
        }
        try (DirectoryStream<Path> pngs = java.nio.file.Files.newDirectoryStream(dir, "*.png")) {
            pngs.forEach(p -> names.add(p.getFileName().toString()));
        } catch (IOException e) {
            return names;
        }
        names.sort((a, b) -> {
            boolean ka = a.startsWith("kymograph");
            boolean kb = b.startsWith("kymograph");
            return ka == kb ? a.compareTo(b) : ka ? -1 : 1;
        });
        return names;
    }

    /** A statistic for the group tables: as the reports write numbers, and an empty cell when there is none. */
    private static String cell(double v) {
        return Double.isFinite(v) ? Numbers.forPeople(v) : "";
    }

    private static String p(double v) {
        if (!Double.isFinite(v)) {
            return "";
        }
        return v < 1e-4 ? "&lt; 0.0001" : String.format(Locale.ROOT, "%.4f", v);
    }

    private static String slug(String s) {
        return s.toLowerCase(Locale.ROOT).replaceAll("[^a-z0-9]+", "-").replaceAll("(^-|-$)", "");
    }
}
