package org.dendrokin.ij1;

import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;

import ij.IJ;
import ij.ImagePlus;
import ij.WindowManager;
import ij.gui.PointRoi;
import ij.gui.Roi;
import ij.process.FloatPolygon;
import ij.measure.ResultsTable;
import ij.plugin.PlugIn;

import org.dendrokin.core.analysis.Headline;
import org.dendrokin.core.analysis.MotionMode;
import org.dendrokin.core.analysis.SkippedModel;
import org.dendrokin.core.fit.FitResult;
import org.dendrokin.core.fit.Interval;
import org.dendrokin.core.fit.KymographFits;
import org.dendrokin.core.fit.Misfit;
import org.dendrokin.core.fit.ParameterEstimate;
import org.dendrokin.core.kymo.Kymograph;
import org.dendrokin.core.spread.SpreadAnalysis;
import org.dendrokin.io.InputException;
import org.dendrokin.io.SessionRunner;
import org.dendrokin.io.path.PathFiles;
import org.dendrokin.io.session.SessionOverrides;

/**
 * Plugins > Dendrokin > Analyze Session Folder: runs the same analysis as the command line's {@code analyze}
 * on one session folder (session.json, movie, path), writes results.json, kymograph.csv, the pictures and
 * report.html to the output folder, and shows the analysed kymograph, the measured spread and the fits. The
 * signal channel, structural channel, motion handling and stimulus spot (filled from a point selection on the
 * current image) may be set for this run over session.json; they are recorded in macros as {@code channel=},
 * {@code structural=}, {@code motion=} and {@code stimulus=}.
 */
public class Analyze_Session_Folder implements PlugIn {
    static final String COMMAND = "Analyze Session Folder";
    /** The choice that keeps session.json's setting. */
    static final String FROM_SESSION = "as in session.json";
    static final String NO_CHANNEL = "none";
    private static final String[] MOTION = {FROM_SESSION, "correct", "measure", "off"};
    /** Channels offered; a hyperstack with more is set in session.json. */
    private static final int MAX_CHANNEL_CHOICE = 8;

    @Override
    public void run(String arg) {
        IjProgress progress = new IjProgress(COMMAND);
        try {
            OptionsDialog d = new OptionsDialog(COMMAND, "session");
            d.folder("Session folder (holds session.json)", "");
            d.folder("Output folder (empty: beside it, with -results)", "");
            d.message("For this run only, over session.json (the folder is not changed):");
            // not remembered: a setting for one run must not carry over to the next session unseen
            d.choice("Channel (signal)", channels(false), FROM_SESSION, false);
            d.choice("Structural channel", channels(true), FROM_SESSION, false);
            d.choice("Motion", MOTION, FROM_SESSION, false);
            String spot = pointSelection(WindowManager.getCurrentImage());
            d.text("Stimulus spot (x,y in pixels; empty: from session.json)", spot == null ? "" : spot, 14, false);
            d.message(spot == null ? "A point selection on the movie fills the stimulus spot."
                    : "The stimulus spot is the point selection on " + WindowManager.getCurrentImage().getTitle()
                            + ".");
            if (!d.show()) {
                return;
            }
            String session = d.nextText();
            String output = d.nextText();
            if (session.isEmpty()) {
                throw new IllegalArgumentException("choose the session folder, the one that holds session.json");
            }
            SessionOverrides overrides = overrides(d.nextChoice(), d.nextChoice(), d.nextChoice(), d.nextText());
            Path sessionDir = Path.of(session);
            Path outDir = output.isEmpty() ? defaultOutput(sessionDir) : Path.of(output);
            SessionRunner.Result result = SessionRunner.analyze(sessionDir, outDir, overrides, progress);
            if (!overrides.isEmpty()) {
                IJ.log(COMMAND + " (" + result.session() + "): " + overrides.sentence());
            }
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

    /** The dialog's overrides: each choice either keeps session.json's setting or names one. */
    static SessionOverrides overrides(String channel, String structural, String motion, String spot) {
        Integer signal = FROM_SESSION.equals(channel) ? null : Integer.valueOf(channel);
        Integer reference = FROM_SESSION.equals(structural) ? null : NO_CHANNEL.equals(structural) ? 0
                : Integer.valueOf(structural);
        MotionMode mode = FROM_SESSION.equals(motion) ? null : MotionMode.of(motion);
        Double x = null;
        Double y = null;
        if (!spot.isBlank()) {
            double[] xy = SessionOverrides.spot(spot);
            if (xy == null) {
                throw new InputException(null, "the stimulus spot must be two numbers x,y in pixels, such as "
                        + "120.5,40, not \"" + spot + "\"");
            }
            x = xy[0];
            y = xy[1];
        }
        return new SessionOverrides(signal, reference, mode, x, y, SessionOverrides.Origin.DIALOG);
    }

    /**
     * The first point of the image's point selection as {@code x,y} in our pixel convention (ImageJ puts a
     * clicked point at whole-number coordinates meaning the pixel's centre, as for lines, so
     * {@link PathFiles#LINE_ROI_SHIFT} is added), or null without one.
     */
    static String pointSelection(ImagePlus image) {
        Roi roi = image == null ? null : image.getRoi();
        if (!(roi instanceof PointRoi)) {
            return null;
        }
        FloatPolygon p = roi.getFloatPolygon();
        if (p.npoints == 0) {
            return null;
        }
        return String.format(Locale.ROOT, "%s,%s", plain(p.xpoints[0] + PathFiles.LINE_ROI_SHIFT),
                plain(p.ypoints[0] + PathFiles.LINE_ROI_SHIFT));
    }

    private static String plain(double v) {
        String s = String.format(Locale.ROOT, "%.2f", v);
        return s.replaceAll("\\.?0+$", "");
    }

    private static String[] channels(boolean withNone) {
        List<String> items = new ArrayList<>(List.of(FROM_SESSION));
        if (withNone) {
            items.add(NO_CHANNEL);
        }
        for (int c = 1; c <= MAX_CHANNEL_CHOICE; c++) {
            items.add(Integer.toString(c));
        }
        return items.toArray(String[]::new);
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
