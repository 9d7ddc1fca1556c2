package org.dendrokin.core.analysis;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Locale;
import java.util.function.Function;

import org.dendrokin.core.Progress;
import org.dendrokin.core.calib.SignalKind;
import org.dendrokin.core.fit.FitResult;
import org.dendrokin.core.fit.InputUncertainty;
import org.dendrokin.core.fit.KymographFits;
import org.dendrokin.core.kymo.Extraction;
import org.dendrokin.core.kymo.LineTiming;
import org.dendrokin.core.kymo.FrameSource;
import org.dendrokin.core.kymo.Kymograph;
import org.dendrokin.core.model.BuiltInModel;
import org.dendrokin.core.model.ModelCatalogue;
import org.dendrokin.core.preprocess.BackgroundEstimator;
import org.dendrokin.core.preprocess.BaselineChange;
import org.dendrokin.core.preprocess.Preprocessing;
import org.dendrokin.core.preprocess.Robust;
import org.dendrokin.core.spread.SpreadAnalysis;
import org.dendrokin.core.units.Unit;

/**
 * One analysis from a movie channel and a path to typed results, in this order: the kymograph along the path;
 * the background; background subtraction, the stimulus, the baseline, the bleaching correction and dF/F0
 * ({@link Preprocessing}); the calibration ({@link CalibrationStage}); the model-free spread measures, made once
 * ({@link SpreadAnalysis}); the model fits and their comparison ({@link KymographFits}); and the headline numbers
 * ({@link Headline}). Nothing here reads or writes a file: the caller opens the movie and writes the outputs.
 */
public final class SessionAnalysis {
    /** Gap between the band's edge and the pixels the background beside the path is read from, um (spines). */
    static final double BESIDE_GAP_UM = 2.5;
    /** Depth of the strip beside the path the background is read from, um. */
    static final double BESIDE_DEPTH_UM = 2.0;
    /** Half-length along the path over which the background beside it is pooled, um. */
    static final double BESIDE_WINDOW_UM = 2.5;
    /** Stretches of the path whose background errors count as independent, um (twice the beside window). */
    static final double BACKGROUND_BLOCK_UM = 2 * BESIDE_WINDOW_UM;
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
        List<ResolvedStimulus> stimuli = Stimuli.resolve(request.stimuli(), request.path(), px,
                request.pathWidthUm(), request.trainGapS(), warnings);
        ResolvedStimulus primary = stimuli.get(0);
        MotionStage motion = MotionStage.measure(request, primary, warnings, progress);
        Extraction extraction = motion.extract(frames, progress);
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
        RatioParts ratioParts = request.denominator() != null
                ? ratioParts(request, motion, extraction, background, progress) : null;
        Kymograph ratio = ratioParts == null ? null : ratioParts.ratio(null, null);
        Preprocessing.Options options = new Preprocessing.Options(finiteOrNull(primary.timeS()),
                finiteOrNull(primary.positionUm()), request.baselineFrames(), request.bleachCorrection());
        Preprocessing.Result pre;
        try {
            pre = Preprocessing.run(extraction.kymograph(), background.perFrame(), background.alongPath(), options);
        } catch (IllegalArgumentException e) {
            throw new AnalysisInputException(AnalysisInputException.Subject.SETTINGS, e.getMessage(), e);
        }
        float[] reference = meanFrame(frames, pre.baselineFirst(), pre.baselineLast());
        pre.warnings().forEach(w -> warnings.add(new Warning(Warning.Topic.PREPROCESSING, w)));

        CalibrationStage.Lifetime lifetime = CalibrationStage.lifetime(request.calibration(),
                channel -> motion.extract(channel, progress).kymograph(), request.pathWidthUm(), px);
        CalibrationStage.Calibrated calibrated = CalibrationStage.apply(request.calibration(),
                pre.bleach().corrected(), pre.deltaF().kymograph(), ratio, lifetime, pre.baselineFirst(),
                pre.baselineLast());
        if (request.normalisation() != Normalisation.NONE) {
            calibrated = StructuralNormalisation.apply(request, motion, extraction, pre, background, warnings,
                    progress);
        }
        calibrated.warnings().forEach(w -> warnings.add(new Warning(Warning.Topic.CALIBRATION, w)));
        double[] delays;
        try {
            delays = LineTiming.delays(request.linePeriodS(), frames.height(), dt, extraction.yPx());
        } catch (IllegalArgumentException e) {
            throw new AnalysisInputException(AnalysisInputException.Subject.SETTINGS, e.getMessage(), e);
        }
        Kymograph signal = calibrated.signal().withSampleDelays(delays);
        progress.checkCancelled();

        Preprocessing.Stimulus stimulus = pre.stimulus();
        SpreadAnalysis.Result spread = null;
        List<AnalysisResult.StimulusOutcome> outcomes = new ArrayList<>();
        Kymograph fitted = signal;
        if (stimulus.known()) {
            BaselineChange.Result change = BaselineChange.of(signal, pre.baselineFirst(), pre.baselineLast());
            change = new BaselineChange.Result(change.kymograph().withSampleDelays(delays), change.noiseSd());
            int end = stimuli.size() > 1 ? signal.firstFrameAtOrAfter(stimuli.get(1).timeS()) : signal.frameCount();
            Kymograph window = end < signal.frameCount() && end > 0 ? change.kymograph().frames(0, end)
                    : change.kymograph();
            spread = SpreadAnalysis.measure(window, stimulus.timeS(), stimulus.positionUm(), change.noiseSd());
            spread.warnings().forEach(w -> warnings.add(new Warning(Warning.Topic.SPREAD, w)));
            ResolvedStimulus first = new ResolvedStimulus(stimulus.timeS(), stimulus.positionUm(),
                    primary.offPathUm(), primary.pulses(), primary.lastPulseS());
            outcomes.add(new AnalysisResult.StimulusOutcome(first, spread, 0, window.frameCount()));
            if (stimuli.size() > 1 && end > 0 && end < signal.frameCount()) {
                fitted = signal.frames(0, end);
                warnings.add(new Warning(Warning.Topic.FIT, String.format(Locale.ROOT, "The models were fitted to the "
                        + "response to the first stimulus only, up to the next stimulus at %.3g s.",
                        stimuli.get(1).timeS())));
            }
            outcomes.addAll(laterStimuli(change, stimuli, warnings));
        }
        List<SkippedModel> skipped = new ArrayList<>();
        InputUncertainty bgUncertainty = stimulus.known()
                ? backgroundUncertainty(request.calibration(), request.normalisation(), extraction.kymograph(),
                        background, ratioParts, options, pre, fitted, progress)
                : null;
        KymographFits.Outcome fits = fit(request.fits(), fitted, pre, spread, bgUncertainty, skipped, warnings,
                progress);
        Headline headline = Headline.choose(spread, fits, warnings);

        AnalysisResult.Movie movie = new AnalysisResult.Movie(frames.width(), frames.height(), frames.frameCount(),
                px, dt, request.path().lengthPx() * px, request.pathWidthUm(), request.linePeriodS());
        return new AnalysisResult(movie, extraction, background, reference, pre, calibrated, spread, fits, skipped,
                headline, new AnalysisResult.Motion(request.motion(), motion.trace()), request.normalisation(),
                outcomes, warnings);
    }

    /**
     * The spread of each stimulus after the first, each over its own window: from its time to the next
     * stimulus (or the movie's end), as the change from the mean of the (up to five) frames just before it, so that
     * the tail of the earlier response does not count.
     */
    private static List<AnalysisResult.StimulusOutcome> laterStimuli(BaselineChange.Result change,
            List<ResolvedStimulus> stimuli, List<Warning> warnings) {
        List<AnalysisResult.StimulusOutcome> out = new ArrayList<>();
        Kymograph k = change.kymograph();
        int nx = k.positionCount();
        for (int i = 1; i < stimuli.size(); i++) {
            ResolvedStimulus s = stimuli.get(i);
            int start = k.firstFrameAtOrAfter(s.timeS());
            int end = i + 1 < stimuli.size() ? k.firstFrameAtOrAfter(stimuli.get(i + 1).timeS()) : k.frameCount();
            int before = Math.max(0, start - 5);
            if (start <= before || end - start < 4 || !Double.isFinite(s.positionUm())) {
                warnings.add(new Warning(Warning.Topic.SPREAD, String.format(Locale.ROOT, "The spread of the "
                        + "stimulus at %.3g s could not be measured: it needs a place along the path, frames before "
                        + "it and at least 4 frames before the next one.", s.timeS())));
                out.add(new AnalysisResult.StimulusOutcome(s, null, start, end));
                continue;
            }
            double[] level = new double[nx];
            for (int p = 0; p < nx; p++) {
                double sum = 0;
                int n = 0;
                for (int f = before; f < start; f++) {
                    double v = k.value(f, p);
                    if (Double.isFinite(v)) {
                        sum += v;
                        n++;
                    }
                }
                level[p] = n > 0 ? sum / n : Double.NaN;
            }
            Kymograph window = k.frames(before, end);
            double[] v = window.values();
            for (int f = 0; f < window.frameCount(); f++) {
                for (int p = 0; p < nx; p++) {
                    v[f * nx + p] -= level[p];
                }
            }
            SpreadAnalysis.Result spread = SpreadAnalysis.measure(window.withValues(v, window.signalUnit()),
                    s.timeS(), s.positionUm(), change.noiseSd());
            spread.warnings().forEach(w -> warnings.add(new Warning(Warning.Topic.SPREAD, String.format(Locale.ROOT,
                    "Stimulus at %.3g s: %s", s.timeS(), w))));
            out.add(new AnalysisResult.StimulusOutcome(s, spread, before, end));
        }
        return out;
    }

    private static Double finiteOrNull(double v) {
        return Double.isFinite(v) ? v : null;
    }

    /**
     * The model fits, or null (with a warning) when the stimulus is not known. Of the default models, the
     * travelling-wave ones are fitted only where the arrival times show a front; the others are listed in
     * {@code skipped}. Models the user names are always fitted.
     */
    private static KymographFits.Outcome fit(FitRequest request, Kymograph signal, Preprocessing.Result pre,
                                             SpreadAnalysis.Result spread, InputUncertainty bgUncertainty,
                                             List<SkippedModel> skipped, List<Warning> warnings,
                                             Progress progress) {
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
                .withSealedEnds(request.sealedEnds())
                .withInputUncertainty(bgUncertainty);
        setup = setup.withOptions(setup.options().withProfiles(request.profiles())
                .withBootstrap(request.bootstrapReplicates(), request.seed()));
        if (pre.baselineLast() >= pre.baselineFirst()) {
            setup = setup.withBaselineFrames(pre.baselineFirst(), pre.baselineLast());
        }
        if (pre.bleach().applied() && signal.signalUnit().equals(Unit.DF_F0.symbol())) {
            // the bleaching correction's own error would otherwise end up in the decay rate
            setup = setup.withResidualBleaching(0.5 * (signal.timeS(pre.baselineFirst())
                    + signal.timeS(pre.baselineLast())));
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

    /**
     * The background's uncertainty as shifts of the fitted signal, or null when it is not known (a given value or
     * region) or the signal is one that this does not follow (a lifetime, a structural normalisation). The path is
     * cut into stretches of {@value #BACKGROUND_BLOCK_UM} um, twice the estimate's window, within which the errors
     * of the estimate are shared, and between which they are taken as independent; for each stretch the analysis
     * from the background on (subtraction, bleaching correction, F0, calibration; for a ratio, the ratio and its
     * calibration, each channel's background in turn) is run again with the background raised there by its
     * uncertainty, and the change of the signal is one shift.
     *
     * @param cal           the calibration that made the signal
     * @param normalisation the structural normalisation (none is followed)
     * @param raw           the signal channel's kymograph before any correction
     * @param background    the signal channel's background
     * @param ratio         the two channels of a ratio signal, or null for one channel's intensity
     * @param options       the preprocessing's options (the stimulus and baseline are taken from {@code pre})
     * @param pre           the preprocessing's result
     * @param fitted        the signal as fitted (its first frames: the shifts are on its grid)
     * @param progress      checked for cancellation
     */
    static InputUncertainty backgroundUncertainty(CalibrationRequest cal, Normalisation normalisation, Kymograph raw,
                                                  AnalysisResult.Background background, RatioParts ratio,
                                                  Preprocessing.Options options, Preprocessing.Result pre,
                                                  Kymograph fitted, Progress progress) {
        if (normalisation != Normalisation.NONE) {
            return null;
        }
        SignalKind input = cal.calibrates() ? cal.calibration().input() : SignalKind.DF_F0;
        List<Function<double[], Kymograph>> channels = new ArrayList<>();
        List<double[]> alongs = new ArrayList<>();
        List<Double> sds = new ArrayList<>();
        int nx = raw.positionCount();
        if (ratio == null && (input == SignalKind.INTENSITY || input == SignalKind.DF_F0)) {
            Preprocessing.Options fixed = new Preprocessing.Options(pre.stimulus().timeS(),
                    pre.stimulus().positionUm(), new int[] {pre.baselineFirst(), pre.baselineLast()},
                    options.bleachCorrection());
            channels.add(raised -> {
                Preprocessing.Result p2 = Preprocessing.run(raw, background.perFrame(), raised, fixed);
                return CalibrationStage.apply(cal, p2.bleach().corrected(), p2.deltaF().kymograph(), null,
                        p2.baselineFirst(), p2.baselineLast()).signal();
            });
            alongs.add(background.alongPath());
            sds.add(background.uncertainty());
        } else if (ratio != null && (input == SignalKind.RATIO || input == SignalKind.RATIO_OVER_BASELINE)) {
            Kymograph intensity = pre.bleach().corrected();
            Kymograph deltaF = pre.deltaF().kymograph();
            channels.add(raised -> CalibrationStage.apply(cal, intensity, deltaF, ratio.ratio(raised, null),
                    pre.baselineFirst(), pre.baselineLast()).signal());
            alongs.add(ratio.numeratorAlong());
            sds.add(ratio.numeratorSd());
            channels.add(raised -> CalibrationStage.apply(cal, intensity, deltaF, ratio.ratio(null, raised),
                    pre.baselineFirst(), pre.baselineLast()).signal());
            alongs.add(ratio.denominatorAlong());
            sds.add(ratio.denominatorSd());
        }
        double[] base = fitted.values();
        int blockSamples = Math.max(1, (int) Math.round(BACKGROUND_BLOCK_UM / raw.distanceStepUm()));
        List<double[]> shifts = new ArrayList<>();
        for (int c = 0; c < channels.size(); c++) {
            double sd = sds.get(c);
            if (!(sd > 0 && Double.isFinite(sd))) {
                continue;
            }
            double[] along = alongs.get(c) != null ? alongs.get(c) : new double[nx];
            for (int from = 0; from < nx; from += blockSamples) {
                progress.checkCancelled();
                double[] raised = along.clone();
                for (int p = from; p < Math.min(nx, from + blockSamples); p++) {
                    raised[p] += sd;
                }
                Kymograph again;
                try {
                    again = channels.get(c).apply(raised);
                } catch (RuntimeException e) {
                    // a background raised this far leaves no usable signal: the uncertainty cannot be carried
                    return null;
                }
                double[] moved = again.values();
                double[] shift = new double[base.length];
                for (int g = 0; g < base.length; g++) {
                    double d = moved[g] - base[g];
                    shift[g] = Double.isFinite(d) ? d : 0;
                }
                shifts.add(shift);
            }
        }
        return shifts.isEmpty() ? null : new InputUncertainty("background", shifts);
    }

    /**
     * The two channels a ratio is made of, each with its background (one level a frame, and one a position when it
     * was estimated beside the path) and that background's uncertainty (NaN when it was given).
     */
    record RatioParts(Kymograph numerator, double[] numeratorPerFrame, double[] numeratorAlong, double numeratorSd,
                      Kymograph denominator, double[] denominatorPerFrame, double[] denominatorAlong,
                      double denominatorSd) {
        /**
         * The ratio kymograph: each channel minus its own background, numerator over denominator; with the
         * backgrounds along the path replaced where an argument is not null.
         */
        Kymograph ratio(double[] numeratorAlongUsed, double[] denominatorAlongUsed) {
            return CalibrationStage.ratio(
                    minusAlongPath(numerator, numeratorAlongUsed != null ? numeratorAlongUsed : numeratorAlong),
                    numeratorPerFrame,
                    minusAlongPath(denominator, denominatorAlongUsed != null ? denominatorAlongUsed : denominatorAlong),
                    denominatorPerFrame);
        }
    }

    private static RatioParts ratioParts(AnalysisRequest request, MotionStage motion, Extraction numerator,
                                         AnalysisResult.Background numeratorBackground, Progress progress) {
        FrameSource denominator = request.denominator();
        int frames = request.signal().frameCount();
        Kymograph denRaw = motion.extract(denominator, progress).kymograph();
        CalibrationRequest cal = request.calibration();
        Kymograph num = numerator.kymograph();
        double[] numBg;
        double[] numAlong = null;
        double numSd = Double.NaN;
        if (cal.numeratorBackground() == null) {
            numBg = numeratorBackground.perFrame();
            numAlong = numeratorBackground.alongPath();
            numSd = numeratorBackground.uncertainty();
        } else {
            numBg = constant(cal.numeratorBackground(), frames);
        }
        double[] denBg;
        double[] denAlong = null;
        double denSd = Double.NaN;
        if (cal.denominatorBackground() != null) {
            denBg = constant(cal.denominatorBackground(), frames);
        } else {
            AnalysisResult.Background b = background(request.background(), denominator, numerator, request, progress);
            denBg = b.perFrame();
            denAlong = b.alongPath();
            denSd = b.uncertainty();
        }
        return new RatioParts(num, numBg, numAlong, numSd, denRaw, denBg, denAlong, denSd);
    }

    /** The kymograph minus a background that varies along the path (unchanged for null). */
    static Kymograph minusAlongPath(Kymograph k, double[] alongPath) {
        if (alongPath == null) {
            return k;
        }
        int nx = k.positionCount();
        double[] v = k.values();
        for (int i = 0; i < v.length; i++) {
            v[i] -= alongPath[i % nx];
        }
        return k.withValues(v, k.signalUnit());
    }

    /** The background of one channel: the given value, the region's mean frame by frame, or the estimate. */
    static AnalysisResult.Background background(BackgroundRequest how, FrameSource frames,
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
        double inner = (request.pathWidthUm() / 2 + BESIDE_GAP_UM) / request.pixelSizeUm();
        double outer = inner + BESIDE_DEPTH_UM / request.pixelSizeUm();
        int halfWindow = (int) Math.round(BESIDE_WINDOW_UM / request.pixelSizeUm());
        double[] beside = BackgroundEstimator.besidePath(frames, extraction.xPx(), extraction.yPx(), inner, outer,
                halfWindow, picks, progress);
        if (beside.length == 0 || !Double.isFinite(beside[0])) {
            return new AnalysisResult.Background(constant(est.value(), n), null, est.value(), est.spread(),
                    est.description() + String.format(Locale.ROOT, " Its uncertainty under the path is taken as the "
                            + "background's spread across the field, %.3g (robust SD).", est.spread()));
        }
        double median = Robust.median(beside);
        return new AnalysisResult.Background(new double[n], beside, median, est.spread(), String.format(Locale.ROOT,
                "Estimated from the data beside the path, position by position: the mean of the medians on the two "
                + "sides of the pixels %.3g to %.3g um from the path within %.3g um along it, averaged over %d frames "
                + "(the value shown is the median along the path). Far from the path, the %.0fth percentile of %d "
                + "pixels is %.4g. The background under the path is not seen: its uncertainty is taken as the "
                + "background's spread across the field, %.3g (robust SD of those pixels), and carried into the "
                + "fitted constants' intervals.",
                request.pathWidthUm() / 2 + BESIDE_GAP_UM, request.pathWidthUm() / 2 + BESIDE_GAP_UM
                        + BESIDE_DEPTH_UM, BESIDE_WINDOW_UM, picks.length, BackgroundEstimator.PERCENTILE,
                est.pixelCount(), est.value(), est.spread()));
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
    static float[] meanFrame(FrameSource frames, int first, int last) {
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

    static double[] constant(double value, int frames) {
        double[] out = new double[frames];
        Arrays.fill(out, value);
        return out;
    }
}
