package org.dendrokin.io.json;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;
import static org.junit.jupiter.api.Assertions.fail;

import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Random;
import java.util.function.Consumer;

import org.dendrokin.io.InputException;
import org.dendrokin.io.calib.CalibrationConfig;
import org.dendrokin.io.model.ModelFile;
import org.dendrokin.io.session.SessionConfig;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * Seeded mutations of valid session.json and model files: every mutant is either read or refused with an
 * {@link InputException} of one line naming the file, never another exception (which the command line would
 * report as an internal error).
 */
class JsonFuzzTest {
    /** Mutants per valid file: the session reader takes well under 1 ms each, a model file a few ms. */
    private static final int SESSION_CASES = 3000;
    private static final int MODEL_CASES = 800;
    private static final String SESSION = """
            {"movie": "dendrite.tif", "path": "dendrite.roi", "path_width_um": 1.0, "pixel_size_um": 0.2,
             "frame_interval_s": 0.5, "stimulus": {"time_s": 9.75, "position_um": 15.0}, "baseline_frames": [0, 19],
             "background": {"value": 120}, "models": ["diffusion-decay", "nagumo"], "bleach_correction": true,
             "calibration": {"method": "single-wavelength", "kd_uM": 0.35, "f_min": 60, "f_max": 1400,
                             "kd_uM_sd": 0.02, "flag_saturation_above": 0.8},
             "fit": {"criterion": "bic", "profiles": false, "bootstrap_replicates": 20, "seed": 3}, "group": "a"}
            """;
    private static final String MODEL = """
            {"model": "nagumo", "parameters": {"D": 1.0, "k": 2.0, "a": 0.2},
             "domain": {"length_um": 40, "dx_um": 0.25, "boundary": "no-flux",
                        "cross_section": [{"position_um": 0, "area_um2": 1}, {"position_um": 40, "area_um2": 2}]},
             "time": {"duration_s": 4, "output_interval_s": 0.5},
             "stimuli": [{"kind": "pulse", "time_s": 0.5, "position_um": 10, "width_um": 2, "amount": 1.5}],
             "solver": {"step_factor": 0.5, "spatial_order": 4}, "output": {"dx_um": 0.5},
             "movie": {"file": "m.tif", "path_px": [[5, 5], [60, 20]], "pixel_size_um": 0.5, "width_px": 64,
                       "height_px": 32, "noise_sd": 1, "seed": 2}}
            """;
    private static final String NETWORK = """
            {"model": "network",
             "network": {"species": [{"name": "A", "D_um2_per_s": 1, "initial": 0.1}, {"name": "B", "D_um2_per_s": 0}],
                         "parameters": {"kf": 2},
                         "reactions": [{"reactants": {"A": 1}, "products": {"B": 1}, "k": 1, "kr": 0.5},
                                       {"reactants": {"B": 1}, "law": "michaelis-menten", "vmax": 1, "km": 0.5},
                                       {"products": {"A": 1}, "law": "expression", "rate": "kf * B"}]},
             "domain": {"length_um": 10, "dx_um": 0.5}, "time": {"duration_s": 1, "output_interval_s": 0.1},
             "stochastic": {"runs": 2, "seed": 4, "threads": 1}}
            """;
    /** Pieces a mutation inserts: JSON punctuation, odd numbers and values of the wrong kind. */
    private static final String[] PIECES = {"{", "}", "[", "]", ",", ":", "\"", "\\", "\n", "-", "e", ".", "0",
        "1e999", "-1e-999", "NaN", "null", "true", "\"x\"", "[]", "{}", "-0", "9007199254740993", "1e308",
        "2147483648", "\uFEFF", "\u0000", "\"\\u0000\"", "0.5", "-5", "\"nagumo\"", "\"network\""};

    @TempDir
    Path dir;

    @Test
    void mutatedSessionFilesAreReadOrRefusedInOneSentence() {
        Path file = dir.resolve("session.json");
        fuzz(SESSION, 20261204L, SESSION_CASES, text -> {
            SessionConfig c = SessionConfig.parse(file, text);
            CalibrationConfig.parse(c.calibration(), file);
        }, file);
    }

    @Test
    void mutatedModelFilesAreReadOrRefusedInOneSentence() throws IOException {
        Path file = dir.resolve("model.json");
        Consumer<String> read = text -> {
            try {
                Files.writeString(file, text, StandardCharsets.UTF_8);
            } catch (IOException e) {
                throw new java.io.UncheckedIOException(e);
            }
            ModelFile.read(file);
        };
        fuzz(MODEL, 20261205L, MODEL_CASES, read, file);
        fuzz(NETWORK, 20261206L, MODEL_CASES, read, file);
    }

    /** Reads {@code cases} mutants of {@code valid}; fails on the first exception that is not bad input. */
    private static void fuzz(String valid, long seed, int cases, Consumer<String> reader, Path file) {
        reader.accept(valid);
        Random random = new Random(seed);  // fixed seed: a failure must reproduce
        int refused = 0;
        for (int i = 0; i < cases; i++) {
            String mutant = mutate(valid, random, 1 + random.nextInt(3));
            try {
                reader.accept(mutant);
            } catch (InputException e) {
                refused++;
                assertTrue(e.getMessage().startsWith(file + ": "), "names the file: " + e.getMessage());
                assertEquals(1, e.getMessage().lines().count(), "one line: " + e.getMessage());
            } catch (RuntimeException | StackOverflowError e) {
                fail("case " + i + " (seed " + seed + ") threw " + e + " for:\n" + mutant, e);
            }
        }
        assertTrue(refused > cases / 10 && refused < cases, "the mutations both break and keep files: " + refused);
    }

    private static String mutate(String text, Random random, int edits) {
        StringBuilder b = new StringBuilder(text);
        for (int e = 0; e < edits && b.length() > 0; e++) {
            int at = random.nextInt(b.length());
            switch (random.nextInt(6)) {
                case 0 -> b.deleteCharAt(at);
                case 1 -> b.insert(at, PIECES[random.nextInt(PIECES.length)]);
                case 2 -> b.setLength(at);
                case 3 -> replaceNumber(b, random);
                case 4 -> {
                    int end = Math.min(b.length(), at + 1 + random.nextInt(40));
                    b.insert(end, b.substring(at, end));
                }
                default -> {
                    int end = Math.min(b.length(), at + 1 + random.nextInt(20));
                    b.delete(at, end);
                }
            }
        }
        return b.toString();
    }

    /** Replaces one number in the text with an extreme or wrong value, keeping the JSON valid most of the time. */
    private static void replaceNumber(StringBuilder b, Random random) {
        List<int[]> numbers = new ArrayList<>();
        java.util.regex.Matcher m = java.util.regex.Pattern.compile("-?\\d+(\\.\\d+)?").matcher(b);
        while (m.find()) {
            numbers.add(new int[] {m.start(), m.end()});
        }
        if (numbers.isEmpty()) {
            return;
        }
        int[] n = numbers.get(random.nextInt(numbers.size()));
        String[] values = {"0", "-1", "1e300", "-1e300", "1e-300", "3.5", "1e9", "2147483648", "\"1\"", "null",
            "true", "[]", "{}", "0.0001", "100000"};
        b.replace(n[0], n[1], values[random.nextInt(values.length)]);
    }
}
