package org.dendrokin.core.analysis;

import org.dendrokin.core.Checks;

/**
 * How the background (camera offset plus autofluorescence, in the movie's grey values) is found: a value the
 * user gave, the mean of a region the user drew, frame by frame, or an estimate from pixels far from the path
 * ({@link org.dendrokin.core.preprocess.BackgroundEstimator}).
 */
public sealed interface BackgroundRequest {
    /** A value given by the user, the same for every frame; {@code description} says where it came from. */
    record Fixed(double value, String description) implements BackgroundRequest {
        public Fixed {
            Checks.finite(value, "background value");
        }
    }

    /**
     * The mean of the given pixels in each frame. Coordinates are pixel indices (column, row) inside the image;
     * {@code name} names the region in the report.
     */
    record Region(int[] xPx, int[] yPx, String name) implements BackgroundRequest {
        public Region {
            Checks.require(xPx.length == yPx.length, "a background region needs as many x as y coordinates");
            Checks.require(xPx.length > 0, "a background region needs at least one pixel");
            xPx = xPx.clone();
            yPx = yPx.clone();
        }

        @Override
        public int[] xPx() {
            return xPx.clone();
        }

        @Override
        public int[] yPx() {
            return yPx.clone();
        }
    }

    /** Estimated from the pixels far from the path, one value for the whole movie. */
    record Estimated() implements BackgroundRequest {
    }
}
