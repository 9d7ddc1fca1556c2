package org.dendrokin.core.spines;

import org.dendrokin.core.Checks;

/**
 * How spines are found and analysed. Lengths in um, rates in 1/s.
 *
 * @param detect             look for spine heads in the reference image (besides any given ones)
 * @param minDistanceUm      least distance of a detected head's centre from the path, um; the band's half width
 *                           is used when it is larger, so that a head is never part of the shaft's band
 * @param maxDistanceUm      largest distance of a detected head's centre from the path, um
 * @param headRadiusUm       radius of the disc averaged as a head's time course, um; detected heads are at least
 *                           twice this (a head diameter) apart
 * @param thresholdSd        a detected head stands this many noise standard deviations above its surroundings
 *                           (dimensionless)
 * @param shaftSmoothingUm   sd of the Gaussian weights by which kymograph columns near a spine's base are averaged
 *                           into the shaft's time course there, um
 * @param headDecayPerS      first-order loss of the signal inside a head, 1/s (0: the signal is lost only through
 *                           the neck); for a signal that decays everywhere, the shaft's fitted decay rate
 * @param stimulatedWithinUm a spine whose position along the path lies this close to the stimulus may be the
 *                           stimulated one (decided from its own time course), um
 * @param profiles           make profile-likelihood intervals for the neck time constant (otherwise Student t)
 */
public record SpineSettings(boolean detect, double minDistanceUm, double maxDistanceUm, double headRadiusUm,
        double thresholdSd, double shaftSmoothingUm, double headDecayPerS, double stimulatedWithinUm,
        boolean profiles) {
    public SpineSettings {
        Checks.nonNegativeFinite(minDistanceUm, "spines: min_distance_um");
        Checks.positiveFinite(maxDistanceUm, "spines: max_distance_um");
        Checks.require(maxDistanceUm > minDistanceUm, "spines: max_distance_um (" + maxDistanceUm
                + ") must exceed min_distance_um (" + minDistanceUm + ")");
        Checks.positiveFinite(headRadiusUm, "spines: head_radius_um");
        Checks.positiveFinite(thresholdSd, "spines: threshold_sd");
        Checks.positiveFinite(shaftSmoothingUm, "spines: shaft_smoothing_um");
        Checks.nonNegativeFinite(headDecayPerS, "spines: head_decay_per_s");
        Checks.nonNegativeFinite(stimulatedWithinUm, "spines: stimulated_within_um");
    }

    /**
     * Detection on; heads 0.8 to 2.5 um from the path, disc radius 0.3 um, 5 noise standard deviations; the shaft
     * averaged with weights of sd 0.3 um at each base; no loss inside the head; the stimulated spine looked for
     * within 1.5 um of the stimulus; profile intervals.
     */
    public static SpineSettings defaults() {
        return new SpineSettings(true, 0.8, 2.5, 0.3, 5, 0.3, 0, 1.5, true);
    }

    public SpineSettings withDetect(boolean on) {
        return new SpineSettings(on, minDistanceUm, maxDistanceUm, headRadiusUm, thresholdSd, shaftSmoothingUm,
                headDecayPerS, stimulatedWithinUm, profiles);
    }

    public SpineSettings withDistanceRange(double minUm, double maxUm) {
        return new SpineSettings(detect, minUm, maxUm, headRadiusUm, thresholdSd, shaftSmoothingUm, headDecayPerS,
                stimulatedWithinUm, profiles);
    }

    public SpineSettings withHeadRadius(double um) {
        return new SpineSettings(detect, minDistanceUm, maxDistanceUm, um, thresholdSd, shaftSmoothingUm,
                headDecayPerS, stimulatedWithinUm, profiles);
    }

    public SpineSettings withThreshold(double sd) {
        return new SpineSettings(detect, minDistanceUm, maxDistanceUm, headRadiusUm, sd, shaftSmoothingUm,
                headDecayPerS, stimulatedWithinUm, profiles);
    }

    public SpineSettings withShaftSmoothing(double um) {
        return new SpineSettings(detect, minDistanceUm, maxDistanceUm, headRadiusUm, thresholdSd, um,
                headDecayPerS, stimulatedWithinUm, profiles);
    }

    public SpineSettings withHeadDecay(double perS) {
        return new SpineSettings(detect, minDistanceUm, maxDistanceUm, headRadiusUm, thresholdSd, shaftSmoothingUm,
                perS, stimulatedWithinUm, profiles);
    }

    public SpineSettings withStimulatedWithin(double um) {
        return new SpineSettings(detect, minDistanceUm, maxDistanceUm, headRadiusUm, thresholdSd, shaftSmoothingUm,
                headDecayPerS, um, profiles);
    }

    public SpineSettings withProfiles(boolean on) {
        return new SpineSettings(detect, minDistanceUm, maxDistanceUm, headRadiusUm, thresholdSd, shaftSmoothingUm,
                headDecayPerS, stimulatedWithinUm, on);
    }
}
