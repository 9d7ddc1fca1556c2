package org.dendrokin.io.session;

import java.io.IOException;
import java.io.OutputStreamWriter;
import java.io.Writer;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;

import org.dendrokin.core.Progress;
import org.dendrokin.core.analysis.AnalysisResult;
import org.dendrokin.core.analysis.SpineOutcome;
import org.dendrokin.core.analysis.TreeSessionAnalysis;
import org.dendrokin.core.motion.MotionTrace;
import org.dendrokin.io.AtomicFiles;
import org.dendrokin.io.InputException;
import org.dendrokin.io.KymographCsv;
import org.dendrokin.io.plot.Picture;
import org.dendrokin.io.text.Numbers;

import org.apache.commons.csv.CSVFormat;
import org.apache.commons.csv.CSVPrinter;

/**
 * Writes the outputs of one analysis into its output folder, each from the one typed result:
 * {@code kymograph.csv} (and {@code concentration_sd.csv} when the calibration's uncertainty was propagated),
 * the pictures, {@code results.json} and {@code report.html}. Each file goes through a temporary name.
 */
public final class SessionOutputs {
    /** The analysed kymograph. */
    public static final String KYMOGRAPH_CSV = "kymograph.csv";
    /** The per-sample SD of the concentration, same layout as the kymograph. */
    public static final String SD_CSV = "concentration_sd.csv";
    /** The report. */
    public static final String REPORT_HTML = "report.html";
    /** The measured shift of every frame. */
    public static final String MOTION_CSV = "motion.csv";

    private SessionOutputs() {
    }

    /** One line a frame: time, the shift in um along x and y, and the correlation peak's height. */
    private static void writeMotion(MotionTrace t, double frameIntervalS, Path target) {
        AtomicFiles.write(target, out -> {
            Writer w = new OutputStreamWriter(out, StandardCharsets.UTF_8);
            try (CSVPrinter csv = new CSVPrinter(w, CSVFormat.DEFAULT.builder().setRecordSeparator('\n').get())) {
                csv.printRecord("frame", "time_s", "dx_um", "dy_um", "peak_height");
                double[] dx = t.dxUm();
                double[] dy = t.dyUm();
                double[] peaks = t.peakHeights();
                for (int f = 0; f < dx.length; f++) {
                    csv.printRecord(f, Numbers.forFile(f * frameIntervalS), Numbers.forFile(dx[f]),
                            Numbers.forFile(dy[f]), Numbers.forFile(peaks[f]));
                }
            }
        });
    }

    /**
     * Writes every output.
     *
     * @param outDir   output folder, created with its parents if missing
     * @param in       the session's inputs
     * @param a        the analysis
     * @param progress progress of the writing
     * @return the report file
     */
    public static Path write(Path outDir, SessionInputs in, AnalysisResult a, Progress progress) {
        return write(outDir, in, a, null, progress);
    }

    /**
     * Writes every output, with the spines' ({@link SpineOutputs}) when they were analysed.
     *
     * @param spines the spine analysis, or null when the session did not ask for one
     */
    public static Path write(Path outDir, SessionInputs in, AnalysisResult a, SpineOutcome spines,
            Progress progress) {
        return write(outDir, in, a, spines, null, progress);
    }

    /**
     * Writes every output, with the spines' when they were analysed and those of a branched session's tree ({@link
     * TreeSessionOutputs}) when there is one.
     *
     * @param spines the spine analysis, or null when the session did not ask for one
     * @param tree   the branched part, or null for a single-path session
     */
    public static Path write(Path outDir, SessionInputs in, AnalysisResult a, SpineOutcome spines,
            TreeSessionAnalysis.Result tree, Progress progress) {
        progress.report("writing results", 0, 1);
        try {
            Files.createDirectories(outDir);
        } catch (IOException e) {
            throw new InputException(outDir, "cannot be created (" + e.getMessage() + ")", e);
        }
        KymographCsv.write(a.signal(), outDir.resolve(KYMOGRAPH_CSV));
        if (a.calibrated().propagated()) {
            KymographCsv.write(a.calibrated().sdMicromolar(), outDir.resolve(SD_CSV));
        }
        if (a.motion().trace() != null) {
            writeMotion(a.motion().trace(), a.movie().frameIntervalS(), outDir.resolve(MOTION_CSV));
        }
        double saturation = in.bitDepth() == 8 || in.bitDepth() == 16 ? (1 << in.bitDepth()) - 1 : Double.NaN;
        List<Picture> pictures = new java.util.ArrayList<>(SessionPictures.writeAll(outDir, a, saturation));
        if (spines != null) {
            pictures.add(SpineOutputs.write(outDir, spines));
        }
        if (tree != null) {
            pictures.addAll(TreeSessionOutputs.write(outDir, tree));
        }
        com.google.gson.JsonObject results = ResultsJson.build(in, a, KYMOGRAPH_CSV, spines);
        if (tree != null) {
            results.add(TreeSession.KEY, TreeSessionOutputs.json(tree));   // the "tree" section, last
        }
        ResultsJson.write(results, outDir.resolve(ResultsJson.FILE_NAME));
        Path report = outDir.resolve(REPORT_HTML);
        ReportHtml.write(report, in, a, pictures, spines, tree == null ? "" : TreeSessionOutputs.html(tree));
        progress.report("writing results", 1, 1);
        return report;
    }
}
