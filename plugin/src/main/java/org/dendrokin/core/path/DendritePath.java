package org.dendrokin.core.path;

import java.util.Arrays;

import org.dendrokin.core.Checks;

/**
 * A dendrite path in pixel coordinates, ImageJ convention: pixel column i, row j covers [i, i+1) x [j, j+1),
 * so its centre is (i + 0.5, j + 0.5). The path is the polyline through its vertices; distance along it starts
 * at the first vertex. Immutable.
 *
 * <p>Freehand paths are drawn by hand and stored by ImageJ as pixel-stepped vertices, whose staircase adds
 * length and jitters the local direction. They are smoothed lightly: {@value #FREEHAND_PASSES} passes of the
 * three-point binomial filter (1/4, 1/2, 1/4) over the interior vertices, end points fixed. Together that is
 * the five-point kernel (1, 4, 6, 4, 1)/16, a Gaussian of standard deviation 1 vertex spacing (about one
 * pixel), which removes the staircase but keeps bends a few pixels wide.
 */
public final class DendritePath {
    /** Passes of the (1, 2, 1)/4 filter applied to freehand paths. */
    public static final int FREEHAND_PASSES = 2;

    private final double[] xPx;
    private final double[] yPx;
    private final double[] cumulativePx;

    private DendritePath(double[] xPx, double[] yPx) {
        this.xPx = xPx;
        this.yPx = yPx;
        this.cumulativePx = new double[xPx.length];
        for (int i = 1; i < xPx.length; i++) {
            cumulativePx[i] = cumulativePx[i - 1] + Math.hypot(xPx[i] - xPx[i - 1], yPx[i] - yPx[i - 1]);
        }
    }

    /**
     * A path through the given vertices. Consecutive repeated vertices are dropped. A freehand path is smoothed
     * lightly (see the class comment).
     *
     * @param xPx      vertex x, ImageJ pixel coordinates. Not modified.
     * @param yPx      vertex y, ImageJ pixel coordinates. Not modified.
     * @param freehand true for a hand-drawn path that should be smoothed
     * @throws IllegalArgumentException for fewer than 2 distinct points (zero length) or non-finite values
     */
    public static DendritePath of(double[] xPx, double[] yPx, boolean freehand) {
        Checks.require(xPx.length == yPx.length,
                "the path has " + xPx.length + " x values but " + yPx.length + " y values");
        for (int i = 0; i < xPx.length; i++) {
            Checks.require(Double.isFinite(xPx[i]) && Double.isFinite(yPx[i]),
                    "path vertex " + (i + 1) + " is not a finite number");
        }
        double[][] xy = withoutRepeats(xPx, yPx);
        Checks.require(xy[0].length >= 2, "the path has zero length: it needs at least two distinct points");
        if (freehand) {
            double[] x = xy[0];
            double[] y = xy[1];
            for (int pass = 0; pass < FREEHAND_PASSES; pass++) {
                x = binomial3(x);
                y = binomial3(y);
            }
            xy = withoutRepeats(x, y);
        }
        return new DendritePath(xy[0], xy[1]);
    }

    /** Copies of x and y without consecutive repeated points. */
    private static double[][] withoutRepeats(double[] xPx, double[] yPx) {
        double[] x = new double[xPx.length];
        double[] y = new double[yPx.length];
        int n = 0;
        for (int i = 0; i < xPx.length; i++) {
            if (n == 0 || xPx[i] != x[n - 1] || yPx[i] != y[n - 1]) {
                x[n] = xPx[i];
                y[n] = yPx[i];
                n++;
            }
        }
        return new double[][] {Arrays.copyOf(x, n), Arrays.copyOf(y, n)};
    }

    /** One pass of (1/4, 1/2, 1/4) over the interior values; the end values are kept. Not modifying v. */
    static double[] binomial3(double[] v) {
        double[] out = v.clone();
        for (int i = 1; i < v.length - 1; i++) {
            out[i] = 0.25 * v[i - 1] + 0.5 * v[i] + 0.25 * v[i + 1];
        }
        return out;
    }

    /** Length along the vertices (sum of the segment lengths), pixels. */
    public double lengthPx() {
        return cumulativePx[cumulativePx.length - 1];
    }

    public int vertexCount() {
        return xPx.length;
    }

    /** Vertex x, ImageJ pixel coordinates (a copy; after smoothing for a freehand path). */
    public double[] xPx() {
        return xPx.clone();
    }

    /** Vertex y, ImageJ pixel coordinates (a copy; after smoothing for a freehand path). */
    public double[] yPx() {
        return yPx.clone();
    }

    /**
     * The point of the path nearest to a point of the image (for example a stimulation spot recorded by the
     * acquisition software), by orthogonal projection onto each segment (clamped to the segment) and the
     * smallest Euclidean distance; ties go to the earlier segment.
     *
     * @param xPx point x, ImageJ pixel coordinates
     * @param yPx point y, ImageJ pixel coordinates
     * @return the arc length of the nearest point from the first vertex, pixels, and the distance from the
     *         point to the path, pixels
     */
    public Projection project(double xPx, double yPx) {
        double bestDistance = Double.POSITIVE_INFINITY;
        double bestArc = 0;
        double travelled = 0;
        for (int i = 0; i + 1 < this.xPx.length; i++) {
            double ax = this.xPx[i];
            double ay = this.yPx[i];
            double ux = this.xPx[i + 1] - ax;
            double uy = this.yPx[i + 1] - ay;
            double len2 = ux * ux + uy * uy;
            double f = Math.max(0, Math.min(1, ((xPx - ax) * ux + (yPx - ay) * uy) / len2));
            double dx = ax + f * ux - xPx;
            double dy = ay + f * uy - yPx;
            double distance = Math.hypot(dx, dy);
            if (distance < bestDistance) {
                bestDistance = distance;
                bestArc = travelled + f * Math.sqrt(len2);
            }
            travelled += Math.sqrt(len2);
        }
        return new Projection(bestArc, bestDistance);
    }

    /**
     * Where a point of the image falls on the path.
     *
     * @param arcLengthPx distance along the path from its first vertex to the nearest point, pixels
     * @param offPathPx   distance from the point to the path, pixels
     */
    public record Projection(double arcLengthPx, double offPathPx) {
    }

    /**
     * Points at uniform arc length along the polyline: sample k at distance {@code k * stepPx} from the first
     * vertex, for every k with {@code k * stepPx <= lengthPx()} (the last vertex itself is included only when
     * the length is a whole number of steps, to within 1e-9 of a step). Each point is found by linear
     * interpolation on the segment that holds it. Its tangent is that segment's unit direction; a point that
     * falls on an interior vertex (within 1e-9 pixel) gets the normalised sum of the two neighbouring segment
     * directions, the bisector of the corner.
     *
     * @param stepPx spacing along the path, pixels, positive and finite
     */
    public ResampledPath resample(double stepPx) {
        Checks.positiveFinite(stepPx, "stepPx");
        double length = lengthPx();
        long count = (long) Math.floor(length / stepPx + 1e-9) + 1;
        Checks.require(count <= 50_000_000L, "a step of " + stepPx + " pixels gives too many samples");
        int n = (int) count;
        double[] x = new double[n];
        double[] y = new double[n];
        double[] tx = new double[n];
        double[] ty = new double[n];
        int seg = 0;
        int last = xPx.length - 1;
        for (int k = 0; k < n; k++) {
            double s = Math.min(k * stepPx, length);
            while (seg < last - 1 && cumulativePx[seg + 1] < s) {
                seg++;
            }
            double segLength = cumulativePx[seg + 1] - cumulativePx[seg];
            double f = segLength > 0 ? (s - cumulativePx[seg]) / segLength : 0;
            f = Math.max(0, Math.min(1, f));
            x[k] = xPx[seg] + f * (xPx[seg + 1] - xPx[seg]);
            y[k] = yPx[seg] + f * (yPx[seg + 1] - yPx[seg]);
            double dx = (xPx[seg + 1] - xPx[seg]) / segLength;
            double dy = (yPx[seg + 1] - yPx[seg]) / segLength;
            if (seg + 1 < last && Math.abs(cumulativePx[seg + 1] - s) < 1e-9) {
                double ex = (xPx[seg + 2] - xPx[seg + 1]);
                double ey = (yPx[seg + 2] - yPx[seg + 1]);
                double el = Math.hypot(ex, ey);
                double bx = dx + ex / el;
                double by = dy + ey / el;
                double bl = Math.hypot(bx, by);
                if (bl > 1e-12) {
                    dx = bx / bl;
                    dy = by / bl;
                }
            }
            tx[k] = dx;
            ty[k] = dy;
        }
        return new ResampledPath(stepPx, x, y, tx, ty);
    }
}
