package org.dendrokin.io.session;

import java.io.IOException;
import java.io.StringReader;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.Set;
import java.util.regex.Matcher;
import java.util.regex.Pattern;

import org.dendrokin.io.InputException;

import com.google.gson.JsonArray;
import com.google.gson.JsonElement;
import com.google.gson.JsonObject;
import com.google.gson.JsonParseException;
import com.google.gson.JsonParser;
import com.google.gson.Strictness;
import com.google.gson.stream.JsonReader;
import com.google.gson.stream.JsonToken;

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
 */
public record SessionConfig(String movie, String path, String pathRoiName, double pathWidthUm, Double pixelSizeUm,
        Double frameIntervalS, Double stimulusTimeS, Double stimulusPositionUm, int[] baselineFrames,
        Double backgroundValue, String backgroundRoi, JsonObject calibration, List<String> models,
        boolean bleachCorrection, FitSettings fit, List<String> warnings) {

    /** The name of the file that marks a session folder. */
    public static final String FILE_NAME = "session.json";

    /** The calibration methods of the contract. */
    public static final List<String> CALIBRATION_METHODS =
            List.of("none", "single-wavelength", "dynamic-range", "ratio", "hill", "standards", "file");

    private static final Set<String> KEYS = Set.of("movie", "path", "path_roi_name", "path_width_um", "pixel_size_um",
            "frame_interval_s", "stimulus", "baseline_frames", "background", "calibration", "models",
            "bleach_correction", "fit", "description", "notes", "group");
    private static final Set<String> FIT_KEYS = Set.of("criterion", "profiles", "bootstrap_replicates", "seed",
            "free_stimulus", "sealed_ends");
    private static final Pattern LINE = Pattern.compile("line (\\d+)");

    public SessionConfig {
        baselineFrames = baselineFrames == null ? null : baselineFrames.clone();
        calibration = calibration == null ? null : calibration.deepCopy();
        models = models == null ? null : List.copyOf(models);
        warnings = List.copyOf(warnings);
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
        String text;
        try {
            text = Files.readString(file, StandardCharsets.UTF_8);
        } catch (IOException e) {
            throw new InputException(file, "cannot be read (" + e.getMessage() + ")", e);
        }
        return parse(file, text);
    }

    /** Parses the text of a session.json; {@code file} names it in error messages. */
    public static SessionConfig parse(Path file, String text) {
        JsonObject root = strictObject(file, text);
        Parser p = new Parser(file);
        List<String> warnings = new ArrayList<>();
        for (String key : root.keySet()) {
            if (!KEYS.contains(key)) {
                warnings.add(String.format(Locale.ROOT, "%s: key \"%s\" is not one Dendrokin knows and was ignored.",
                        file.getFileName(), key));
            }
        }
        String movie = p.string(root, "movie", "movie");
        String path = p.string(root, "path", "path");
        String pathRoiName = p.string(root, "path_roi_name", "path_roi_name");
        Double width = p.number(root, "path_width_um", "path_width_um", true);
        Double pixel = p.number(root, "pixel_size_um", "pixel_size_um", false);
        Double interval = p.number(root, "frame_interval_s", "frame_interval_s", false);
        Double stimTime = null;
        Double stimPos = null;
        if (root.has("stimulus")) {
            JsonObject s = p.object(root, "stimulus", "stimulus");
            for (String key : s.keySet()) {
                if (!key.equals("time_s") && !key.equals("position_um")) {
                    warnings.add(String.format(Locale.ROOT, "%s: key \"stimulus.%s\" is not one Dendrokin knows and "
                            + "was ignored.", file.getFileName(), key));
                }
            }
            stimTime = p.number(s, "time_s", "stimulus.time_s", true);
            stimPos = p.number(s, "position_um", "stimulus.position_um", true);
        }
        int[] baseline = null;
        if (root.has("baseline_frames")) {
            baseline = p.frameRange(root.get("baseline_frames"));
        }
        Double bgValue = null;
        String bgRoi = null;
        if (root.has("background")) {
            JsonObject b = p.object(root, "background", "background");
            boolean hasValue = b.has("value");
            boolean hasRoi = b.has("roi");
            if (hasValue == hasRoi) {
                throw p.bad("background", "must hold exactly one of \"value\" (a grey value) or \"roi\" (a .roi file)",
                        b);
            }
            if (hasValue) {
                bgValue = p.finite(b, "value", "background.value");
            } else {
                bgRoi = p.string(b, "roi", "background.roi");
            }
        }
        JsonObject calibration;
        if (root.has("calibration")) {
            calibration = p.object(root, "calibration", "calibration");
            String method = p.string(calibration, "method", "calibration.method");
            if (method == null || !CALIBRATION_METHODS.contains(method)) {
                throw p.bad("calibration.method", "must be one of " + String.join(", ", CALIBRATION_METHODS),
                        calibration.get("method"));
            }
        } else {
            calibration = new JsonObject();
            calibration.addProperty("method", "none");
        }
        List<String> models = null;
        if (root.has("models")) {
            JsonElement m = root.get("models");
            if (!m.isJsonArray()) {
                throw p.bad("models", "must be a list of model names", m);
            }
            models = new ArrayList<>();
            for (JsonElement e : m.getAsJsonArray()) {
                if (!e.isJsonPrimitive() || !e.getAsJsonPrimitive().isString()) {
                    throw p.bad("models", "must be a list of model names", m);
                }
                models.add(e.getAsString());
            }
        }
        boolean bleach = p.flag(root, "bleach_correction", "bleach_correction", true);
        FitSettings fit = FitSettings.DEFAULT;
        if (root.has("fit")) {
            fit = fitSettings(p, p.object(root, "fit", "fit"), file, warnings);
        }
        return new SessionConfig(movie, path, pathRoiName, width == null ? 1.0 : width, pixel, interval, stimTime,
                stimPos, baseline, bgValue, bgRoi, calibration, models, bleach, fit, warnings);
    }

    private static FitSettings fitSettings(Parser p, JsonObject f, Path file, List<String> warnings) {
        for (String key : f.keySet()) {
            if (!FIT_KEYS.contains(key)) {
                warnings.add(String.format(Locale.ROOT, "%s: key \"fit.%s\" is not one Dendrokin knows and was "
                        + "ignored.", file.getFileName(), key));
            }
        }
        FitSettings d = FitSettings.DEFAULT;
        String criterion = p.string(f, "criterion", "fit.criterion");
        if (criterion == null) {
            criterion = d.criterion();
        } else if (!FitSettings.CRITERIA.contains(criterion)) {
            throw p.bad("fit.criterion", "must be one of " + String.join(", ", FitSettings.CRITERIA),
                    f.get("criterion"));
        }
        boolean profiles = p.flag(f, "profiles", "fit.profiles", d.profiles());
        boolean freeStimulus = p.flag(f, "free_stimulus", "fit.free_stimulus", d.freeStimulus());
        boolean sealedEnds = p.flag(f, "sealed_ends", "fit.sealed_ends", d.sealedEnds());
        int replicates = (int) p.wholeNumber(f, "bootstrap_replicates", "fit.bootstrap_replicates", 0,
                FitSettings.MAX_BOOTSTRAP, d.bootstrapReplicates());
        long seed = p.wholeNumber(f, "seed", "fit.seed", 0, Long.MAX_VALUE, d.seed());
        return new FitSettings(criterion, profiles, replicates, seed, freeStimulus, sealedEnds);
    }

    /** Parses strictly (no comments, no trailing commas, no single quotes); a syntax error names its line. */
    private static JsonObject strictObject(Path file, String text) {
        if (text.isBlank()) {
            throw new InputException(file, "is empty; it must hold one JSON object {...} with the session's settings");
        }
        try (JsonReader reader = new JsonReader(new StringReader(text))) {
            reader.setStrictness(Strictness.STRICT);
            JsonElement root = JsonParser.parseReader(reader);
            if (reader.peek() != JsonToken.END_DOCUMENT) {
                throw new InputException(file, "has text after the closing brace of the settings object");
            }
            if (!root.isJsonObject()) {
                throw new InputException(file, "must hold one JSON object {...} with the session's settings");
            }
            return root.getAsJsonObject();
        } catch (JsonParseException | IOException e) {
            String msg = e.getMessage() == null ? "" : e.getMessage();
            Matcher m = LINE.matcher(msg);
            String where = m.find() ? "line " + m.group(1) : "somewhere";
            if (msg.contains("End of input") || msg.contains("EOFException") || text.isBlank()) {
                return failEnd(file, where);
            }
            throw new InputException(file, "is not valid JSON: the problem is at " + where
                    + " (check for a missing comma or quote, a trailing comma, or a comment)", e);
        }
    }

    private static JsonObject failEnd(Path file, String where) {
        throw new InputException(file, "is not valid JSON: it ends too early (" + where
                + "); a closing brace or bracket is probably missing");
    }

    /** Reads typed values, naming the key in every complaint. */
    private static final class Parser {
        private final Path file;

        Parser(Path file) {
            this.file = file;
        }

        InputException bad(String key, String requirement, JsonElement got) {
            return new InputException(file,
                    "key \"" + key + "\" " + requirement + ", got " + (got == null ? "nothing" : got.toString()));
        }

        String string(JsonObject o, String name, String key) {
            if (!o.has(name) || o.get(name).isJsonNull()) {
                return null;
            }
            JsonElement e = o.get(name);
            if (!e.isJsonPrimitive() || !e.getAsJsonPrimitive().isString() || e.getAsString().isBlank()) {
                throw bad(key, "must be a file or item name in quotes", e);
            }
            return e.getAsString();
        }

        JsonObject object(JsonObject o, String name, String key) {
            JsonElement e = o.get(name);
            if (e == null || !e.isJsonObject()) {
                throw bad(key, "must be an object {...}", e);
            }
            return e.getAsJsonObject();
        }

        Double number(JsonObject o, String name, String key, boolean zeroAllowed) {
            if (!o.has(name) || o.get(name).isJsonNull()) {
                return null;
            }
            JsonElement e = o.get(name);
            double v = isNumber(e) ? e.getAsDouble() : Double.NaN;
            boolean ok = Double.isFinite(v) && (zeroAllowed ? v >= 0 : v > 0);
            if (!ok) {
                throw bad(key, zeroAllowed ? "must be zero or a positive number" : "must be a positive number", e);
            }
            return v;
        }

        double finite(JsonObject o, String name, String key) {
            JsonElement e = o.get(name);
            if (!isNumber(e) || !Double.isFinite(e.getAsDouble())) {
                throw bad(key, "must be a number", e);
            }
            return e.getAsDouble();
        }

        boolean flag(JsonObject o, String name, String key, boolean absent) {
            if (!o.has(name) || o.get(name).isJsonNull()) {
                return absent;
            }
            JsonElement e = o.get(name);
            if (!e.isJsonPrimitive() || !e.getAsJsonPrimitive().isBoolean()) {
                throw bad(key, "must be true or false", e);
            }
            return e.getAsBoolean();
        }

        long wholeNumber(JsonObject o, String name, String key, long min, long max, long absent) {
            if (!o.has(name) || o.get(name).isJsonNull()) {
                return absent;
            }
            JsonElement e = o.get(name);
            double v = isNumber(e) ? e.getAsDouble() : Double.NaN;
            if (!(v == Math.rint(v) && v >= min && v <= max)) {
                throw bad(key, "must be a whole number from " + min + " to " + max, e);
            }
            return e.getAsLong();
        }

        int[] frameRange(JsonElement e) {
            String need = "must be [first, last]: two whole frame numbers counted from 0, first <= last";
            if (!e.isJsonArray() || e.getAsJsonArray().size() != 2) {
                throw bad("baseline_frames", need, e);
            }
            JsonArray a = e.getAsJsonArray();
            int[] out = new int[2];
            for (int i = 0; i < 2; i++) {
                JsonElement x = a.get(i);
                if (!isNumber(x) || x.getAsDouble() != Math.rint(x.getAsDouble()) || x.getAsDouble() < 0
                        || x.getAsDouble() > Integer.MAX_VALUE) {
                    throw bad("baseline_frames", need, e);
                }
                out[i] = (int) x.getAsDouble();
            }
            if (out[0] > out[1]) {
                throw bad("baseline_frames", need, e);
            }
            return out;
        }

        private static boolean isNumber(JsonElement e) {
            return e != null && e.isJsonPrimitive() && e.getAsJsonPrimitive().isNumber();
        }
    }

    /** The keys Dendrokin reads, for documentation and tests. */
    public static Set<String> knownKeys() {
        return KEYS;
    }
}
