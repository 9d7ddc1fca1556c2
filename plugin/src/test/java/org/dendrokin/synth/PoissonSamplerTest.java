package org.dendrokin.synth;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.SplittableRandom;

import org.apache.commons.math3.distribution.PoissonDistribution;
import org.apache.commons.math3.special.Gamma;
import org.apache.commons.math3.stat.inference.ChiSquareTest;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.ValueSource;

class PoissonSamplerTest {
    @ParameterizedTest(name = "mean {0}")
    @ValueSource(doubles = {0.7, 6.3, 10.0, 37.5, 412.25, 5321.5})
    void drawsFollowThePoissonLaw(double mean) {
        SplittableRandom random = new SplittableRandom(20261204L);
        int n = 1_000_000;
        // Bins: every count within 5 sd of the mean, and the two tails pooled, so each expected count is >= 5.
        PoissonDistribution law = new PoissonDistribution(mean);
        int lo = (int) Math.max(0, Math.floor(mean - 5 * Math.sqrt(mean)));
        int hi = (int) Math.ceil(mean + 5 * Math.sqrt(mean)) + 2;
        long[] observed = new long[hi - lo + 2];
        double sum = 0;
        double sumSq = 0;
        for (int i = 0; i < n; i++) {
            long k = PoissonSampler.sample(random, mean);
            sum += k;
            sumSq += (double) k * k;
            int bin = k < lo ? 0 : k > hi ? observed.length - 1 : (int) (k - lo) + 1;
            observed[bin]++;
        }
        double[] expected = new double[observed.length];
        // REF: Poisson probabilities from Commons Math PoissonDistribution [common practice]
        expected[0] = lo > 0 ? law.cumulativeProbability(lo - 1) * n : 0;
        for (int k = lo; k <= hi; k++) {
            expected[k - lo + 1] = law.probability(k) * n;
        }
        expected[expected.length - 1] = (1 - law.cumulativeProbability(hi)) * n;
        // Pool bins with fewer than 5 expected counts into their neighbours toward the mode.
        double[] e = pooled(expected);
        long[] o = pooled(observed, expected);
        double p = new ChiSquareTest().chiSquareTest(e, o);
        assertTrue(p > 1e-4, "chi-square goodness of fit p = " + p + " at mean " + mean);
        double m = sum / n;
        double var = sumSq / n - m * m;
        // REF: Poisson mean and variance both equal the mean [published: standard]
        assertEquals(mean, m, 5 * Math.sqrt(mean / n), "sample mean");
        assertEquals(mean, var, 5 * mean * Math.sqrt(2.0 / n) + 5 * Math.sqrt(mean / n), "sample variance");
    }

    @Test
    void logFactorialMatchesCommonsMathLogGamma() {
        for (long k : new long[] {0, 1, 2, 19, 20, 21, 50, 999, 123_456, 10_000_000}) {
            // REF: ln k! = ln Gamma(k + 1), Commons Math Gamma.logGamma [common practice]
            double expected = Gamma.logGamma(k + 1.0);
            assertEquals(expected, PoissonSampler.logFactorial(k), 1e-13 * Math.max(1, expected), "ln " + k + "!");
        }
    }

    private static double[] pooled(double[] expected) {
        java.util.List<Double> out = new java.util.ArrayList<>();
        double carry = 0;
        for (double v : expected) {
            carry += v;
            if (carry >= 5) {
                out.add(carry);
                carry = 0;
            }
        }
        if (carry > 0) {
            out.set(out.size() - 1, out.get(out.size() - 1) + carry);
        }
        return out.stream().mapToDouble(Double::doubleValue).toArray();
    }

    private static long[] pooled(long[] observed, double[] expected) {
        java.util.List<Long> out = new java.util.ArrayList<>();
        double carry = 0;
        long count = 0;
        for (int i = 0; i < expected.length; i++) {
            carry += expected[i];
            count += observed[i];
            if (carry >= 5) {
                out.add(count);
                carry = 0;
                count = 0;
            }
        }
        if (carry > 0 || count > 0) {
            out.set(out.size() - 1, out.get(out.size() - 1) + count);
        }
        return out.stream().mapToLong(Long::longValue).toArray();
    }
}
