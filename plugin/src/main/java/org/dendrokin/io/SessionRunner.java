package org.dendrokin.io;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.stream.Stream;

import org.dendrokin.core.Progress;
import org.dendrokin.core.analysis.AnalysisInputException;
import org.dendrokin.core.analysis.AnalysisRequest;
import org.dendrokin.core.analysis.AnalysisResult;
import org.dendrokin.core.analysis.BackgroundRequest;
import org.dendrokin.core.analysis.BranchedPaths;
import org.dendrokin.core.analysis.FitRequest;
import org.dendrokin.core.analysis.SessionAnalysis;
import org.dendrokin.core.analysis.SpineOutcome;
import org.dendrokin.core.analysis.SpineRequest;
import org.dendrokin.core.analysis.SpineStage;
import org.dendrokin.core.analysis.TreeSessionAnalysis;
import org.dendrokin.core.analysis.Warning;
import org.dendrokin.core.kymo.FrameSource;
import org.dendrokin.core.path.DendritePath;
import org.dendrokin.core.preprocess.Preprocessing;
import org.dendrokin.core.spread.SpreadAnalysis;
import org.dendrokin.io.calib.CalibrationConfig;
import org.dendrokin.io.calib.CalibrationSetup;
import org.dendrokin.io.calib.SessionCalibration;
import org.dendrokin.io.calib.SessionLifetime;
import org.dendrokin.io.movie.Movie;
import org.dendrokin.io.path.PathFiles;
import org.dendrokin.io.session.FitSettings;
import org.dendrokin.io.session.ResultsJson;
import org.dendrokin.io.session.SessionConfig;
import org.dendrokin.io.session.SessionInputs;
import org.dendrokin.io.session.SessionOutputs;
import org.dendrokin.io.session.SessionOverrides;
import org.dendrokin.io.session.SpineConfig;
import org.dendrokin.io.session.TreeSession;
import org.dendrokin.io.text.Numbers;

import ij.gui.Roi;

/**
 * One session folder in, one output folder out: reads session.json, the movie and the path and checks them;
 * runs the analysis ({@link SessionAnalysis}: kymograph, background, bleaching, dF/F0, calibration, spread, model
 * fits); writes its outputs ({@link SessionOutputs}). The CLI, the SciJava command, the ImageJ 1.x plug-in and
 * the batch runner all call {@link #analyze}. Nothing in the session folder is written; every output goes
 * through {@link AtomicFiles}.
 */
public final class SessionRunner {
    /** Output file names. */
    public static final String KYMOGRAPH_CSV = SessionOutputs.KYMOGRAPH_CSV;
    public static final String RESULTS_JSON = ResultsJson.FILE_NAME;
    public static final String REPORT_HTML = SessionOutputs.REPORT_HTML;

    private SessionRunner() {
    }

    /**
     * What one analysis produced.
     *
     * @param inputs   what the session folder held
     * @param analysis the typed results, from which every output was written
     * @param outDir   where the outputs are
     * @param report   the report file
     */
    public record Result(SessionInputs inputs, AnalysisResult analysis, Path outDir, Path report) {
        /** The session folder's name. */
        public String session() {
            return inputs.sessionName();
        }

        /** Unit of the analysed signal. */
        public String signalUnit() {
            return analysis.signal().signalUnit();
        }

        /** Model-free spread measures, or null when no stimulus was known. */
        public SpreadAnalysis.Result spread() {
            return analysis.spread();
        }

        /** The stimulus used. */
        public Preprocessing.Stimulus stimulus() {
            return analysis.stimulus();
        }

        /** The preferred model, or null. */
        public String bestModel() {
            return analysis.bestModel();
        }

        /** Every warning sentence, about the inputs first, as in results.json and the report. */
        public List<String> warnings() {
            return Stream.concat(inputs.warnings().stream(), analysis.warnings().stream()).map(Warning::text)
                    .toList();
        }
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
        return analyze(sessionDir, outDir, SessionOverrides.NONE, progress);
    }

    /**
     * Analyses one session with settings given for this run over session.json's (the folder is not changed).
     *
     * @param sessionDir folder holding session.json; never written
     * @param outDir     output folder, created with its parents if missing
     * @param overrides  settings that take precedence over session.json, stated in the outputs
     * @param progress   progress and cancellation
     * @throws InputException for bad input, naming the file or the override
     */
    public static Result analyze(Path sessionDir, Path outDir, SessionOverrides overrides, Progress progress) {
        OutputFolder.check(outDir, sessionDir);
        if (!Files.isDirectory(sessionDir)) {
            throw new InputException(sessionDir, "is not a folder");
        }
        Path sessionFile = sessionDir.resolve(SessionConfig.FILE_NAME);
        SessionConfig config = overrides.apply(SessionConfig.read(sessionDir), sessionFile);
        CalibrationSetup calibration = CalibrationConfig.parse(config.calibration(), sessionFile);
        List<Warning> warnings = new ArrayList<>();
        config.warnings().forEach(w -> warnings.add(new Warning(Warning.Topic.SETTINGS, w)));
        SpineConfig spineConfig = SpineConfig.read(sessionDir);
        if (spineConfig != null) {
            spineConfig.warnings().forEach(w -> warnings.add(new Warning(Warning.Topic.SETTINGS, w)));
        }
        calibration.warnings().forEach(w -> warnings.add(new Warning(Warning.Topic.CALIBRATION, w)));
        Path movieFile = config.movie() != null ? sessionDir.resolve(config.movie()) : onlyFile(sessionDir,
                "movie", "a TIFF movie", null, ".tif", ".tiff");
        if (!Files.isRegularFile(movieFile)) {
            throw new InputException(sessionFile,
                    "key \"movie\" names " + config.movie() + ", which is not in the session folder");
        }
        TreeSession.Lines lines = TreeSession.read(sessionDir, config,
                config.path() == null ? null : sessionDir.resolve(config.path()));
        Path pathFile = lines != null ? lines.files().values().iterator().next()
                : config.path() != null ? sessionDir.resolve(config.path()) : onlyFile(sessionDir, "path",
                        "an ImageJ .roi path", config.backgroundRoi(), ".roi");
        if (!Files.isRegularFile(pathFile)) {
            throw new InputException(sessionFile,
                    "key \"path\" names " + config.path() + ", which is not in the session folder");
        }
        DendritePath path = lines != null ? lines.paths().values().iterator().next()
                : PathFiles.read(pathFile, config.pathRoiName());
        TreeSessionAnalysis.Result tree = null;
        SessionInputs inputs;
        AnalysisResult analysis;
        SpineOutcome spines = null;
        try (Movie movie = Movie.open(movieFile, config.pixelSizeUm(), config.frameIntervalS())) {
            movie.warnings().forEach(w -> warnings.add(new Warning(Warning.Topic.MOVIE, w)));
            SessionCalibration.requireChannels(calibration, sessionFile, movieFile, movie.channelCount());
            CalibrationSetup.RatioChannels channels = calibration.channels();
            SessionConfig.Acquisition acq = config.acquisition();
            int signalChannel = acq.channel() > 0 ? acq.channel() : channels == null ? 1 : channels.numerator();
            if (overrides.setsChannel()) {
                requireChannel(movieFile, movie, overrides.origin().channelName(), signalChannel);
            } else {
                requireChannel(sessionFile, movieFile, movie, "channel", signalChannel);
            }
            if (acq.structuralChannel() > 0 && overrides.structuralChannel() != null) {
                requireChannel(movieFile, movie, overrides.origin().structuralName(), acq.structuralChannel());
            } else if (acq.structuralChannel() > 0) {
                requireChannel(sessionFile, movieFile, movie, "structural_channel", acq.structuralChannel());
            }
            if (movie.zSlices() > 1 && acq.zSlice() > movie.zSlices()) {
                throw new InputException(sessionFile, String.format(Locale.ROOT, "key \"z.slice\" is %d, but %s has "
                        + "%d focal planes", acq.zSlice(), movieFile.getFileName(), movie.zSlices()));
            }
            if (overrides.stimulusXPx() != null && !(overrides.stimulusXPx() >= 0
                    && overrides.stimulusXPx() <= movie.width() && overrides.stimulusYPx() >= 0
                    && overrides.stimulusYPx() <= movie.height())) {
                // named here, not by the analysis's check, which would blame session.json's keys
                throw new InputException(movieFile, String.format(Locale.ROOT, "is %d x %d pixels, but %s places the "
                        + "stimulus spot at (%s, %s) px, outside it", movie.width(), movie.height(),
                        overrides.origin().spotName(), Numbers.forPeople(overrides.stimulusXPx()),
                        Numbers.forPeople(overrides.stimulusYPx())));
            }
            FrameSource frames = planes(movie, signalChannel - 1, acq);
            if (movie.channelCount() > 1 && channels == null && acq.channel() == 0) {
                warnings.add(new Warning(Warning.Topic.MOVIE, String.format(Locale.ROOT, "The movie has %d channels; "
                        + "the first was analysed (set \"channel\" to choose another).", movie.channelCount())));
            }
            if (movie.zSlices() > 1) {
                warnings.add(new Warning(Warning.Topic.MOVIE, acq.zSlice() > 0
                        ? String.format(Locale.ROOT, "The movie has %d focal planes at each time point; plane %d was "
                                + "analysed.", movie.zSlices(), acq.zSlice())
                        : String.format(Locale.ROOT, "The movie has %d focal planes at each time point; their %s "
                                + "projection was analysed (set \"z\" to choose a plane or the other projection).",
                                movie.zSlices(), acq.zProjection().equals("max") ? "maximum" : "mean")));
            }
            SessionLifetime lifetime = calibration.lifetime() == null ? null
                    : SessionLifetime.open(calibration, sessionFile, movie);
            if (lifetime != null) {
                lifetime.warnings().forEach(w -> warnings.add(new Warning(Warning.Topic.MOVIE, w)));
            }
            inputs = new SessionInputs(sessionDir, sessionName(sessionDir), config, movieFile, pathFile,
                    movie.bitDepth(), movie.channelCount(), calibration, warnings, overrides);
            AnalysisRequest request = new AnalysisRequest(frames,
                    channels == null ? null : planes(movie, channels.denominator() - 1, acq),
                    acq.structuralChannel() > 0 ? planes(movie, acq.structuralChannel() - 1, acq) : null, path,
                    movie.pixelSizeUm(), movie.frameIntervalS(), config.pathWidthUm(),
                    background(config, sessionDir, frames), SessionCalibration.request(calibration, lifetime),
                    config.stimuli(), acq.trainGapS(), config.baselineFrames(), config.bleachCorrection(),
                    acq.motion(), acq.normalisation(), fitRequest(config.models(), config.fit()),
                    acq.linePeriodS(movie.frameIntervalS()));
            SpineRequest spineRequest = spineConfig == null ? null
                    : spineConfig.request(sessionDir, frames.width(), frames.height());
            BranchedPaths layout = lines == null ? null : TreeSession.join(lines, movie.pixelSizeUm());
            try (lifetime) {
                analysis = SessionAnalysis.run(request, progress);
            } catch (AnalysisInputException e) {
                Path file = switch (e.subject()) {
                    case PATH -> pathFile;
                    case MOVIE -> movieFile;
                    case SETTINGS -> sessionFile;
                };
                throw new InputException(file, e.getMessage(), e);
            }
            if (spineRequest != null) {
                spines = SpineStage.run(request, analysis, spineRequest, progress);
            }
            if (layout != null) {
                tree = TreeSession.analyse(lines, layout, frames, config, analysis, progress);
            }
        }
        progress.checkCancelled();
        SpineOutcome spinesFound = spines;
        TreeSessionAnalysis.Result treeFound = tree;
        OutputFolder.fill(outDir, dir -> SessionOutputs.write(dir, inputs, analysis, spinesFound, treeFound,
                progress));
        return new Result(inputs, analysis, outDir, outDir.resolve(REPORT_HTML));
    }

    /** Checks that a channel named in session.json exists in the movie. */
    private static void requireChannel(Path sessionFile, Path movieFile, Movie movie, String key, int channel) {
        if (channel > movie.channelCount()) {
            throw new InputException(sessionFile, String.format(Locale.ROOT, "key \"%s\" is %d, but %s has %d "
                    + "channel%s", key, channel, movieFile.getFileName(), movie.channelCount(),
                    movie.channelCount() == 1 ? "" : "s"));
        }
    }

    /** Checks that a channel set for this run (e.g. by {@code --channel}) exists in the movie. */
    private static void requireChannel(Path movieFile, Movie movie, String option, int channel) {
        if (channel > movie.channelCount()) {
            throw new InputException(movieFile, String.format(Locale.ROOT, "has %d channel%s, but %s asks for "
                    + "channel %d", movie.channelCount(), movie.channelCount() == 1 ? "" : "s", option, channel));
        }
    }

    /** A channel's frames: its one focal plane, the chosen plane of a z-stack, or the projection over planes. */
    private static FrameSource planes(Movie movie, int channel, SessionConfig.Acquisition acq) {
        if (movie.zSlices() == 1) {
            return movie.channel(channel);
        }
        return acq.zSlice() > 0 ? movie.slice(channel, acq.zSlice() - 1) : movie.projected(channel, acq.zProjection());
    }

    /** The fit settings of session.json as the analysis takes them. */
    static FitRequest fitRequest(List<String> models, FitSettings fit) {
        return new FitRequest(models, fit.criterion(), fit.profiles(), fit.bootstrapReplicates(), fit.seed(),
                fit.freeStimulus(), fit.sealedEnds());
    }

    /** How session.json asks for the background: a value, a region drawn as a ROI, or an estimate. */
    private static BackgroundRequest background(SessionConfig config, Path sessionDir, FrameSource frames) {
        if (config.backgroundValue() != null) {
            return new BackgroundRequest.Fixed(config.backgroundValue(), "Given in session.json.");
        }
        if (config.backgroundRoi() != null) {
            return roiRegion(sessionDir.resolve(config.backgroundRoi()), config.backgroundRoi(), frames);
        }
        return new BackgroundRequest.Estimated();
    }

    private static BackgroundRequest.Region roiRegion(Path roiFile, String name, FrameSource frames) {
        if (!Files.isRegularFile(roiFile)) {
            throw new InputException(roiFile, "the background ROI named in session.json is not in the session folder");
        }
        Roi roi = PathFiles.readRoi(roiFile);
        if (!roi.isArea()) {
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
        return new BackgroundRequest.Region(inside.stream().mapToInt(p -> p.x).toArray(),
                inside.stream().mapToInt(p -> p.y).toArray(), name);
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
