package org.dendrokin.core.analysis;

import java.util.List;

import org.dendrokin.core.Checks;

/**
 * Which models an analysis fits and how.
 *
 * @param models              model names, or null for the defaults
 * @param criterion           model-selection criterion: "aicc", "aic" or "bic"
 * @param profiles            make profile-likelihood intervals for the headline parameters
 * @param bootstrapReplicates parametric-bootstrap refits per model (0: none)
 * @param seed                seed of the bootstrap's random numbers
 * @param freeStimulus        fit the stimulus time and position instead of holding them
 * @param sealedEnds          the path's ends are the dendrite's sealed ends
 */
public record FitRequest(List<String> models, String criterion, boolean profiles, int bootstrapReplicates,
                         long seed, boolean freeStimulus, boolean sealedEnds) {
    /** The defaults: the default models, AICc, profiles, no bootstrap, held stimulus, open ends. */
    public static final FitRequest DEFAULT = new FitRequest(null, "aicc", true, 0, 1L, false, false);

    public FitRequest {
        models = models == null ? null : List.copyOf(models);
        Checks.require(bootstrapReplicates >= 0, "bootstrap replicates must be zero or positive");
    }
}
