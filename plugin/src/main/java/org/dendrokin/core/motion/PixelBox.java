package org.dendrokin.core.motion;

import org.dendrokin.core.Checks;
import org.dendrokin.core.path.DendritePath;

/**
 * An axis-aligned rectangle in ImageJ pixel coordinates (pixel i covers [i, i+1)), such as the bounding box of a
 * path.
 *
 * @param minXPx left edge, pixels
 * @param minYPx top edge, pixels
 * @param maxXPx right edge, pixels, at least {@code minXPx}
 * @param maxYPx bottom edge, pixels, at least {@code minYPx}
 */
public record PixelBox(double minXPx, double minYPx, double maxXPx, double maxYPx) {
    public PixelBox {
        Checks.finite(minXPx, "minXPx");
        Checks.finite(minYPx, "minYPx");
        Checks.finite(maxXPx, "maxXPx");
        Checks.finite(maxYPx, "maxYPx");
        Checks.require(maxXPx >= minXPx && maxYPx >= minYPx, "the box's maximum lies below its minimum");
    }

    /** The bounding box of the path's vertices, widened by {@code paddingPx} on every side. */
    public static PixelBox around(DendritePath path, double paddingPx) {
        Checks.nonNegativeFinite(paddingPx, "paddingPx");
        double[] x = path.xPx();
        double[] y = path.yPx();
        double minX = Double.POSITIVE_INFINITY;
        double minY = Double.POSITIVE_INFINITY;
        double maxX = Double.NEGATIVE_INFINITY;
        double maxY = Double.NEGATIVE_INFINITY;
        for (int i = 0; i < x.length; i++) {
            minX = Math.min(minX, x[i]);
            maxX = Math.max(maxX, x[i]);
            minY = Math.min(minY, y[i]);
            maxY = Math.max(maxY, y[i]);
        }
        return new PixelBox(minX - paddingPx, minY - paddingPx, maxX + paddingPx, maxY + paddingPx);
    }

    public double widthPx() {
        return maxXPx - minXPx;
    }

    public double heightPx() {
        return maxYPx - minYPx;
    }
}
