package org.dendrokin.io.batch;

import java.nio.file.Files;
import java.nio.file.Path;

import com.google.gson.GsonBuilder;
import com.google.gson.JsonArray;
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
 *   {"format": 1, "fit_settings": {"free_stimulus": false, "sealed_ends": false},
 *    "sample_delays_s": [0.0, 0.0021, ...]}
 * </pre>
 * {@code sample_delays_s} (a raster scan's delay of each kymograph position after its frame's time, s) is there
 * only when the session's fits read the model at each sample's own time; kymograph.csv holds frame times only.
 */
final class GlobalFitInput {
    static final String FILE = "global-fit-input.json";

    /**
     * The settings read back.
     *
     * @param freeStimulus the session's fits fitted the stimulus time and position
     * @param sealedEnds   the session's path ends were sealed dendrite ends
     * @param recorded     false when the file was missing (results of an older version): the defaults were assumed
     * @param delaysS      each position's scan-line delay, s, or null when the session has none
     */
    record Settings(boolean freeStimulus, boolean sealedEnds, boolean recorded, double[] delaysS) {
    }

    private GlobalFitInput() {
    }

    /**
     * Writes the file into a session's result folder.
     *
     * @param delaysS the analysed kymograph's scan-line delay per position, s, or null when it has none
     */
    static void write(Path outDir, FitSettings fit, double[] delaysS) {
        JsonObject settings = new JsonObject();
        settings.addProperty("free_stimulus", fit.freeStimulus());
        settings.addProperty("sealed_ends", fit.sealedEnds());
        JsonObject o = new JsonObject();
        o.addProperty("format", 1);
        o.add("fit_settings", settings);
        if (delaysS != null) {
            JsonArray delays = new JsonArray();
            for (double d : delaysS) {
                delays.add(d);
            }
            o.add("sample_delays_s", delays);
        }
        AtomicFiles.writeString(outDir.resolve(FILE), new GsonBuilder().setPrettyPrinting().create().toJson(o) + "\n");
    }

    /** The settings of a session's result folder; the defaults, marked not recorded, when the file is absent. */
    static Settings read(Path resultDir) {
        Path f = resultDir.resolve(FILE);
        if (!Files.isRegularFile(f)) {
            return new Settings(FitSettings.DEFAULT.freeStimulus(), FitSettings.DEFAULT.sealedEnds(), false, null);
        }
        JsonObject o = JsonFiles.readObject(f, "the session's global-fit input");
        JsonElement s = o.get("fit_settings");
        if (s == null || !s.isJsonObject()) {
            throw new InputException(f, "key \"fit_settings\" is missing or not an object");
        }
        return new Settings(flag(f, s.getAsJsonObject(), "free_stimulus"), flag(f, s.getAsJsonObject(), "sealed_ends"),
                true, delays(f, o.get("sample_delays_s")));
    }

    private static double[] delays(Path f, JsonElement e) {
        if (e == null || e.isJsonNull()) {
            return null;
        }
        if (!e.isJsonArray()) {
            throw new InputException(f, "key \"sample_delays_s\" must be a list of delays in seconds");
        }
        double[] d = new double[e.getAsJsonArray().size()];
        for (int i = 0; i < d.length; i++) {
            JsonElement x = e.getAsJsonArray().get(i);
            if (!x.isJsonPrimitive() || !x.getAsJsonPrimitive().isNumber() || !(x.getAsDouble() >= 0)) {
                throw new InputException(f, "key \"sample_delays_s\" must hold delays of 0 s or more");
            }
            d[i] = x.getAsDouble();
        }
        return d;
    }

    private static boolean flag(Path f, JsonObject o, String key) {
        JsonElement e = o.get(key);
        if (e == null || !e.isJsonPrimitive() || !e.getAsJsonPrimitive().isBoolean()) {
            throw new InputException(f, "key \"fit_settings." + key + "\" must be true or false");
        }
        return e.getAsBoolean();
    }
}
