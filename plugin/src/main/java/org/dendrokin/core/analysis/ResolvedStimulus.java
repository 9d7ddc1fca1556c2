package org.dendrokin.core.analysis;

/**
 * A stimulus placed on the path: a spot of the image projected onto the path's nearest point, or a distance given
 * along the path; several pulses at one place close in time make one train.
 *
 * @param timeS       time of the (first) pulse, s, or NaN when it is to be detected
 * @param positionUm  distance along the path, um, or NaN when it is to be detected
 * @param offPathUm   distance of the given spot from the path, um (0 for a distance given along the path, NaN if
 *                    none was given)
 * @param pulses      number of pulses merged into this stimulus (1 for a single pulse)
 * @param lastPulseS  time of the last pulse of a train, s (the first for a single pulse)
 */
public record ResolvedStimulus(double timeS, double positionUm, double offPathUm, int pulses, double lastPulseS) {
    /** True when the train holds more than one pulse. */
    public boolean isTrain() {
        return pulses > 1;
    }
}
