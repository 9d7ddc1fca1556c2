package org.dendrokin.io;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Path;
import java.util.List;

import org.dendrokin.core.Progress;
import org.dendrokin.core.fit.FitResult;
import org.dendrokin.core.fit.KymographFits;
import org.dendrokin.core.fit.Misfit;
import org.dendrokin.synth.SessionGenerator;
import org.dendrokin.synth.SessionSpec;
import org.junit.jupiter.api.Tag;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * Movies with something the models do not have: a slow drift of the specimen, and a bright spine head moving into
 * the path's band. The misfit is flagged with its pattern, and no model whose residuals are flagged gets the weight
 * of the comparison.
 */
@Tag("slow")
class MisfitOnRealisticMoviesTest {
    private static final SessionSpec.SessionFile BOTH_MODELS = SessionSpec.SessionFile.standard()
            .withModels(List.of("diffusion-decay", "nagumo"));

    @TempDir
    Path dir;

    private SessionRunner.Result analyse(SessionSpec spec, String name) {
        return analyse(spec, name, BOTH_MODELS);
    }

    private SessionRunner.Result analyse(SessionSpec spec, String name, SessionSpec.SessionFile session) {
        SessionGenerator.write(spec.withSession(session), dir.resolve(name));
        // the movement itself is what is tested here, so the analysis must not correct it
        Path json = dir.resolve(name).resolve("session.json");
        try {
            String text = java.nio.file.Files.readString(json);
            java.nio.file.Files.writeString(json, text.replaceFirst("\\{", "{\"motion\": \"off\", "));
        } catch (java.io.IOException e) {
            throw new java.io.UncheckedIOException(e);
        }
        return SessionRunner.analyze(dir.resolve(name), dir.resolve(name + "-out"), Progress.NONE);
    }

    private static void flaggedAndWithoutWeight(SessionRunner.Result r) {
        KymographFits.Outcome o = r.analysis().fits();
        Misfit.Result dd = o.misfit("diffusion-decay").orElseThrow();
        assertEquals(Misfit.Verdict.MISFIT, dd.verdict(), dd.toString());
        assertEquals(Misfit.Pattern.STRIPES, dd.pattern(), dd.toString());
        for (FitResult f : o.fits()) {
            if (o.isMisfit(f.model())) {
                double w = o.weights().getOrDefault(f.model(), Double.NaN);
                assertFalse(w > 0.9, f.model() + " is flagged as a misfit but has Akaike weight " + w);
                assertFalse(f.model().equals(o.bestModel()), "a flagged model is not the best");
            }
        }
        assertTrue(r.warnings().stream().anyMatch(w -> w.contains("stripes along time")), r.warnings().toString());
    }

    @Test
    void aSlowDriftIsFlaggedAsStripes() {
        // 0.8 um over the movie, as in the case that once made the wrong model win with all the weight
        flaggedAndWithoutWeight(analyse(SessionSpec.realistic(3).withMotion(SessionSpec.Motion.linear(0.8, 0.0)),
                "drift"));
    }

    @Test
    void aBrightSpineEnteringTheBandIsFlaggedAsStripes() {
        // a head four times as bright as the shaft, moving from 2.5 um to 0.3 um off the axis between 20 and 40 s
        SessionSpec.Intruder intruder = new SessionSpec.Intruder(true, 4, 0.45, 0.3, 2.5, 0.3, 20, 40);
        flaggedAndWithoutWeight(analyse(SessionSpec.realistic(3).withIntruder(intruder), "intruder"));
    }

    @Test
    void theRealisticMovieWithoutMotionIsNotAMisfit() {
        SessionRunner.Result r = analyse(SessionSpec.realistic(3), "still", SessionSpec.SessionFile.standard());
        Misfit.Result dd = r.analysis().fits().misfit("diffusion-decay").orElseThrow();
        assertTrue(dd.verdict() != Misfit.Verdict.MISFIT, dd.toString());
        assertEquals("diffusion-decay", r.bestModel(), r.warnings().toString());
    }
}
