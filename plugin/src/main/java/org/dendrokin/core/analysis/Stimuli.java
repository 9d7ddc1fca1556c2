package org.dendrokin.core.analysis;

import java.util.ArrayList;
import java.util.Comparator;
import java.util.List;
import java.util.Locale;

import org.dendrokin.core.path.DendritePath;

/**
 * Places the stimuli a user gave on the path. A spot of the image goes to the nearest point of the path
 * ({@link DendritePath#project}); how far off the path it was is kept, and a spot farther than
 * {@value #FAR_UM} um plus half the band's width is warned about. Several stimuli are taken in time order. Pulses
 * at one place (within {@value #SAME_PLACE_UM} um along the path) that follow each other within the train gap
 * make one train: one stimulus at the first pulse's time, whose spread is measured from then on.
 */
final class Stimuli {
    /** Distance off the band's edge, um, from which a stimulus spot is said to be far from the path. */
    static final double FAR_UM = 1.0;
    /** Distance along the path, um, within which pulses count as being at the same place. */
    static final double SAME_PLACE_UM = 2.0;

    private Stimuli() {
    }

    /**
     * @param given       the stimuli as given (at least one; {@link StimulusSpec#DETECT} when none was)
     * @param path        the path, ImageJ pixel coordinates
     * @param pixelSizeUm pixel size, um
     * @param bandWidthUm width of the band averaged across the path, um
     * @param trainGapS   largest time between pulses of one train, s
     * @param warnings    receives sentences about far spots and merged trains. Modified.
     * @throws AnalysisInputException for a position beyond the path, or several stimuli without times
     */
    static List<ResolvedStimulus> resolve(List<StimulusSpec> given, DendritePath path, double pixelSizeUm,
                                          double bandWidthUm, double trainGapS, List<Warning> warnings) {
        double lengthUm = path.lengthPx() * pixelSizeUm;
        List<ResolvedStimulus> placed = new ArrayList<>();
        for (int i = 0; i < given.size(); i++) {
            StimulusSpec s = given.get(i);
            String name = given.size() == 1 ? "stimulus" : "stimuli[" + i + "]";
            if (given.size() > 1 && s.timeS() == null) {
                throw new AnalysisInputException(AnalysisInputException.Subject.SETTINGS, "key \"" + name
                        + ".time_s\" is missing: with several stimuli each needs its time");
            }
            double time = s.timeS() == null ? Double.NaN : s.timeS();
            double position = Double.NaN;
            double off = Double.NaN;
            if (s.isSpot()) {
                DendritePath.Projection p = path.project(s.xPx(), s.yPx());
                position = p.arcLengthPx() * pixelSizeUm;
                off = p.offPathPx() * pixelSizeUm;
                if (off > FAR_UM + bandWidthUm / 2) {
                    warnings.add(new Warning(Warning.Topic.SETTINGS, String.format(Locale.ROOT, "The stimulus spot "
                            + "at (%.1f, %.1f) px lies %.2f um from the path, outside its %.2f um band; it was placed "
                            + "at the nearest point of the path, %.3g um from its start. Check that the spot and the "
                            + "path belong to the same dendrite.", s.xPx(), s.yPx(), off, bandWidthUm, position)));
                }
            } else if (s.positionUm() != null) {
                position = s.positionUm();
                off = 0;
                if (position > lengthUm + 1e-9 * Math.max(1, lengthUm)) {
                    throw new AnalysisInputException(AnalysisInputException.Subject.SETTINGS, String.format(
                            Locale.ROOT, "key \"%s.position_um\" is %.4g um, beyond the end of the path, which is "
                                    + "%.4g um long", name, position, lengthUm));
                }
            }
            placed.add(new ResolvedStimulus(time, position, off, 1, time));
        }
        if (placed.size() == 1) {
            return placed;
        }
        placed.sort(Comparator.comparingDouble(ResolvedStimulus::timeS));
        List<ResolvedStimulus> merged = new ArrayList<>();
        for (ResolvedStimulus s : placed) {
            ResolvedStimulus last = merged.isEmpty() ? null : merged.get(merged.size() - 1);
            if (last != null && s.timeS() - last.lastPulseS() <= trainGapS
                    && Math.abs(s.positionUm() - last.positionUm()) <= SAME_PLACE_UM) {
                merged.set(merged.size() - 1, new ResolvedStimulus(last.timeS(), last.positionUm(), last.offPathUm(),
                        last.pulses() + 1, s.timeS()));
            } else {
                merged.add(s);
            }
        }
        for (ResolvedStimulus s : merged) {
            if (s.isTrain()) {
                warnings.add(new Warning(Warning.Topic.SETTINGS, String.format(Locale.ROOT, "%d pulses at %.3g um "
                        + "from %.3g s to %.3g s were analysed as one train: pulses at one place (within %.0f um) "
                        + "less than %.3g s apart count as one stimulus, whose spread is measured from its first "
                        + "pulse.", s.pulses(), s.positionUm(), s.timeS(), s.lastPulseS(), SAME_PLACE_UM, trainGapS)));
            }
        }
        return merged;
    }
}
