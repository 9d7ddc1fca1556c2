package org.dendrokin.core.motion;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Arrays;
import java.util.List;

import org.dendrokin.core.Progress;
import org.dendrokin.core.fit.DiffusionDecayPulse;
import org.dendrokin.core.fit.KymographFits;
import org.dendrokin.core.fit.ParameterEstimate;
import org.dendrokin.core.kymo.Kymograph;
import org.dendrokin.core.kymo.KymographExtractor;
import org.dendrokin.core.path.DendritePath;
import org.dendrokin.core.preprocess.Preprocessing;
import org.junit.jupiter.api.Tag;
import org.junit.jupiter.api.Test;

/**
 * The scientific point of motion correction: a diffusion-decay pulse imaged on a dendrite that drifts by 0.8 um
 * across it. After correction, the fitted D and k must agree with those of the same pulse imaged without drift,
 * and the preferred model must be the same.
 */
@Tag("slow")
class CorrectedFitTest {
    private static final double PIXEL_UM = 0.3;
    private static final double FRAME_S = 0.1;
    private static final int FRAMES = 150;
    private static final int STIMULUS_FRAME = 30;
    private static final double BAND_UM = 1.0;
    private static final double BACKGROUND = 20;
    private static final double D_UM2_PER_S = 0.4;
    private static final double K_PER_S = 0.3;
    private static final double X0_PX = 80;
    private static final double PATH_START_PX = 15;

    @Test
    void correctedDriftGivesTheConstantsOfTheStillMovie() {
        SyntheticDendrite scene = new SyntheticDendrite(160, 48, 21, 0);
        DendritePath path = scene.path(PATH_START_PX, 145);
        double d = D_UM2_PER_S / (PIXEL_UM * PIXEL_UM);
        var pulse = SyntheticMovie.diffusionDecay(X0_PX, 3, 1.0 / PIXEL_UM, d, K_PER_S, STIMULUS_FRAME, FRAME_S);
        double[] still = new double[FRAMES];
        double[] dx = new double[FRAMES];
        double[] dy = new double[FRAMES];
        for (int f = 0; f < FRAMES; f++) {
            // 0.8 um across the dendrite and 0.5 um along it over the movie
            dx[f] = 0.5 / PIXEL_UM * f / (FRAMES - 1);
            dy[f] = 0.8 / PIXEL_UM * f / (FRAMES - 1);
        }
        SyntheticMovie stillMovie = new SyntheticMovie(scene, still, still, pulse, true, 31);
        SyntheticMovie drifting = new SyntheticMovie(scene, dx, dy, pulse, true, 32);
        MotionTrace trace = MotionCorrection.measure(drifting, PixelBox.around(path, 0), 0, STIMULUS_FRAME - 1,
                new StimulusRegion(X0_PX, scene.centreY(X0_PX), 3 / PIXEL_UM), MotionSettings.of(PIXEL_UM, BAND_UM),
                Progress.NONE);

        Kymograph stillK = deltaF(KymographExtractor.extract(stillMovie, path, PIXEL_UM, FRAME_S, BAND_UM,
                PIXEL_UM, Progress.NONE).kymograph());
        Kymograph corrected = deltaF(MotionCorrection.extract(drifting, path, trace, PIXEL_UM, FRAME_S, BAND_UM,
                PIXEL_UM, Progress.NONE).kymograph());
        Kymograph uncorrected = deltaF(KymographExtractor.extract(drifting, path, PIXEL_UM, FRAME_S, BAND_UM,
                PIXEL_UM, Progress.NONE).kymograph());

        double t0 = STIMULUS_FRAME * FRAME_S;
        double x0 = (X0_PX - PATH_START_PX) * PIXEL_UM;
        KymographFits.Setup setup = KymographFits.Setup.of(t0, x0);
        KymographFits.Outcome stillFit = KymographFits.fit(stillK, setup, Progress.NONE);
        KymographFits.Outcome correctedFit = KymographFits.fit(corrected, setup, Progress.NONE);
        KymographFits.Outcome uncorrectedFit = KymographFits.fit(uncorrected,
                setup.withModels(List.of(DiffusionDecayPulse.NAME)), Progress.NONE);
        boolean uncorrectedAgrees = true;
        for (String p : new String[] {"D", "k"}) {
            ParameterEstimate s = estimate(stillFit, p);
            ParameterEstimate c = estimate(correctedFit, p);
            // REF: the same pulse imaged without drift, fitted the same way; each estimate within the other's 95%
            // interval [common practice]
            assertTrue(s.ci95().contains(c.value()), p + " corrected " + c.value() + " outside the still movie's "
                    + s.ci95());
            assertTrue(c.ci95().contains(s.value()), p + " of the still movie " + s.value() + " outside the "
                    + "corrected " + c.ci95());
            uncorrectedAgrees &= s.ci95().contains(estimate(uncorrectedFit, p).value());
        }
        assertFalse(uncorrectedAgrees, "without correction the drift should move D or k out of the interval");
        assertEquals(stillFit.bestModel(), correctedFit.bestModel(), "preferred model");
        assertTrue(trace.exceedsThreshold(), "the drift is reported: " + trace.warnings());
    }

    private static ParameterEstimate estimate(KymographFits.Outcome o, String name) {
        return o.fit(DiffusionDecayPulse.NAME).orElseThrow().estimate(name).orElseThrow();
    }

    /** dF/F0 with the known background, F0 over the frames before the stimulus, no bleaching correction. */
    private static Kymograph deltaF(Kymograph raw) {
        double[] background = new double[raw.frameCount()];
        Arrays.fill(background, BACKGROUND);
        return Preprocessing.run(raw, background, new Preprocessing.Options(STIMULUS_FRAME * FRAME_S,
                (X0_PX - PATH_START_PX) * PIXEL_UM, null, false)).deltaF().kymograph();
    }
}
