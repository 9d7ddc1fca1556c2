package org.dendrokin.bench;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.Locale;

import org.dendrokin.synth.SessionGenerator;
import org.dendrokin.synth.SessionSpec;
import org.dendrokin.synth.Truth;

/**
 * Writes the sessions of the worked examples in docs/acquisitions.md: realistic movies made by the project's own
 * generator (seeded, so the same files every time), each with one feature of a real acquisition. Run it with
 * {@code java -cp "$(bench/test-classpath.sh)" org.dendrokin.bench.AcquisitionExamples OUT_DIR}; each session's
 * truth.json holds the values that made it.
 */
public final class AcquisitionExamples {
    private AcquisitionExamples() {
    }

    public static void main(String[] args) throws IOException {
        if (args.length != 1) {
            System.err.println("usage: AcquisitionExamples OUT_DIR");
            System.exit(2);
        }
        Path out = Path.of(args[0]);
        // 1. a slow drift of 0.8 um over the movie
        SessionGenerator.write(SessionSpec.realistic(21).withMotion(SessionSpec.Motion.linear(0.8, 0.02)),
                out.resolve("drift"));
        // 2. a red structural channel first, the signal second
        SessionGenerator.write(SessionSpec.realistic(22).withChannels(SessionSpec.Channels.twoStructuralFirst()),
                out.resolve("two-channels"));
        // 3. the stimulus given as a spot in pixels
        SessionGenerator.Written spot = SessionGenerator.write(SessionSpec.realistic(23), out.resolve("spot"));
        Truth.Stimulus s = spot.truth().stimulus();
        replaceStimulus(out.resolve("spot"), String.format(Locale.ROOT, "\"stimulus\": {\"time_s\": %s, "
                + "\"x_px\": %.2f, \"y_px\": %.2f}", s.timeS(), s.xPx(), s.yPx()));
        // 4. two stimuli, 30 s and about a third of the path apart
        SessionSpec base = SessionSpec.realistic(24);
        SessionSpec.GaussianPulse first = (SessionSpec.GaussianPulse) base.signal();
        SessionSpec.GaussianPulse second = new SessionSpec.GaussianPulse(first.dUm2PerS(), first.kPerS(),
                first.sigma0Um(), first.amplitude(), first.timeS() + 30, first.positionFraction() > 0.5 ? 0.15 : 0.85);
        SessionGenerator.Written two = SessionGenerator.write(base.withSignal(new SessionSpec.PulsePair(first, second)),
                out.resolve("two-stimuli"));
        Truth.Stimulus a = two.truth().stimulus();
        Truth.Stimulus b = two.truth().laterStimuli().get(0);
        replaceStimulus(out.resolve("two-stimuli"), String.format(Locale.ROOT, "\"stimuli\": [{\"time_s\": %s, "
                + "\"x_px\": %.2f, \"y_px\": %.2f}, {\"time_s\": %s, \"x_px\": %.2f, \"y_px\": %.2f}]", a.timeS(), a.xPx(),
                a.yPx(), b.timeS(), b.xPx(), b.yPx()));
        // 5. a fast front down a vertical dendrite, raster-scanned over the whole frame interval
        SessionGenerator.write(SessionSpec.clean(5)
                .withImaging(new SessionSpec.Imaging(32, 200, 40, 0.25, 0.2, 1, 0, 0.2 / 200, 2))
                .withDendrite(new SessionSpec.Dendrite(3, 0, 90, 0.6, 0, 5))
                .withSignal(new SessionSpec.NagumoFront(200, 25, 0.1, 1.0, 2.0))
                .withSession(new SessionSpec.SessionFile(List.of(), true, true, true)),
                out.resolve("raster"));
        // the front fills the whole field, so there is no still region to measure motion against
        Path raster = out.resolve("raster").resolve("session.json");
        Files.writeString(raster, Files.readString(raster).replaceFirst("\\{", "{\n  \"motion\": \"off\","));
        System.out.println("wrote drift, two-channels, spot, two-stimuli and raster under " + out);
    }

    private static void replaceStimulus(Path session, String with) throws IOException {
        Path json = session.resolve("session.json");
        Files.writeString(json, Files.readString(json).replaceAll("\"stimulus\"\\s*:\\s*\\{[^}]*\\}", with));
    }
}
