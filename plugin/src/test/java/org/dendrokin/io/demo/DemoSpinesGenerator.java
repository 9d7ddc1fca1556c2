package org.dendrokin.io.demo;

import java.nio.file.Path;
import java.util.SplittableRandom;

import org.dendrokin.io.AtomicFiles;
import org.dendrokin.io.text.TextFiles;
import org.dendrokin.synth.SessionGenerator;
import org.dendrokin.synth.SessionSpec;

import com.google.gson.GsonBuilder;
import com.google.gson.JsonObject;
import com.google.gson.JsonParser;

/**
 * Writes the spine demo session: our realistic synthetic preset ({@link SessionSpec#realistic}: a curved spiny
 * dendrite, blur, uneven loading, bleaching, Poisson-Gaussian camera noise) imaged fast (every 0.05 s, 160 frames)
 * so that neck exchange times of 0.1 to 2 s show, with a stimulated spine; its session.json asks for the spine
 * analysis. The generator's true values are written beside it in truth.json. Seeded: the same bytes every time.
 *
 * <p>Usage: {@code java -cp "$(bench/test-classpath.sh)" org.dendrokin.io.demo.DemoSpinesGenerator [OUT_DIR]}
 * (default {@code test-images/demo-spines}).
 */
public final class DemoSpinesGenerator {
    /** The demo's seed. */
    public static final long SEED = 14;
    /** Frame interval, s. */
    public static final double FRAME_S = 0.05;
    /** Stimulus time, s. */
    public static final double STIMULUS_S = 2.0;

    private DemoSpinesGenerator() {
    }

    /** The realistic preset of {@code seed}, 160 x 64 pixels of 0.2 um, 160 frames of 0.05 s, released at 2 s. */
    public static SessionSpec spec(long seed) {
        SessionSpec base = SessionSpec.realistic(seed);
        SessionSpec.GaussianPulse drawn = SessionSpec.GaussianPulse.drawn(new SplittableRandom(seed));
        SessionSpec.GaussianPulse pulse = new SessionSpec.GaussianPulse(drawn.dUm2PerS(), drawn.kPerS(),
                drawn.sigma0Um(), drawn.amplitude(), STIMULUS_S, drawn.positionFraction());
        SessionSpec.Imaging imaging = new SessionSpec.Imaging(160, 64, 160, 0.2, FRAME_S, 1, 0, 0, 2);
        return base.withImaging(imaging).withSignal(pulse);
    }

    public static void main(String[] args) {
        Path dir = Path.of(args.length > 0 ? args[0] : "test-images/demo-spines");
        SessionSpec spec = spec(SEED);
        SessionGenerator.Written w = SessionGenerator.write(spec, dir);
        Path session = dir.resolve("session.json");
        JsonObject o = JsonParser.parseString(TextFiles.read(session)).getAsJsonObject();
        o.addProperty("description", "Synthetic spine demo (seed " + SEED + "), made by "
                + "org.dendrokin.io.demo.DemoSpinesGenerator; true values in truth.json");
        JsonObject spines = new JsonObject();
        spines.addProperty("head_decay_per_s", w.truth().signal().kPerS());
        o.add("spines", spines);
        AtomicFiles.writeString(session, new GsonBuilder().setPrettyPrinting().create().toJson(o) + "\n");
    }
}
