package org.dendrokin.core.spread;

import java.util.Arrays;

import org.apache.commons.math3.distribution.NormalDistribution;
import org.dendrokin.core.Checks;

/**
 * Robust straight line y = a + b x by the Theil-Sen estimator: the slope b is the median of the slopes over
 * all pairs of points with distinct x, the intercept a the median of y - b x (Theil 1950; Sen 1968). One wild
 * point in five does not move it, unlike least squares.
 *
 * <p>The 95% interval of the slope is Sen's (1968) rank construction from the null distribution of Kendall's
 * statistic S: with N pairwise slopes sorted, C = z(0.975) sqrt(n (n - 1) (2 n + 5) / 18) and the interval
 * runs from the slope of rank round((N - C) / 2) to the slope of rank round((N + C) / 2) + 1 (1-based ranks;
 * no correction for tied x). It assumes independent errors; it is distribution-free otherwise.
 */
public final class TheilSen {
    private static final double Z975 = new NormalDistribution().inverseCumulativeProbability(0.975);

    private TheilSen() {
    }

    /**
     * A fitted line.
     *
     * @param slope     median pairwise slope, units of y per unit of x
     * @param intercept median of y - slope x
     * @param slopeLo95 lower end of Sen's 95% interval
     * @param slopeHi95 upper end of Sen's 95% interval
     * @param points    number of points used
     */
    public record Line(double slope, double intercept, double slopeLo95, double slopeHi95, int points) {
    }

    /**
     * Fits the line to the finite pairs (x[i], y[i]); pairs with a NaN are skipped.
     *
     * @param x abscissae. Not modified.
     * @param y ordinates, same length. Not modified.
     * @throws IllegalArgumentException with fewer than 3 usable points or all x equal
     */
    public static Line fit(double[] x, double[] y) {
        Checks.sameLength(x.length, y);
        int n = 0;
        double[] xs = new double[x.length];
        double[] ys = new double[x.length];
        for (int i = 0; i < x.length; i++) {
            if (Double.isFinite(x[i]) && Double.isFinite(y[i])) {
                xs[n] = x[i];
                ys[n] = y[i];
                n++;
            }
        }
        Checks.require(n >= 3, "a robust line needs at least 3 points, got " + n);
        double[] slopes = new double[n * (n - 1) / 2];
        int m = 0;
        for (int i = 0; i < n; i++) {
            for (int j = i + 1; j < n; j++) {
                if (xs[j] != xs[i]) {
                    slopes[m++] = (ys[j] - ys[i]) / (xs[j] - xs[i]);
                }
            }
        }
        Checks.require(m > 0, "a robust line needs at least two distinct x values");
        slopes = Arrays.copyOf(slopes, m);
        Arrays.sort(slopes);
        double slope = median(slopes);
        double[] residual = new double[n];
        for (int i = 0; i < n; i++) {
            residual[i] = ys[i] - slope * xs[i];
        }
        Arrays.sort(residual);
        double intercept = median(residual);
        double c = Z975 * Math.sqrt(n * (n - 1.0) * (2.0 * n + 5.0) / 18.0);
        int lowerRank = (int) Math.round((m - c) / 2.0);
        int upperRank = (int) Math.round((m + c) / 2.0) + 1;
        double lo = lowerRank >= 1 ? slopes[lowerRank - 1] : Double.NEGATIVE_INFINITY;
        double hi = upperRank <= m ? slopes[upperRank - 1] : Double.POSITIVE_INFINITY;
        return new Line(slope, intercept, lo, hi, n);
    }

    /** Median of a sorted array. */
    static double median(double[] sorted) {
        int k = sorted.length;
        return k % 2 == 1 ? sorted[k / 2] : 0.5 * (sorted[k / 2 - 1] + sorted[k / 2]);
    }
}
