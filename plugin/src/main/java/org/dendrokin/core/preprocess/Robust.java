package org.dendrokin.core.preprocess;

import java.util.Arrays;

import org.apache.commons.math3.stat.descriptive.rank.Median;

/** Robust summaries that skip NaN: median and the normal-consistent median absolute deviation. */
public final class Robust {
    /** 1 / Phi^-1(3/4): makes the MAD estimate the standard deviation of normal data [common practice]. */
    public static final double MAD_TO_SD = 1.4826022185056018;

    private Robust() {
    }

    /** Median of the finite values, NaN when there are none. Not modified. */
    public static double median(double[] values) {
        double[] finite = finite(values);
        return finite.length == 0 ? Double.NaN : new Median().evaluate(finite);
    }

    /** Standard deviation estimated as 1.4826 times the median absolute deviation of the finite values. */
    public static double madSd(double[] values) {
        double[] finite = finite(values);
        if (finite.length < 2) {
            return Double.NaN;
        }
        double med = new Median().evaluate(finite);
        for (int i = 0; i < finite.length; i++) {
            finite[i] = Math.abs(finite[i] - med);
        }
        return MAD_TO_SD * new Median().evaluate(finite);
    }

    static double[] finite(double[] values) {
        return Arrays.stream(values).filter(Double::isFinite).toArray();
    }

    /** Centred moving average over {@code 2 * half + 1} points, shrinking at the ends; NaN points are skipped. */
    public static double[] movingAverage(double[] values, int half) {
        double[] out = new double[values.length];
        for (int i = 0; i < values.length; i++) {
            double sum = 0;
            int n = 0;
            for (int j = Math.max(0, i - half); j <= Math.min(values.length - 1, i + half); j++) {
                if (Double.isFinite(values[j])) {
                    sum += values[j];
                    n++;
                }
            }
            out[i] = n > 0 ? sum / n : Double.NaN;
        }
        return out;
    }
}
