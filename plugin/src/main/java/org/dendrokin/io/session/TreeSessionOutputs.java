package org.dendrokin.io.session;

import java.nio.file.Path;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;

import org.dendrokin.core.analysis.BranchedPaths;
import org.dendrokin.core.analysis.TreeSessionAnalysis;
import org.dendrokin.core.fit.ParameterEstimate;
import org.dendrokin.core.kymo.Kymograph;
import org.dendrokin.core.model.TreeGeometry;
import org.dendrokin.io.KymographCsv;
import org.dendrokin.io.plot.Picture;
import org.dendrokin.io.plot.Pictures;
import org.dendrokin.io.plot.TreePlot;

import com.google.gson.JsonArray;
import com.google.gson.JsonObject;

/**
 * The outputs of a branched session beside the single-path ones: {@code kymograph-<line>.csv} for every line,
 * {@code tree.png} (peak dF/F0 on the tree laid out by distance from the stimulus), the {@code "tree"} section of
 * results.json (built here, written by {@link ResultsJson}) and the report's section on the tree.
 */
public final class TreeSessionOutputs {
    /** The tree picture's file name. */
    public static final String TREE_PNG = "tree.png";

    private TreeSessionOutputs() {
    }

    /** Writes the per-line kymographs and the tree picture; returns the picture for the report. */
    static List<Picture> write(Path outDir, TreeSessionAnalysis.Result t) {
        for (Map.Entry<String, Kymograph> e : t.kymographs().entrySet()) {
            KymographCsv.write(e.getValue(), outDir.resolve(TreeSession.kymographFile(e.getKey())));
        }
        BranchedPaths layout = t.layout();
        TreeGeometry tree = layout.tree();
        Map<String, List<double[]>> byBranch = new LinkedHashMap<>();
        for (String line : layout.lines()) {
            Kymograph k = t.kymographs().get(line);
            for (int p = 0; p < k.positionCount(); p++) {
                Map.Entry<String, Double> at = layout.locate(line, k.distanceUm(p));
                double peak = Double.NEGATIVE_INFINITY;
                for (int f = 0; f < k.frameCount(); f++) {
                    double v = k.value(f, p);
                    if (Double.isFinite(v)) {
                        peak = Math.max(peak, v);
                    }
                }
                double x = Math.min(at.getValue(), tree.branch(at.getKey()).lengthUm());
                List<double[]> list = byBranch.computeIfAbsent(at.getKey(), b -> new ArrayList<>());
                if (list.isEmpty() || x > list.get(list.size() - 1)[0]) {
                    list.add(new double[] {x, Double.isFinite(peak) ? peak : Double.NaN});
                }
            }
        }
        Map<String, double[]> positions = new LinkedHashMap<>();
        Map<String, double[]> values = new LinkedHashMap<>();
        byBranch.forEach((b, list) -> {
            positions.put(b, list.stream().mapToDouble(v -> v[0]).toArray());
            values.put(b, list.stream().mapToDouble(v -> v[1]).toArray());
        });
        String origin = t.stimulus() != null ? t.stimulus().branch() : tree.branchNames().get(0);
        double originUm = t.stimulus() != null ? t.stimulus().stimulus().positionUm() : 0;
        Pictures.savePng(TreePlot.render(tree, origin, originUm, positions, values,
                "Peak dF/F0 on the tree", "dF/F0", true), outDir.resolve(TREE_PNG));
        return List.of(new Picture(TREE_PNG, "The tree", "Peak dF/F0 over the movie at each position of every "
                + "branch, the branches laid out by distance from the stimulus along the tree (across) and labelled "
                + "by name, coloured on a logarithmic scale over two decades below the largest peak; each line's own "
                + "kymograph is in kymograph-LINE.csv."));
    }

    /** The {@code "tree"} section of results.json. */
    static JsonObject json(TreeSessionAnalysis.Result t) {
        JsonObject o = new JsonObject();
        BranchedPaths layout = t.layout();
        JsonArray lines = new JsonArray();
        for (String line : layout.lines()) {
            JsonObject l = new JsonObject();
            l.addProperty("name", line);
            l.addProperty("kymograph", TreeSession.kymographFile(line));
            l.addProperty("length_um", layout.cutsUm(line)[layout.cutsUm(line).length - 1]);
            JsonArray b = new JsonArray();
            layout.branchesOf(line).forEach(b::add);
            l.add("branches", b);
            l.add("baseline_noise_sd_dF_F0", ResultsJson.finiteOrNull(t.noiseSd().get(line)));
            lines.add(l);
        }
        o.add("lines", lines);
        JsonArray points = new JsonArray();
        for (BranchedPaths.BranchPoint p : layout.branchPoints()) {
            JsonObject bp = new JsonObject();
            bp.addProperty("x_px", p.xPx());
            bp.addProperty("y_px", p.yPx());
            JsonArray m = new JsonArray();
            p.members().forEach(m::add);
            bp.add("lines", m);
            bp.addProperty("largest_gap_um", p.gapUm());
            points.add(bp);
        }
        o.add("branch_points", points);
        JsonArray branches = new JsonArray();
        for (TreeGeometry.Branch b : layout.tree().branches()) {
            JsonObject bo = new JsonObject();
            bo.addProperty("name", b.name());
            bo.addProperty("length_um", b.lengthUm());
            branches.add(bo);
        }
        o.add("branches", branches);
        if (t.stimulus() != null) {
            JsonObject s = new JsonObject();
            s.addProperty("branch", t.stimulus().branch());
            s.addProperty("position_um", t.stimulus().stimulus().positionUm());
            o.add("stimulus", s);
        }
        o.add("fit", t.fit() == null ? com.google.gson.JsonNull.INSTANCE : ResultsJson.fit(t.fit()));
        JsonArray entered = new JsonArray();
        for (TreeSessionAnalysis.Entered e : t.entered()) {
            JsonObject eo = new JsonObject();
            eo.addProperty("line", e.line());
            eo.add("distance_from_stimulus_um", ResultsJson.finiteOrNull(e.distanceUm()));
            eo.add("data_at_model_peak_dF_F0_um", ResultsJson.finiteOrNull(e.dataPeak()));
            eo.add("model_peak_dF_F0_um", ResultsJson.finiteOrNull(e.modelPeak()));
            eo.add("data_over_model", ResultsJson.finiteOrNull(e.ratio()));
            eo.add("model_peak_time_s", ResultsJson.finiteOrNull(e.peakTimeS()));
            entered.add(eo);
        }
        o.add("entered_side_branches", entered);
        JsonArray w = new JsonArray();
        t.warnings().forEach(w::add);
        o.add("warnings", w);
        return o;
    }

    /** The report's section on the tree. */
    static String html(TreeSessionAnalysis.Result t) {
        StringBuilder h = new StringBuilder();
        BranchedPaths layout = t.layout();
        h.append("<h2>Branches</h2>\n<p>The session holds ").append(layout.lines().size())
                .append(" lines that meet at ").append(layout.branchPoints().size())
                .append(layout.branchPoints().size() == 1 ? " branch point" : " branch points")
                .append("; the numbers above are for the main line, ").append(esc(layout.lines().get(0)))
                .append(", which holds the stimulus. Each line's dF/F0 kymograph is in kymograph-LINE.csv.</p>\n");
        h.append("<table>\n<tr><th>Branch point (x, y in pixels)</th><th>Lines that meet there</th>"
                + "<th>Largest gap, um</th></tr>\n");
        for (BranchedPaths.BranchPoint p : layout.branchPoints()) {
            h.append("<tr><td>").append(String.format(Locale.ROOT, "%.1f, %.1f", p.xPx(), p.yPx()))
                    .append("</td><td>").append(esc(String.join("; ", p.members()))).append("</td><td>")
                    .append(TreeSession.number(p.gapUm())).append("</td></tr>\n");
        }
        h.append("</table>\n");
        if (t.fit() != null && t.fit().converged()) {
            h.append("<p>One fit of the ").append(TreeSessionAnalysis.MODEL).append(" model to all branches at once "
                    + "(shared D and k; an amplitude and a baseline a branch; the stimulus held where the main line's "
                    + "fit put it). The interval is the robust one when neighbouring samples share their noise, widened "
                    + "by the background's uncertainty when the background was estimated (its method says which; "
                    + "Student t alone is in results.json):</p>\n<table>\n<tr><th>Parameter</th><th>Value</th>"
                    + "<th>95% interval</th><th>Interval method</th><th>Unit</th></tr>\n");
            for (String name : List.of("D", "k")) {
                ParameterEstimate e = t.fit().estimate(name).orElse(null);
                if (e == null) {
                    continue;
                }
                h.append("<tr><td>").append(name).append("</td><td>").append(TreeSession.number(e.value()))
                        .append("</td><td>").append(e.ci95() == null ? "n/a" : TreeSession.number(e.ci95().lower())
                                + " to " + TreeSession.number(e.ci95().upper()))
                        .append("</td><td title=\"").append(e.ci95() == null ? "" : esc(e.ci95().note()))
                        .append("\">").append(e.ci95() == null ? "" : esc(e.ci95().method()))
                        .append("</td><td>").append(esc(e.unit().symbol())).append("</td></tr>\n");
            }
            h.append("</table>\n");
        }
        if (!t.entered().isEmpty()) {
            h.append("<p>The signal that entered each side line: its dF/F0 above the fitted baseline summed along the "
                    + "line, against the same sum of the model with the stimulated branch's amplitude, at the model's "
                    + "peak (data averaged over five frames there); data / model is the least-squares scale of the "
                    + "model's time course to the data's. A ratio near 1 means diffusion through the tree accounts "
                    + "for what entered.</p>\n<table>\n<tr><th>Line</th><th>Distance from the stimulus, um</th>"
                    + "<th>Data, dF/F0 um</th><th>Model, dF/F0 um</th><th>Data / model</th><th>Model's peak at, s"
                    + "</th></tr>\n");
            for (TreeSessionAnalysis.Entered e : t.entered()) {
                h.append("<tr><td>").append(esc(e.line())).append("</td><td>")
                        .append(TreeSession.number(e.distanceUm())).append("</td><td>").append(TreeSession.number(e.dataPeak())).append("</td><td>")
                        .append(TreeSession.number(e.modelPeak())).append("</td><td>")
                        .append(TreeSession.number(e.ratio())).append("</td><td>")
                        .append(TreeSession.number(e.peakTimeS())).append("</td></tr>\n");
            }
            h.append("</table>\n");
        }
        if (!t.warnings().isEmpty()) {
            h.append("<div class=\"warn\"><ul>\n");
            t.warnings().forEach(w -> h.append("<li>").append(esc(w)).append("</li>\n"));
            h.append("</ul></div>\n");
        }
        return h.toString();
    }

    private static String esc(String s) {
        return s.replace("&", "&amp;").replace("<", "&lt;").replace(">", "&gt;").replace("\"", "&quot;");
    }
}
