package org.dendrokin.core.stats;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Random;

import org.apache.commons.math3.distribution.TDistribution;
import org.apache.commons.math3.special.Gamma;
import org.apache.commons.math3.stat.descriptive.SummaryStatistics;
import org.apache.commons.math3.stat.inference.MannWhitneyUTest;
import org.apache.commons.math3.stat.inference.TTest;
import org.junit.jupiter.api.Test;

class GroupComparisonTest {

    private static double[] sample(Random r, int n, double mean, double sd) {
        double[] x = new double[n];
        for (int i = 0; i < n; i++) {
            x[i] = mean + sd * r.nextGaussian();
        }
        return x;
    }

    @Test
    void welchAndMannWhitneyAgreeWithCommonsMathOnTheSameNumbers() {
        Random random = new Random(424242);  // fixed seed: a failure must reproduce
        for (int trial = 0; trial < 20; trial++) {
            double[] a = sample(random, 3 + random.nextInt(12), 0.5, 0.1 + random.nextDouble());
            double[] b = sample(random, 3 + random.nextInt(12), 0.8, 0.1 + random.nextDouble());
            GroupComparison c = GroupComparison.of("a", a, "b", b);
            // REF: Commons Math 3.6.1 TTest (unequal variances) and MannWhitneyUTest [common practice]
            assertEquals(new TTest().tTest(a, b), c.welchP(), 1e-12, "Welch p");
            assertEquals(new TTest().t(a, b), c.welchT(), 1e-12, "Welch t");
            assertEquals(new MannWhitneyUTest().mannWhitneyUTest(a, b), c.mannWhitneyP(), 1e-12, "Mann-Whitney p");
            assertEquals(a.length, c.nA(), "n of group a");
            assertEquals(b.length, c.nB(), "n of group b");
        }
    }

    @Test
    void reproducesStudentsSleepDataWorkedExample() {
        // Extra hours of sleep with two soporific drugs, 10 patients each (Cushny and Peebles 1905, as used by
        // Student 1908, Biometrika 6:1), analysed as two independent groups.
        double[] drug1 = {0.7, -1.6, -0.2, -1.2, -0.1, 3.4, 3.7, 0.8, 0.0, 2.0};
        double[] drug2 = {1.9, 0.8, 1.1, 0.1, -0.1, 4.4, 5.5, 1.6, 4.6, 3.4};
        GroupComparison c = GroupComparison.of("drug 1", drug1, "drug 2", drug2);
        // REF: R t.test(extra ~ group, data = sleep), Welch: t = -1.8608, df = 17.776, p = 0.07939
        // [from memory: R's documented example output; fairly sure]
        assertEquals(-1.8608, c.welchT(), 1e-4, "Welch t");
        assertEquals(17.776, c.welchDf(), 1e-3, "Welch df");
        assertEquals(0.07939, c.welchP(), 1e-5, "Welch p");
        assertEquals(0.75 - 2.33, c.meanA() - c.meanB(), 1e-12, "difference of means, h");
        // REF: R wilcox.test(extra ~ group, data = sleep): W = 25.5 [from memory: R's example output; fairly sure]
        assertEquals(25.5, c.mannWhitneyU(), 0, "U of drug 1");
    }

    @Test
    void welchDegreesOfFreedomReproduceThePValue() {
        Random random = new Random(99);
        double[] a = sample(random, 6, 1.0, 0.3);
        double[] b = sample(random, 11, 1.4, 0.9);
        GroupComparison c = GroupComparison.of("a", a, "b", b);
        // REF: Welch 1947, two-sided p = 2 P(T_df > |t|) with the Welch-Satterthwaite df [published]
        double p = 2 * (1 - new TDistribution(c.welchDf()).cumulativeProbability(Math.abs(c.welchT())));
        assertEquals(c.welchP(), p, 1e-9, "p from our df and t");
    }

    @Test
    void uCountsThePairsWhereTheFirstGroupIsLarger() {
        double[] a = {1.0, 2.5, 2.5, 4.0, 7.0};
        double[] b = {2.5, 3.0, 0.5, 6.0};
        double brute = 0;
        for (double x : a) {
            for (double y : b) {
                brute += x > y ? 1 : x == y ? 0.5 : 0;
            }
        }
        // REF: Mann and Whitney 1947, U as the count of pairs, ties one half [published definition]
        assertEquals(brute, GroupComparison.of("a", a, "b", b).mannWhitneyU(), 0, "U by counting pairs");
        // REF: U_a + U_b = n_a n_b [published identity]
        assertEquals(a.length * b.length, GroupComparison.of("a", a, "b", b).mannWhitneyU()
                + GroupComparison.of("b", b, "a", a).mannWhitneyU(), 0, "U_a + U_b");
    }

    @Test
    void hedgesCorrectionMatchesTheExactGammaFormula() {
        Random random = new Random(31);
        for (int[] n : new int[][] {{3, 3}, {4, 9}, {10, 10}, {25, 40}}) {
            double[] a = sample(random, n[0], 2.0, 0.5);
            double[] b = sample(random, n[1], 1.5, 0.7);
            SummaryStatistics sa = new SummaryStatistics();
            SummaryStatistics sb = new SummaryStatistics();
            for (double v : a) {
                sa.addValue(v);
            }
            for (double v : b) {
                sb.addValue(v);
            }
            int df = n[0] + n[1] - 2;
            double sPooled = Math.sqrt(((n[0] - 1) * sa.getVariance() + (n[1] - 1) * sb.getVariance()) / df);
            double cohenD = (sa.getMean() - sb.getMean()) / sPooled;
            // REF: Hedges 1981 eq. 6b, exact J(m) = Gamma(m/2) / (sqrt(m/2) Gamma((m-1)/2)) [published]
            double exactJ = Math.exp(Gamma.logGamma(df / 2.0) - Gamma.logGamma((df - 1) / 2.0)) / Math.sqrt(df / 2.0);
            double g = GroupComparison.of("a", a, "b", b).hedgesG();
            // The approximation 1 - 3/(4 df - 1) is within 0.3% of the exact J for df >= 4 (Hedges 1981, table 2).
            assertEquals(exactJ * cohenD, g, Math.abs(exactJ * cohenD) * 4e-3, "g, n = " + n[0] + "+" + n[1]);
        }
    }

    @Test
    void tooSmallGroupsGiveNoTestRatherThanANumber() {
        GroupComparison c = GroupComparison.of("a", new double[] {1.0}, "b", new double[] {2.0, 3.0, Double.NaN});
        assertEquals(1, c.nA(), "n of a");
        assertEquals(2, c.nB(), "NaN is not counted");
        assertTrue(Double.isNaN(c.hedgesG()) && Double.isNaN(c.welchP()), "no effect size or t test with n = 1");
    }

    @Test
    void groupSummaryIntervalUsesStudentsT() {
        double[] x = {4.1, 3.9, 4.4, 4.0, 4.6};
        GroupSummary s = GroupSummary.of(x);
        SummaryStatistics ref = new SummaryStatistics();
        for (double v : x) {
            ref.addValue(v);
        }
        // REF: Student 1908 interval mean +- t(0.975, 4) s / sqrt(5), t(0.975, 4) = 2.776 [published table]
        assertEquals(ref.getMean() + 2.776445 * ref.getStandardDeviation() / Math.sqrt(5), s.ciHigh(), 1e-5, "upper");
        assertEquals(4.1, s.median(), 1e-12, "median");
    }
}
