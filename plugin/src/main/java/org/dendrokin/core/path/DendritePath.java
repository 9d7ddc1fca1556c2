package org.dendrokin.core.path;

/**
 * A dendrite path in pixel coordinates, ImageJ convention: pixel column i, row j covers [i, i+1) x [j, j+1),
 * so its centre is (i + 0.5, j + 0.5). Distance along the path starts at the first vertex. Immutable.
 */
public final class DendritePath {
    private final double[] xPx;
    private final double[] yPx;

    private DendritePath(double[] xPx, double[] yPx) {
        this.xPx = xPx;
        this.yPx = yPx;
    }

    /**
     * A path through the given vertices. Consecutive repeated vertices are dropped. A freehand path (drawn
     * by hand, pixel-stepped) is smoothed lightly before use.
     *
     * @param xPx      vertex x, ImageJ pixel coordinates. Not modified.
     * @param yPx      vertex y, ImageJ pixel coordinates. Not modified.
     * @param freehand true for a hand-drawn path that should be smoothed
     * @throws IllegalArgumentException for fewer than 2 distinct points, a zero length or non-finite values
     */
    public static DendritePath of(double[] xPx, double[] yPx, boolean freehand) {
        throw new UnsupportedOperationException("not yet implemented");
    }

    /** Length along the vertices, pixels. */
    public double lengthPx() {
        throw new UnsupportedOperationException("not yet implemented");
    }

    public int vertexCount() {
        return xPx.length;
    }

    /** Vertex x, ImageJ pixel coordinates (a copy). */
    public double[] xPx() {
        return xPx.clone();
    }

    /** Vertex y, ImageJ pixel coordinates (a copy). */
    public double[] yPx() {
        return yPx.clone();
    }

    /**
     * Points at uniform arc length {@code stepPx} from the first vertex, with unit tangents and normals.
     *
     * @param stepPx spacing along the path, pixels, positive
     */
    public ResampledPath resample(double stepPx) {
        throw new UnsupportedOperationException("not yet implemented");
    }
}
