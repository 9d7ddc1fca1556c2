package org.dendrokin.io.session;

import java.util.List;

/**
 * The {@code fit} object of session.json: how the model fits are run and reported.
 * <pre>
 *   "fit": {"criterion": "aicc", "profiles": true, "bootstrap_replicates": 200, "seed": 7,
 *           "free_stimulus": false, "sealed_ends": false}
 * </pre>
 *
 * @param criterion           model-selection criterion: "aicc" (default), "aic" or "bic"
 * @param profiles            make profile-likelihood intervals for the headline parameters (default true)
 * @param bootstrapReplicates parametric-bootstrap refits per model (default 0, none)
 * @param seed                seed of the bootstrap's random numbers (default 1)
 * @param freeStimulus        fit the stimulus time and position (diffusion-decay) instead of holding them at the
 *                            given or detected values (default false)
 * @param sealedEnds          the path's ends are the dendrite's sealed ends: no flux leaves there (default false:
 *                            the dendrite goes on beyond the path)
 */
public record FitSettings(String criterion, boolean profiles, int bootstrapReplicates, long seed,
        boolean freeStimulus, boolean sealedEnds) {
    /** The criteria a session may name. */
    public static final List<String> CRITERIA = List.of("aicc", "aic", "bic");

    /** The most replicates a session may ask for; each is a full refit of every model. */
    public static final int MAX_BOOTSTRAP = 10_000;

    /** What an absent {@code fit} object means. */
    public static final FitSettings DEFAULT = new FitSettings("aicc", true, 0, 1L, false, false);
}
