package org.dendrokin.core.analysis;

/**
 * One stimulus as the user gave it: its time, and its place either as a distance along the path or as a spot of
 * the image (as acquisition software records an uncaging or stimulation spot). Any part may be missing, to be
 * detected from the data.
 *
 * @param timeS      stimulus time, s, or null
 * @param positionUm distance along the path from its first vertex, um, or null
 * @param xPx        spot x, ImageJ pixel coordinates (the centre of pixel i is i + 0.5), or null
 * @param yPx        spot y, or null
 */
public record StimulusSpec(Double timeS, Double positionUm, Double xPx, Double yPx) {
    /** Nothing given: detect both. */
    public static final StimulusSpec DETECT = new StimulusSpec(null, null, null, null);

    /** True when the place is given as a spot of the image. */
    public boolean isSpot() {
        return xPx != null && yPx != null;
    }
}
