package org.dendrokin.io.fit;

import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.Optional;

import org.dendrokin.core.Progress;
import org.dendrokin.core.fit.FitResult;
import org.dendrokin.core.fit.KymographFits;
import org.dendrokin.core.fit.ParameterEstimate;
import org.dendrokin.core.kymo.Kymograph;
import org.dendrokin.core.preprocess.Robust;
import org.dendrokin.io.session.FitSettings;

import com.google.gson.JsonElement;
import com.google.gson.JsonObject;

/**
 * The model fits of one analysed session: runs {@link KymographFits} on the analysed kymograph, gives the
 * results.json objects and the best model, puts the fitted wave's front speed into the spread section, and
 * writes the comparison pictures of the best model. The session pipeline calls this one class.
 */
public final class SessionFits {
    /** Relative difference between model and model-free front speed above which a warning is given. */
    static final double SPEED_DISAGREEMENT = 0.25;

    private final KymographFits.Outcome outcome;
    private final Kymograph signal;
    private final double stimulusTimeS;
    private final double stimulusPositionUm;

    private SessionFits(KymographFits.Outcome outcome, Kymograph signal, double t0, double x0) {
        this.outcome = outcome;
        this.signal = signal;
        this.stimulusTimeS = t0;
        this.stimulusPositionUm = x0;
    }

    /**
     * Fits the models to the session's analysed signal.
     *
     * @param models         model names from session.json, or null for the defaults
     * @param settings       criterion, profiles and bootstrap from session.json's {@code fit} object
     * @param signal         the analysed kymograph (dF/F0 or concentration). Not modified.
     * @param stimulusKnown  false if no stimulus was given or detected (then nothing is fitted)
     * @param stimulusTimeS  stimulus time, s
     * @param stimulusPosUm  stimulus position, um
     * @param baselineFirst  first baseline frame
     * @param baselineLast   last baseline frame
     * @param warnings       receives the sentences about the comparison and each converged fit. Modified.
     * @param progress       progress and cancellation
     */
    public static SessionFits run(List<String> models, FitSettings settings, Kymograph signal,
                                  boolean stimulusKnown, double stimulusTimeS, double stimulusPosUm,
                                  int baselineFirst, int baselineLast, List<String> warnings, Progress progress) {
        if (!stimulusKnown || !Double.isFinite(stimulusTimeS) || !Double.isFinite(stimulusPosUm)) {
            warnings.add("No model was fitted: the stimulus time and position are not known (give \"stimulus\" in "
                    + "session.json).");
            return new SessionFits(null, signal, Double.NaN, Double.NaN);
        }
        KymographFits.Setup setup = KymographFits.Setup.of(stimulusTimeS, stimulusPosUm)
                .withModels(models == null || models.isEmpty() ? KymographFits.DEFAULT_MODELS : models)
                .withCriterion(settings.criterion())
                .withFreeStimulus(settings.freeStimulus(), settings.freeStimulus())
                .withSealedEnds(settings.sealedEnds());
        setup = setup.withOptions(setup.options().withProfiles(settings.profiles())
                .withBootstrap(settings.bootstrapReplicates(), settings.seed()));
        if (baselineLast >= baselineFirst) {
            setup = setup.withBaselineFrames(baselineFirst, baselineLast);
        }
        KymographFits.Outcome outcome = KymographFits.fit(signal, setup, progress);
        warnings.addAll(outcome.warnings());
        outcome.best().ifPresent(best -> best.warnings().forEach(w -> warnings.add(best.model() + " fit: " + w)));
        for (FitResult f : outcome.fits()) {
            if (!f.converged()) {
                warnings.add("The " + f.model() + " fit did not converge (" + f.reason() + "); it is listed but "
                        + "gives no constants.");
            }
        }
        return new SessionFits(outcome, signal, stimulusTimeS, stimulusPosUm);
    }

    /** The results.json objects, one per model asked for (empty if nothing was fitted). */
    public List<JsonObject> json() {
        return outcome == null ? List.of() : FitJson.fits(outcome);
    }

    /** The preferred model by the criterion, or null. */
    public String bestModel() {
        return outcome == null ? null : outcome.bestModel();
    }

    /** The fitting outcome, if the fits ran. */
    public Optional<KymographFits.Outcome> outcome() {
        return Optional.ofNullable(outcome);
    }

    /**
     * When the best model is a travelling-wave model, its front speed becomes {@code spread.front_speed}
     * (with {@code "source": "model"}) and the model-free figure moves beside it as
     * {@code front_speed_model_free}; a warning is added when the two differ by more than 25%.
     *
     * @param spread   the spread object of results.json. Modified.
     * @param warnings receives the disagreement warning. Modified.
     */
    public void adjustSpread(JsonObject spread, List<String> warnings) {
        if (outcome == null) {
            return;
        }
        Optional<ParameterEstimate> wave = outcome.waveFrontSpeed();
        if (wave.isEmpty()) {
            return;
        }
        ParameterEstimate e = wave.get();
        JsonElement modelFree = spread.get("front_speed");
        JsonObject fs = new JsonObject();
        fs.add("value", FitJson.number(e.value()));
        fs.addProperty("unit", e.unit().symbol());
        com.google.gson.JsonArray ci = new com.google.gson.JsonArray();
        ci.add(FitJson.number(e.ci95() == null ? Double.NaN : e.ci95().lower()));
        ci.add(FitJson.number(e.ci95() == null ? Double.NaN : e.ci95().upper()));
        fs.add("ci95", ci);
        fs.addProperty("ci_method", e.ci95() == null ? "" : e.ci95().method());
        fs.addProperty("source", "model:" + outcome.bestModel());
        spread.add("front_speed", fs);
        spread.add("front_speed_model_free", modelFree);
        if (modelFree != null && modelFree.isJsonObject() && modelFree.getAsJsonObject().has("value")
                && !modelFree.getAsJsonObject().get("value").isJsonNull()) {
            double free = modelFree.getAsJsonObject().get("value").getAsDouble();
            if (Math.abs(free - e.value()) > SPEED_DISAGREEMENT * Math.abs(e.value())) {
                warnings.add(String.format(Locale.ROOT, "The front speed read off the arrival times (%.3g um/s) "
                        + "differs from the fitted %s front speed (%.3g um/s) by more than 25%%: on a short stretch "
                        + "of dendrite the arrival times are biased (the front is still leaving the stimulated site, "
                        + "and speeds up near a sealed end); the model figure is reported.", free,
                        outcome.bestModel(), e.value()));
            }
        }
    }

    /** Writes the measured / model / residual pictures of the best model; none if no fit converged. */
    public List<FitPictures.Picture> writePictures(Path outDir) {
        if (outcome == null || outcome.best().isEmpty()) {
            return List.of();
        }
        FitResult best = outcome.best().get();
        Kymograph model = FitPictures.simulated(signal, best);
        return new ArrayList<>(FitPictures.write(outDir, "fit-" + best.model(), best.model() + " fit", signal, model,
                stimulusTimeS, stimulusPositionUm, Robust.median(outcome.noiseSd())));
    }
}
