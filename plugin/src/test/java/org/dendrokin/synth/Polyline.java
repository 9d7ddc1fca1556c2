package org.dendrokin.synth;

import java.util.Arrays;

import org.dendrokin.core.Checks;

/**
 * A polyline in image pixel coordinates (pixel i covers [i, i+1)) with its arc length: points at a given arc
 * length, unit tangents and normals, and the nearest point to a given point. Immutable.
 */
final class Polyline {
    private final double[] x;
    private final double[] y;
    /** Arc length at each vertex, pixels. */
    private final double[] arc;

    Polyline(double[] x, double[] y) {
        Checks.require(x.length == y.length && x.length >= 2, "a polyline needs at least 2 vertices");
        this.x = x.clone();
        this.y = y.clone();
        this.arc = new double[x.length];
        for (int i = 1; i < x.length; i++) {
            arc[i] = arc[i - 1] + Math.hypot(x[i] - x[i - 1], y[i] - y[i - 1]);
            Checks.require(arc[i] > arc[i - 1], "polyline vertices must be distinct");
        }
    }

    int size() {
        return x.length;
    }

    double x(int i) {
        return x[i];
    }

    double y(int i) {
        return y[i];
    }

    /** Arc length at vertex i, pixels. */
    double arcAt(int i) {
        return arc[i];
    }

    double[] xs() {
        return x.clone();
    }

    double[] ys() {
        return y.clone();
    }

    /** Total length, pixels. */
    double length() {
        return arc[arc.length - 1];
    }

    private int segmentAt(double s) {
        int i = Arrays.binarySearch(arc, s);
        if (i < 0) {
            i = -i - 2;
        }
        return Math.max(0, Math.min(arc.length - 2, i));
    }

    /** The point at arc length s (pixels), {x, y}; linear beyond the ends. */
    double[] point(double s) {
        int i = segmentAt(s);
        double u = (s - arc[i]) / (arc[i + 1] - arc[i]);
        return new double[] {x[i] + u * (x[i + 1] - x[i]), y[i] + u * (y[i + 1] - y[i])};
    }

    /** Unit tangent at arc length s, {tx, ty}, in the direction of increasing arc length. */
    double[] tangent(double s) {
        int i = segmentAt(s);
        double len = arc[i + 1] - arc[i];
        return new double[] {(x[i + 1] - x[i]) / len, (y[i + 1] - y[i]) / len};
    }

    /** Unit normal at arc length s: the tangent turned by +90 degrees in image coordinates, {-ty, tx}. */
    double[] normal(double s) {
        double[] t = tangent(s);
        return new double[] {-t[1], t[0]};
    }

    /**
     * The nearest point of the polyline to (px, py).
     *
     * @return {arc length of the nearest point (pixels), signed distance (pixels, positive on the normal's side)}
     */
    double[] nearest(double px, double py) {
        double best = Double.POSITIVE_INFINITY;
        double bestArc = 0;
        double bestSigned = 0;
        for (int i = 0; i + 1 < x.length; i++) {
            double ex = x[i + 1] - x[i];
            double ey = y[i + 1] - y[i];
            double len2 = ex * ex + ey * ey;
            double u = Math.max(0, Math.min(1, ((px - x[i]) * ex + (py - y[i]) * ey) / len2));
            double qx = x[i] + u * ex;
            double qy = y[i] + u * ey;
            double d = Math.hypot(px - qx, py - qy);
            if (d < best) {
                best = d;
                bestArc = arc[i] + u * Math.sqrt(len2);
                double cross = ex * (py - y[i]) - ey * (px - x[i]);
                bestSigned = cross >= 0 ? d : -d;
            }
        }
        return new double[] {bestArc, bestSigned};
    }
}
