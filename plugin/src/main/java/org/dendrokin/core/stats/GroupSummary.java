package org.dendrokin.core.stats;

import org.apache.commons.math3.distribution.TDistribution;
import org.apache.commons.math3.stat.descriptive.DescriptiveStatistics;

/**
 * One group's values of one quantity: count, mean, sample standard deviation (n - 1), median and the 95%
 * confidence interval of the mean, mean +- t(0.975, n - 1) s / sqrt(n) (Student 1908; common practice).
 * Values that are not finite are dropped. Everything is NaN where too few values make it undefined.
 *
 * @param n      number of finite values
 * @param mean   in the quantity's unit
 * @param sd     sample standard deviation, in the quantity's unit
 * @param median in the quantity's unit
 * @param ciLow  lower end of the 95% interval of the mean
 * @param ciHigh upper end of the 95% interval of the mean
 */
public record GroupSummary(int n, double mean, double sd, double median, double ciLow, double ciHigh) {

    /** Summarises the finite values; the array is not modified. */
    public static GroupSummary of(double[] values) {
        double[] x = GroupComparison.finite(values);
        if (x.length == 0) {
            return new GroupSummary(0, Double.NaN, Double.NaN, Double.NaN, Double.NaN, Double.NaN);
        }
        DescriptiveStatistics s = new DescriptiveStatistics(x);
        double mean = s.getMean();
        double median = s.getPercentile(50);
        if (x.length < 2) {
            return new GroupSummary(1, mean, Double.NaN, median, Double.NaN, Double.NaN);
        }
        double sd = s.getStandardDeviation();
        double half = new TDistribution(x.length - 1).inverseCumulativeProbability(0.975) * sd / Math.sqrt(x.length);
        return new GroupSummary(x.length, mean, sd, median, mean - half, mean + half);
    }
}
