package org.dendrokin.core.stats;

import java.util.Arrays;

import org.apache.commons.math3.stat.descriptive.moment.Mean;
import org.apache.commons.math3.stat.descriptive.moment.Variance;
import org.apache.commons.math3.stat.inference.MannWhitneyUTest;
import org.apache.commons.math3.stat.inference.TTest;
import org.dendrokin.core.Checks;

/**
 * Compares one quantity (e.g. a fitted D in um^2/s) between two groups of sessions: the standardised mean
 * difference with Hedges' small-sample correction, Welch's unequal-variance t test and the Mann-Whitney U
 * test, both two-sided, the tests from Commons Math.
 *
 * <p>Hedges' g = J(df) (mean_a - mean_b) / s_pooled, with s_pooled^2 = ((n_a - 1) s_a^2 + (n_b - 1) s_b^2)
 * / df, df = n_a + n_b - 2 and the correction J(df) = 1 - 3 / (4 df - 1) (Hedges 1981, J. Educ. Stat. 6:107,
 * eq. 6e; Hedges and Olkin 1985, ch. 5). Welch's t = (mean_a - mean_b) / sqrt(s_a^2 / n_a + s_b^2 / n_b) with
 * Welch-Satterthwaite degrees of freedom (Welch 1947). Mann-Whitney U counts the pairs (a, b) with a &gt; b,
 * ties counted one half (Mann and Whitney 1947); Commons Math's p value uses the normal approximation.
 *
 * <p>Values that are not finite are dropped first. Where a group has fewer than two values the effect
 * size and the t test are NaN; the U test needs at least one value in each group.
 *
 * @param groupA   name of the first group
 * @param groupB   name of the second group
 * @param nA       number of finite values in the first group
 * @param nB       number of finite values in the second group
 * @param meanA    mean of the first group, in the quantity's unit
 * @param meanB    mean of the second group, in the quantity's unit
 * @param hedgesG  (mean_a - mean_b) / s_pooled times J(df), dimensionless; positive when A is larger
 * @param welchT   Welch's t statistic, dimensionless
 * @param welchDf  Welch-Satterthwaite degrees of freedom
 * @param welchP   two-sided p value of Welch's test
 * @param mannWhitneyU U statistic of group A (pairs where A's value is larger, ties one half)
 * @param mannWhitneyP two-sided p value of the Mann-Whitney test (normal approximation)
 */
public record GroupComparison(String groupA, String groupB, int nA, int nB, double meanA, double meanB,
                              double hedgesG, double welchT, double welchDf, double welchP,
                              double mannWhitneyU, double mannWhitneyP) {

    public GroupComparison {
        Checks.require(groupA != null && groupB != null, "both groups need a name");
    }

    /** Compares the finite values of {@code a} with those of {@code b}; the arrays are not modified. */
    public static GroupComparison of(String groupA, double[] a, String groupB, double[] b) {
        double[] x = finite(a);
        double[] y = finite(b);
        double meanA = x.length > 0 ? new Mean().evaluate(x) : Double.NaN;
        double meanB = y.length > 0 ? new Mean().evaluate(y) : Double.NaN;
        double g = Double.NaN;
        double t = Double.NaN;
        double df = Double.NaN;
        double p = Double.NaN;
        if (x.length >= 2 && y.length >= 2) {
            g = hedgesG(x, y);
            double va = new Variance().evaluate(x);
            double vb = new Variance().evaluate(y);
            if (va + vb > 0) {
                TTest test = new TTest();
                t = test.t(x, y);
                p = test.tTest(x, y);
                double qa = va / x.length;
                double qb = vb / y.length;
                df = (qa + qb) * (qa + qb) / (qa * qa / (x.length - 1) + qb * qb / (y.length - 1));
            }
        }
        double u = Double.NaN;
        double pu = Double.NaN;
        if (x.length >= 1 && y.length >= 1) {
            u = uStatistic(x, y);
            pu = new MannWhitneyUTest().mannWhitneyUTest(x, y);
        }
        return new GroupComparison(groupA, groupB, x.length, y.length, meanA, meanB, g, t, df, p, u, pu);
    }

    /**
     * Hedges' g of two samples with at least two values each (see the class comment). NaN when both samples
     * have no spread at all.
     */
    static double hedgesG(double[] x, double[] y) {
        int df = x.length + y.length - 2;
        double pooled = ((x.length - 1) * new Variance().evaluate(x) + (y.length - 1) * new Variance().evaluate(y))
                / df;
        if (!(pooled > 0)) {
            return Double.NaN;
        }
        double correction = 1 - 3.0 / (4.0 * df - 1);
        return correction * (new Mean().evaluate(x) - new Mean().evaluate(y)) / Math.sqrt(pooled);
    }

    /** U of the first sample: the pairs where its value is larger, ties counted one half. O(n log n). */
    static double uStatistic(double[] x, double[] y) {
        double[] sorted = y.clone();
        Arrays.sort(sorted);
        double u = 0;
        for (double v : x) {
            int below = lowerBound(sorted, v);
            int notAbove = upperBound(sorted, v);
            u += below + 0.5 * (notAbove - below);
        }
        return u;
    }

    private static int lowerBound(double[] sorted, double v) {
        int lo = 0;
        int hi = sorted.length;
        while (lo < hi) {
            int mid = (lo + hi) >>> 1;
            if (sorted[mid] < v) {
                lo = mid + 1;
            } else {
                hi = mid;
            }
        }
        return lo;
    }

    private static int upperBound(double[] sorted, double v) {
        int lo = 0;
        int hi = sorted.length;
        while (lo < hi) {
            int mid = (lo + hi) >>> 1;
            if (sorted[mid] <= v) {
                lo = mid + 1;
            } else {
                hi = mid;
            }
        }
        return lo;
    }

    /** The finite values of {@code values}, in their order. */
    public static double[] finite(double[] values) {
        return Arrays.stream(values).filter(Double::isFinite).toArray();
    }
}
