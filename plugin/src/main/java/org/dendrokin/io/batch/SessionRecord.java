package org.dendrokin.io.batch;

import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.LinkedHashMap;
import java.util.Map;

import com.google.gson.Gson;
import com.google.gson.GsonBuilder;
import com.google.gson.JsonElement;
import com.google.gson.JsonObject;

import org.dendrokin.io.AtomicFiles;
import org.dendrokin.io.InputException;
import org.dendrokin.io.ToolVersion;
import org.dendrokin.io.json.JsonFiles;

/**
 * What the batch keeps beside each session's results, as {@code batch.json}: where the session came from,
 * how it ended and what it was computed from, so that a later run can tell whether it is still current.
 * A session's result folder without this file is incomplete and is never counted.
 *
 * @param session       the session's id (path under the root)
 * @param sourceDir     absolute path of the session folder
 * @param group         the session's {@code group}, "" if none
 * @param status        {@link #OK}, {@link #FAILED} (bad input) or {@link #ERROR} (anything else)
 * @param error         for a failed session, one sentence saying what went wrong; "" otherwise
 * @param inputs        hex SHA-256 by input file name
 * @param settingsSha256 SHA-256 of session.json's settings with keys sorted (blind to spacing and key order)
 * @param toolVersion   the version that computed the result
 * @param movieBytes    size of the session's TIFF files, bytes
 * @param elapsedS      wall time of the analysis, s
 */
public record SessionRecord(String session, String sourceDir, String group, String status, String error,
                            Map<String, String> inputs, String settingsSha256, String toolVersion, long movieBytes,
                            double elapsedS) {
    public static final String FILE = "batch.json";
    public static final String OK = "ok";
    public static final String FAILED = "failed";
    /** An unexpected failure (not the input's fault, e.g. out of memory): tried again on the next run. */
    public static final String ERROR = "error";
    private static final Gson GSON = new GsonBuilder().setPrettyPrinting().disableHtmlEscaping()
            .serializeSpecialFloatingPointValues().create();

    public SessionRecord {
        inputs = new LinkedHashMap<>(inputs);
    }

    public boolean ok() {
        return OK.equals(status);
    }

    /** True when this record was computed from exactly these inputs by this version. */
    public boolean matches(InputHashes hashes, String settings, String version) {
        return inputs.equals(hashes.sorted()) && settingsSha256.equals(settings) && toolVersion.equals(version);
    }

    public void write(Path folder) {
        AtomicFiles.writeString(folder.resolve(FILE), GSON.toJson(this) + "\n");
    }

    /** The record in {@code folder}, or null when there is none or it cannot be read (then it is redone). */
    public static SessionRecord read(Path folder) {
        Path f = folder.resolve(FILE);
        if (!Files.isRegularFile(f)) {
            return null;
        }
        try {
            SessionRecord r = GSON.fromJson(JsonFiles.readObject(f, "the batch's record of one session"),
                    SessionRecord.class);
            if (r == null || r.session() == null || r.status() == null || r.inputs() == null
                    || r.settingsSha256() == null || r.toolVersion() == null) {
                return null;
            }
            return r;
        } catch (RuntimeException e) {
            // InputException (not JSON, damaged), JsonParseException (wrong types) or the bare RuntimeException
            // Gson throws when the record's constructor refuses a value: the session is simply redone.
            return null;
        }
    }

    /** The tool's version from the build's properties file ("unknown" when run from unpackaged classes). */
    public static String currentToolVersion() {
        return ToolVersion.get();
    }

    /**
     * SHA-256 of session.json's content with object keys sorted, or of its raw bytes when it is not JSON.
     */
    public static String settingsHash(Path sessionJson) {
        try {
            String text = Files.readString(sessionJson, StandardCharsets.UTF_8);
            try {
                return InputHashes.sha256(canonical(JsonFiles.parseObject(sessionJson, text, "settings")).toString());
            } catch (InputException e) {
                return InputHashes.sha256(text);
            }
        } catch (IOException e) {
            return InputHashes.sha256(sessionJson);
        }
    }

    private static JsonElement canonical(JsonElement e) {
        if (e.isJsonObject()) {
            JsonObject sorted = new JsonObject();
            e.getAsJsonObject().entrySet().stream().sorted(Map.Entry.comparingByKey())
                    .forEach(x -> sorted.add(x.getKey(), canonical(x.getValue())));
            return sorted;
        }
        if (e.isJsonArray()) {
            com.google.gson.JsonArray a = new com.google.gson.JsonArray();
            e.getAsJsonArray().forEach(x -> a.add(canonical(x)));
            return a;
        }
        return e;
    }
}
