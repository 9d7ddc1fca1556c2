package org.dendrokin.io.session;

import java.nio.file.Path;
import java.util.List;
import java.util.Locale;

import java.util.stream.Stream;

import org.dendrokin.core.analysis.AnalysisResult;
import org.dendrokin.core.analysis.SpineOutcome;
import org.dendrokin.core.analysis.CalibrationStage;
import org.dendrokin.core.analysis.Headline;
import org.dendrokin.core.analysis.MotionMode;
import org.dendrokin.core.analysis.Normalisation;
import org.dendrokin.core.analysis.Warning;
import org.dendrokin.core.calib.Calibration;
import org.dendrokin.core.calib.CalibrationSummary;
import org.dendrokin.core.kymo.Kymograph;
import org.dendrokin.core.preprocess.BleachCorrection;
import org.dendrokin.core.preprocess.Preprocessing;
import org.dendrokin.core.spread.Estimate;
import org.dendrokin.core.spread.SpreadAnalysis;
import org.dendrokin.io.AtomicFiles;
import org.dendrokin.io.ToolVersion;
import org.dendrokin.io.calib.CalibrationSetup;
import org.dendrokin.io.fit.FitReportHtml;
import org.dendrokin.io.plot.Picture;
import org.dendrokin.io.text.Html;
import org.dendrokin.io.text.Numbers;

/**
 * Writes {@code report.html}: one self-contained page (no scripts, no web fonts; pictures are PNG files beside
 * it, linked by relative names) that a scientist who never used the tool can read: what was analysed, the
 * pictures, a table of numbers with units and intervals, the warnings and the cautions.
 */
public final class ReportHtml {
    private ReportHtml() {
    }

    /**
     * Writes the report.
     *
     * @param target   the file to write
     * @param in       the session's inputs
     * @param a        the analysis
     * @param pictures the pictures beside the report, in the order shown
     */
    public static void write(Path target, SessionInputs in, AnalysisResult a, List<Picture> pictures) {
        write(target, in, a, pictures, null);
    }

    /** Writes the report, with a spine section ({@link SpineOutputs#section}) when spines were analysed (or null). */
    public static void write(Path target, SessionInputs in, AnalysisResult a, List<Picture> pictures,
            SpineOutcome spines) {
        write(target, in, a, pictures, spines, "");
    }

    /**
     * Writes the report with the spine section (when {@code spines} is not null) and an extra section (HTML) after
     * the fits, e.g. a branched session's tree.
     *
     * @param extraHtml inserted before the warnings; empty for none
     */
    public static void write(Path target, SessionInputs in, AnalysisResult a, List<Picture> pictures,
            SpineOutcome spines, String extraHtml) {
        String session = in.sessionName();
        Kymograph signal = a.signal();
        Preprocessing.Result pre = a.preprocessing();
        SpreadAnalysis.Result spread = a.spread();
        AnalysisResult.Movie movie = a.movie();
        StringBuilder h = new StringBuilder(16384);
        h.append("<!DOCTYPE html>\n<html lang=\"en\">\n<head>\n<meta charset=\"utf-8\">\n<title>Dendrokin report: ")
                .append(esc(session)).append("</title>\n<style>\n")
                .append("body{font-family:sans-serif;max-width:980px;margin:2em auto;padding:0 1em;color:#222;"
                        + "line-height:1.45}\n")
                .append("table{border-collapse:collapse;margin:0.5em 0 1.5em}td,th{border:1px solid #ccc;"
                        + "padding:4px 8px;text-align:left;vertical-align:top}th{background:#f2f2f2}\n")
                .append("figure{margin:1em 0 2em}figcaption{font-size:0.92em;color:#444;max-width:760px}"
                        + "img{max-width:100%;border:1px solid #ddd}\n")
                .append(".warn{background:#fff6e0;border-left:4px solid #e0a000;padding:0.5em 1em}"
                        + ".caution{background:#f4f4f4;padding:0.5em 1em;font-size:0.92em}\n")
                .append("</style>\n</head>\n<body>\n");
        h.append("<h1>Spread along the dendrite: ").append(esc(session)).append("</h1>\n");
        h.append("<p>Made by Dendrokin ").append(esc(ToolVersion.get()))
                .append(". Every number below is also in <a href=\"results.json\">results.json</a>; the kymograph "
                        + "itself is in <a href=\"kymograph.csv\">kymograph.csv</a> (one row a frame, one column a "
                        + "position).</p>\n");

        h.append("<h2>What was analysed</h2>\n<table>\n");
        row(h, "Session folder", esc(in.sessionDir().toAbsolutePath().normalize().toString()));
        if (!in.overrides().isEmpty()) {
            row(h, "Overrides", esc(in.overrides().sentence()));
        }
        row(h, "Movie", esc(in.relative(in.movieFile())) + String.format(Locale.ROOT,
                ": %d x %d pixels, %d frames, %d-bit", movie.widthPx(), movie.heightPx(), movie.frameCount(),
                in.bitDepth()));
        row(h, "Pixel size", number(movie.pixelSizeUm()) + " um" + source(in.config().pixelSizeUm() != null));
        row(h, "Frame interval", number(movie.frameIntervalS()) + " s" + source(in.config().frameIntervalS() != null)
                + "; frame i is at time i x " + number(movie.frameIntervalS()) + " s");
        if (movie.linePeriodS() > 0) {
            row(h, "Scan lines", number(movie.linePeriodS()) + " s per line (session.json): a sample on image row y "
                    + "was taken y x " + number(movie.linePeriodS()) + " s after its frame's time; the arrival times "
                    + "and every model fit use those times");
        }
        row(h, "Path", esc(in.relative(in.pathFile())) + ", " + number(movie.pathLengthUm())
                + " um long; averaged over a band " + number(movie.pathWidthUm()) + " um wide; "
                + signal.positionCount() + " positions every " + number(signal.distanceStepUm())
                + " um from the first vertex");
        row(h, "Channels", channelsSentence(in, a));
        row(h, "Motion", motionSentence(a.motion()));
        row(h, "Background", String.format(Locale.ROOT, "%.1f", a.background().value()) + " grey values. "
                + esc(a.background().description()));
        Preprocessing.Stimulus s = pre.stimulus();
        String stim = s.known() ? "t = " + number(s.timeS()) + " s at " + number(s.positionUm())
                + " um along the path (" + esc(s.source()) + ")" : "none given or found";
        if (s.detection() != null && s.known()) {
            stim += String.format(Locale.ROOT, "; the rise at the onset was %.1f times the noise standard deviation",
                    s.detection().strength());
        } else if (s.detection() != null) {
            stim += ". " + esc(s.detection().describe());
        }
        row(h, "Stimulus", stim);
        row(h, "Baseline (F0)", String.format(Locale.ROOT, "median of frames %d to %d at each position",
                pre.baselineFirst(), pre.baselineLast()));
        row(h, "Bleaching correction", bleach(in.config().bleachCorrection(), pre.bleach()));
        row(h, "Calibration", esc(calibrationSentence(in.calibration(), a.calibrated())) + " The analysed signal is in "
                + esc(signal.signalUnit()) + ".");
        h.append("</table>\n");

        Headline headline = a.headline();
        h.append("<h2>Numbers</h2>\n<p>Measures of the spread, read directly off the kymograph unless the last column "
                + "names a fitted model. The 95% interval says how precisely the data fix each number; how it was "
                + "made is in the last column.</p>\n");
        h.append("<table>\n<tr><th>Quantity</th><th>Value</th><th>95% interval</th><th>Unit</th>"
                + "<th>How it was measured</th></tr>\n");
        String noFront = spread == null ? "not available (no stimulus is known)"
                : "not available: " + spread.front().reason();
        estimateRow(h, "Front speed", headline.frontSpeed(), headline.frontSpeedFromModel()
                ? "front speed of the fitted " + headline.bestModel() + " model (the arrival times give "
                        + (headline.modelFreeFrontSpeed() == null ? "none"
                                : number(headline.modelFreeFrontSpeed().value()) + " um/s") + ")"
                : "half-maximum arrival time at each position; robust (Theil-Sen) line of distance against time",
                noFront);
        if (spread != null && spread.front().present()) {
            estimateRow(h, "Front speed towards the path's start", spread.front().left(),
                    "arrival times on that side of the stimulus only", "not available (too few positions)");
            estimateRow(h, "Front speed towards the path's end", spread.front().right(),
                    "arrival times on that side of the stimulus only", "not available (too few positions)");
        }
        estimateRow(h, "Peak decay length", spread == null ? null : spread.peakDecayLength(),
                "peak amplitude against distance from the stimulus, fitted as exp(-distance / peak decay length)");
        estimateRow(h, "Length constant sqrt(D / k)", headline.lengthConstantEstimate(),
                "from D and k of the fitted " + headline.bestModel() + " model",
                "not available (the preferred model has no D and k, or no model was fitted)");
        estimateRow(h, "Decay time", spread == null ? null : spread.decayTime(),
                "signal summed along the path, fitted as exp(-t / decay time) after its peak");
        String dHow = "growth of the spatial variance of the profile, variance = s0^2 + 2 D t";
        if (spread != null && spread.varianceWindowS() != null) {
            dHow += String.format(Locale.ROOT, ", over %s to %s s after the stimulus",
                    number(spread.varianceWindowS()[0]), number(spread.varianceWindowS()[1]));
        }
        estimateRow(h, "Apparent diffusion coefficient D", spread == null ? null : spread.apparentD(), dHow);
        estimateRow(h, "Bleaching time constant", pre.bleach().timeConstant(),
                "exponential fit to the samples outside the response");
        h.append("</table>\n");

        h.append(FitReportHtml.section(a.fits(), a.skipped()));
        if (spines != null) {
            h.append(SpineOutputs.section(spines));
        }
        h.append(extraHtml);

        h.append("<h2>Warnings</h2>\n");
        List<String> warnings = Stream.concat(in.warnings().stream(), a.warnings().stream()).map(Warning::text)
                .toList();
        if (warnings.isEmpty()) {
            h.append("<p>None.</p>\n");
        } else {
            h.append("<div class=\"warn\"><ul>\n");
            for (String w : warnings) {
                h.append("<li>").append(esc(w)).append("</li>\n");
            }
            h.append("</ul></div>\n");
        }

        h.append("<h2>Pictures</h2>\n");
        for (Picture p : pictures) {
            h.append("<figure><a href=\"").append(esc(p.file())).append("\"><img src=\"").append(esc(p.file()))
                    .append("\" alt=\"").append(esc(p.title())).append("\"></a><figcaption><b>").append(esc(p.title())).append(".</b> ").append(esc(p.caption()))
                    .append("</figcaption></figure>\n");
        }

        h.append("<h2>How to read this</h2>\n<ul>\n")
                .append("<li>dF/F0 is the change of fluorescence relative to the baseline F0 at the same position: "
                        + "0 means no change, 1 means twice as bright.</li>\n")
                .append("<li>A front speed read off a short stretch of dendrite is biased: close to the stimulus the "
                        + "signal is still leaving the stimulated site, and near a sealed end it can speed up. Passive "
                        + "diffusion has no constant front speed at all; its arrival times grow with the square of "
                        + "distance.</li>\n")
                .append("<li>The apparent D assumes spread by diffusion from a compact source; binding, transport or "
                        + "a regenerative wave give other values.</li>\n")
                .append("<li>The peak decay length is how far from the stimulus the peak signal falls e-fold; the "
                        + "length constant sqrt(D / k) is that distance for a steady source. After a brief release "
                        + "the peak also falls because the signal dilutes as it spreads, so near the stimulus the peak "
                        + "decay length is shorter than the length constant.</li>\n")
                .append("</ul>\n");
        h.append("<h2>Cautions</h2>\n<div class=\"caution\"><p>Dendrokin is research software. The numbers depend on "
                + "the path drawn, the background, the bleaching correction and the calibration; fitted constants "
                + "also depend on the model chosen. Check the pictures before using a number. It is not for clinical "
                + "use. Laser and uncaging work follows your institution's safety rules.</p></div>\n");
        h.append("</body>\n</html>\n");
        AtomicFiles.writeString(target, h.toString());
    }

    private static String channelsSentence(SessionInputs in, AnalysisResult a) {
        SessionConfig.Acquisition acq = in.config().acquisition();
        int signal = acq.channel() > 0 ? acq.channel()
                : in.calibration().channels() != null ? in.calibration().channels().numerator() : 1;
        StringBuilder b = new StringBuilder(String.format(Locale.ROOT, "signal in channel %d of %d", signal,
                in.channelCount()));
        if (acq.structuralChannel() > 0) {
            b.append(String.format(Locale.ROOT, "; structural dye in channel %d", acq.structuralChannel()));
        }
        if (a.normalisation() != Normalisation.NONE) {
            b.append("; the signal is normalised as ").append(a.normalisation().key())
                    .append(a.normalisation() == Normalisation.G_OVER_R ? " (signal over structural intensity)"
                            : " ((G - G0) / R, G0 the baseline of the signal)");
        }
        return esc(b.toString());
    }

    private static String motionSentence(AnalysisResult.Motion m) {
        if (m.mode() == MotionMode.OFF) {
            return "not measured (switched off in session.json)";
        }
        if (m.trace() == null) {
            return "not measured (see the warnings)";
        }
        return esc(String.format(Locale.ROOT, "measured against %s: largest shift %s um, RMS %s um; %s",
                m.trace().reference().describe(), number(m.trace().maxShiftUm()), number(m.trace().rmsShiftUm()),
                m.corrected() ? "the path was moved with the shift of each frame" : "not corrected (\"motion\": "
                        + "\"measure\")"));
    }

    /** One sentence for the report: the calibration method, its constants, and what was flagged. */
    public static String calibrationSentence(CalibrationSetup setup, CalibrationStage.Calibrated applied) {
        Calibration cal = setup.calibration();
        String description = cal.description();
        StringBuilder b = new StringBuilder(description.isEmpty() ? description
                : Character.toUpperCase(description.charAt(0)) + description.substring(1));
        if (setup.sourceFile() != null) {
            b.append(" (from ").append(setup.sourceFile()).append(')');
        }
        b.append('.');
        if (applied.summary() != null) {
            CalibrationSummary s = applied.summary();
            b.append(String.format(Locale.ROOT, " Samples above %s of the indicator's range are flagged (%s of the "
                    + "samples) and above %s set to NaN; %s of the samples have no concentration in all.",
                    percent(s.limits().flagAbove()), percent(s.fractionFlagged()), percent(s.limits().rejectAbove()),
                    percent(s.fractionNan())));
            b.append(applied.propagated()
                    ? " The calibration's own uncertainty was propagated to a per-sample SD (concentration_sd.csv)."
                    : " No uncertainty of the calibration constants was given, so none was propagated.");
        } else if (applied.propagated()) {
            b.append(" A per-sample SD, from the signal's own precision and the uncertainty of the method's constants, "
                    + "was propagated (concentration_sd.csv).");
        }
        return b.toString();
    }

    private static String percent(double f) {
        return String.format(Locale.ROOT, "%.1f%%", 100 * f);
    }

    private static String source(boolean fromSession) {
        return fromSession ? " (from session.json)" : " (from the TIFF)";
    }

    private static String bleach(boolean requested, BleachCorrection.Result b) {
        if (!requested) {
            return "switched off in session.json";
        }
        if (!b.applied()) {
            return "not applied (see the warnings)";
        }
        Estimate tau = b.timeConstant();
        if (b.fastPhase() != null) {
            double f = b.fastPhase().fraction();
            return "applied in two phases: intensity divided by " + number(f) + " exp(-t / "
                    + number(b.fastPhase().timeConstant().value()) + " s) + " + number(1 - f) + " exp(-t / "
                    + number(tau.value()) + " s), fitted on " + b.quietPositions()
                    + " positions outside the response after the stimulus and on every position before it";
        }
        return "applied: intensity divided by exp(-t / " + number(tau.value()) + " s), fitted on " + b.quietPositions()
                + " positions outside the response after the stimulus and on every position before it";
    }

    private static void row(StringBuilder h, String name, String valueHtml) {
        h.append("<tr><th>").append(esc(name)).append("</th><td>").append(valueHtml).append("</td></tr>\n");
    }

    private static void estimateRow(StringBuilder h, String name, Estimate e, String how) {
        estimateRow(h, name, e, how, "not available (see the warnings)");
    }

    private static void estimateRow(StringBuilder h, String name, Estimate e, String how, String missing) {
        h.append("<tr><td>").append(esc(name)).append("</td>");
        if (e == null) {
            h.append("<td colspan=\"3\">").append(esc(missing)).append("</td>");
        } else {
            h.append("<td>").append(number(e.value())).append("</td><td>").append(number(e.lo95())).append(" to ")
                    .append(number(e.hi95())).append("</td><td>").append(esc(e.unit())).append("</td>");
        }
        h.append("<td>").append(esc(how)).append("</td></tr>\n");
    }

    private static String number(double v) {
        return Numbers.forPeople(v);
    }

    private static String esc(String s) {
        return Html.esc(s);
    }
}
