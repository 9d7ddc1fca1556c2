package org.dendrokin.core.path;

import org.dendrokin.core.Checks;

/**
 * A path sampled at uniform arc length: sample k lies at distance {@code k * stepPx} from the first vertex.
 * Coordinates in ImageJ pixel convention (pixel i covers [i, i+1)). Tangents are unit vectors along the
 * direction of travel; normals are the tangents turned by +90 degrees in image coordinates
 * ({@code (nx, ny) = (-ty, tx)}). Arrays are copied in and out.
 */
public final class ResampledPath {
    private final double stepPx;
    private final double[] xPx;
    private final double[] yPx;
    private final double[] tangentX;
    private final double[] tangentY;

    /**
     * @param stepPx   spacing along the path, pixels
     * @param xPx      sample x, pixels
     * @param yPx      sample y, pixels
     * @param tangentX unit tangent x at each sample
     * @param tangentY unit tangent y at each sample
     */
    public ResampledPath(double stepPx, double[] xPx, double[] yPx, double[] tangentX, double[] tangentY) {
        int n = xPx.length;
        Checks.positiveFinite(stepPx, "stepPx");
        Checks.sameLength(n, yPx, tangentX, tangentY);
        Checks.require(n >= 1, "a resampled path needs at least one point");
        this.stepPx = stepPx;
        this.xPx = xPx.clone();
        this.yPx = yPx.clone();
        this.tangentX = tangentX.clone();
        this.tangentY = tangentY.clone();
    }

    public int size() {
        return xPx.length;
    }

    public double stepPx() {
        return stepPx;
    }

    public double[] xPx() {
        return xPx.clone();
    }

    public double[] yPx() {
        return yPx.clone();
    }

    public double[] tangentX() {
        return tangentX.clone();
    }

    public double[] tangentY() {
        return tangentY.clone();
    }

    /** Normal x: the tangent turned by +90 degrees, {@code -tangentY}. */
    public double[] normalX() {
        double[] n = new double[tangentY.length];
        for (int i = 0; i < n.length; i++) {
            n[i] = -tangentY[i];
        }
        return n;
    }

    /** Normal y: the tangent turned by +90 degrees, {@code tangentX}. */
    public double[] normalY() {
        return tangentX.clone();
    }

    /** Distance of each sample from the first vertex, pixels: {@code k * stepPx}. */
    public double[] arcPx() {
        double[] s = new double[xPx.length];
        for (int i = 0; i < s.length; i++) {
            s[i] = i * stepPx;
        }
        return s;
    }
}
