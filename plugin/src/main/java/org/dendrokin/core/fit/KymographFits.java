package org.dendrokin.core.fit;

import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.Optional;

import org.dendrokin.core.Checks;
import org.dendrokin.core.Progress;
import org.dendrokin.core.kymo.Kymograph;
import org.dendrokin.core.model.Boundary;
import org.dendrokin.core.model.DataGuesses;
import org.dendrokin.core.model.Domain;
import org.dendrokin.core.model.ModelCatalogue;
import org.dendrokin.core.model.StartPoints;
import org.dendrokin.core.model.Stimulus;
import org.dendrokin.core.spread.Estimate;
import org.dendrokin.core.spread.SpreadAnalysis;
import org.dendrokin.core.units.Unit;

/**
 * Fits the models a user asks for to one kymograph and compares them: noise per position from the baseline
 * frames, starting values from the model-free spread measures ({@link SpreadAnalysis}), several starts per
 * model, then AIC, AICc, BIC and Akaike weights, and the best model by the chosen criterion among the fits that
 * converged. {@code diffusion-decay} is fitted in closed form ({@link DiffusionDecayPulse}); every other scalar
 * engine model through the engine ({@link EngineFitModel}), stimulated by a unit pulse at the stimulus with the
 * width the diffusion-decay fit found.
 */
public final class KymographFits {
    /** Models fitted when the user names none. */
    public static final List<String> DEFAULT_MODELS = List.of(DiffusionDecayPulse.NAME,
            ModelCatalogue.NAGUMO.name());
    /** Engine models get profile-likelihood intervals only up to this many samples (each profile point is a refit). */
    public static final int ENGINE_PROFILE_LIMIT = 20_000;

    /**
     * What to fit.
     *
     * @param stimulusTimeS       t0, s (a starting value when {@code fitStimulusTime})
     * @param stimulusPositionUm  x0, um along the path (a starting value when {@code fitStimulusPosition})
     * @param fitStimulusTime     fit t0 in the diffusion-decay model instead of holding it
     * @param fitStimulusPosition fit x0 in the diffusion-decay model instead of holding it
     * @param baselineFrames      {first, last} baseline frame (inclusive), or null for every frame before t0
     * @param sealedEnds          true if the path's ends are sealed dendrite ends (mirror images, no-flux engine)
     * @param models              model names to fit
     * @param criterion           "aicc" (default), "aic" or "bic"
     * @param options             fitter options
     * @param stimulusWidthUm     width (Gaussian SD, um) of the unit pulse that starts the engine models, or NaN
     *                            to take it from the half-maximum width of the first frame after the stimulus
     * @param residualBleachingFromS the middle of the baseline frames (s) when the diffusion-decay fit also fits the
     *                            bleaching the correction left over ({@link ResidualBleaching}), NaN otherwise
     * @param inputUncertainty    the uncertainty of an input of the kymograph (its background), as shifts on the
     *                            kymograph's grid, carried into every fit's intervals; or null
     */
    public record Setup(double stimulusTimeS, double stimulusPositionUm, boolean fitStimulusTime,
                        boolean fitStimulusPosition, int[] baselineFrames, boolean sealedEnds, List<String> models,
                        String criterion, ModelFit.Options options, double stimulusWidthUm,
                        double residualBleachingFromS, InputUncertainty inputUncertainty) {
        public Setup {
            Checks.finite(stimulusTimeS, "stimulus time (s)");
            Checks.finite(stimulusPositionUm, "stimulus position (um)");
            Checks.require(List.of("aic", "aicc", "bic").contains(criterion),
                    "the model-selection criterion must be aic, aicc or bic, not " + criterion);
            models = List.copyOf(models);
            Checks.require(!models.isEmpty(), "name at least one model to fit");
            for (String m : models) {
                Checks.require(ModelCatalogue.findScalar(m).isPresent(),
                        "unknown model '" + m + "'; known: " + ModelCatalogue.scalarNames());
            }
        }

        /** The defaults: stimulus fixed where given, baseline before it, open ends, both default models, AICc. */
        public static Setup of(double stimulusTimeS, double stimulusPositionUm) {
            return new Setup(stimulusTimeS, stimulusPositionUm, false, false, null, false, DEFAULT_MODELS, "aicc",
                    ModelFit.Options.defaults(), Double.NaN, Double.NaN, null);
        }

        public Setup withModels(List<String> names) {
            return new Setup(stimulusTimeS, stimulusPositionUm, fitStimulusTime, fitStimulusPosition, baselineFrames,
                    sealedEnds, names, criterion, options, stimulusWidthUm, residualBleachingFromS, inputUncertainty);
        }

        public Setup withOptions(ModelFit.Options newOptions) {
            return new Setup(stimulusTimeS, stimulusPositionUm, fitStimulusTime, fitStimulusPosition, baselineFrames,
                    sealedEnds, models, criterion, newOptions, stimulusWidthUm, residualBleachingFromS, inputUncertainty);
        }

        public Setup withSealedEnds(boolean sealed) {
            return new Setup(stimulusTimeS, stimulusPositionUm, fitStimulusTime, fitStimulusPosition, baselineFrames,
                    sealed, models, criterion, options, stimulusWidthUm, residualBleachingFromS, inputUncertainty);
        }

        public Setup withFreeStimulus(boolean time, boolean position) {
            return new Setup(stimulusTimeS, stimulusPositionUm, time, position, baselineFrames, sealedEnds, models,
                    criterion, options, stimulusWidthUm, residualBleachingFromS, inputUncertainty);
        }

        public Setup withCriterion(String name) {
            return new Setup(stimulusTimeS, stimulusPositionUm, fitStimulusTime, fitStimulusPosition, baselineFrames,
                    sealedEnds, models, name, options, stimulusWidthUm, residualBleachingFromS, inputUncertainty);
        }

        public Setup withBaselineFrames(int first, int last) {
            return new Setup(stimulusTimeS, stimulusPositionUm, fitStimulusTime, fitStimulusPosition,
                    new int[] {first, last}, sealedEnds, models, criterion, options, stimulusWidthUm,
                    residualBleachingFromS, inputUncertainty);
        }

        /**
         * Fits the residual bleaching with the diffusion-decay model ({@link ResidualBleaching}); for a dF/F0
         * kymograph whose bleaching was corrected.
         *
         * @param baselineMiddleS the middle of the baseline frames, s, where F0 was taken; NaN to switch it off
         */
        public Setup withResidualBleaching(double baselineMiddleS) {
            return new Setup(stimulusTimeS, stimulusPositionUm, fitStimulusTime, fitStimulusPosition, baselineFrames,
                    sealedEnds, models, criterion, options, stimulusWidthUm, baselineMiddleS, inputUncertainty);
        }

        /**
         * Carries the uncertainty of an input of the kymograph into every fit's intervals.
         *
         * @param uncertainty shifts on the kymograph's grid (frame * positions + position), or null for none
         */
        public Setup withInputUncertainty(InputUncertainty uncertainty) {
            return new Setup(stimulusTimeS, stimulusPositionUm, fitStimulusTime, fitStimulusPosition, baselineFrames,
                    sealedEnds, models, criterion, options, stimulusWidthUm, residualBleachingFromS, uncertainty);
        }

        public Setup withStimulusWidth(double widthUm) {
            return new Setup(stimulusTimeS, stimulusPositionUm, fitStimulusTime, fitStimulusPosition, baselineFrames,
                    sealedEnds, models, criterion, options, widthUm, residualBleachingFromS, inputUncertainty);
        }
    }

    /**
     * Everything the fits gave.
     *
     * @param fits           one result per model, in the order asked, converged or not
     * @param bestModel      name of the preferred converged fit, or null if none converged
     * @param criterion      the criterion that chose it
     * @param weights        Akaike weights by model name, from the chosen criterion (0 for non-converged fits)
     * @param noiseSd        noise standard deviation per position used for the weights, signal units
     * @param spread         the model-free measures used for the starting values
     * @param warnings       plain sentences about the data and the comparison (each fit has its own too)
     * @param noiseModel     the noise variance behind the weights (baseline noise, and its growth with the signal)
     * @param misfits        the residual structure of each converged fit, by model name
     */
    public record Outcome(List<FitResult> fits, String bestModel, String criterion, Map<String, Double> weights,
                          double[] noiseSd, SpreadAnalysis.Result spread, List<String> warnings,
                          VarianceModel noiseModel, Map<String, Misfit.Result> misfits) {
        public Outcome {
            fits = List.copyOf(fits);
            warnings = List.copyOf(warnings);
            misfits = Map.copyOf(misfits);
        }

        /** The residual structure of a converged fit, if measured. */
        public Optional<Misfit.Result> misfit(String model) {
            return Optional.ofNullable(misfits.get(model));
        }

        /** True when a fit's residuals show that its model does not describe the data. */
        public boolean isMisfit(String model) {
            return misfit(model).map(m -> m.verdict() == Misfit.Verdict.MISFIT).orElse(false);
        }

        /** An outcome whose weights came from the baseline noise alone, without residual checks. */
        public Outcome(List<FitResult> fits, String bestModel, String criterion, Map<String, Double> weights,
                       double[] noiseSd, SpreadAnalysis.Result spread, List<String> warnings) {
            this(fits, bestModel, criterion, weights, noiseSd, spread, warnings,
                    noiseSd == null ? null : VarianceModel.baselineOnly(noiseSd), Map.of());
        }

        /** The fit of a model by name. */
        public Optional<FitResult> fit(String model) {
            return fits.stream().filter(f -> f.model().equals(model)).findFirst();
        }

        /** The best fit, if any converged. */
        public Optional<FitResult> best() {
            return bestModel == null ? Optional.empty() : fit(bestModel);
        }

        /** Front speed of the best model when it is a travelling-wave model that converged. */
        public Optional<ParameterEstimate> waveFrontSpeed() {
            return best().flatMap(f -> f.estimate("front_speed"));
        }
    }

    private KymographFits() {
    }

    /**
     * Fits every model of the setup to the kymograph.
     *
     * @param k        the kymograph (dF/F0 or concentration; NaN marks missing samples). Not modified.
     * @param setup    what to fit
     * @param progress reports per model; checked for cancellation
     */
    public static Outcome fit(Kymograph k, Setup setup, Progress progress) {
        return fit(k, setup, null, progress);
    }

    /**
     * Fits every model of the setup to the kymograph, with starting values from spread measures the caller has
     * already made (a session analysis measures the spread once and shows the same figures everywhere).
     *
     * @param k        the kymograph (dF/F0 or concentration; NaN marks missing samples). Not modified.
     * @param setup    what to fit
     * @param measured the model-free spread measures of this kymograph about the setup's stimulus, or null to
     *                 measure them here
     * @param progress reports per model; checked for cancellation
     */
    public static Outcome fit(Kymograph k, Setup setup, SpreadAnalysis.Result measured, Progress progress) {
        List<String> warnings = new ArrayList<>();
        double t0 = setup.stimulusTimeS();
        double x0 = setup.stimulusPositionUm();
        int[] baseline = setup.baselineFrames();
        int firstAfter = k.firstFrameAtOrAfter(t0);
        if (baseline == null) {
            baseline = new int[] {0, firstAfter - 1};
        }
        double[] sigma = NoiseEstimate.perPosition(k, baseline[0], baseline[1], warnings);
        double b0 = baselineLevel(k, baseline);
        double noise = org.dendrokin.core.preprocess.Robust.median(sigma);
        Kymograph zeroed = shifted(k, -b0);
        SpreadAnalysis.Result spread = measured != null ? measured : SpreadAnalysis.measure(zeroed, t0, x0, noise);
        int framesAfter = k.frameCount() - firstAfter;
        if (framesAfter < 2) {
            warnings.add(String.format(Locale.ROOT, "Only %d frame(s) after the stimulus: no model can be fitted to "
                    + "the spread.", framesAfter));
        }
        if (k.nanCount() > 0) {
            warnings.add(String.format(Locale.ROOT, "%d of %d samples are missing (NaN) and were left out of the "
                    + "fits.", k.nanCount(), (long) k.positionCount() * k.frameCount()));
        }
        VarianceModel noiseModel = VarianceModel.estimate(k, sigma, b0, firstAfter);
        FitData data = noiseModel.fitData(k);
        if (setup.inputUncertainty() != null) {
            data = data.withInputUncertainty(setup.inputUncertainty());
        }
        StartGuess guess = StartGuess.from(k, zeroed, spread, t0, x0, firstAfter, b0);
        List<FitResult> fits = new ArrayList<>();
        FitResult dd = null;
        List<String> order = new ArrayList<>(setup.models());
        if (order.remove(DiffusionDecayPulse.NAME)) {
            order.add(0, DiffusionDecayPulse.NAME);
        }
        for (String name : order) {
            progress.checkCancelled();
            FitResult r;
            if (framesAfter < 2) {
                r = FitResult.failed(name, "too few frames after the stimulus to fit a model", List.of());
            } else if (name.equals(DiffusionDecayPulse.NAME)) {
                r = fitDiffusionDecay(k, data, setup, guess, progress);
                dd = r;
            } else {
                r = fitEngine(name, k, data, setup, guess, dd, progress);
                if (ModelCatalogue.scalar(name).travellingWave()) {
                    r = withFronts(r, k, sigma, setup, guess, spread, progress);
                }
            }
            fits.add(r);
        }
        // back to the order the user gave
        List<FitResult> ordered = new ArrayList<>();
        for (String name : setup.models()) {
            fits.stream().filter(f -> f.model().equals(name)).findFirst().ifPresent(ordered::add);
        }
        Map<String, Misfit.Result> misfits = new LinkedHashMap<>();
        for (FitResult f : ordered) {
            if (f.converged() && f.fitted() != null) {
                misfits.put(f.model(), Misfit.of(k, f.fitted(), sigma, firstAfter, x0));
            }
        }
        String criterion = setup.criterion();
        // A model whose residuals show it does not describe the data takes no part in the comparison: an
        // information criterion ranks models that fit up to noise, and would give such a model all the weight.
        double[] values = ordered.stream().mapToDouble(f -> f.converged() && !(misfits.containsKey(f.model())
                && misfits.get(f.model()).verdict() == Misfit.Verdict.MISFIT) ? f.criterion(criterion) : Double.NaN)
                .toArray();
        double[] w = InformationCriteria.weights(values);
        Map<String, Double> weights = new LinkedHashMap<>();
        String best = null;
        double bestValue = Double.POSITIVE_INFINITY;
        for (int i = 0; i < ordered.size(); i++) {
            weights.put(ordered.get(i).model(), w[i]);
            if (Double.isFinite(values[i]) && values[i] < bestValue) {
                bestValue = values[i];
                best = ordered.get(i).model();
            }
        }
        boolean anyConverged = ordered.stream().anyMatch(FitResult::converged);
        if (best == null && !anyConverged) {
            warnings.add("No model fit converged, so no model is reported as best and no fitted constants are given.");
        } else if (best == null) {
            Misfit.Pattern pattern = misfits.values().stream().map(Misfit.Result::pattern).findFirst()
                    .orElse(Misfit.Pattern.GENERAL);
            warnings.add("No model describes these data: the residuals of every fit show structure (" + pattern.label()
                    + ": " + pattern.meaning() + "), so no model is reported as best and no fitted constant should be "
                    + "quoted. Look at the residual pictures.");
        }
        return new Outcome(ordered, best, criterion, weights, sigma, spread, warnings, noiseModel, misfits);
    }

    private static FitResult fitDiffusionDecay(Kymograph k, FitData data, Setup setup, StartGuess g,
                                               Progress progress) {
        double[] walls = setup.sealedEnds() ? new double[] {k.distanceUm(0), k.distanceUm(k.positionCount() - 1)}
                : null;
        boolean lineTimed = k.hasSampleDelays() && k.frameCount() >= 2;
        DiffusionDecayPulse model = new DiffusionDecayPulse(k.distancesUm(),
                lineTimed ? LineTimedModel.extendedTimes(k.timesS()) : k.timesS(),
                setup.fitStimulusTime() ? Double.NaN : setup.stimulusTimeS(),
                setup.fitStimulusPosition() ? Double.NaN : setup.stimulusPositionUm(), walls, g.unit);
        // a raster scan: the model is read at each sample's own time
        FitModel timed = lineTimed ? new LineTimedModel(model, k.timesS(), k.sampleDelaysS()) : model;
        List<double[]> starts = new ArrayList<>();
        double[][] factors = {{1, 1}, {0.3, 1}, {3, 1}, {1, 0.3}, {1, 3}};
        for (double[] f : factors) {
            double d = g.dUm2PerS * f[0];
            double kk = g.kPerS * f[1];
            double v1 = g.widthUm * g.widthUm;
            double amp = g.peak * Math.exp(kk * g.tau1) * Math.sqrt(v1 + 2 * d * g.tau1) / g.widthUm;
            starts.add(model.pack(d, kk, amp, g.peakPositionUm, g.widthUm, g.baseline, setup.stimulusTimeS()));
        }
        if (Double.isFinite(setup.residualBleachingFromS())) {
            ResidualBleaching bleaching = new ResidualBleaching(timed, k.timesS(), k.positionCount(),
                    setup.residualBleachingFromS());
            return ModelFit.fit(bleaching, data, starts.stream().map(ResidualBleaching::start).toList(),
                    setup.options(), progress);
        }
        return ModelFit.fit(timed, data, starts, setup.options(), progress);
    }

    private static FitResult fitEngine(String name, Kymograph k, FitData data, Setup setup, StartGuess g,
                                       FitResult diffusionDecay, Progress progress) {
        double xFirst = k.distanceUm(0);
        double lengthUm = k.distanceUm(k.positionCount() - 1) - xFirst;
        double kymoDx = k.distanceStepUm();
        double t0 = setup.stimulusTimeS();
        double x0 = setup.stimulusPositionUm();
        // The stimulus width comes from the first frames (half-maximum width), not from the diffusion-decay fit,
        // whose width absorbs the spread of a travelling front when the data are a wave.
        double width = Double.isFinite(setup.stimulusWidthUm()) && setup.stimulusWidthUm() > 0
                ? setup.stimulusWidthUm() : g.widthUm;
        if (diffusionDecay != null && diffusionDecay.converged()) {
            x0 = diffusionDecay.estimate("position").map(ParameterEstimate::value).orElse(x0);
            t0 = diffusionDecay.estimate("stimulus_time").map(ParameterEstimate::value).orElse(t0);
        }
        if (!(lengthUm > 0) || k.positionCount() < 3) {
            return FitResult.failed(name, "the kymograph has too few positions for a model along the dendrite",
                    List.of());
        }
        // the model's own starts from the data's measures, then amplitude (the plateau) and baseline
        StartPoints own = ModelCatalogue.scalar(name).startPoints(
                new DataGuesses(g.frontSpeedUmPerS, width, g.dUm2PerS, g.kPerS, kymoDx));
        List<double[]> starts = new ArrayList<>();
        for (double[] theta : own.points()) {
            double[] start = java.util.Arrays.copyOf(theta, theta.length + 2);
            start[theta.length] = g.plateau;
            start[theta.length + 1] = g.baseline;
            starts.add(start);
        }
        double minFront = own.narrowestFeatureUm();
        double h = Math.min(kymoDx, Math.min(minFront, width) / 3);
        h = Math.min(h, lengthUm / 4);
        double dMax = 0;
        double rMax = 0;
        for (double[] s : starts) {
            dMax = Math.max(dMax, s[0]);
            rMax = Math.max(rMax, s[1]);
        }
        // Time step from the engine's own rule at twice the largest starting D and rate, so that it still
        // resolves the model where the optimiser wanders; at most half a frame, and not below a tenth of a frame
        // (the scheme is second order and L-stable, so a coarser step costs accuracy, never stability).
        double frame = Math.max(k.timeStepS(), 1e-6);
        double dt = org.dendrokin.core.model.SolverSettings.DEFAULT.maxStep(2 * rMax, h, 2 * dMax,
                Math.max(width, h));
        dt = Math.max(Math.min(dt, frame / 2), frame / 10);
        double[] positions = k.distancesUm();
        for (int i = 0; i < positions.length; i++) {
            positions[i] -= xFirst;
        }
        // a raster scan: the model is read at each sample's own time
        boolean lineTimed = k.hasSampleDelays() && k.frameCount() >= 2;
        EngineFitModel model;
        try {
            Domain domain = new Domain(lengthUm, h, Boundary.NO_FLUX);
            model = new EngineFitModel(name, domain, lineTimed
                    ? LineTimedModel.extendedTimes(k.timesS(), EngineFitModel.LINE_STEPS) : k.timesS(), positions,
                    List.of(Stimulus.pulse(Math.max(0, t0), Math.min(Math.max(x0 - xFirst, 0), lengthUm),
                            Math.max(width, h), 1.0)), dt, g.unit);
        } catch (IllegalArgumentException e) {
            return FitResult.failed(name, "the model could not be set up for this kymograph: " + e.getMessage(),
                    List.of());
        }
        List<String> notes = new ArrayList<>();
        // Each evaluation is a full simulation: fewer evaluations per start, and profiles only on small kymographs
        // (elsewhere the Student t intervals are reported and say so in ci_method).
        ModelFit.Options options = setup.options().withMaxEvaluations(Math.min(setup.options().maxEvaluations(), 200));
        if ((long) k.positionCount() * k.frameCount() > ENGINE_PROFILE_LIMIT) {
            options = options.withProfiles(false);
        }
        FitResult r = model.fitInStages(data, starts, options, progress, lineTimed ? k.sampleDelaysS() : null);
        if (!setup.sealedEnds()) {
            notes.add("The " + name + " model was simulated with sealed ends at the ends of the path.");
        }

        if (notes.isEmpty()) {
            return r;
        }
        List<String> all = new ArrayList<>(r.warnings());
        all.addAll(notes);
        return new FitResult(r.model(), r.converged(), r.reason(), r.parameters(), r.derived(), r.pointsUsed(),
                r.chiSquare(), r.rmse(), r.aic(), r.aicc(), r.bic(), r.correlation(), r.fitted(), all,
                r.evaluations());
    }

    /**
     * A travelling-wave fit with the speed and width of its fronts fitted directly ({@link FrontFit}). A formed
     * front fixes its speed c and width w but not D, k and a separately; when the engine fit cannot tell them
     * apart (singular sensitivities, or a threshold at its bound), the model is still reported, with c and w (and
     * the speed of each front) from the direct fit and D, k, a marked as not determined, rather than as a fit that
     * failed. Where the engine fit determines everything, the direct fit adds the speed of each front.
     */
    private static FitResult withFronts(FitResult engine, Kymograph k, double[] sigma, Setup setup, StartGuess g,
                                        SpreadAnalysis.Result spread, Progress progress) {
        FrontFit.Result fronts = FrontFit.fit(k, sigma, setup.stimulusTimeS(), setup.stimulusPositionUm(),
                spread == null ? null : spread.front(), 1.1774 * g.widthUm, g.plateau, g.baseline, g.unit,
                setup.options(), progress);
        if (!fronts.shared().converged()) {
            if (engine.converged()) {
                return engine;
            }
            return appendWarnings(engine, List.of("The fronts' speed and width could not be fitted directly either ("
                    + fronts.shared().reason() + ")."));
        }
        List<ParameterEstimate> direct = FrontFit.derived(fronts);
        List<String> warnings = new ArrayList<>(engine.warnings());
        if (!fronts.comparison().isEmpty()) {
            warnings.add(fronts.comparison());
        }
        boolean determined = engine.converged() && engine.parameters().stream()
                .filter(p -> List.of("D", "k", "a").contains(p.name()))
                .allMatch(p -> p.identifiable() && !p.atBound());
        List<ParameterEstimate> derived = new ArrayList<>();
        if (determined) {
            derived.addAll(engine.derived());
            direct.stream().filter(e -> e.name().endsWith("_left") || e.name().endsWith("_right"))
                    .forEach(derived::add);
            return new FitResult(engine.model(), true, "", engine.parameters(), derived, engine.pointsUsed(),
                    engine.chiSquare(), engine.rmse(), engine.aic(), engine.aicc(), engine.bic(),
                    engine.correlation(), engine.fitted(), warnings, engine.evaluations());
        }
        List<ParameterEstimate> parameters = new ArrayList<>();
        for (ParameterEstimate p : engine.parameters()) {
            boolean shape = List.of("D", "k", "a").contains(p.name());
            parameters.add(shape ? new ParameterEstimate(p.name(), p.unit(), p.value(), Double.NaN, null, List.of(),
                    p.atBound(), false) : p);
        }
        derived.addAll(direct);
        warnings.add(String.format(Locale.ROOT, "D, k and a are not separately determined by these data: a front that "
                + "has formed fixes only its speed c = sqrt(k D / 2)(1 - 2a) and its width w = sqrt(2 D / k). The front "
                + "speed and width (and each front's speed) are fitted directly to the fronts' shape from %.3g s on, "
                + "after they formed; D, k and a are shown but are not estimates.", fronts.fromS()));
        boolean hasLikelihood = Double.isFinite(engine.chiSquare()) && engine.fitted() != null;
        return new FitResult(engine.model(), true, "", parameters, derived, engine.pointsUsed(), engine.chiSquare(),
                engine.rmse(), hasLikelihood ? engine.aic() : Double.NaN, hasLikelihood ? engine.aicc() : Double.NaN,
                hasLikelihood ? engine.bic() : Double.NaN, null, hasLikelihood ? engine.fitted() : null, warnings,
                engine.evaluations() + fronts.shared().evaluations());
    }

    private static FitResult appendWarnings(FitResult r, List<String> more) {
        List<String> all = new ArrayList<>(r.warnings());
        all.addAll(more);
        return new FitResult(r.model(), r.converged(), r.reason(), r.parameters(), r.derived(), r.pointsUsed(),
                r.chiSquare(), r.rmse(), r.aic(), r.aicc(), r.bic(), r.correlation(), r.fitted(), all,
                r.evaluations());
    }

    private static double baselineLevel(Kymograph k, int[] baseline) {
        List<Double> v = new ArrayList<>();
        for (int f = Math.max(0, baseline[0]); f <= Math.min(k.frameCount() - 1, baseline[1]); f++) {
            for (int p = 0; p < k.positionCount(); p++) {
                double x = k.value(f, p);
                if (Double.isFinite(x)) {
                    v.add(x);
                }
            }
        }
        if (v.isEmpty()) {
            return 0;
        }
        return org.dendrokin.core.preprocess.Robust.median(v.stream().mapToDouble(Double::doubleValue).toArray());
    }

    private static Kymograph shifted(Kymograph k, double by) {
        double[] v = k.values();
        for (int i = 0; i < v.length; i++) {
            v[i] += by;
        }
        return k.withValues(v, k.signalUnit());
    }

    /** Starting values read off the data. */
    private static final class StartGuess {
        Unit unit;
        double baseline;
        double peak;
        double peakPositionUm;
        double widthUm;
        double tau1;
        double dUm2PerS;
        double kPerS;
        double plateau;
        double frontSpeedUmPerS;

        static StartGuess from(Kymograph k, Kymograph zeroed, SpreadAnalysis.Result spread, double t0, double x0,
                               int firstAfter, double b0) {
            StartGuess g = new StartGuess();
            g.unit = unitOf(k.signalUnit());
            g.baseline = b0;
            int nx = k.positionCount();
            int nt = k.frameCount();
            double dx = Math.max(k.distanceStepUm(), 1e-6);
            double span = Math.max(k.timeS(nt - 1) - t0, Math.max(k.timeStepS(), 1e-6));
            int f1 = Math.min(firstAfter, nt - 1);
            if (f1 < nt - 1 && k.timeS(f1) - t0 <= 0) {
                f1++;     // the first frame with some spread behind it
            }
            double[] row = zeroed.row(f1);
            int iMax = -1;
            for (int p = 0; p < nx; p++) {
                if (Double.isFinite(row[p]) && (iMax < 0 || row[p] > row[iMax])) {
                    iMax = p;
                }
            }
            g.peak = iMax >= 0 && row[iMax] > 0 ? row[iMax] : 1;
            g.peakPositionUm = x0;
            int left = iMax;
            int right = iMax;
            while (left > 0 && Double.isFinite(row[left - 1]) && row[left - 1] > g.peak / 2) {
                left--;
            }
            while (right >= 0 && right < nx - 1 && Double.isFinite(row[right + 1]) && row[right + 1] > g.peak / 2) {
                right++;
            }
            double fwhm = iMax >= 0 ? (right - left + 1) * dx : dx;
            g.widthUm = Math.max(fwhm / 2.3548, dx / 2);
            g.tau1 = Math.max(0, k.timeS(f1) - t0);
            g.dUm2PerS = positive(spread.apparentD(), dx * dx / Math.max(k.timeStepS(), 1e-6) / 10);
            double decay = positive(spread.decayTime(), span);
            g.kPerS = 1 / decay;
            double top = Double.NEGATIVE_INFINITY;
            for (double v : zeroed.values()) {
                if (Double.isFinite(v)) {
                    top = Math.max(top, v);
                }
            }
            g.plateau = top > 0 ? top : 1;
            g.frontSpeedUmPerS = positive(spread.frontSpeed(), Math.max(nx * dx / 4 / span, dx / span));
            return g;
        }

        private static double positive(Estimate e, double fallback) {
            return e != null && Double.isFinite(e.value()) && e.value() > 0 ? e.value() : fallback;
        }
    }

    /** The Unit for a kymograph's signal unit string. */
    public static Unit unitOf(String signalUnit) {
        return Unit.ofSymbol(signalUnit);
    }
}
