package org.dendrokin.core.analysis;

import java.util.List;
import java.util.Locale;
import java.util.Optional;

import org.dendrokin.core.fit.KymographFits;
import org.dendrokin.core.fit.ParameterEstimate;
import org.dendrokin.core.spread.Estimate;
import org.dendrokin.core.spread.SpreadAnalysis;

/**
 * The numbers an analysis shows first, chosen once so that every output shows the same ones. The front speed
 * is the fitted model's when the preferred model is a travelling wave (a front read off arrival times on a
 * short stretch of dendrite is biased; the model accounts for the stimulated site and the ends), otherwise the
 * model-free figure from the arrival times, which is null where the arrival times show no front. The length
 * constant is sqrt(D / k) of the preferred model, when it has one; the model-free e-fold distance of the peak
 * has a name of its own (peak decay length).
 *
 * @param bestModel          preferred model by the chosen criterion, or null
 * @param modelFrontSpeed    the preferred wave model's front speed, or null when the headline is model-free
 * @param modelFreeFrontSpeed front speed from the arrival times, or null
 * @param lengthConstant     sqrt(D / k) of the preferred model with its interval, or null
 */
public record Headline(String bestModel, ParameterEstimate modelFrontSpeed, Estimate modelFreeFrontSpeed,
                       ParameterEstimate lengthConstant) {
    /** Relative difference between model and model-free front speed above which a warning is given. */
    public static final double SPEED_DISAGREEMENT = 0.25;
    /** Name of the derived quantity sqrt(D / k) of a fitted model. */
    public static final String LENGTH_CONSTANT = "length_constant";

    /** True when the front speed shown first is the fitted model's. */
    public boolean frontSpeedFromModel() {
        return modelFrontSpeed != null;
    }

    /** The front speed shown first: the wave model's, else the model-free one; null when neither exists. */
    public Estimate frontSpeed() {
        return modelFrontSpeed != null ? asEstimate(modelFrontSpeed, bestModel) : modelFreeFrontSpeed;
    }

    /** sqrt(D / k) of the preferred model as an estimate, or null. */
    public Estimate lengthConstantEstimate() {
        return lengthConstant == null ? null : asEstimate(lengthConstant, bestModel);
    }

    /**
     * Warns when the decay time of the summed signal and 1/k of the preferred model disagree beyond both
     * intervals: the summed signal also falls as signal leaves the path, which the model's open ends account for.
     */
    private static void decayWarning(SpreadAnalysis.Result spread, KymographFits.Outcome fits, List<Warning> warnings) {
        Estimate tau = spread == null ? null : spread.decayTime();
        ParameterEstimate k = fits == null ? null : fits.best().flatMap(f -> f.estimate("k")).orElse(null);
        if (tau == null || k == null || k.ci95() == null || !(k.value() > 0) || !(k.ci95().lower() > 0)) {
            return;
        }
        double modelTau = 1 / k.value();
        double modelLo = 1 / k.ci95().upper();
        double modelHi = 1 / k.ci95().lower();
        if (tau.hi95() < modelLo || tau.lo95() > modelHi) {
            warnings.add(new Warning(Warning.Topic.HEADLINE, String.format(Locale.ROOT, "The decay time of the summed "
                    + "signal (%.3g s, 95%% interval %.3g to %.3g) differs from 1/k of the fitted %s model (%.3g s, "
                    + "%.3g to %.3g). The summed signal also falls as signal leaves the path or the band, and the model "
                    + "accounts for that; quote 1/k of the model if its residuals show no structure.", tau.value(),
                    tau.lo95(), tau.hi95(), fits.bestModel(), modelTau, modelLo, modelHi)));
        }
    }

    /** A fitted quantity as a measured number; an end the data do not close is infinite. */
    static Estimate asEstimate(ParameterEstimate e, String model) {
        double lo = e.ci95() == null || !Double.isFinite(e.ci95().lower()) ? Double.NEGATIVE_INFINITY
                : e.ci95().lower();
        double hi = e.ci95() == null || !Double.isFinite(e.ci95().upper()) ? Double.POSITIVE_INFINITY
                : e.ci95().upper();
        String method = (e.ci95() == null ? "no interval" : e.ci95().method()) + ", fitted " + model + " model";
        return new Estimate(e.value(), e.unit().symbol(), lo, hi, method);
    }

    /**
     * Chooses the headline numbers.
     *
     * @param spread   the model-free measures, or null
     * @param fits     the fits, or null when none ran
     * @param warnings receives the sentence about a disagreement of the two front speeds. Modified.
     */
    static Headline choose(SpreadAnalysis.Result spread, KymographFits.Outcome fits, List<Warning> warnings) {
        Estimate free = spread == null ? null : spread.frontSpeed();
        String best = fits == null ? null : fits.bestModel();
        Optional<ParameterEstimate> wave = fits == null ? Optional.empty() : fits.waveFrontSpeed();
        ParameterEstimate lambda = fits == null ? null
                : fits.best().flatMap(f -> f.estimate(LENGTH_CONSTANT)).orElse(null);
        decayWarning(spread, fits, warnings);
        if (wave.isEmpty()) {
            return new Headline(best, null, free, lambda);
        }
        ParameterEstimate e = wave.get();
        if (free != null && Math.abs(free.value() - e.value()) > SPEED_DISAGREEMENT * Math.abs(e.value())) {
            warnings.add(new Warning(Warning.Topic.HEADLINE, String.format(Locale.ROOT, "The front speed read off the "
                    + "arrival times (%.3g um/s) differs from the fitted %s front speed (%.3g um/s) by more than 25%%: "
                    + "on a short stretch of dendrite the arrival times are biased (the front is still leaving the "
                    + "stimulated site, and speeds up near a sealed end); the model figure is reported.", free.value(),
                    best, e.value())));
        }
        return new Headline(best, e, free, lambda);
    }
}
