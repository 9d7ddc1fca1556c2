package org.dendrokin.core.motion;

import org.dendrokin.core.Checks;
import org.dendrokin.core.path.DendritePath;
import org.dendrokin.core.path.ResampledPath;

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
     * The disc around the point {@code positionUm} along the path (clamped to the path's ends), as a stimulus given
     * in um along the path becomes one in the image. The radius should cover the response's reach, a few um.
     *
     * @param path        the path, ImageJ pixel coordinates
     * @param positionUm  distance along the path from its first vertex, um
     * @param pixelSizeUm pixel size, um, positive
     * @param radiusUm    radius, um, positive
     */
    public static StimulusRegion alongPath(DendritePath path, double positionUm, double pixelSizeUm,
            double radiusUm) {
        Checks.finite(positionUm, "positionUm");
        Checks.positiveFinite(pixelSizeUm, "pixelSizeUm");
        Checks.positiveFinite(radiusUm, "radiusUm");
        double stepPx = 0.25;
        ResampledPath samples = path.resample(stepPx);
        int k = (int) Math.max(0, Math.min(samples.size() - 1, Math.round(positionUm / pixelSizeUm / stepPx)));
        return new StimulusRegion(samples.xPx()[k], samples.yPx()[k], radiusUm / pixelSizeUm);
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
