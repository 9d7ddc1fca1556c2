package org.dendrokin.core.spines;

import org.dendrokin.core.Checks;

/**
 * Where a spine head is in the image: its centre and the radius of the disc whose mean is its time course.
 * Coordinates are ImageJ pixel coordinates (pixel i covers [i, i+1), its centre at i + 0.5).
 *
 * @param xPx       head centre x, pixels
 * @param yPx       head centre y, pixels
 * @param radiusPx  radius of the head's disc, pixels; NaN to use the settings' head radius
 * @param label     the name the user gave it (a ROI's name), or empty
 * @param source    how it was found
 * @param contrast  for a detected head, its detection score in noise standard deviations (dimensionless); NaN
 *                  for a given one
 */
public record SpineSite(double xPx, double yPx, double radiusPx, String label, Source source, double contrast) {
    /** How a spine head was found. */
    public enum Source {
        /** Found as a local maximum of the reference image beside the shaft. */
        DETECTED("detected"),
        /** Given by the user as a point or an oval. */
        GIVEN("given");

        private final String word;

        Source(String word) {
            this.word = word;
        }

        /** The word written to files, e.g. {@code "detected"}. */
        public String word() {
            return word;
        }
    }

    public SpineSite {
        Checks.finite(xPx, "spine x (pixels)");
        Checks.finite(yPx, "spine y (pixels)");
        Checks.require(Double.isNaN(radiusPx) || radiusPx > 0 && Double.isFinite(radiusPx),
                "a spine's radius must be positive or NaN, got " + radiusPx);
        Checks.require(label != null && source != null, "a spine site needs a label (may be empty) and a source");
    }

    /** A head the user gave, with its own radius (pixels) or NaN for the settings' radius. */
    public static SpineSite given(double xPx, double yPx, double radiusPx, String label) {
        return new SpineSite(xPx, yPx, radiusPx, label, Source.GIVEN, Double.NaN);
    }
}
