package org.dendrokin.io;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.stream.Stream;

import org.dendrokin.core.Progress;
import org.dendrokin.core.kymo.Extraction;
import org.dendrokin.core.kymo.FrameSource;
import org.dendrokin.core.kymo.Kymograph;
import org.dendrokin.core.kymo.KymographExtractor;
import org.dendrokin.core.path.DendritePath;
import org.dendrokin.core.preprocess.BackgroundEstimator;
import org.dendrokin.core.preprocess.BaselineChange;
import org.dendrokin.core.preprocess.Preprocessing;
import org.dendrokin.core.spread.SpreadAnalysis;
import org.dendrokin.io.calib.CalibrationConfig;
import org.dendrokin.io.calib.CalibrationSetup;
import org.dendrokin.io.calib.SessionCalibration;
import org.dendrokin.io.fit.SessionFits;
import org.dendrokin.io.movie.Movie;
import org.dendrokin.io.path.PathFiles;
import org.dendrokin.io.session.ReportHtml;
import org.dendrokin.io.session.ResultsJson;
import org.dendrokin.io.session.SessionConfig;
import org.dendrokin.io.session.SessionPictures;

import com.google.gson.JsonArray;
import com.google.gson.JsonObject;

import ij.gui.Roi;
import ij.io.RoiDecoder;

/**
 * One session folder in, one output folder out: reads session.json, the movie and the path; extracts the
 * kymograph; subtracts the background, corrects bleaching and forms dF/F0; applies the calibration; measures
 * the spread; adds model fits; writes kymograph.csv, pictures, results.json and report.html. The CLI, the
 * SciJava command and the ImageJ 1.x plug-in all call {@link #analyze}. Nothing in the session folder is
 * written; every output goes through {@link AtomicFiles}.
 */
public final class SessionRunner {
    /** Output file names. */
    public static final String KYMOGRAPH_CSV = "kymograph.csv";
    public static final String RESULTS_JSON = "results.json";
    public static final String REPORT_HTML = "report.html";

    private SessionRunner() {
    }

    /**
     * What one analysis produced.
     *
     * @param session      the session folder's name
     * @param outDir       where the outputs are
     * @param report       the report file
     * @param signalUnit   unit of the analysed signal
     * @param spread       model-free spread measures (null when no stimulus was known)
     * @param stimulus     the stimulus used
     * @param fits         fitted models as written to results.json
     * @param bestModel    preferred model, or null
     * @param warnings     plain sentences, also in results.json and the report
     */
    public record Result(String session, Path outDir, Path report, String signalUnit, SpreadAnalysis.Result spread,
            Preprocessing.Stimulus stimulus, List<JsonObject> fits, String bestModel, List<String> warnings) {
    }

    /**
     * Everything the report needs about the inputs. {@code referenceImage} is the mean of up to 10 baseline
     * frames, row-major, {@code width * height} values (shared, not copied).
     */
    public record Inputs(Path sessionDir, SessionConfig config, Path movieFile, Path pathFile, int width, int height,
            int frameCount, int bitDepth, double pixelSizeUm, double frameIntervalS, double pathLengthUm,
            Extraction extraction, double backgroundValue, String backgroundDescription, float[] referenceImage) {
    }

    /**
     * Analyses one session.
     *
     * @param sessionDir folder holding session.json; never written
     * @param outDir     output folder, created with its parents if missing
     * @param progress   progress and cancellation
     * @throws InputException for bad input, naming the file
     */
    public static Result analyze(Path sessionDir, Path outDir, Progress progress) {
        if (!Files.isDirectory(sessionDir)) {
            throw new InputException(sessionDir, "is not a folder");
        }
        SessionConfig config = SessionConfig.read(sessionDir);
        Path sessionFile = sessionDir.resolve(SessionConfig.FILE_NAME);
        CalibrationSetup calibration = CalibrationConfig.parse(config.calibration(), sessionFile);
        List<String> warnings = new ArrayList<>(config.warnings());
        warnings.addAll(calibration.warnings());
        Path movieFile = config.movie() != null ? sessionDir.resolve(config.movie()) : onlyFile(sessionDir,
                "movie", "a TIFF movie", null, ".tif", ".tiff");
        if (!Files.isRegularFile(movieFile)) {
            throw new InputException(sessionDir.resolve(SessionConfig.FILE_NAME),
                    "key \"movie\" names " + config.movie() + ", which is not in the session folder");
        }
        Path pathFile = config.path() != null ? sessionDir.resolve(config.path()) : onlyFile(sessionDir, "path",
                "an ImageJ .roi path", config.backgroundRoi(), ".roi");
        if (!Files.isRegularFile(pathFile)) {
            throw new InputException(sessionDir.resolve(SessionConfig.FILE_NAME),
                    "key \"path\" names " + config.path() + ", which is not in the session folder");
        }
        DendritePath path = PathFiles.read(pathFile, config.pathRoiName());
        Inputs inputs;
        Extraction extraction;
        Preprocessing.Result pre;
        Kymograph ratio = null;
        try (Movie movie = Movie.open(movieFile, config.pixelSizeUm(), config.frameIntervalS())) {
            warnings.addAll(movie.warnings());
            double px = movie.pixelSizeUm();
            double dt = movie.frameIntervalS();
            SessionCalibration.requireChannels(calibration, sessionFile, movieFile, movie.channelCount());
            CalibrationSetup.RatioChannels channels = calibration.channels();
            FrameSource frames = movie.channel(channels == null ? 0 : channels.numerator() - 1);
            if (movie.channelCount() > 1 && channels == null) {
                warnings.add(String.format(Locale.ROOT, "The movie has %d channels; the first was analysed.",
                        movie.channelCount()));
            }
            extraction = KymographExtractor.extract(frames, path, px, dt, config.pathWidthUm(), px, progress);
            if (extraction.fractionOutside() > 0.5) {
                throw new InputException(pathFile, String.format(Locale.ROOT, "%.0f%% of the path lies outside the "
                        + "%d x %d pixel movie", 100 * extraction.fractionOutside(), movie.width(), movie.height()));
            }
            if (extraction.fractionOutside() > 0) {
                warnings.add(String.format(Locale.ROOT, "%.0f%% of the path lies outside the image; those positions "
                        + "are empty (NaN) in the kymograph.", 100 * extraction.fractionOutside()));
            }
            Background bg = background(config, sessionDir, frames, extraction, px, progress);
            double[] background = bg.perFrame();
            double bgValue = bg.value();
            String bgDescription = bg.description();
            if (channels != null) {
                FrameSource denominator = movie.channel(channels.denominator() - 1);
                Kymograph denRaw = KymographExtractor.extract(denominator, path, px, dt, config.pathWidthUm(), px,
                        progress).kymograph();
                double[] numBg = channels.numeratorBackground() == null ? background
                        : SessionCalibration.constant(channels.numeratorBackground(), movie.frameCount());
                double[] denBg = channels.denominatorBackground() != null
                        ? SessionCalibration.constant(channels.denominatorBackground(), movie.frameCount())
                        : background(config, sessionDir, denominator, extraction, px, progress).perFrame();
                ratio = SessionCalibration.ratio(extraction.kymograph(), numBg, denRaw, denBg);
            }
            Kymograph raw = extraction.kymograph();
            try {
                pre = Preprocessing.run(raw, background, new Preprocessing.Options(config.stimulusTimeS(),
                        config.stimulusPositionUm(), config.baselineFrames(), config.bleachCorrection()));
            } catch (IllegalArgumentException e) {
                throw new InputException(sessionDir.resolve(SessionConfig.FILE_NAME), e.getMessage(), e);
            }
            inputs = new Inputs(sessionDir, config, movieFile, pathFile, movie.width(), movie.height(),
                    movie.frameCount(), movie.bitDepth(), px, dt, path.lengthPx() * px, extraction, bgValue,
                    bgDescription, meanFrame(frames, pre.baselineFirst(), pre.baselineLast()));
        }
        warnings.addAll(pre.warnings());

        SessionCalibration.Applied calibrated = SessionCalibration.apply(calibration, pre.bleach().corrected(),
                pre.deltaF().kymograph(), ratio, pre.baselineFirst(), pre.baselineLast());
        warnings.addAll(calibrated.warnings());
        Kymograph signal = calibrated.signal();
        BaselineChange.Result change = BaselineChange.of(signal, pre.baselineFirst(), pre.baselineLast());
        progress.checkCancelled();
        SpreadAnalysis.Result spread = null;
        if (pre.stimulus().known()) {
            spread = SpreadAnalysis.measure(change.kymograph(), pre.stimulus().timeS(), pre.stimulus().positionUm(),
                    change.noiseSd());
            warnings.addAll(spread.warnings());
        }
        List<JsonObject> fits = new ArrayList<>();
        SessionFits sessionFits = SessionFits.run(config.models(), config.fit(), signal, pre.stimulus().known(),
                pre.stimulus().timeS(), pre.stimulus().positionUm(), pre.baselineFirst(), pre.baselineLast(), warnings,
                progress);
        fits.addAll(sessionFits.json());
        String bestModel = sessionFits.bestModel();

        progress.checkCancelled();
        progress.report("writing results", 0, 1);
        try {
            Files.createDirectories(outDir);
        } catch (IOException e) {
            throw new InputException(outDir, "cannot be created (" + e.getMessage() + ")", e);
        }
        KymographCsv.write(signal, outDir.resolve(KYMOGRAPH_CSV));
        if (SessionCalibration.propagated(calibrated)) {
            KymographCsv.write(calibrated.sdMicromolar(), outDir.resolve(SessionCalibration.SD_CSV));
        }
        List<SessionPictures.Picture> pictures = new ArrayList<>(
                SessionPictures.writeAll(outDir, inputs, pre, signal, spread));
        sessionFits.writePictures(outDir).forEach(
                p -> pictures.add(new SessionPictures.Picture(p.file(), p.title(), p.caption())));
        JsonObject spreadResults = spreadJson(spread);
        sessionFits.adjustSpread(spreadResults, warnings);
        String session = sessionName(sessionDir);
        JsonObject results = ResultsJson.build(ToolVersion.get(), session, signal.signalUnit(),
                KYMOGRAPH_CSV, signal.distanceStepUm(), signal.timeStepS(), fits, bestModel, spreadResults,
                extras(inputs, pre, SessionCalibration.toJson(calibration, calibrated)), warnings);
        ResultsJson.write(results, outDir.resolve(RESULTS_JSON));
        Path report = outDir.resolve(REPORT_HTML);
        ReportHtml.write(report, session, inputs, pre, signal, SessionCalibration.sentence(calibration, calibrated),
                spread, fits, bestModel, pictures, warnings);
        progress.report("writing results", 1, 1);
        return new Result(session, outDir, report, signal.signalUnit(), spread, pre.stimulus(), List.copyOf(fits),
                bestModel, List.copyOf(warnings));
    }

    private static JsonObject spreadJson(SpreadAnalysis.Result spread) {
        JsonObject o = new JsonObject();
        o.add("front_speed", ResultsJson.estimate(spread == null ? null : spread.frontSpeed()));
        o.add("length_constant", ResultsJson.estimate(spread == null ? null : spread.lengthConstant()));
        o.add("decay_time", ResultsJson.estimate(spread == null ? null : spread.decayTime()));
        com.google.gson.JsonElement d = ResultsJson.estimate(spread == null ? null : spread.apparentD());
        if (d.isJsonObject() && spread.varianceWindowS() != null) {
            JsonArray window = new JsonArray();
            window.add(spread.varianceWindowS()[0]);
            window.add(spread.varianceWindowS()[1]);
            d.getAsJsonObject().add("time_window_s", window);
        }
        o.add("apparent_D", d);
        o.addProperty("positions_with_arrival", spread == null ? 0 : spread.arrivalTimeS().length);
        return o;
    }

    private static JsonObject extras(Inputs in, Preprocessing.Result pre, JsonObject calibration) {
        JsonObject extra = new JsonObject();
        JsonObject movie = new JsonObject();
        movie.addProperty("file", in.sessionDir().relativize(in.movieFile()).toString());
        movie.addProperty("width_px", in.width());
        movie.addProperty("height_px", in.height());
        movie.addProperty("frames", in.frameCount());
        movie.addProperty("bit_depth", in.bitDepth());
        movie.addProperty("pixel_size_um", in.pixelSizeUm());
        movie.addProperty("frame_interval_s", in.frameIntervalS());
        extra.add("movie", movie);
        JsonObject path = new JsonObject();
        path.addProperty("file", in.sessionDir().relativize(in.pathFile()).toString());
        path.addProperty("length_um", in.pathLengthUm());
        path.addProperty("band_width_um", in.config().pathWidthUm());
        path.addProperty("positions", in.extraction().kymograph().positionCount());
        path.addProperty("fraction_outside_image", in.extraction().fractionOutside());
        extra.add("path", path);
        JsonObject stim = new JsonObject();
        Preprocessing.Stimulus s = pre.stimulus();
        stim.add("time_s", ResultsJson.finiteOrNull(s.timeS()));
        stim.add("position_um", ResultsJson.finiteOrNull(s.positionUm()));
        stim.addProperty("source", s.source());
        if (s.detection() != null) {
            stim.addProperty("detection_strength_noise_sd", s.detection().strength());
            stim.addProperty("detection", s.detection().describe());
        }
        extra.add("stimulus", stim);
        JsonArray baseline = new JsonArray();
        baseline.add(pre.baselineFirst());
        baseline.add(pre.baselineLast());
        extra.add("baseline_frames", baseline);
        JsonObject bg = new JsonObject();
        bg.addProperty("value", in.backgroundValue());
        bg.addProperty("how", in.backgroundDescription());
        extra.add("background", bg);
        JsonObject bleach = new JsonObject();
        bleach.addProperty("requested", in.config().bleachCorrection());
        bleach.addProperty("applied", pre.bleach().applied());
        bleach.add("time_constant", ResultsJson.estimate(pre.bleach().timeConstant()));
        extra.add("bleach_correction", bleach);
        extra.add("baseline_noise_sd_dF_F0", ResultsJson.finiteOrNull(pre.deltaF().typicalNoiseSd()));
        extra.add("calibration", calibration);
        return extra;
    }

    /** Background of each frame (grey values), a representative value, and how it was found. */
    private record Background(double[] perFrame, double value, String description) {
    }

    /** The session's background for one channel: given value, ROI mean frame by frame, or estimated. */
    private static Background background(SessionConfig config, Path sessionDir, FrameSource frames,
            Extraction extraction, double px, Progress progress) {
        int n = frames.frameCount();
        double[] background = new double[n];
        if (config.backgroundValue() != null) {
            java.util.Arrays.fill(background, config.backgroundValue());
            return new Background(background, config.backgroundValue(), "Given in session.json.");
        }
        if (config.backgroundRoi() != null) {
            Path roiFile = sessionDir.resolve(config.backgroundRoi());
            background = roiBackground(roiFile, frames, progress);
            return new Background(background, org.dendrokin.core.preprocess.Robust.median(background),
                    "Mean of the pixels inside " + config.backgroundRoi()
                    + ", frame by frame (the value shown is the median over frames).");
        }
        int span = Math.max(1, Math.min(n, Math.max(16, n / 4)));
        int count = Math.min(16, span);
        int[] picks = new int[count];
        for (int i = 0; i < count; i++) {
            picks[i] = (int) Math.round(i * (span - 1.0) / Math.max(1, count - 1));
        }
        double minDistancePx = (config.pathWidthUm() / 2 + 3.0) / px;
        BackgroundEstimator.Estimate est = BackgroundEstimator.fromFarPixels(frames, extraction.xPx(),
                extraction.yPx(), minDistancePx, picks, progress);
        if (!Double.isFinite(est.value())) {
            throw new InputException(sessionDir.resolve(SessionConfig.FILE_NAME), est.description()
                    + " Set key \"background\" to {\"value\": ...} or {\"roi\": \"file.roi\"}");
        }
        java.util.Arrays.fill(background, est.value());
        return new Background(background, est.value(), est.description());
    }

    private static float[] meanFrame(FrameSource frames, int first, int last) {
        int w = frames.width();
        int h = frames.height();
        int count = Math.min(10, last - first + 1);
        float[] sum = new float[w * h];
        float[] buffer = new float[w * h];
        for (int i = 0; i < count; i++) {
            int f = first + (int) Math.round(i * (last - first) / Math.max(1.0, count - 1.0));
            frames.readRows(f, 0, h, buffer);
            for (int k = 0; k < sum.length; k++) {
                sum[k] += buffer[k] / count;
            }
        }
        return sum;
    }

    private static double[] roiBackground(Path roiFile, FrameSource frames, Progress progress) {
        if (!Files.isRegularFile(roiFile)) {
            throw new InputException(roiFile, "the background ROI named in session.json is not in the session folder");
        }
        Roi roi;
        try {
            roi = RoiDecoder.open(roiFile.toString());
        } catch (RuntimeException e) {
            roi = null;
        }
        if (roi == null || !roi.isArea()) {
            throw new InputException(roiFile, "is not an ImageJ area ROI (rectangle, oval, polygon or freehand area)");
        }
        List<java.awt.Point> inside = new ArrayList<>();
        for (java.awt.Point p : roi.getContainedPoints()) {
            if (p.x >= 0 && p.y >= 0 && p.x < frames.width() && p.y < frames.height()) {
                inside.add(p);
            }
        }
        if (inside.isEmpty()) {
            throw new InputException(roiFile, "covers no pixel of the movie");
        }
        int y0 = inside.stream().mapToInt(p -> p.y).min().getAsInt();
        int y1 = inside.stream().mapToInt(p -> p.y).max().getAsInt();
        int rows = y1 - y0 + 1;
        float[] buffer = new float[rows * frames.width()];
        double[] out = new double[frames.frameCount()];
        for (int f = 0; f < out.length; f++) {
            progress.checkCancelled();
            frames.readRows(f, y0, rows, buffer);
            double sum = 0;
            for (java.awt.Point p : inside) {
                sum += buffer[(p.y - y0) * frames.width() + p.x];
            }
            out[f] = sum / inside.size();
            progress.report("measuring the background", f + 1, out.length);
        }
        return out;
    }

    /** The only file with one of the suffixes, leaving out {@code exclude} (a name another key already uses). */
    private static Path onlyFile(Path dir, String key, String what, String exclude, String... suffixes) {
        List<Path> found;
        try (Stream<Path> files = Files.list(dir)) {
            found = files.filter(Files::isRegularFile).filter(p -> {
                String name = p.getFileName().toString().toLowerCase(Locale.ROOT);
                if (exclude != null && p.getFileName().toString().equals(exclude)) {
                    return false;
                }
                for (String s : suffixes) {
                    if (name.endsWith(s) && !name.startsWith(".")) {
                        return true;
                    }
                }
                return false;
            }).sorted().toList();
        } catch (IOException e) {
            throw new InputException(dir, "cannot be listed (" + e.getMessage() + ")", e);
        }
        if (found.size() != 1) {
            throw new InputException(dir.resolve(SessionConfig.FILE_NAME), String.format(Locale.ROOT,
                    "key \"%s\" is not set and the folder holds %d files of %s, not exactly one; name the file",
                    key, found.size(), what));
        }
        return found.get(0);
    }

    static String sessionName(Path sessionDir) {
        Path abs = sessionDir.toAbsolutePath().normalize();
        return abs.getFileName() == null ? abs.toString() : abs.getFileName().toString();
    }
}
