package org.dendrokin.io.session;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.Set;

import org.dendrokin.core.analysis.AnalysisRequest;
import org.dendrokin.core.analysis.MotionMode;
import org.dendrokin.core.analysis.Normalisation;
import org.dendrokin.core.analysis.StimulusSpec;
import org.dendrokin.core.model.ModelCatalogue;
import org.dendrokin.io.InputException;
import org.dendrokin.io.json.JsonFields;
import org.dendrokin.io.json.JsonFiles;
import org.dendrokin.io.text.TextFiles;

import com.google.gson.JsonArray;
import com.google.gson.JsonElement;
import com.google.gson.JsonObject;

/**
 * The settings of one session, read from its {@code session.json}. Every key is optional except that a path
 * must be given or found; a null field means "not given" (use the TIFF's calibration, detect the stimulus,
 * estimate the background, ...). Unknown keys are kept as warnings, not errors, so that a newer session file
 * still runs.
 *
 * @param movie              movie file name relative to the folder, or null for the only TIFF there
 * @param path               path file name relative to the folder, or null for the only .roi there
 * @param pathRoiName        name of the ROI inside a RoiSet.zip, or null for the first line ROI
 * @param pathWidthUm        width of the band averaged across the path, um (default 1.0)
 * @param pixelSizeUm        pixel size override, um, or null
 * @param frameIntervalS     frame interval override, s, or null
 * @param stimulusTimeS      stimulus time, s, or null to detect
 * @param stimulusPositionUm stimulus position along the path, um, or null to detect
 * @param baselineFrames     {first, last}, 0-based inclusive, or null for every frame before the stimulus
 * @param backgroundValue    background grey value, or null
 * @param backgroundRoi      background ROI file name relative to the folder, or null
 * @param calibration        the {@code calibration} object as written ({"method": "none"} when absent)
 * @param models             model names to fit, or null for every built-in one that applies
 * @param bleachCorrection   false when {@code "bleach_correction": false}
 * @param fit                how the models are fitted ({@link FitSettings#DEFAULT} when absent)
 * @param warnings           sentences about keys that were ignored
 * @param stimuli            every stimulus as given ({@code stimulus} or {@code stimuli}); one entry with nothing
 *                           given when the stimulus is to be detected. The first is the one of
 *                           {@code stimulusTimeS} and {@code stimulusPositionUm}.
 * @param acquisition        channels, z-slices, motion and the train gap
 */
public record SessionConfig(String movie, String path, String pathRoiName, double pathWidthUm, Double pixelSizeUm,
        Double frameIntervalS, Double stimulusTimeS, Double stimulusPositionUm, int[] baselineFrames,
        Double backgroundValue, String backgroundRoi, JsonObject calibration, List<String> models,
        boolean bleachCorrection, FitSettings fit, List<String> warnings, List<StimulusSpec> stimuli,
        Acquisition acquisition) {

    /**
     * Which parts of the movie are analysed, and how.
     *
     * @param channel           signal channel, counted from 1, or 0 when not given (the first, or the ratio
     *                          method's numerator)
     * @param structuralChannel structural channel counted from 1, or 0 for none
     * @param normalisation     normalisation by the structural channel
     * @param motion            what to do about motion (default: correct)
     * @param zSlice            z-slice to analyse, counted from 1, or 0 to project
     * @param zProjection       "max" or "mean", the projection over slices when {@code zSlice} is 0
     * @param trainGapS         largest gap between pulses of one train, s
     * @param linePeriodS       time between scan lines, s ({@code line_period_s}, or the frame interval over
     *                          {@code lines_per_frame}), or 0 when not given
     * @param linesPerFrame     {@code lines_per_frame} as given, or 0
     */
    public record Acquisition(int channel, int structuralChannel, Normalisation normalisation, MotionMode motion,
                              int zSlice, String zProjection, double trainGapS, double linePeriodS,
                              int linesPerFrame) {
        /** Nothing given. */
        public static final Acquisition DEFAULT = new Acquisition(0, 0, Normalisation.NONE, MotionMode.CORRECT, 0,
                "max", AnalysisRequest.DEFAULT_TRAIN_GAP_S, 0, 0);

        /** The line period for a movie of the given frame interval, s (0 for none). */
        public double linePeriodS(double frameIntervalS) {
            return linesPerFrame > 0 ? frameIntervalS / linesPerFrame : linePeriodS;
        }
    }

    /** The name of the file that marks a session folder. */
    public static final String FILE_NAME = "session.json";

    /** The calibration methods of the contract. */
    public static final List<String> CALIBRATION_METHODS =
            List.of("none", "single-wavelength", "dynamic-range", "ratio", "hill", "standards", "file", "ratio-change",
                    "lifetime");

    private static final Set<String> KEYS = Set.of("movie", "path", "path_roi_name", "path_width_um", "pixel_size_um",
            "frame_interval_s", "stimulus", "stimuli", "train_gap_s", "baseline_frames", "background", "calibration",
            "models", "bleach_correction", "fit", "description", "notes", "group", "channel", "structural_channel",
            "normalisation", "motion", "z", "line_period_s", "lines_per_frame", SpineConfig.KEY, "tree");
    private static final Set<String> FIT_KEYS = Set.of("criterion", "profiles", "bootstrap_replicates", "seed",
            "free_stimulus", "sealed_ends");
    private static final Set<String> STIMULUS_KEYS = Set.of("time_s", "position_um", "x_px", "y_px");
    private static final Set<String> Z_KEYS = Set.of("slice", "projection");
    /** The names {@code models} may hold: the models the session analysis can fit. */
    private static final List<String> FITTABLE_MODELS = ModelCatalogue.scalarNames();

    public SessionConfig {
        baselineFrames = baselineFrames == null ? null : baselineFrames.clone();
        calibration = calibration == null ? null : calibration.deepCopy();
        models = models == null ? null : List.copyOf(models);
        warnings = List.copyOf(warnings);
        stimuli = List.copyOf(stimuli);
    }

    @Override
    public int[] baselineFrames() {
        return baselineFrames == null ? null : baselineFrames.clone();
    }

    @Override
    public JsonObject calibration() {
        return calibration.deepCopy();
    }

    /** The calibration method name, e.g. {@code "none"}. */
    public String calibrationMethod() {
        return calibration.get("method").getAsString();
    }

    /** Reads {@code session.json} in the given folder. */
    public static SessionConfig read(Path sessionDir) {
        Path file = sessionDir.resolve(FILE_NAME);
        if (!Files.isRegularFile(file)) {
            throw new InputException(sessionDir, "this folder has no " + FILE_NAME + ", so it is not a session folder");
        }
        return parse(file, TextFiles.read(file));
    }

    /** Parses the text of a session.json; {@code file} names it in error messages. */
    public static SessionConfig parse(Path file, String text) {
        JsonFields root = JsonFields.of(file, JsonFiles.parseObject(file, text, "the session's settings"));
        List<String> warnings = new ArrayList<>();
        ignored(root, KEYS, warnings);
        String movie = root.optionalString("movie");
        String path = root.optionalString("path");
        String pathRoiName = root.optionalString("path_roi_name");
        Double width = root.optionalNonNegative("path_width_um");
        Double pixel = root.optionalPositive("pixel_size_um");
        Double interval = root.optionalPositive("frame_interval_s");
        List<StimulusSpec> stimuli = stimuli(root, warnings);
        Double stimTime = stimuli.get(0).timeS();
        Double stimPos = stimuli.get(0).positionUm();
        int[] baseline = null;
        if (root.get("baseline_frames") != null) {
            baseline = frameRange(root);
        }
        Double bgValue = null;
        String bgRoi = null;
        if (root.get("background") != null) {
            JsonFields b = root.object("background");
            boolean hasValue = b.get("value") != null;
            boolean hasRoi = b.get("roi") != null;
            if (hasValue == hasRoi) {
                throw root.bad("background", "must hold exactly one of \"value\" (a grey value) or \"roi\" (a .roi "
                        + "file)");
            }
            if (hasValue) {
                bgValue = b.number("value");
            } else {
                bgRoi = b.string("roi");
            }
        }
        JsonObject calibration;
        if (root.get("calibration") != null) {
            JsonFields c = root.object("calibration");
            String method = c.optionalString("method");
            if (method == null || !CALIBRATION_METHODS.contains(method)) {
                throw c.bad("method", "must be one of " + String.join(", ", CALIBRATION_METHODS));
            }
            calibration = c.json();
        } else {
            calibration = new JsonObject();
            calibration.addProperty("method", "none");
        }
        List<String> models = null;
        if (root.get("models") != null) {
            models = root.strings("models", "must be a list of model names");
            for (String m : models) {
                if (!FITTABLE_MODELS.contains(m)) {
                    throw root.bad("models", "names \"" + m + "\", which is not a model Dendrokin fits; use "
                            + String.join(", ", FITTABLE_MODELS));
                }
            }
        }
        boolean bleach = root.flag("bleach_correction", true);
        FitSettings fit = FitSettings.DEFAULT;
        if (root.get("fit") != null) {
            fit = fitSettings(root.object("fit"), warnings);
        }
        Acquisition acquisition = acquisition(root, warnings);
        if (acquisition.normalisation() != Normalisation.NONE && !"none".equals(calibration.get("method")
                .getAsString())) {
            throw root.bad("normalisation", "cannot be combined with a calibration: give \"normalisation\": \""
                    + acquisition.normalisation().key() + "\" or a calibration method, not both");
        }
        return new SessionConfig(movie, path, pathRoiName, width == null ? 1.0 : width, pixel, interval, stimTime,
                stimPos, baseline, bgValue, bgRoi, calibration, models, bleach, fit, warnings, stimuli, acquisition);
    }

    /**
     * {@code stimulus} (one) or {@code stimuli} (a list), each with {@code time_s} and either {@code position_um}
     * along the path or a spot {@code x_px}, {@code y_px} of the image.
     */
    private static List<StimulusSpec> stimuli(JsonFields root, List<String> warnings) {
        if (root.get("stimulus") != null && root.get("stimuli") != null) {
            throw root.bad("stimuli", "cannot be given together with \"stimulus\": list every stimulus in "
                    + "\"stimuli\"");
        }
        if (root.get("stimuli") != null) {
            List<JsonFields> list = root.objects("stimuli");
            if (list.isEmpty()) {
                throw root.bad("stimuli", "must list at least one stimulus");
            }
            List<StimulusSpec> out = new ArrayList<>();
            for (JsonFields s : list) {
                out.add(stimulus(s, warnings));
            }
            return out;
        }
        if (root.get("stimulus") != null) {
            return List.of(stimulus(root.object("stimulus"), warnings));
        }
        return List.of(StimulusSpec.DETECT);
    }

    private static StimulusSpec stimulus(JsonFields s, List<String> warnings) {
        ignored(s, STIMULUS_KEYS, warnings);
        Double time = s.optionalNonNegative("time_s");
        Double position = s.optionalNonNegative("position_um");
        Double x = s.optionalNumber("x_px");
        Double y = s.optionalNumber("y_px");
        if ((x == null) != (y == null)) {
            throw s.bad(x == null ? "x_px" : "y_px", "must be given together with \"" + (x == null ? "y_px" : "x_px")
                    + "\": a stimulation spot needs both coordinates");
        }
        if (x != null && position != null) {
            throw s.bad("position_um", "cannot be given together with a spot (x_px, y_px): give one of them");
        }
        return new StimulusSpec(time, position, x, y);
    }

    /** Channels, normalisation, motion, z-slices and the train gap. */
    private static Acquisition acquisition(JsonFields root, List<String> warnings) {
        Acquisition d = Acquisition.DEFAULT;
        int channel = (int) root.wholeNumber("channel", 1, 1000, d.channel());
        int structural = (int) root.wholeNumber("structural_channel", 1, 1000, d.structuralChannel());
        if (structural != 0 && structural == channel) {
            throw root.bad("structural_channel", "must differ from \"channel\" (" + channel + ")");
        }
        String n = root.optionalString("normalisation");
        Normalisation normalisation = n == null ? d.normalisation() : Normalisation.of(n);
        if (normalisation == null) {
            throw root.bad("normalisation", "must be \"none\", \"G/R\" or \"dG/R\"");
        }
        if (normalisation != Normalisation.NONE && structural == 0) {
            throw root.bad("normalisation", "needs \"structural_channel\": the channel of the structural dye");
        }
        String m = root.optionalString("motion");
        MotionMode motion = m == null ? d.motion() : MotionMode.of(m);
        if (motion == null) {
            throw root.bad("motion", "must be \"correct\", \"measure\" or \"off\"");
        }
        int slice = d.zSlice();
        String projection = d.zProjection();
        if (root.get("z") != null) {
            JsonFields z = root.object("z");
            ignored(z, Z_KEYS, warnings);
            if ((z.get("slice") == null) == (z.get("projection") == null)) {
                throw root.bad("z", "must hold exactly one of \"slice\" (a slice number counted from 1) or "
                        + "\"projection\" (\"max\" or \"mean\")");
            }
            if (z.get("slice") != null) {
                slice = (int) z.wholeNumber("slice", 1, 100_000, 0);
            } else {
                projection = z.string("projection");
                if (!projection.equals("max") && !projection.equals("mean")) {
                    throw z.bad("projection", "must be \"max\" or \"mean\"");
                }
            }
        }
        Double gap = root.optionalNonNegative("train_gap_s");
        Double line = root.optionalPositive("line_period_s");
        int lines = root.has("lines_per_frame") ? (int) root.wholeNumber("lines_per_frame", 1, 1_000_000, 0) : 0;
        if (line != null && lines > 0) {
            throw root.bad("lines_per_frame", "cannot be given with \"line_period_s\"; give one of them");
        }
        return new Acquisition(channel, structural, normalisation, motion, slice, projection,
                gap == null ? d.trainGapS() : gap, line == null ? 0 : line, lines);
    }

    /** Adds a warning for each key of {@code o} that Dendrokin does not read. */
    private static void ignored(JsonFields o, Set<String> known, List<String> warnings) {
        for (String key : o.unknownKeys(known)) {
            warnings.add(String.format(Locale.ROOT, "%s: key \"%s\" is not one Dendrokin knows and was ignored.",
                    o.file().getFileName(), key));
        }
    }

    private static FitSettings fitSettings(JsonFields f, List<String> warnings) {
        ignored(f, FIT_KEYS, warnings);
        FitSettings d = FitSettings.DEFAULT;
        String criterion = f.optionalString("criterion");
        if (criterion == null) {
            criterion = d.criterion();
        } else if (!FitSettings.CRITERIA.contains(criterion)) {
            throw f.bad("criterion", "must be one of " + String.join(", ", FitSettings.CRITERIA));
        }
        boolean profiles = f.flag("profiles", d.profiles());
        boolean freeStimulus = f.flag("free_stimulus", d.freeStimulus());
        boolean sealedEnds = f.flag("sealed_ends", d.sealedEnds());
        int replicates = (int) f.wholeNumber("bootstrap_replicates", 0, FitSettings.MAX_BOOTSTRAP,
                d.bootstrapReplicates());
        long seed = f.wholeNumber("seed", 0, Long.MAX_VALUE, d.seed());
        return new FitSettings(criterion, profiles, replicates, seed, freeStimulus, sealedEnds);
    }

    /** {@code baseline_frames}: [first, last], whole frame numbers from 0, first <= last. */
    private static int[] frameRange(JsonFields root) {
        String need = "must be [first, last]: two whole frame numbers counted from 0, first <= last";
        JsonElement e = root.get("baseline_frames");
        if (!e.isJsonArray() || e.getAsJsonArray().size() != 2) {
            throw root.bad("baseline_frames", need);
        }
        JsonArray a = e.getAsJsonArray();
        int[] out = new int[2];
        for (int i = 0; i < 2; i++) {
            JsonElement x = a.get(i);
            boolean number = x.isJsonPrimitive() && x.getAsJsonPrimitive().isNumber();
            double v = number ? x.getAsDouble() : Double.NaN;
            if (!(v == Math.rint(v) && v >= 0 && v <= Integer.MAX_VALUE)) {
                throw root.bad("baseline_frames", need);
            }
            out[i] = (int) v;
        }
        if (out[0] > out[1]) {
            throw root.bad("baseline_frames", need);
        }
        return out;
    }

    /** The keys Dendrokin reads, for documentation and tests. */
    public static Set<String> knownKeys() {
        return KEYS;
    }
}
