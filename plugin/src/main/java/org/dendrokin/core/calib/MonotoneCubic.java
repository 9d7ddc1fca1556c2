package org.dendrokin.core.calib;

import org.dendrokin.core.Checks;

/**
 * Monotone piecewise cubic Hermite interpolant of Fritsch &amp; Carlson (1980, SIAM J Numer Anal
 * 17:238-246). Tangents start as the mean of the neighbouring secants (one-sided at the ends) and are
 * scaled down on each interval where alpha^2 + beta^2 &gt; 9 (alpha, beta = tangent / secant at its ends),
 * which keeps the interpolant monotone wherever the data are. Unlike a natural or Akima spline, it never
 * overshoots between monotone data. It does not extrapolate: outside [x0, x_last] it returns NaN.
 */
public final class MonotoneCubic {
    private final double[] x;
    private final double[] y;
    private final double[] m;

    /**
     * @param x nodes, strictly increasing, at least 2. Not modified.
     * @param y values at the nodes, finite. Not modified.
     */
    public MonotoneCubic(double[] x, double[] y) {
        int n = x.length;
        Checks.require(n >= 2, "a monotone interpolant needs at least 2 nodes, got " + n);
        Checks.sameLength(n, y);
        for (int i = 0; i < n; i++) {
            Checks.finite(x[i], "node " + i);
            Checks.finite(y[i], "value " + i);
            Checks.require(i == 0 || x[i] > x[i - 1], "nodes must be strictly increasing");
        }
        this.x = x.clone();
        this.y = y.clone();
        double[] d = new double[n - 1];
        for (int i = 0; i < n - 1; i++) {
            d[i] = (y[i + 1] - y[i]) / (x[i + 1] - x[i]);
        }
        double[] t = new double[n];
        t[0] = d[0];
        t[n - 1] = d[n - 2];
        for (int i = 1; i < n - 1; i++) {
            t[i] = d[i - 1] * d[i] <= 0 ? 0 : (d[i - 1] + d[i]) / 2;
        }
        for (int i = 0; i < n - 1; i++) {
            if (d[i] == 0) {
                t[i] = 0;
                t[i + 1] = 0;
                continue;
            }
            double alpha = t[i] / d[i];
            double beta = t[i + 1] / d[i];
            double r = alpha * alpha + beta * beta;
            if (r > 9) {
                double tau = 3 / Math.sqrt(r);
                t[i] = tau * alpha * d[i];
                t[i + 1] = tau * beta * d[i];
            }
        }
        this.m = t;
    }

    /** Interpolated value at xq; the node value at a node; NaN outside [x0, x_last]. */
    public double value(double xq) {
        int i = interval(xq);
        if (i < 0) {
            return Double.NaN;
        }
        double h = x[i + 1] - x[i];
        double s = (xq - x[i]) / h;
        double s2 = s * s;
        double s3 = s2 * s;
        return (2 * s3 - 3 * s2 + 1) * y[i] + (s3 - 2 * s2 + s) * h * m[i]
                + (-2 * s3 + 3 * s2) * y[i + 1] + (s3 - s2) * h * m[i + 1];
    }

    /** First derivative at xq; NaN outside [x0, x_last]. */
    public double derivative(double xq) {
        int i = interval(xq);
        if (i < 0) {
            return Double.NaN;
        }
        double h = x[i + 1] - x[i];
        double s = (xq - x[i]) / h;
        double s2 = s * s;
        return ((6 * s2 - 6 * s) * y[i] + (6 * s2 - 6 * s) * -y[i + 1]) / h
                + (3 * s2 - 4 * s + 1) * m[i] + (3 * s2 - 2 * s) * m[i + 1];
    }

    public double first() {
        return x[0];
    }

    public double last() {
        return x[x.length - 1];
    }

    private int interval(double xq) {
        if (!(xq >= x[0] && xq <= x[x.length - 1])) {
            return -1;
        }
        int lo = 0;
        int hi = x.length - 1;
        while (hi - lo > 1) {
            int mid = (lo + hi) >>> 1;
            if (x[mid] <= xq) {
                lo = mid;
            } else {
                hi = mid;
            }
        }
        return lo;
    }
}
