package org.dendrokin.ij1;

import java.nio.file.Path;
import java.util.List;

import ij.IJ;
import ij.ImagePlus;
import ij.measure.ResultsTable;
import ij.plugin.PlugIn;

import org.dendrokin.core.analysis.Headline;
import org.dendrokin.core.analysis.SkippedModel;
import org.dendrokin.core.fit.FitResult;
import org.dendrokin.core.fit.Interval;
import org.dendrokin.core.fit.KymographFits;
import org.dendrokin.core.fit.Misfit;
import org.dendrokin.core.fit.ParameterEstimate;
import org.dendrokin.core.kymo.Kymograph;
import org.dendrokin.core.spread.SpreadAnalysis;
import org.dendrokin.io.SessionRunner;

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
            Kymograph k = result.analysis().signal();
            ImagePlus image = KymographImage.toImage(k, result.session());
            Display.showKymograph(image);
            Tables.show(table(result), "Dendrokin session " + result.session(), image.getWindow());
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
        Headline headline = r.analysis().headline();
        Tables.add(t, headline.frontSpeedFromModel() ? headline.bestModel() + " (best)" : "spread", "front speed",
                "um/s", headline.frontSpeed(), s == null ? why : s.front().verdict().phrase());
        Tables.add(t, "spread", "peak decay length", "um", s == null ? null : s.peakDecayLength(), why);
        Tables.add(t, "spread", "decay time", "s", s == null ? null : s.decayTime(), why);
        Tables.add(t, "spread", "apparent D", "um^2/s", s == null ? null : s.apparentD(), why);
        addFits(t, r.analysis().fits());
        for (SkippedModel m : r.analysis().skipped()) {
            Tables.add(t, m.model() + " (not tried)", "", Double.NaN, "", Double.NaN, Double.NaN, m.reason());
        }
        return t;
    }

    /** Rows of each fit: its parameters and derived quantities, then its criteria and Akaike weight. */
    static void addFits(ResultsTable t, KymographFits.Outcome outcome) {
        if (outcome == null) {
            return;
        }
        for (FitResult fit : outcome.fits()) {
            String model = fit.model();
            boolean converged = fit.converged();
            String source = model + (model.equals(outcome.bestModel()) ? " (best)" : "")
                    + (converged ? "" : " (not converged)");
            if (converged) {
                for (List<ParameterEstimate> block : List.of(fit.parameters(), fit.derived())) {
                    for (ParameterEstimate p : block) {
                        Interval ci = p.ci95();
                        Tables.add(t, source, p.name(), p.value(), p.unit().symbol(),
                                ci == null ? Double.NaN : ci.lower(), ci == null ? Double.NaN : ci.upper(),
                                ci == null ? "" : ci.method());
                    }
                }
            }
            outcome.misfit(model).ifPresent(m -> Tables.add(t, source, "residual correlation between frames",
                    m.temporalCorrelation(), "", Double.NaN, Double.NaN, m.verdict().label()
                    + (m.pattern() == Misfit.Pattern.NONE ? "" : ": " + m.pattern().label())));
            double weight = converged ? outcome.weights().getOrDefault(model, Double.NaN) : Double.NaN;
            double[] criteria = {fit.aicc(), fit.aic(), fit.bic(), fit.rmse(), weight};
            String[] names = {"AICC", "AIC", "BIC", "RMSE", "Akaike weight"};
            for (int i = 0; i < names.length; i++) {
                Tables.add(t, source, names[i], converged ? criteria[i] : Double.NaN, "", Double.NaN, Double.NaN, "");
            }
        }
    }
}
