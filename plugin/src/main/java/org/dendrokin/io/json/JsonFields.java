package org.dendrokin.io.json;

import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Set;
import java.util.TreeSet;

import org.dendrokin.io.InputException;

import com.google.gson.JsonArray;
import com.google.gson.JsonElement;
import com.google.gson.JsonObject;

/**
 * Typed access to one JSON object of a user's file, naming the file and the full key in every complaint:
 * {@code session.json: key "stimulus.time_s" must be a number, got "soon".} A nested object or a list
 * element is reached through {@link #object} and {@link #objects}, which carry the key's prefix
 * ({@code stimulus.}, {@code stimuli[2].}), so a reader never spells a key twice.
 *
 * <p>Conventions: a key that is absent and a key whose value is JSON {@code null} are the same ("not
 * given"); the {@code optional...} methods return null (or the given default) for it, the others refuse it.
 * Numbers must be finite. Requirements read "must be ...", followed by ", got VALUE" or " (it is missing)";
 * a value longer than {@value #SHOWN} characters is cut. Unknown keys are the reader's decision: list them
 * with {@link #unknownKeys} (to warn) or refuse them with {@link #refuseUnknownKeys}.
 *
 * <p>Not thread-safe to share while the underlying object is changed; reading is side-effect free.
 */
public final class JsonFields {
    /** Longest value text quoted in an error message, characters. */
    static final int SHOWN = 80;

    private final Path file;
    private final JsonObject object;
    private final String prefix;

    private JsonFields(Path file, JsonObject object, String prefix) {
        this.file = file;
        this.object = object;
        this.prefix = prefix;
    }

    /** The top-level object of {@code file}. */
    public static JsonFields of(Path file, JsonObject object) {
        return new JsonFields(file, object, "");
    }

    /**
     * An object found at {@code key} in {@code file}, e.g. the {@code calibration} block of session.json passed
     * on to the calibration reader; its keys are named {@code key.name}.
     */
    public static JsonFields of(Path file, JsonObject object, String key) {
        return new JsonFields(file, object, key.isEmpty() ? "" : key + ".");
    }

    /** The file named in messages. */
    public Path file() {
        return file;
    }

    /** The object read (not a copy: do not change it). */
    public JsonObject json() {
        return object;
    }

    /** The full key of {@code name} in this object, e.g. {@code stimulus.time_s}. */
    public String key(String name) {
        return prefix + name;
    }

    /** True when {@code name} is given and not null. */
    public boolean has(String name) {
        JsonElement e = object.get(name);
        return e != null && !e.isJsonNull();
    }

    /** The raw value of {@code name}, or null when it is absent. */
    public JsonElement get(String name) {
        return object.get(name);
    }

    /** The names in this object, in file order. */
    public Set<String> names() {
        return object.keySet();
    }

    // ---- unknown keys ----

    /** Full keys of the names not in {@code known}, in file order. */
    public List<String> unknownKeys(Set<String> known) {
        List<String> out = new ArrayList<>();
        for (String name : object.keySet()) {
            if (!known.contains(name)) {
                out.add(key(name));
            }
        }
        return out;
    }

    /** Refuses the first name not in {@code known}, listing the known ones. */
    public void refuseUnknownKeys(Set<String> known) {
        List<String> unknown = unknownKeys(known);
        if (!unknown.isEmpty()) {
            throw fail("unknown key " + unknown.get(0) + " (expected one of " + String.join(", ", new TreeSet<>(known))
                    + ")");
        }
    }

    // ---- nested objects and lists ----

    /** The object at {@code name}. */
    public JsonFields object(String name) {
        JsonElement e = object.get(name);
        if (e == null || !e.isJsonObject()) {
            throw bad(name, "must be an object {...}");
        }
        return new JsonFields(file, e.getAsJsonObject(), key(name) + ".");
    }

    /** The object at {@code name}, or null when it is not given. */
    public JsonFields optionalObject(String name) {
        return has(name) ? object(name) : null;
    }

    /** The list at {@code name}. */
    public JsonArray array(String name) {
        JsonElement e = object.get(name);
        if (e == null || !e.isJsonArray()) {
            throw bad(name, "must be a list [...]");
        }
        return e.getAsJsonArray();
    }

    /** The list of objects at {@code name}; element i is named {@code name[i]}. */
    public List<JsonFields> objects(String name) {
        JsonArray a = array(name);
        List<JsonFields> out = new ArrayList<>(a.size());
        for (int i = 0; i < a.size(); i++) {
            String elementKey = key(name) + "[" + i + "]";
            JsonElement e = a.get(i);
            if (!e.isJsonObject()) {
                throw fail("key \"" + elementKey + "\" must be an object {...}, got " + shown(e));
            }
            out.add(new JsonFields(file, e.getAsJsonObject(), elementKey + "."));
        }
        return out;
    }

    /** The list of finite numbers at {@code name}. */
    public double[] numbers(String name) {
        JsonElement e = object.get(name);
        String requirement = "must be a list of numbers [...]";
        if (e == null || !e.isJsonArray()) {
            throw bad(name, requirement);
        }
        JsonArray a = e.getAsJsonArray();
        double[] out = new double[a.size()];
        for (int i = 0; i < out.length; i++) {
            Double v = finite(a.get(i));
            if (v == null) {
                throw bad(name, requirement);
            }
            out[i] = v;
        }
        return out;
    }

    /** The list of text values at {@code name}. */
    public List<String> strings(String name, String requirement) {
        JsonElement e = object.get(name);
        if (e == null || !e.isJsonArray()) {
            throw bad(name, requirement);
        }
        List<String> out = new ArrayList<>();
        for (JsonElement x : e.getAsJsonArray()) {
            if (!x.isJsonPrimitive() || !x.getAsJsonPrimitive().isString()) {
                throw bad(name, requirement);
            }
            out.add(x.getAsString());
        }
        return out;
    }

    // ---- values ----

    /** The non-blank text at {@code name}. */
    public String string(String name) {
        String s = optionalString(name);
        if (s == null) {
            throw bad(name, "must be text in quotes");
        }
        return s;
    }

    /** The non-blank text at {@code name}, or null when it is not given. */
    public String optionalString(String name) {
        if (!has(name)) {
            return null;
        }
        JsonElement e = object.get(name);
        if (!e.isJsonPrimitive() || !e.getAsJsonPrimitive().isString() || e.getAsString().isBlank()) {
            throw bad(name, "must be text in quotes");
        }
        return e.getAsString();
    }

    /** The finite number at {@code name}. */
    public double number(String name) {
        return required(name, optionalNumber(name), "must be a number");
    }

    /** The number at {@code name}, which must be above 0. */
    public double positive(String name) {
        return required(name, optionalPositive(name), "must be a positive number");
    }

    /** The number at {@code name}, which must be 0 or above. */
    public double nonNegative(String name) {
        return required(name, optionalNonNegative(name), "must be zero or a positive number");
    }

    /** The finite number at {@code name}, or null when it is not given. */
    public Double optionalNumber(String name) {
        if (!has(name)) {
            return null;
        }
        Double v = finite(object.get(name));
        if (v == null) {
            throw bad(name, "must be a number");
        }
        return v;
    }

    /** The number at {@code name}, above 0, or null when it is not given. */
    public Double optionalPositive(String name) {
        Double v = has(name) ? finite(object.get(name)) : null;
        if (has(name) && (v == null || !(v > 0))) {
            throw bad(name, "must be a positive number");
        }
        return v;
    }

    /** The number at {@code name}, 0 or above, or null when it is not given. */
    public Double optionalNonNegative(String name) {
        Double v = has(name) ? finite(object.get(name)) : null;
        if (has(name) && (v == null || !(v >= 0))) {
            throw bad(name, "must be zero or a positive number");
        }
        return v;
    }

    /** The whole number at {@code name}, from {@code min} to {@code max}, or {@code absent} when not given. */
    public long wholeNumber(String name, long min, long max, long absent) {
        if (!has(name)) {
            return absent;
        }
        Double v = finite(object.get(name));
        if (v == null || v != Math.rint(v) || v < min || v > max) {
            throw bad(name, "must be a whole number from " + min + " to " + max);
        }
        return object.get(name).getAsLong();
    }

    /** The true or false at {@code name}, or {@code absent} when it is not given. */
    public boolean flag(String name, boolean absent) {
        if (!has(name)) {
            return absent;
        }
        JsonElement e = object.get(name);
        if (!e.isJsonPrimitive() || !e.getAsJsonPrimitive().isBoolean()) {
            throw bad(name, "must be true or false");
        }
        return e.getAsBoolean();
    }

    // ---- complaints ----

    /**
     * "key "K" REQUIREMENT, got VALUE" (or "(it is missing)"), naming this file.
     *
     * @param requirement what the value must be, e.g. "must be a positive number"
     */
    public InputException bad(String name, String requirement) {
        JsonElement got = object.get(name);
        return fail("key \"" + key(name) + "\" " + requirement
                + (got == null ? " (it is missing)" : ", got " + shown(got)));
    }

    /** An {@link InputException} with this sentence, naming this file. */
    public InputException fail(String sentence) {
        return new InputException(file, sentence);
    }

    /** An {@link InputException} with this sentence, naming this file, caused by {@code cause}. */
    public InputException fail(String sentence, Throwable cause) {
        return new InputException(file, sentence, cause);
    }

    /** The value as JSON text, cut to {@value #SHOWN} characters. */
    static String shown(JsonElement e) {
        String s = e.toString();
        return s.length() <= SHOWN ? s : s.substring(0, SHOWN - 3) + "...";
    }

    /**
     * The key a Gson JSON path points at, as readers name keys: {@code $.stimulus.time_s} gives
     * {@code stimulus.time_s}, {@code $.stimuli[0].kind} gives {@code stimuli[0].kind}, {@code $} gives "".
     */
    static String keyOfPath(String path) {
        String key = path.startsWith("$") ? path.substring(1) : path;
        return key.startsWith(".") ? key.substring(1) : key;
    }

    private static Double finite(JsonElement e) {
        if (e == null || !e.isJsonPrimitive() || !e.getAsJsonPrimitive().isNumber()) {
            return null;
        }
        double v = e.getAsDouble();
        return Double.isFinite(v) ? v : null;
    }

    private double required(String name, Double v, String requirement) {
        if (v == null) {
            throw bad(name, requirement);
        }
        return v;
    }
}
