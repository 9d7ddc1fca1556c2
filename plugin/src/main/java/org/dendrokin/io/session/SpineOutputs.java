package org.dendrokin.io.session;

import java.io.OutputStreamWriter;
import java.io.Writer;
import java.nio.charset.StandardCharsets;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;

import org.dendrokin.core.analysis.SpineOutcome;
import org.dendrokin.core.fit.ParameterEstimate;
import org.dendrokin.core.spines.Spine;
import org.dendrokin.core.spines.SpineAnalysis;
import org.dendrokin.io.AtomicFiles;
import org.dendrokin.io.plot.LinePlot;
import org.dendrokin.io.plot.Picture;
import org.dendrokin.io.plot.Pictures;
import org.dendrokin.io.text.Html;
import org.dendrokin.io.text.Numbers;

import org.apache.commons.csv.CSVFormat;
import org.apache.commons.csv.CSVPrinter;

/**
 * The spine outputs of one analysis, each from the typed {@link SpineOutcome}: {@code spines.csv} (one line a
 * spine), {@code spine_traces.csv} (each head's dF/F0 and the shaft's at its base, frame by frame), the picture
 * {@code spines.png} (peak dF/F0 against distance from the stimulus, spines beside the shaft) and the report's
 * spine section.
 */
public final class SpineOutputs {
    /** One line a spine. */
    public static final String SPINES_CSV = "spines.csv";
    /** The time courses. */
    public static final String TRACES_CSV = "spine_traces.csv";
    /** Peak against distance. */
    public static final String SPINES_PNG = "spines.png";

    private SpineOutputs() {
    }

    /** Writes the two tables and the picture; returns the picture for the report. */
    public static Picture write(Path outDir, SpineOutcome s) {
        SpineAnalysis.Result r = s.result();
        writeTable(r, outDir.resolve(SPINES_CSV));
        writeTraces(r, outDir.resolve(TRACES_CSV));
        Pictures.savePng(picture(r).render(900, 520), outDir.resolve(SPINES_PNG));
        return new Picture(SPINES_PNG, "Spines beside the shaft", "Peak dF/F0 of each spine head (points; the "
                + "stimulated one marked apart) and of the shaft (line) against distance from the stimulus along the "
                + "dendrite. Heads that follow the shaft through their necks peak lower and later than the shaft "
                + "under them.");
    }

    private static LinePlot picture(SpineAnalysis.Result r) {
        LinePlot plot = new LinePlot("Peak dF/F0: spines and shaft", "distance from the stimulus (um)",
                "peak dF/F0");
        plot.line("shaft", r.shaftDistanceUm(), r.shaftPeakDeltaF());
        List<double[]> plain = new ArrayList<>();
        List<double[]> stimulated = new ArrayList<>();
        for (Spine sp : r.spines()) {
            if (Double.isFinite(sp.distanceFromStimulusUm()) && Double.isFinite(sp.peakDeltaF())) {
                (sp.stimulated() ? stimulated : plain).add(new double[] {sp.distanceFromStimulusUm(), sp.peakDeltaF()});
            }
        }
        plot.points("spine heads", plain.stream().mapToDouble(p -> p[0]).toArray(),
                plain.stream().mapToDouble(p -> p[1]).toArray());
        if (!stimulated.isEmpty()) {
            plot.points("stimulated spine", stimulated.stream().mapToDouble(p -> p[0]).toArray(),
                    stimulated.stream().mapToDouble(p -> p[1]).toArray());
        }
        return plot;
    }

    /** The header of spines.csv. */
    static final String[] HEADER = {"id", "label", "source", "x_px", "y_px", "radius_px", "position_um", "side",
        "off_path_um", "base_position_um", "distance_from_stimulus_um", "stimulated", "peak_dF_F0", "time_to_peak_s",
        "decay_time_s", "tau_neck_s", "tau_neck_ci_low_s", "tau_neck_ci_high_s", "tau_neck_ci_method",
        "tau_neck_determined", "not_fitted"};

    private static void writeTable(SpineAnalysis.Result r, Path target) {
        AtomicFiles.write(target, out -> {
            Writer w = new OutputStreamWriter(out, StandardCharsets.UTF_8);
            try (CSVPrinter csv = new CSVPrinter(w, CSVFormat.DEFAULT.builder().setRecordSeparator('\n').get())) {
                csv.printRecord((Object[]) HEADER);
                for (Spine sp : r.spines()) {
                    ParameterEstimate tau = sp.tauNeck().orElse(null);
                    boolean ci = tau != null && tau.ci95() != null;
                    csv.printRecord(sp.id(), sp.site().label(), sp.site().source().word(),
                            Numbers.forFile(sp.site().xPx()), Numbers.forFile(sp.site().yPx()),
                            Numbers.forFile(sp.radiusUm() / r.pixelSizeUm()), Numbers.forFile(sp.positionUm()),
                            sp.side().word(), Numbers.forFile(sp.offPathUm()),
                            Numbers.forFile(sp.basePositionUm()), Numbers.forFile(sp.distanceFromStimulusUm()),
                            sp.stimulated(), Numbers.forFile(sp.peakDeltaF()), Numbers.forFile(sp.timeToPeakS()),
                            Numbers.forFile(sp.decayTimeS()), tau == null ? "" : Numbers.forFile(tau.value()),
                            ci ? Numbers.forFile(tau.ci95().lower()) : "",
                            ci ? Numbers.forFile(tau.ci95().upper()) : "", ci ? tau.ci95().method() : "",
                            tau == null ? "" : tau.identifiable(), notFitted(sp));
                }
            }
        });
    }

    /** Why a spine has no neck time constant, or empty. */
    static String notFitted(Spine sp) {
        if (sp.exchange() == null) {
            return sp.notFitted();
        }
        return sp.exchange().converged() ? "" : "the fit did not converge: " + sp.exchange().reason();
    }

    private static void writeTraces(SpineAnalysis.Result r, Path target) {
        AtomicFiles.write(target, out -> {
            Writer w = new OutputStreamWriter(out, StandardCharsets.UTF_8);
            try (CSVPrinter csv = new CSVPrinter(w, CSVFormat.DEFAULT.builder().setRecordSeparator('\n').get())) {
                List<String> header = new ArrayList<>();
                header.add("time_s");
                List<double[]> columns = new ArrayList<>();
                for (Spine sp : r.spines()) {
                    header.add("head_" + sp.id() + "_dF_F0");
                    header.add("shaft_" + sp.id() + "_dF_F0");
                    columns.add(sp.headDeltaF());
                    columns.add(sp.shaftDeltaF());
                }
                csv.printRecord(header);
                double[] t = r.timesS();
                for (int f = 0; f < t.length; f++) {
                    List<String> row = new ArrayList<>();
                    row.add(Numbers.forFile(t[f]));
                    for (double[] c : columns) {
                        row.add(Numbers.forFile(c[f]));
                    }
                    csv.printRecord(row);
                }
            }
        });
    }

    /** The report's spine section. */
    public static String section(SpineOutcome s) {
        SpineAnalysis.Result r = s.result();
        StringBuilder h = new StringBuilder();
        h.append("<h2>Spines</h2>\n<p>");
        long detected = r.spines().stream().filter(sp -> sp.site().source().word().equals("detected")).count();
        h.append(Html.esc(String.format(Locale.ROOT, "%d spine head%s (%d found in the image, %d given%s). Each "
                + "head's dF/F0 is the mean of a disc around its centre, with the background, bleaching correction "
                + "and baseline of the shaft. The neck time constant tau_neck is fitted with the head as one "
                + "compartment exchanging with the shaft under it, dc/dt = (u(t) - c)/tau_neck - k_head c, driven "
                + "by the shaft's dF/F0 u at the neck's base (%s); intervals are 95%%.", r.spines().size(),
                r.spines().size() == 1 ? "" : "s", detected, r.spines().size() - detected,
                s.request().source().isEmpty() ? "" : " in " + s.request().source(),
                r.shaftDriver().isEmpty() ? "as measured" : "as the fitted " + r.shaftDriver() + " model describes "
                        + "it, which carries no noise; " + TRACES_CSV + " gives the measured one")));
        h.append("</p>\n<table>\n<tr><th>id</th><th>position (um)</th><th>side</th><th>from stimulus (um)</th>"
                + "<th>peak dF/F0</th><th>time to peak (s)</th><th>decay time (s)</th><th>tau_neck (s)</th>"
                + "<th>95% interval</th></tr>\n");
        for (Spine sp : r.spines()) {
            ParameterEstimate tau = sp.tauNeck().orElse(null);
            String tauText = tau == null ? Html.esc(notFitted(sp).isEmpty() ? "-" : "not fitted: " + notFitted(sp))
                    : Numbers.forPeople(tau.value()) + (tau.identifiable() ? "" : " (not determined)");
            String ci = tau == null || tau.ci95() == null ? "" : Numbers.forPeople(tau.ci95().lower()) + " to "
                    + Numbers.forPeople(tau.ci95().upper());
            h.append("<tr><td>").append(sp.id()).append(sp.stimulated() ? " (stimulated)" : "").append("</td><td>")
                    .append(Numbers.forPeople(sp.positionUm())).append("</td><td>").append(sp.side().word())
                    .append("</td><td>").append(Numbers.forPeople(sp.distanceFromStimulusUm())).append("</td><td>")
                    .append(Numbers.forPeople(sp.peakDeltaF())).append("</td><td>")
                    .append(Numbers.forPeople(sp.timeToPeakS())).append("</td><td>")
                    .append(Numbers.forPeople(sp.decayTimeS())).append("</td><td>").append(tauText)
                    .append("</td><td>").append(ci).append("</td></tr>\n");
        }
        h.append("</table>\n<p>Every number is in ").append(SPINES_CSV).append("; the time courses are in ")
                .append(TRACES_CSV).append(".</p>\n");
        if (!s.warnings().isEmpty()) {
            h.append("<ul>\n");
            for (String w : s.warnings()) {
                h.append("<li>").append(Html.esc(w)).append("</li>\n");
            }
            h.append("</ul>\n");
        }
        return h.toString();
    }
}
