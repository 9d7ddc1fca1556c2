package org.dendrokin.io.calib;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.Set;
import java.util.function.Supplier;

import org.dendrokin.core.calib.Calibration;
import org.dendrokin.core.calib.DynamicRange;
import org.dendrokin.core.calib.Hill;
import org.dendrokin.core.calib.MeanLifetime;
import org.dendrokin.core.calib.Ratio;
import org.dendrokin.core.calib.RatioChange;
import org.dendrokin.core.calib.SaturationLimits;
import org.dendrokin.core.calib.SingleWavelength;
import org.dendrokin.core.calib.Standards;
import org.dendrokin.core.calib.TwoStateLifetime;
import org.dendrokin.io.InputException;
import org.dendrokin.io.json.JsonFields;

import com.google.gson.JsonObject;

/**
 * Reads the {@code calibration} block of session.json. The keys of the contract, plus these of our own:
 * <ul>
 * <li>standard deviations for first-order error propagation: {@code kd_uM_sd}, {@code f_min_sd},
 *     {@code f_max_sd} (single-wavelength); {@code k_half_uM_sd}, {@code n_sd}, {@code f_min_sd},
 *     {@code f_max_sd} (hill); {@code kd_uM_sd}, {@code r_min_sd}, {@code r_max_sd}, {@code beta_sd} (ratio);
 *     {@code kd_uM_sd}, {@code rf_sd}, {@code resting_uM_sd}, {@code n_sd} (dynamic-range);</li>
 * <li>{@code n} for the dynamic-range method with a Hill indicator (default 1);</li>
 * <li>ratio and ratio-change: {@code numerator_channel} (default 1), {@code denominator_channel} (default 2),
 *     {@code numerator_background}, {@code denominator_background} (fixed values; default: the session's
 *     background handling per channel);</li>
 * <li>ratio-change (R/R0 without dye constants): {@code output}, {@code "R/R0"} or {@code "dR/R0"} (default);</li>
 * <li>lifetime: {@code movie} (the mean lifetime per pixel, ns) or {@code lifetime_channel} (the session's movie's
 *     channel holding it; with {@code movie}, that file's channel, default 1); {@code photons} (photon counts per
 *     pixel) and/or {@code photon_channel} (their channel, of {@code photons} if given, else of the lifetime's
 *     movie), neither meaning equal weights; {@code tau_free_ns}, {@code tau_bound_ns} and their {@code _sd};
 *     {@code output}, {@code "lifetime"} or {@code "fraction-bound"} (default: fraction-bound when both reference
 *     lifetimes are given, else lifetime);</li>
 * <li>standards: {@code monotone} (true: monotone interpolation instead of the Hill fit), or {@code file}
 *     instead of {@code table}: a calibration file written by {@code calibrate};</li>
 * <li>every method: {@code flag_saturation_above} (default 0.8) and {@code reject_saturation_above}
 *     (default 0.95), fractions of the indicator's range.</li>
 * </ul>
 * The method name {@code file} with key {@code file} is accepted as a synonym of standards-from-file.
 * File names are relative to the session folder. Every problem is an {@link InputException} naming
 * session.json (or the table or calibration file at fault) and the key.
 */
public final class CalibrationConfig {
    private static final Set<String> COMMON = Set.of("method", "flag_saturation_above", "reject_saturation_above");
    private static final Map<String, Set<String>> KEYS = Map.of(
            "none", Set.of(),
            "single-wavelength", Set.of("kd_uM", "f_min", "f_max", "kd_uM_sd", "f_min_sd", "f_max_sd"),
            "dynamic-range", Set.of("kd_uM", "rf", "resting_uM", "n", "kd_uM_sd", "rf_sd", "resting_uM_sd", "n_sd"),
            "ratio", Set.of("kd_uM", "r_min", "r_max", "beta", "kd_uM_sd", "r_min_sd", "r_max_sd", "beta_sd",
                    "numerator_channel", "denominator_channel", "numerator_background", "denominator_background"),
            "hill", Set.of("k_half_uM", "n", "f_min", "f_max", "k_half_uM_sd", "n_sd", "f_min_sd", "f_max_sd"),
            "standards", Set.of("table", "monotone", "file"),
            "file", Set.of("file"),
            "ratio-change", Set.of("numerator_channel", "denominator_channel", "numerator_background",
                    "denominator_background", "output"),
            "lifetime", Set.of("movie", "lifetime_channel", "photons", "photon_channel", "tau_free_ns", "tau_bound_ns",
                    "tau_free_ns_sd", "tau_bound_ns_sd", "output"));
    /** The method names, in the order error messages list them. */
    public static final List<String> METHODS = List.of("none", "single-wavelength", "dynamic-range", "ratio", "hill",
            "standards", "file", "ratio-change", "lifetime");

    private CalibrationConfig() {
    }

    /**
     * @param block       the {@code calibration} object of session.json, or null for {@code none}
     * @param sessionFile the session.json file, for messages; its folder resolves file names
     */
    public static CalibrationSetup parse(JsonObject block, Path sessionFile) {
        if (block == null) {
            return CalibrationSetup.NONE;
        }
        Keys k = new Keys(sessionFile, block);
        String method = k.string("method", true);
        if (!KEYS.containsKey(method)) {
            throw k.bad("method", "must be one of " + String.join(", ", METHODS));
        }
        List<String> warnings = new ArrayList<>();
        for (String key : k.names()) {
            if (!COMMON.contains(key) && !KEYS.get(method).contains(key)) {
                warnings.add(String.format(Locale.ROOT, "%s: key \"calibration.%s\" is not used by the %s method "
                        + "and was ignored.", sessionFile.getFileName(), key, method));
            }
        }
        double flag = k.fraction("flag_saturation_above", SaturationLimits.DEFAULT.flagAbove());
        double reject = k.fraction("reject_saturation_above", Math.max(flag, SaturationLimits.DEFAULT.rejectAbove()));
        SaturationLimits limits = k.build(() -> new SaturationLimits(flag, reject));
        Path dir = sessionFile.toAbsolutePath().getParent();
        switch (method) {
            case "none":
                return new CalibrationSetup(CalibrationSetup.NONE.calibration(), limits, null, null, warnings);
            case "single-wavelength": {
                double kd = k.positive("kd_uM");
                double fMin = k.number("f_min");
                double fMax = k.number("f_max");
                k.greater("f_max", fMax, "f_min", fMin);
                Calibration c = k.build(() -> new SingleWavelength(kd, fMin, fMax, k.sd("kd_uM_sd"), k.sd("f_min_sd"),
                        k.sd("f_max_sd")));
                return new CalibrationSetup(c, limits, null, null, warnings);
            }
            case "hill": {
                double kh = k.positive("k_half_uM");
                double n = k.positive("n");
                double fMin = k.number("f_min");
                double fMax = k.number("f_max");
                k.greater("f_max", fMax, "f_min", fMin);
                Calibration c = k.build(() -> new Hill(kh, n, fMin, fMax, k.sd("k_half_uM_sd"), k.sd("n_sd"),
                        k.sd("f_min_sd"), k.sd("f_max_sd")));
                return new CalibrationSetup(c, limits, null, null, warnings);
            }
            case "ratio": {
                double kd = k.positive("kd_uM");
                double rMin = k.nonNegative("r_min");
                double rMax = k.number("r_max");
                k.greater("r_max", rMax, "r_min", rMin);
                double beta = k.positive("beta");
                Calibration c = k.build(() -> new Ratio(kd, rMin, rMax, beta, k.sd("kd_uM_sd"), k.sd("r_min_sd"),
                        k.sd("r_max_sd"), k.sd("beta_sd")));
                return new CalibrationSetup(c, limits, null, ratioChannels(k), warnings);
            }
            case "ratio-change": {
                String output = k.string("output", false);
                RatioChange.Output out = output == null ? RatioChange.Output.CHANGE : RatioChange.Output.of(output);
                if (out == null) {
                    throw k.bad("output", "must be \"R/R0\" or \"dR/R0\"");
                }
                return new CalibrationSetup(new RatioChange(out), limits, null, ratioChannels(k), warnings);
            }
            case "lifetime":
                return lifetime(k, dir, limits, warnings);
            case "dynamic-range": {
                double kd = k.positive("kd_uM");
                double rf = k.number("rf");
                if (!(rf > 1)) {
                    throw k.bad("rf", "must be greater than 1, since it is Fmax/Fmin and Fmax must exceed Fmin");
                }
                double c0 = k.positive("resting_uM");
                Double n = k.optional("n");
                if (n != null && !(n > 0)) {
                    throw k.bad("n", "must be a positive number");
                }
                Calibration c = k.build(() -> new DynamicRange(kd, rf, c0, n == null ? 1.0 : n, k.sd("kd_uM_sd"),
                        k.sd("rf_sd"), k.sd("resting_uM_sd"), k.sd("n_sd")));
                return new CalibrationSetup(c, limits, null, null, warnings);
            }
            default:
                return standards(k, method, dir, limits, warnings);
        }
    }

    private static CalibrationSetup.RatioChannels ratioChannels(Keys k) {
        int num = k.channel("numerator_channel", 1);
        int den = k.channel("denominator_channel", 2);
        if (num == den) {
            throw k.bad("denominator_channel", "must differ from calibration.numerator_channel (" + num + ")");
        }
        return new CalibrationSetup.RatioChannels(num, den, k.optional("numerator_background"),
                k.optional("denominator_background"));
    }

    /** The lifetime method: where its movies are, and the conversion to the fraction bound if asked for. */
    private static CalibrationSetup lifetime(Keys k, Path dir, SaturationLimits limits, List<String> warnings) {
        String movie = k.string("movie", false);
        int lifetimeChannel = k.channel("lifetime_channel", 0);
        if (movie == null && lifetimeChannel == 0) {
            throw k.bad("movie", "must name the movie of mean lifetimes (ns per pixel), or calibration.lifetime_channel "
                    + "the channel of the session's movie that holds them");
        }
        if (movie != null) {
            k.requireFile("movie", dir.resolve(movie));
        }
        String photons = k.string("photons", false);
        if (photons != null) {
            k.requireFile("photons", dir.resolve(photons));
        }
        int photonChannel = k.channel("photon_channel", 0);
        CalibrationSetup.LifetimeInput input = new CalibrationSetup.LifetimeInput(movie, Math.max(1, lifetimeChannel),
                photons, photonChannel);
        String photonFile = photons != null ? photons : movie;
        boolean sameFile = photonFile == null ? movie == null : photonFile.equals(movie);
        if (input.weighted() && sameFile && input.photonChannelOrFirst() == input.lifetimeChannel()) {
            throw k.bad(photonChannel > 0 ? "photon_channel" : "photons", String.format(Locale.ROOT, "must name other "
                    + "data than the lifetime: both would be channel %d of %s", input.lifetimeChannel(),
                    movie == null ? "the session's movie" : movie));
        }
        Double tauFree = k.lifetime("tau_free_ns");
        Double tauBound = k.lifetime("tau_bound_ns");
        String output = k.string("output", false);
        if (output != null && !output.equals("lifetime") && !output.equals("fraction-bound")) {
            throw k.bad("output", "must be \"lifetime\" or \"fraction-bound\"");
        }
        boolean fraction = output == null ? tauFree != null && tauBound != null : output.equals("fraction-bound");
        if (!fraction) {
            for (String key : List.of("tau_free_ns", "tau_bound_ns", "tau_free_ns_sd", "tau_bound_ns_sd")) {
                if (k.names().contains(key)) {
                    warnings.add(String.format(Locale.ROOT, "%s: key \"calibration.%s\" is not used when the "
                            + "lifetime method reports the lifetime itself (set \"output\": \"fraction-bound\" "
                            + "and give both reference lifetimes to convert it).", k.fileName(), key));
                }
            }
            return new CalibrationSetup(MeanLifetime.INSTANCE, limits, null, null, input, warnings);
        }
        if (tauFree == null || tauBound == null) {
            throw k.bad(tauFree == null ? "tau_free_ns" : "tau_bound_ns", "is needed to convert the lifetime to the "
                    + "fraction of bound sensor");
        }
        if (!(tauBound < tauFree)) {
            throw k.bad("tau_bound_ns", String.format(Locale.ROOT, "must be shorter than calibration.tau_free_ns (%s), "
                    + "since the bound (FRET) state of the sensor has the shorter lifetime", k.fields.get("tau_free_ns")));
        }
        Calibration c = k.build(() -> new TwoStateLifetime(tauFree, tauBound, k.sd("tau_free_ns_sd"),
                k.sd("tau_bound_ns_sd")));
        return new CalibrationSetup(c, limits, null, null, input, warnings);
    }

    private static CalibrationSetup standards(Keys k, String method, Path dir, SaturationLimits limits,
                                              List<String> warnings) {
        String fileName = k.string("file", false);
        String tableName = method.equals("standards") ? k.string("table", false) : null;
        if (fileName != null && tableName != null) {
            throw k.bad("file", "cannot be given together with calibration.table; give one of them");
        }
        if (fileName != null) {
            k.requireFile("file", dir.resolve(fileName));
            Calibration c = CalibrationFile.read(dir.resolve(fileName));
            return new CalibrationSetup(c, limits, fileName, null, warnings);
        }
        if (tableName == null) {
            throw k.bad(method.equals("file") ? "file" : "table", method.equals("file")
                    ? "must name a calibration file written by the calibrate command"
                    : "must name a CSV of standards (concentration_uM,intensity), or give \"file\" with a "
                    + "calibration file written by the calibrate command");
        }
        Path table = dir.resolve(tableName);
        k.requireFile("table", table);
        Standards standards = StandardsCsv.read(table);
        boolean monotone = k.bool("monotone");
        CalibrationBuilder.Built built = CalibrationBuilder.fromStandards(standards, monotone, table, tableName,
                monotone ? "calibration.monotone in " + k.fileName() : null);
        warnings.addAll(built.warnings());
        Calibration c = built.calibration();
        return new CalibrationSetup(c, limits, tableName, null, warnings);
    }

    /** The block's values with the checks calibration needs, naming session.json and the key in every complaint. */
    static final class Keys {
        final JsonFields fields;

        Keys(Path file, JsonObject block) {
            this.fields = JsonFields.of(file, block, "calibration");
        }

        void requireFile(String key, Path path) {
            if (!Files.isRegularFile(path)) {
                throw fields.fail("key \"" + fields.key(key) + "\" names " + fields.get(key)
                        + ", which is not in the session folder");
            }
        }

        String fileName() {
            return String.valueOf(fields.file().getFileName());
        }

        Set<String> names() {
            return fields.names();
        }

        InputException bad(String key, String requirement) {
            return fields.bad(key, requirement);
        }

        Double optional(String key) {
            return fields.optionalNumber(key);
        }

        double number(String key) {
            if (!fields.has(key)) {
                throw bad(key, "is needed by this calibration method");
            }
            return fields.number(key);
        }

        double positive(String key) {
            double v = number(key);
            if (!(v > 0)) {
                throw bad(key, "must be a positive number");
            }
            return v;
        }

        double nonNegative(String key) {
            double v = number(key);
            if (!(v >= 0)) {
                throw bad(key, "must be zero or a positive number");
            }
            return v;
        }

        /** A lifetime in ns, above zero, or null when not given. */
        Double lifetime(String key) {
            Double v = optional(key);
            if (v != null && !(v > 0)) {
                throw bad(key, "must be a positive number (a lifetime in ns)");
            }
            return v;
        }

        double sd(String key) {
            Double v = optional(key);
            if (v != null && !(v >= 0)) {
                throw bad(key, "must be zero or a positive number (a standard deviation)");
            }
            return v == null ? 0 : v;
        }

        double fraction(String key, double fallback) {
            Double v = optional(key);
            if (v == null) {
                return fallback;
            }
            if (!(v > 0 && v <= 1)) {
                throw bad(key, "must be a fraction of the indicator's range, above 0 and at most 1");
            }
            return v;
        }

        int channel(String key, int fallback) {
            Double v = optional(key);
            if (v == null) {
                return fallback;
            }
            if (v < 1 || v != Math.rint(v)) {
                throw bad(key, "must be a channel number counted from 1");
            }
            return (int) Math.round(v);
        }

        void greater(String bigKey, double big, String smallKey, double small) {
            if (!(big > small)) {
                throw bad(bigKey, String.format(Locale.ROOT, "must be greater than %s (%s)", fields.key(smallKey),
                        fields.get(smallKey)));
            }
        }

        String string(String key, boolean required) {
            if (required && !fields.has(key)) {
                throw bad(key, "is needed");
            }
            return fields.optionalString(key);
        }

        boolean bool(String key) {
            return fields.flag(key, false);
        }

        <T> T build(Supplier<T> maker) {
            try {
                return maker.get();
            } catch (IllegalArgumentException e) {
                throw fields.fail("in the calibration block, " + e.getMessage(), e);
            }
        }
    }
}
