package org.dendrokin.io.session;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;

import org.dendrokin.core.Progress;
import org.dendrokin.core.analysis.AnalysisResult;
import org.dendrokin.io.InputException;
import org.dendrokin.io.KymographCsv;
import org.dendrokin.io.plot.Picture;

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

    private SessionOutputs() {
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
        double saturation = in.bitDepth() == 8 || in.bitDepth() == 16 ? (1 << in.bitDepth()) - 1 : Double.NaN;
        List<Picture> pictures = SessionPictures.writeAll(outDir, a, saturation);
        ResultsJson.write(ResultsJson.build(in, a, KYMOGRAPH_CSV), outDir.resolve(ResultsJson.FILE_NAME));
        Path report = outDir.resolve(REPORT_HTML);
        ReportHtml.write(report, in, a, pictures);
        progress.report("writing results", 1, 1);
        return report;
    }
}
