package org.dendrokin.io.batch;

import java.nio.file.Path;
import java.util.Locale;
import java.util.Random;

import com.google.gson.GsonBuilder;
import com.google.gson.JsonObject;

import org.dendrokin.io.AtomicFiles;
import org.dendrokin.io.json.JsonFiles;
import org.dendrokin.io.demo.DemoSessionGenerator;
import org.dendrokin.io.demo.DemoSessionGenerator.Scenario;

/**
 * Writes a demo study for trying batches: N session folders {@code control/cell01, drug/cell02, ...}, each a
 * synthetic movie made by {@link DemoSessionGenerator} with its own seed, and a {@code group} in session.json.
 * Scenario of our own, for demonstration only: the "drug" group's diffusion coefficient is half the
 * control's (0.8 against 0.4 um^2/s), each cell varies around its group's value by 15% (log-normal), and the
 * decay rate is 0.05 1/s +- 15% everywhere.
 *
 * <p>Usage: {@code java -cp "$(bench/test-classpath.sh)" org.dendrokin.io.batch.DemoStudy OUT_DIR N
 * [WIDTH HEIGHT FRAMES]} (defaults 128 x 64 pixels, 100 frames, about 1.6 MB a movie; smaller frames leave too
 * few pixels away from the path to estimate the background). A main beside the tests: it is not shipped.
 */
public final class DemoStudy {
    private DemoStudy() {
    }

    public static void main(String[] args) {
        if (args.length < 2) {
            System.err.println("usage: DemoStudy OUT_DIR N [WIDTH HEIGHT FRAMES]");
            System.exit(2);
        }
        Path out = Path.of(args[0]);
        int n = Integer.parseInt(args[1]);
        int w = args.length > 2 ? Integer.parseInt(args[2]) : 128;
        int h = args.length > 3 ? Integer.parseInt(args[3]) : 64;
        int frames = args.length > 4 ? Integer.parseInt(args[4]) : 100;
        write(out, n, w, h, frames, 20261201L);
        System.err.println("Wrote " + n + " sessions under " + out.toAbsolutePath());
    }

    /** Writes {@code n} sessions alternating between the groups; the same seed gives the same study. */
    public static void write(Path out, int n, int widthPx, int heightPx, int frames, long seed) {
        Random random = new Random(seed);
        for (int i = 1; i <= n; i++) {
            boolean control = i % 2 == 1;
            String group = control ? "control" : "drug";
            double d = (control ? 0.8 : 0.4) * Math.exp(0.15 * random.nextGaussian());
            double k = 0.05 * Math.exp(0.15 * random.nextGaussian());
            double frameIntervalS = 0.5;
            double stimulusTimeS = Math.min(9.75, frames * frameIntervalS * 0.2);
            double lengthUm = widthPx * 0.9 * 0.2;
            Scenario s = new Scenario(widthPx, heightPx, frames, 0.2, frameIntervalS, stimulusTimeS, lengthUm / 2, d, k,
                    1.0, 1.5, 600, 120, 150, 3, seed * 1000 + i);
            Path dir = out.resolve(group).resolve(String.format(Locale.ROOT, "cell%03d", i));
            DemoSessionGenerator.write(dir, s);
            addGroup(dir.resolve("session.json"), group, d, k);
        }
    }

    private static void addGroup(Path json, String group, double d, double k) {
        JsonObject o = JsonFiles.readObject(json, "the session's settings");
        o.addProperty("group", group);
        o.addProperty("notes", String.format(Locale.ROOT, "demo study: true D %.4f um^2/s, true k %.4f 1/s", d, k));
        AtomicFiles.writeString(json, new GsonBuilder().setPrettyPrinting().create().toJson(o) + "\n");
    }
}
