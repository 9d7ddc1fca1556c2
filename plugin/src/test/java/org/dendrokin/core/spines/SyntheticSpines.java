package org.dendrokin.core.spines;

import java.util.List;
import java.util.SplittableRandom;

import org.dendrokin.core.Progress;
import org.dendrokin.core.fit.DiffusionDecayPulse;
import org.dendrokin.core.fit.FitResult;
import org.dendrokin.core.fit.KymographFits;
import org.dendrokin.core.kymo.Extraction;
import org.dendrokin.core.kymo.FrameSource;
import org.dendrokin.core.kymo.Kymograph;
import org.dendrokin.core.kymo.KymographExtractor;
import org.dendrokin.core.path.DendritePath;
import org.dendrokin.core.preprocess.BackgroundEstimator;
import org.dendrokin.core.preprocess.Preprocessing;
import org.dendrokin.synth.SessionGenerator;
import org.dendrokin.synth.SessionSpec;
import org.dendrokin.synth.Truth;

/**
 * A realistic synthetic session (the project's own generator, {@link SessionGenerator}, which shares no code with
 * the analysis) turned into the inputs of a spine analysis the way the session analysis makes them: the kymograph
 * along the drawn path, the background from far pixels, the baseline before the stimulus, the bleaching
 * correction and dF/F0, and the mean of up to 10 baseline frames as the reference image.
 */
final class SyntheticSpines {
    /** Fast imaging: 0.05 s frames, so that neck time constants down to 0.1 s can be measured. */
    static final double FRAME_S = 0.05;
    static final int FRAMES = 160;
    static final double STIMULUS_S = 2.0;

    final SessionGenerator.Rendering rendering;
    final SpineInputs inputs;

    SyntheticSpines(SessionGenerator.Rendering rendering, SpineInputs inputs) {
        this.rendering = rendering;
        this.inputs = inputs;
    }

    Truth truth() {
        return rendering.truth();
    }

    /**
     * The realistic preset of a seed (curved dendrite, spines with neck time constants of 0.1 to 2 s, blur, uneven
     * loading, Poisson-Gaussian noise, uneven background, bleaching) imaged every {@value #FRAME_S} s, with the
     * pulse released at {@value #STIMULUS_S} s.
     */
    static SessionSpec fastSpec(long seed) {
        SessionSpec base = SessionSpec.realistic(seed);
        SessionSpec.GaussianPulse drawn = SessionSpec.GaussianPulse.drawn(new SplittableRandom(seed));
        SessionSpec.GaussianPulse pulse = new SessionSpec.GaussianPulse(drawn.dUm2PerS(), drawn.kPerS(),
                drawn.sigma0Um(), drawn.amplitude(), STIMULUS_S, drawn.positionFraction());
        SessionSpec.Imaging imaging = new SessionSpec.Imaging(160, 64, FRAMES, 0.2, FRAME_S, 1, 0, 0, 2);
        return base.withImaging(imaging).withSignal(pulse);
    }

    static SyntheticSpines of(SessionSpec spec, List<SpineSite> given) {
        return of(spec, given, true);
    }

    /**
     * @param fittedShaft drive the neck fits by the shaft's fitted model, as a session does; false: by the measured
     *                    kymograph
     */
    static SyntheticSpines of(SessionSpec spec, List<SpineSite> given, boolean fittedShaft) {
        SessionGenerator.Rendering r = SessionGenerator.render(spec);
        Truth t = r.truth();
        FrameSource frames = new RenderedFrames(r, spec.channels().signalChannel() - 1);
        DendritePath path = DendritePath.of(t.path().xPx(), t.path().yPx(), false);
        double px = t.movie().pixelSizeUm();
        double dt = t.movie().frameIntervalS();
        double width = t.path().widthUm();
        Extraction extraction = KymographExtractor.extract(frames, path, px, dt, width, px, Progress.NONE);
        int[] picks = new int[16];
        for (int i = 0; i < picks.length; i++) {
            picks[i] = i * (frames.frameCount() / 4 - 1) / (picks.length - 1);
        }
        double bg = BackgroundEstimator.fromFarPixels(frames, extraction.xPx(), extraction.yPx(),
                (width / 2 + 3.0) / px, picks, Progress.NONE).value();
        double[] background = new double[frames.frameCount()];
        java.util.Arrays.fill(background, bg);
        Preprocessing.Result pre = Preprocessing.run(extraction.kymograph(), background,
                new Preprocessing.Options(t.stimulus().timeS(), t.stimulus().pathPositionUm(), null, true));
        double[] bleach = null;
        if (pre.bleach().applied()) {
            // The curve the shaft was divided by, one or two phases, as the session's spine stage takes it.
            double slow = pre.bleach().timeConstant().value();
            var fast = pre.bleach().fastPhase();
            bleach = new double[frames.frameCount()];
            for (int f = 0; f < bleach.length; f++) {
                double u = f * dt;
                bleach[f] = fast == null ? Math.exp(-u / slow) : fast.fraction()
                        * Math.exp(-u / fast.timeConstant().value()) + (1 - fast.fraction()) * Math.exp(-u / slow);
            }
        }
        float[] reference = meanFrame(frames, pre.baselineFirst(), pre.baselineLast());
        Kymograph shaft = pre.deltaF().kymograph();
        Kymograph model = fittedShaft ? shaftModel(shaft, pre, t.stimulus().timeS(), t.stimulus().pathPositionUm())
                : null;
        SpineInputs in = new SpineInputs(reference, frames, path, px, width, shaft, background,
                bleach, pre.baselineFirst(), pre.baselineLast(), t.stimulus().timeS(), t.stimulus().pathPositionUm(),
                given, model, model == null ? "" : DiffusionDecayPulse.NAME);
        return new SyntheticSpines(r, in);
    }

    /**
     * The shaft's dF/F0 as the diffusion-decay fit describes it, fitted as the session analysis fits it (its
     * baseline frames, the residual bleaching when the bleaching was corrected), or null when the fit did not
     * converge or its residuals show that the model misses the data. The generator's shaft signal is a diffusing,
     * decaying pulse, so this is the model a session would find best.
     */
    static Kymograph shaftModel(Kymograph shaft, Preprocessing.Result pre, double stimulusS, double stimulusUm) {
        KymographFits.Setup setup = KymographFits.Setup.of(stimulusS, stimulusUm)
                .withModels(List.of(DiffusionDecayPulse.NAME))
                .withBaselineFrames(pre.baselineFirst(), pre.baselineLast());
        if (pre.bleach().applied()) {
            setup = setup.withResidualBleaching(0.5 * (shaft.timeS(pre.baselineFirst())
                    + shaft.timeS(pre.baselineLast())));
        }
        KymographFits.Outcome o = KymographFits.fit(shaft, setup, Progress.NONE);
        FitResult best = o.best().orElse(null);
        if (best == null || best.fitted() == null || o.isMisfit(best.model())) {
            return null;
        }
        return new Kymograph(shaft.distancesUm(), shaft.timesS(), best.fitted(), shaft.signalUnit());
    }

    /** Mean of up to 10 frames spread over the baseline, as the session analysis makes its reference image. */
    static float[] meanFrame(FrameSource frames, int first, int last) {
        int w = frames.width();
        int h = frames.height();
        int count = Math.min(10, last - first + 1);
        float[] sum = new float[w * h];
        float[] buffer = new float[w * h];
        for (int i = 0; i < count; i++) {
            int f = first + (int) Math.round(i * (last - first) / Math.max(1.0, count - 1.0));
            frames.readRows(f, 0, h, buffer);
            for (int k = 0; k < sum.length; k++) {
                sum[k] += buffer[k] / count;
            }
        }
        return sum;
    }

    /** The recorded 16-bit planes of one channel of a rendering, as a frame source. */
    static final class RenderedFrames implements FrameSource {
        private final SessionGenerator.Rendering r;
        private final int channel;

        RenderedFrames(SessionGenerator.Rendering r, int channel) {
            this.r = r;
            this.channel = channel;
        }

        @Override
        public int width() {
            return r.width();
        }

        @Override
        public int height() {
            return r.height();
        }

        @Override
        public int frameCount() {
            return r.frames();
        }

        @Override
        public float[] readRows(int frame, int firstRow, int rowCount, float[] dst) {
            int w = r.width();
            short[] plane = r.recorded()[r.plane(channel, r.slices() / 2, frame)];
            for (int i = 0; i < rowCount * w; i++) {
                dst[i] = plane[firstRow * w + i] & 0xffff;
            }
            return dst;
        }
    }
}
