package org.dendrokin.core.analysis;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Locale;

import org.dendrokin.core.Progress;
import org.dendrokin.core.fit.FitResult;
import org.dendrokin.core.fit.KymographFits;
import org.dendrokin.core.kymo.Extraction;
import org.dendrokin.core.kymo.FrameSource;
import org.dendrokin.core.kymo.Kymograph;
import org.dendrokin.core.kymo.KymographExtractor;
import org.dendrokin.core.model.BuiltInModel;
import org.dendrokin.core.model.ModelCatalogue;
import org.dendrokin.core.preprocess.BackgroundEstimator;
import org.dendrokin.core.preprocess.BaselineChange;
import org.dendrokin.core.preprocess.Preprocessing;
import org.dendrokin.core.preprocess.Robust;
import org.dendrokin.core.spread.SpreadAnalysis;

/**
 * One analysis from a movie channel and a path to typed results, in this order: the kymograph along the path;
 * the background; background subtraction, the stimulus, the baseline, the bleaching correction and dF/F0
 * ({@link Preprocessing}); the calibration ({@link CalibrationStage}); the model-free spread measures, made once
 * ({@link SpreadAnalysis}); the model fits and their comparison ({@link KymographFits}); and the headline numbers
 * ({@link Headline}). Nothing here reads or writes a file: the caller opens the movie and writes the outputs.
 */
public final class SessionAnalysis {
    /** Frames averaged for the reference image of the path picture. */
    private static final int REFERENCE_FRAMES = 10;

    private SessionAnalysis() {
    }

    /**
     * Runs the analysis.
     *
     * @param request  the validated inputs
     * @param progress progress and cancellation
     * @throws AnalysisInputException when the inputs cannot be analysed as given (one sentence, naming the input)
     * @throws Progress.CancelledException if the user cancelled
     */
    public static AnalysisResult run(AnalysisRequest request, Progress progress) {
        InputChecks.check(request);
        List<Warning> warnings = new ArrayList<>();
        FrameSource frames = request.signal();
        double px = request.pixelSizeUm();
        double dt = request.frameIntervalS();
        Extraction extraction = KymographExtractor.extract(frames, request.path(), px, dt, request.pathWidthUm(), px,
                progress);
        if (extraction.fractionOutside() > 0.5) {
            throw new AnalysisInputException(AnalysisInputException.Subject.PATH, String.format(Locale.ROOT,
                    "%.0f%% of the path lies outside the %d x %d pixel movie", 100 * extraction.fractionOutside(),
                    frames.width(), frames.height()));
        }
        if (extraction.fractionOutside() > 0) {
            warnings.add(new Warning(Warning.Topic.PATH, String.format(Locale.ROOT, "%.0f%% of the path lies outside "
                    + "the image; those positions are empty (NaN) in the kymograph.", 100 * extraction.fractionOutside())));
        }
        AnalysisResult.Background background = background(request.background(), frames, extraction, request, progress);
        Kymograph ratio = null;
        if (request.denominator() != null) {
            ratio = ratio(request, extraction, background, progress);
        }
        Preprocessing.Result pre;
        try {
            pre = Preprocessing.run(extraction.kymograph(), background.perFrame(), request.preprocessing());
        } catch (IllegalArgumentException e) {
            throw new AnalysisInputException(AnalysisInputException.Subject.SETTINGS, e.getMessage(), e);
        }
        float[] reference = meanFrame(frames, pre.baselineFirst(), pre.baselineLast());
        pre.warnings().forEach(w -> warnings.add(new Warning(Warning.Topic.PREPROCESSING, w)));

        CalibrationStage.Calibrated calibrated = CalibrationStage.apply(request.calibration(),
                pre.bleach().corrected(), pre.deltaF().kymograph(), ratio, pre.baselineFirst(), pre.baselineLast());
        calibrated.warnings().forEach(w -> warnings.add(new Warning(Warning.Topic.CALIBRATION, w)));
        Kymograph signal = calibrated.signal();
        progress.checkCancelled();

        Preprocessing.Stimulus stimulus = pre.stimulus();
        SpreadAnalysis.Result spread = null;
        if (stimulus.known()) {
            BaselineChange.Result change = BaselineChange.of(signal, pre.baselineFirst(), pre.baselineLast());
            spread = SpreadAnalysis.measure(change.kymograph(), stimulus.timeS(), stimulus.positionUm(),
                    change.noiseSd());
            spread.warnings().forEach(w -> warnings.add(new Warning(Warning.Topic.SPREAD, w)));
        }
        List<SkippedModel> skipped = new ArrayList<>();
        KymographFits.Outcome fits = fit(request.fits(), signal, pre, spread, skipped, warnings, progress);
        Headline headline = Headline.choose(spread, fits, warnings);

        AnalysisResult.Movie movie = new AnalysisResult.Movie(frames.width(), frames.height(), frames.frameCount(),
                px, dt, request.path().lengthPx() * px, request.pathWidthUm());
        return new AnalysisResult(movie, extraction, background, reference, pre, calibrated, spread, fits, skipped,
                headline, warnings);
    }

    /**
     * The model fits, or null (with a warning) when the stimulus is not known. Of the default models, the
     * travelling-wave ones are fitted only where the arrival times show a front; the others are listed in
     * {@code skipped}. Models the user names are always fitted.
     */
    private static KymographFits.Outcome fit(FitRequest request, Kymograph signal, Preprocessing.Result pre,
                                             SpreadAnalysis.Result spread, List<SkippedModel> skipped,
                                             List<Warning> warnings, Progress progress) {
        Preprocessing.Stimulus stimulus = pre.stimulus();
        if (!stimulus.known()) {
            warnings.add(new Warning(Warning.Topic.FIT, "No model was fitted: the stimulus time and position are not "
                    + "known (give \"stimulus\" in session.json)."));
            return null;
        }
        boolean asked = request.models() != null && !request.models().isEmpty();
        List<String> models = new ArrayList<>(asked ? request.models() : KymographFits.DEFAULT_MODELS);
        if (!asked && spread != null && !spread.front().present()) {
            for (String m : List.copyOf(models)) {
                if (ModelCatalogue.find(m).map(BuiltInModel::travellingWave).orElse(false)) {
                    models.remove(m);
                    skipped.add(new SkippedModel(m, "The arrival times show no front (" + spread.front().verdict()
                            .phrase() + "), so this travelling-wave model was not fitted; name it in session.json's "
                            + "\"models\" to fit it anyway."));
                }
            }
        }
        KymographFits.Setup setup = KymographFits.Setup.of(stimulus.timeS(), stimulus.positionUm())
                .withModels(models)
                .withCriterion(request.criterion())
                .withFreeStimulus(request.freeStimulus(), request.freeStimulus())
                .withSealedEnds(request.sealedEnds());
        setup = setup.withOptions(setup.options().withProfiles(request.profiles())
                .withBootstrap(request.bootstrapReplicates(), request.seed()));
        if (pre.baselineLast() >= pre.baselineFirst()) {
            setup = setup.withBaselineFrames(pre.baselineFirst(), pre.baselineLast());
        }
        KymographFits.Outcome outcome = KymographFits.fit(signal, setup, spread, progress);
        outcome.warnings().forEach(w -> warnings.add(new Warning(Warning.Topic.FIT, w)));
        outcome.best().ifPresent(best -> best.warnings().forEach(
                w -> warnings.add(new Warning(Warning.Topic.FIT, best.model() + " fit: " + w))));
        for (FitResult f : outcome.fits()) {
            if (outcome.isMisfit(f.model())) {
                warnings.add(new Warning(Warning.Topic.FIT, outcome.misfit(f.model()).orElseThrow().sentence(f.model())));
            }
            if (!f.converged()) {
                warnings.add(new Warning(Warning.Topic.FIT, "The " + f.model() + " fit did not converge ("
                        + f.reason() + "); it is listed but gives no constants."));
            }
        }
        return outcome;
    }

    /** The ratio kymograph: each channel minus its own background, numerator over denominator. */
    private static Kymograph ratio(AnalysisRequest request, Extraction numerator,
                                   AnalysisResult.Background numeratorBackground, Progress progress) {
        FrameSource denominator = request.denominator();
        double px = request.pixelSizeUm();
        int frames = request.signal().frameCount();
        Kymograph denRaw = KymographExtractor.extract(denominator, request.path(), px, request.frameIntervalS(),
                request.pathWidthUm(), px, progress).kymograph();
        CalibrationRequest cal = request.calibration();
        double[] numBg = cal.numeratorBackground() == null ? numeratorBackground.perFrame()
                : constant(cal.numeratorBackground(), frames);
        double[] denBg = cal.denominatorBackground() != null ? constant(cal.denominatorBackground(), frames)
                : background(request.background(), denominator, numerator, request, progress).perFrame();
        return CalibrationStage.ratio(numerator.kymograph(), numBg, denRaw, denBg);
    }

    /** The background of one channel: the given value, the region's mean frame by frame, or the estimate. */
    private static AnalysisResult.Background background(BackgroundRequest how, FrameSource frames,
                                                        Extraction extraction, AnalysisRequest request,
                                                        Progress progress) {
        int n = frames.frameCount();
        if (how instanceof BackgroundRequest.Fixed fixed) {
            return new AnalysisResult.Background(constant(fixed.value(), n), fixed.value(), fixed.description());
        }
        if (how instanceof BackgroundRequest.Region region) {
            double[] perFrame = regionMeans(region, frames, progress);
            return new AnalysisResult.Background(perFrame, Robust.median(perFrame), "Mean of the pixels inside "
                    + region.name() + ", frame by frame (the value shown is the median over frames).");
        }
        int span = Math.max(1, Math.min(n, Math.max(16, n / 4)));
        int count = Math.min(16, span);
        int[] picks = new int[count];
        for (int i = 0; i < count; i++) {
            picks[i] = (int) Math.round(i * (span - 1.0) / Math.max(1, count - 1));
        }
        double minDistancePx = (request.pathWidthUm() / 2 + 3.0) / request.pixelSizeUm();
        BackgroundEstimator.Estimate est = BackgroundEstimator.fromFarPixels(frames, extraction.xPx(),
                extraction.yPx(), minDistancePx, picks, progress);
        if (!Double.isFinite(est.value())) {
            throw new AnalysisInputException(AnalysisInputException.Subject.SETTINGS, est.description()
                    + " Set key \"background\" to {\"value\": ...} or {\"roi\": \"file.roi\"}");
        }
        return new AnalysisResult.Background(constant(est.value(), n), est.value(), est.description());
    }

    /** The mean of the region's pixels in every frame, reading only the rows the region covers. */
    private static double[] regionMeans(BackgroundRequest.Region region, FrameSource frames, Progress progress) {
        int[] xs = region.xPx();
        int[] ys = region.yPx();
        int y0 = Arrays.stream(ys).min().getAsInt();
        int y1 = Arrays.stream(ys).max().getAsInt();
        int rows = y1 - y0 + 1;
        int w = frames.width();
        float[] buffer = new float[rows * w];
        double[] out = new double[frames.frameCount()];
        for (int f = 0; f < out.length; f++) {
            progress.checkCancelled();
            frames.readRows(f, y0, rows, buffer);
            double sum = 0;
            for (int i = 0; i < xs.length; i++) {
                sum += buffer[(ys[i] - y0) * w + xs[i]];
            }
            out[f] = sum / xs.length;
            progress.report("measuring the background", f + 1, out.length);
        }
        return out;
    }

    /** Mean of up to {@value #REFERENCE_FRAMES} frames spread over the baseline, row-major. */
    private static float[] meanFrame(FrameSource frames, int first, int last) {
        int w = frames.width();
        int h = frames.height();
        int count = Math.min(REFERENCE_FRAMES, last - first + 1);
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

    private static double[] constant(double value, int frames) {
        double[] out = new double[frames];
        Arrays.fill(out, value);
        return out;
    }
}
