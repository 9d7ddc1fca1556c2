package org.dendrokin.core.spines;

import org.dendrokin.core.path.DendritePath;

/**
 * Where a point of the image lies relative to a dendrite path: the arc length of its nearest point on the path and
 * its signed distance from it. The nearest point is found as {@link DendritePath#project} finds it (orthogonal
 * projection onto each segment, clamped, the smallest distance; ties go to the earlier segment); the sign is that
 * of the cross product of the nearest segment's direction with the vector from the nearest point to the point.
 * Image y points down, so a negative distance is on the left of the path's direction as seen on the screen, a
 * positive one on the right. Coordinates are ImageJ pixel coordinates (pixel i covers [i, i+1)). Immutable.
 */
final class PathCoordinates {
    private final double[] x;
    private final double[] y;
    private final double lengthPx;

    PathCoordinates(DendritePath path) {
        this.x = path.xPx();
        this.y = path.yPx();
        this.lengthPx = path.lengthPx();
    }

    /** Length of the path, pixels. */
    double lengthPx() {
        return lengthPx;
    }

    /**
     * @param px point x, pixels
     * @param py point y, pixels
     * @return the nearest point's arc length from the first vertex (pixels), the signed distance (pixels, negative
     *         on the left), and whether the nearest point is an end of the path (1) or not (0)
     */
    double[] locate(double px, double py) {
        double best = Double.POSITIVE_INFINITY;
        double bestArc = 0;
        double bestSigned = 0;
        boolean bestAtEnd = false;
        double travelled = 0;
        int last = x.length - 2;
        for (int i = 0; i <= last; i++) {
            double ux = x[i + 1] - x[i];
            double uy = y[i + 1] - y[i];
            double len2 = ux * ux + uy * uy;
            double len = Math.sqrt(len2);
            double f = Math.max(0, Math.min(1, ((px - x[i]) * ux + (py - y[i]) * uy) / len2));
            double dx = px - (x[i] + f * ux);
            double dy = py - (y[i] + f * uy);
            double distance = Math.hypot(dx, dy);
            if (distance < best) {
                best = distance;
                bestArc = travelled + f * len;
                double cross = ux * dy - uy * dx;
                bestSigned = cross < 0 ? -distance : distance;
                bestAtEnd = (i == 0 && f == 0) || (i == last && f == 1);
            }
            travelled += len;
        }
        return new double[] {bestArc, bestSigned, bestAtEnd ? 1 : 0};
    }
}
