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
 * model-free figure from the arrival times.
 *
 * @param bestModel          preferred model by the chosen criterion, or null
 * @param modelFrontSpeed    the preferred wave model's front speed, or null when the headline is model-free
 * @param modelFreeFrontSpeed front speed from the arrival times, or null
 */
public record Headline(String bestModel, ParameterEstimate modelFrontSpeed, Estimate modelFreeFrontSpeed) {
    /** Relative difference between model and model-free front speed above which a warning is given. */
    public static final double SPEED_DISAGREEMENT = 0.25;

    /** True when the front speed shown first is the fitted model's. */
    public boolean frontSpeedFromModel() {
        return modelFrontSpeed != null;
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
        if (wave.isEmpty()) {
            return new Headline(best, null, free);
        }
        ParameterEstimate e = wave.get();
        if (free != null && Math.abs(free.value() - e.value()) > SPEED_DISAGREEMENT * Math.abs(e.value())) {
            warnings.add(new Warning(Warning.Topic.HEADLINE, String.format(Locale.ROOT, "The front speed read off the "
                    + "arrival times (%.3g um/s) differs from the fitted %s front speed (%.3g um/s) by more than 25%%: "
                    + "on a short stretch of dendrite the arrival times are biased (the front is still leaving the "
                    + "stimulated site, and speeds up near a sealed end); the model figure is reported.", free.value(),
                    best, e.value())));
        }
        return new Headline(best, e, free);
    }
}
