package org.dendrokin.core.spines;

import java.util.Optional;

import org.dendrokin.core.fit.FitResult;
import org.dendrokin.core.fit.ParameterEstimate;

/**
 * One spine: where it is, its head's time course beside the shaft's at its base, model-free measures of the
 * head's response, and the neck exchange fit.
 *
 * @param id                     1-based, in order along the path
 * @param site                   the head's centre and how it was found
 * @param radiusUm               radius of the disc averaged as the head, um
 * @param positionUm             the head's centre projected onto the path, um from the path's first vertex
 * @param side                   side of the path, looking along its direction on the screen
 * @param offPathUm              distance of the head's centre from the path, um
 * @param basePositionUm         where the neck meets the shaft, um from the path's first vertex: fitted with the neck
 *                               exchange, otherwise the head's position
 * @param distanceFromStimulusUm position minus the stimulus position along the path, um (negative: towards the
 *                               path's first vertex); NaN when the stimulus is not known
 * @param stimulated             this head is the stimulated one (its own signal jumps at the stimulus)
 * @param headDeltaF             the head's dF/F0 in every frame
 * @param shaftDeltaF            the shaft's dF/F0 at the spine's base in every frame (weighted mean of the
 *                               kymograph's columns there)
 * @param noiseSd                standard deviation of the head's dF/F0 over the baseline frames (1.4826 MAD)
 * @param peakDeltaF             largest dF/F0 of the head after the stimulus (3-frame moving average); NaN if
 *                               unknown
 * @param timeToPeakS            time from the stimulus to that peak, s; NaN when the head did not respond (its peak
 *                               less than 5 noise standard deviations of the 3-frame average)
 * @param decayTimeS             time from the peak until the head's dF/F0 (3-frame average) first falls to 1/e of
 *                               the peak, interpolated between frames, s; NaN when it does not within the movie
 *                               or the head did not respond
 * @param exchange               the neck exchange fit, or null when none was made
 * @param notFitted              why there is no fit (empty when there is one)
 */
public record Spine(int id, SpineSite site, double radiusUm, double positionUm, Side side, double offPathUm,
        double basePositionUm, double distanceFromStimulusUm, boolean stimulated, double[] headDeltaF,
        double[] shaftDeltaF, double noiseSd, double peakDeltaF, double timeToPeakS, double decayTimeS,
        FitResult exchange, String notFitted) {
    public Spine {
        headDeltaF = headDeltaF.clone();
        shaftDeltaF = shaftDeltaF.clone();
    }

    @Override
    public double[] headDeltaF() {
        return headDeltaF.clone();
    }

    @Override
    public double[] shaftDeltaF() {
        return shaftDeltaF.clone();
    }

    /** Side of the path as seen on the screen, looking from its first vertex towards its last. */
    public enum Side {
        LEFT("left"), RIGHT("right");

        private final String word;

        Side(String word) {
            this.word = word;
        }

        /** The word written to files. */
        public String word() {
            return word;
        }
    }

    /** The fitted neck time constant (s) with its 95% interval, when the fit converged. */
    public Optional<ParameterEstimate> tauNeck() {
        if (exchange == null || !exchange.converged()) {
            return Optional.empty();
        }
        return exchange.estimate(NeckExchangeModel.TAU);
    }
}
