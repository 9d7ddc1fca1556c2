package org.dendrokin.io.batch;

import java.awt.image.BufferedImage;
import java.io.IOException;
import java.io.InputStream;
import java.io.UncheckedIOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.security.MessageDigest;
import java.util.HexFormat;
import java.util.Locale;
import java.util.Map;
import java.util.TreeMap;
import java.util.stream.Stream;

import com.google.gson.JsonObject;
import com.google.gson.JsonParser;

import ij.ImagePlus;
import ij.ImageStack;
import ij.io.FileSaver;
import ij.io.Opener;
import ij.process.ShortProcessor;

import org.dendrokin.core.Progress;
import org.dendrokin.io.AtomicFiles;
import org.dendrokin.io.InputException;
import org.dendrokin.io.plot.Pictures;

/**
 * Session folders for batch tests and a stand-in analysis: each session has a small 16-bit TIFF stack,
 * a path CSV and a session.json that carries the "true" constants the stand-in reports back, so that the
 * batch machinery can be tested without the full analysis.
 */
final class BatchFixtures {
    static final int FRAMES = 6;

    private BatchFixtures() {
    }

    /** Writes a good session: movie.tif (16x16xFRAMES), path.csv, session.json with group and known D, k. */
    static Path session(Path root, String id, String group, double dUm2PerS, double kPerS) {
        Path dir = root.resolve(id);
        try {
            Files.createDirectories(dir);
            ImageStack stack = new ImageStack(16, 16);
            for (int f = 0; f < FRAMES; f++) {
                ShortProcessor p = new ShortProcessor(16, 16);
                for (int i = 0; i < 256; i++) {
                    p.set(i % 16, i / 16, 100 + f * 10 + i % 7);
                }
                stack.addSlice(p);
            }
            new FileSaver(new ImagePlus("movie", stack)).saveAsTiffStack(dir.resolve("movie.tif").toString());
            Files.writeString(dir.resolve("path.csv"), "x,y\n2,8\n14,8\n");
            Files.writeString(dir.resolve("session.json"), String.format(Locale.ROOT,
                    "{\"movie\": \"movie.tif\", \"path\": \"path.csv\", \"group\": \"%s\", \"pixel_size_um\": 0.2,%n"
                            + " \"frame_interval_s\": 0.1, \"test_truth\": {\"D\": %s, \"k\": %s}}%n",
                    group, dUm2PerS, kPerS));
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
        return dir;
    }

    /** A good session whose movie is then cut to 60% of its length. */
    static Path truncatedMovie(Path root, String id) {
        Path dir = session(root, id, "broken", 1, 1);
        try {
            byte[] all = Files.readAllBytes(dir.resolve("movie.tif"));
            Files.write(dir.resolve("movie.tif"), java.util.Arrays.copyOf(all, all.length * 6 / 10));
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
        return dir;
    }

    /** A good session whose path file is missing. */
    static Path missingPath(Path root, String id) {
        Path dir = session(root, id, "broken", 1, 1);
        try {
            Files.delete(dir.resolve("path.csv"));
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
        return dir;
    }

    /** A good session whose session.json is not JSON. */
    static Path badJson(Path root, String id) {
        Path dir = session(root, id, "broken", 1, 1);
        try {
            Files.writeString(dir.resolve("session.json"), "{\"movie\": \"movie.tif\", \"path\": \n");
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
        return dir;
    }

    /**
     * The stand-in analysis: checks session.json, the movie (opened by ImageJ, all FRAMES frames) and the
     * path, then writes results.json with the session's true D and k as a converged diffusion-decay fit,
     * plus a small picture, as the real analysis would.
     */
    static void fakeAnalyze(Path sessionDir, Path outDir, Progress progress) {
        Path json = sessionDir.resolve("session.json");
        JsonObject s;
        try {
            s = JsonParser.parseString(Files.readString(json)).getAsJsonObject();
        } catch (IOException | RuntimeException e) {
            throw new InputException(json, "this is not valid JSON");
        }
        Path movie = sessionDir.resolve(s.get("movie").getAsString());
        ImagePlus imp = new Opener().openImage(movie.toString());
        if (imp == null || imp.getStackSize() != FRAMES) {
            throw new InputException(movie, "the TIFF is shorter than its header says (truncated file)");
        }
        Path path = sessionDir.resolve(s.get("path").getAsString());
        if (!Files.isRegularFile(path)) {
            throw new InputException(path, "the path file named in session.json does not exist");
        }
        progress.checkCancelled();
        JsonObject truth = s.getAsJsonObject("test_truth");
        double d = truth.get("D").getAsDouble();
        double k = truth.get("k").getAsDouble();
        String results = String.format(Locale.ROOT, "{\"tool_version\": \"test\", \"session\": \"%s\", "
                + "\"signal_unit\": \"dF/F0\", \"fits\": [{\"model\": \"diffusion-decay\", \"converged\": true, "
                + "\"aic\": -10.5, \"bic\": -8.25, \"rmse\": 0.01, \"parameters\": {"
                + "\"D\": {\"value\": %s, \"unit\": \"um^2/s\", \"ci95\": [%s, %s]}, "
                + "\"k\": {\"value\": %s, \"unit\": \"1/s\", \"ci95\": [%s, %s]}}}], "
                + "\"best_model\": \"diffusion-decay\", \"spread\": {\"front_speed\": {\"value\": %s, \"unit\": "
                + "\"um/s\", \"ci95\": [%s, %s]}, \"length_constant\": {\"value\": %s, \"unit\": \"um\", "
                + "\"ci95\": null}, \"decay_time\": null}, \"warnings\": [\"a demo warning\"]}",
                sessionDir.getFileName(), d, 0.9 * d, 1.1 * d, k, 0.8 * k, 1.2 * k, 2 * Math.sqrt(d * k),
                1.8 * Math.sqrt(d * k), 2.2 * Math.sqrt(d * k), Math.sqrt(d / k));
        AtomicFiles.writeString(outDir.resolve("results.json"), results);
        BufferedImage picture = new BufferedImage(40, 30, BufferedImage.TYPE_INT_RGB);
        Pictures.savePng(picture, outDir.resolve("kymograph.png"));
    }

    /** SHA-256 of every file under {@code root}, by relative path: a fingerprint of the whole tree. */
    static Map<String, String> treeHashes(Path root) {
        Map<String, String> out = new TreeMap<>();
        try (Stream<Path> walk = Files.walk(root)) {
            for (Path f : walk.filter(Files::isRegularFile).toList()) {
                MessageDigest md = MessageDigest.getInstance("SHA-256");
                try (InputStream in = Files.newInputStream(f)) {
                    md.update(in.readAllBytes());
                }
                out.put(root.relativize(f).toString(), HexFormat.of().formatHex(md.digest()));
            }
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        } catch (java.security.NoSuchAlgorithmException e) {
            throw new IllegalStateException(e);
        }
        return out;
    }

    static String read(Path f) {
        try {
            return Files.readString(f, StandardCharsets.UTF_8);
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
    }
}
