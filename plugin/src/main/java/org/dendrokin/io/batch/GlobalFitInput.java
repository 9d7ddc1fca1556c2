package org.dendrokin.io.batch;

import java.nio.file.Files;
import java.nio.file.Path;

import com.google.gson.GsonBuilder;
import com.google.gson.JsonElement;
import com.google.gson.JsonObject;

import org.dendrokin.io.AtomicFiles;
import org.dendrokin.io.InputException;
import org.dendrokin.io.json.JsonFiles;
import org.dendrokin.io.session.FitSettings;

/**
 * {@code global-fit-input.json}, written beside each session's results by the batch: what a joint fit of many
 * sessions needs from a session and results.json does not say, namely how its own fits were set up. The rest comes
 * from results.json ({@code signal_unit}, {@code stimulus}, {@code baseline_frames}, the diffusion-decay fit as
 * starting values) and kymograph.csv, so a folder of finished results, from one machine or a cluster's shards, is
 * enough for the joint fit.
 * <pre>
 *   {"format": 1, "fit_settings": {"free_stimulus": false, "sealed_ends": false}}
 * </pre>
 */
final class GlobalFitInput {
    static final String FILE = "global-fit-input.json";

    /**
     * The settings read back.
     *
     * @param freeStimulus the session's fits fitted the stimulus time and position
     * @param sealedEnds   the session's path ends were sealed dendrite ends
     * @param recorded     false when the file was missing (results of an older version): the defaults were assumed
     */
    record Settings(boolean freeStimulus, boolean sealedEnds, boolean recorded) {
    }

    private GlobalFitInput() {
    }

    static void write(Path outDir, FitSettings fit) {
        JsonObject settings = new JsonObject();
        settings.addProperty("free_stimulus", fit.freeStimulus());
        settings.addProperty("sealed_ends", fit.sealedEnds());
        JsonObject o = new JsonObject();
        o.addProperty("format", 1);
        o.add("fit_settings", settings);
        AtomicFiles.writeString(outDir.resolve(FILE), new GsonBuilder().setPrettyPrinting().create().toJson(o) + "\n");
    }

    /** The settings of a session's result folder; the defaults, marked not recorded, when the file is absent. */
    static Settings read(Path resultDir) {
        Path f = resultDir.resolve(FILE);
        if (!Files.isRegularFile(f)) {
            return new Settings(FitSettings.DEFAULT.freeStimulus(), FitSettings.DEFAULT.sealedEnds(), false);
        }
        JsonObject o = JsonFiles.readObject(f, "the session's global-fit input");
        JsonElement s = o.get("fit_settings");
        if (s == null || !s.isJsonObject()) {
            throw new InputException(f, "key \"fit_settings\" is missing or not an object");
        }
        return new Settings(flag(f, s.getAsJsonObject(), "free_stimulus"), flag(f, s.getAsJsonObject(), "sealed_ends"),
                true);
    }

    private static boolean flag(Path f, JsonObject o, String key) {
        JsonElement e = o.get(key);
        if (e == null || !e.isJsonPrimitive() || !e.getAsJsonPrimitive().isBoolean()) {
            throw new InputException(f, "key \"fit_settings." + key + "\" must be true or false");
        }
        return e.getAsBoolean();
    }
}
