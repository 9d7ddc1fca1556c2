package org.dendrokin.ij1;

import java.nio.file.Path;

import ij.IJ;
import ij.ImagePlus;
import ij.measure.ResultsTable;
import ij.plugin.PlugIn;

import org.dendrokin.core.kymo.Kymograph;
import org.dendrokin.core.spread.SpreadAnalysis;
import org.dendrokin.io.KymographCsv;
import org.dendrokin.io.SessionRunner;

import com.google.gson.JsonArray;
import com.google.gson.JsonElement;
import com.google.gson.JsonObject;

/**
 * Plugins > Dendrokin > Analyze Session Folder: runs the same analysis as the command line's {@code analyze}
 * on one session folder (session.json, movie, path), writes results.json, kymograph.csv, the pictures and
 * report.html to the output folder, and shows the analysed kymograph, the measured spread and the fits.
 */
public class Analyze_Session_Folder implements PlugIn {
    static final String COMMAND = "Analyze Session Folder";

    @Override
    public void run(String arg) {
        IjProgress progress = new IjProgress(COMMAND);
        try {
            OptionsDialog d = new OptionsDialog(COMMAND, "session");
            d.folder("Session folder (holds session.json)", "");
            d.folder("Output folder (empty: beside it, with -results)", "");
            if (!d.show()) {
                return;
            }
            String session = d.nextText();
            String output = d.nextText();
            if (session.isEmpty()) {
                throw new IllegalArgumentException("choose the session folder, the one that holds session.json");
            }
            Path sessionDir = Path.of(session);
            Path outDir = output.isEmpty() ? defaultOutput(sessionDir) : Path.of(output);
            SessionRunner.Result result = SessionRunner.analyze(sessionDir, outDir, progress);
            result.warnings().forEach(w -> IJ.log(COMMAND + " (" + result.session() + "): " + w));
            Kymograph k = KymographCsv.read(outDir.resolve(SessionRunner.KYMOGRAPH_CSV), result.signalUnit());
            ImagePlus image = KymographImage.toImage(k, result.session());
            Display.showKymograph(image);
            Tables.show(table(result), "Dendrokin session " + result.session());
            progress.finish(COMMAND + ": results in " + outDir);
        } catch (RuntimeException e) {
            Failures.show(COMMAND, e);
        }
    }

    /** The sibling folder {@code <session>-results}: outputs never go into the session folder. */
    static Path defaultOutput(Path sessionDir) {
        Path abs = sessionDir.toAbsolutePath().normalize();
        Path parent = abs.getParent() == null ? abs : abs.getParent();
        return parent.resolve(abs.getFileName() + "-results");
    }

    /** Spread measures and every fitted parameter with units and intervals, one row each. */
    static ResultsTable table(SessionRunner.Result r) {
        ResultsTable t = Tables.quantities();
        SpreadAnalysis.Result s = r.spread();
        String why = s == null ? "no stimulus was known or found" : String.join(" ", s.warnings());
        Tables.add(t, "spread", "front speed", "um/s", s == null ? null : s.frontSpeed(), why);
        Tables.add(t, "spread", "length constant", "um", s == null ? null : s.lengthConstant(), why);
        Tables.add(t, "spread", "decay time", "s", s == null ? null : s.decayTime(), why);
        Tables.add(t, "spread", "apparent D", "um^2/s", s == null ? null : s.apparentD(), why);
        addFits(t, r.fits(), r.bestModel());
        return t;
    }

    /** Rows from fits in the results.json form: {model, converged, aic, parameters: {P: {value, unit, ci95}}}. */
    static void addFits(ResultsTable t, Iterable<JsonObject> fits, String bestModel) {
        for (JsonObject fit : fits) {
            String model = fit.has("model") ? fit.get("model").getAsString() : "model";
            boolean converged = !fit.has("converged") || fit.get("converged").getAsBoolean();
            String source = model + (model.equals(bestModel) ? " (best)" : "") + (converged ? "" : " (not converged)");
            for (String block : new String[] {"parameters", "derived"}) {
                if (!fit.has(block) || !fit.get(block).isJsonObject()) {
                    continue;
                }
                for (var e : fit.getAsJsonObject(block).entrySet()) {
                    JsonObject p = e.getValue().getAsJsonObject();
                    double[] ci = ci(p.get("ci95"));
                    Tables.add(t, source, e.getKey(), number(p.get("value")),
                            p.has("unit") ? p.get("unit").getAsString() : "", ci[0], ci[1],
                            p.has("ci_method") && !p.get("ci_method").isJsonNull() ? p.get("ci_method").getAsString()
                                    : "");
                }
            }
            for (String criterion : new String[] {"aicc", "aic", "bic", "rmse", "akaike_weight"}) {
                if (fit.has(criterion)) {
                    String name = criterion.equals("akaike_weight") ? "Akaike weight"
                            : criterion.toUpperCase(java.util.Locale.ROOT);
                    Tables.add(t, source, name, number(fit.get(criterion)), "",
                            Double.NaN, Double.NaN, "");
                }
            }
        }
    }

    private static double number(JsonElement e) {
        return e == null || e.isJsonNull() ? Double.NaN : e.getAsDouble();
    }

    private static double[] ci(JsonElement e) {
        if (e == null || !e.isJsonArray() || e.getAsJsonArray().size() != 2) {
            return new double[] {Double.NaN, Double.NaN};
        }
        JsonArray a = e.getAsJsonArray();
        return new double[] {number(a.get(0)), number(a.get(1))};
    }
}
