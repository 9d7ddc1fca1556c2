package org.dendrokin.core.motion;

import org.dendrokin.core.Checks;

/**
 * The disc of the image where a stimulus changes the signal, in ImageJ pixel coordinates. Motion is measured away
 * from it where the image allows, and with it faded out of the comparison otherwise, so that the response is not
 * taken for movement.
 *
 * @param xPx      centre x, pixels
 * @param yPx      centre y, pixels
 * @param radiusPx radius, pixels, positive
 */
public record StimulusRegion(double xPx, double yPx, double radiusPx) {
    public StimulusRegion {
        Checks.finite(xPx, "xPx");
        Checks.finite(yPx, "yPx");
        Checks.positiveFinite(radiusPx, "radiusPx");
    }

    /**
     * Weight of a point in the motion measurement: 0 within the radius, rising as a half cosine to 1 over a further
     * radius (or 2 pixels if that is more), 1 beyond.
     *
     * @param x point x, ImageJ pixel coordinates
     * @param y point y, ImageJ pixel coordinates
     */
    public double weight(double x, double y) {
        double r = Math.hypot(x - xPx, y - yPx);
        double taper = Math.max(radiusPx, 2);
        if (r <= radiusPx) {
            return 0;
        }
        if (r >= radiusPx + taper) {
            return 1;
        }
        return 0.5 * (1 - Math.cos(Math.PI * (r - radiusPx) / taper));
    }
}
