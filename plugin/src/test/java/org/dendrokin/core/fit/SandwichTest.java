package org.dendrokin.core.fit;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.List;
import java.util.Random;

import org.dendrokin.core.Progress;
import org.dendrokin.core.units.Unit;
import org.junit.jupiter.api.Test;

/** The kernel sums of the robust (sandwich) variance, against brute force and against closed forms. */
class SandwichTest {
    /** One level over a grid: f_i = mu. */
    static final class Level implements FitModel {
        private final int size;

        Level(int size) {
            this.size = size;
        }

        @Override
        public String name() {
            return "level";
        }

        @Override
        public List<ParameterSpec> parameters() {
            return List.of(ParameterSpec.linear("mu", Unit.DIMENSIONLESS));
        }

        @Override
        public int size() {
            return size;
        }

        @Override
        public void evaluate(double[] p, double[] values, double[] jac) {
            java.util.Arrays.fill(values, p[0]);
            if (jac != null) {
                java.util.Arrays.fill(jac, 1);
            }
        }
    }

    @Test
    void windowSumsEqualTheBartlettDoubleSum() {
        Random random = new Random(20261204L);
        int[][] cases = {{7, 5, 1, 1}, {7, 5, 2, 3}, {7, 5, 5, 8}, {1, 20, 1, 4}, {13, 1, 6, 1}, {4, 9, 9, 2}};
        for (int[] c : cases) {
            int columns = c[0];
            int rows = c[1];
            int wx = c[2];
            int wt = c[3];
            double[][] v = new double[rows][columns];
            for (double[] row : v) {
                for (int x = 0; x < columns; x++) {
                    row[x] = random.nextGaussian();
                }
            }
            Sandwich.KernelSum sum = new Sandwich.KernelSum(columns, wx, wt);
            for (double[] row : v) {
                sum.add(row);
            }
            double brute = 0;
            for (int f = 0; f < rows; f++) {
                for (int x = 0; x < columns; x++) {
                    for (int g = 0; g < rows; g++) {
                        for (int y = 0; y < columns; y++) {
                            double kx = Math.max(0, wx - Math.abs(x - y));
                            double kt = Math.max(0, wt - Math.abs(f - g));
                            brute += kx * kt * v[f][x] * v[g][y];
                        }
                    }
                }
            }
            String what = columns + " x " + rows + " grid, window " + wx + " x " + wt;
            // REF: sum over sliding windows of squared window sums = sum_ik (Wx - |dx|)+ (Wt - |dt|)+ v_i v_k [derived in the test]
            assertEquals(brute, sum.total(), 1e-10 * (1 + Math.abs(brute)), what);
        }
    }

    @Test
    void bartlettEstimateOfAnAr1SeriesMatchesItsExpectation() {
        Random random = new Random(20261205L);
        int n = 1_000_000;
        double rho = 0.5;
        int w = 60;
        Sandwich.KernelSum sum = new Sandwich.KernelSum(1, 1, w);
        double x = 0;
        for (int t = 0; t < n; t++) {
            x = rho * x + random.nextGaussian();
            sum.add(new double[] {x});
        }
        double estimate = sum.total() / w / n;
        // REF: AR(1) autocovariance gamma_j = rho^|j| / (1 - rho^2) with unit innovations, long-run variance
        // 1 / (1 - rho)^2 = 4 [from memory: Hamilton 1994 Time Series Analysis ch. 3 and 10; sure]
        double expected = 0;
        for (int j = -(w - 1); j < w; j++) {
            expected += (1 - Math.abs(j) / (double) w) * Math.pow(rho, Math.abs(j)) / (1 - rho * rho);
        }
        assertEquals(4.0, expected, 0.1, "the Bartlett weights keep all but 2% of the long-run variance at W = 60");
        // 3%: about 3 standard errors of the estimate, sqrt(4 W / (3 n)) = 0.9% relative
        assertEquals(expected, estimate, 0.03 * expected, "Bartlett estimate of the long-run variance");
    }

    @Test
    void windowsFollowTheRulesTheyCite() {
        // REF: Lazarus, Lewis, Stock & Watson 2018 JBES 36:541, S = 1.3 sqrt(T) [from memory: LLSW 2018; fairly sure]
        assertEquals((int) Math.ceil(1.3 * Math.sqrt(400)), Sandwich.window(0, 400), "uncorrelated, T = 400");
        // REF: Andrews 1991 Econometrica 59:817, Bartlett AR(1) plug-in 1.1447 (alpha T)^(1/3) [from memory: Andrews 1991; fairly sure]
        double alpha = 4 * 0.9 * 0.9 / (0.1 * 0.1 * 1.9 * 1.9);
        assertEquals((int) Math.ceil(1.1447 * Math.cbrt(alpha * 400)), Sandwich.window(0.9, 400), "rho 0.9, T = 400");
        assertEquals(5, Sandwich.window(0.9, 10), "at most half the length");
        // REF: Kiefer & Vogelsang 2005 Econometric Theory 21:1130, Bartlett fixed-b mean 1 - b + b^2 / 3 [from memory: Kiefer & Vogelsang 2005; fairly sure]
        assertEquals(1 - 0.2 + 0.04 / 3, Sandwich.fixedBandwidthBias(0.2), 1e-15);
        // REF: sum of squared Bartlett weights over |l| < W, (2 W^2 + 1) / (3 W) [derived in the test: W = 3 gives 1 + 2 (4 + 1) / 9]
        assertEquals(1 + 2 * (4 + 1) / 9.0, Sandwich.kernelSquares(3), 1e-15);
    }

    private static FitResult fitLevel(double[] y, int columns) {
        double[] sigma = new double[y.length];
        java.util.Arrays.fill(sigma, 1);
        return ModelFit.fit(new Level(y.length), new FitData(y, sigma, columns), List.of(new double[] {0}),
                ModelFit.Options.defaults(), Progress.NONE);
    }

    @Test
    void independentNoiseKeepsTheWaldInterval() {
        Random random = new Random(20261206L);
        double[] y = new double[60 * 80];
        for (int i = 0; i < y.length; i++) {
            y[i] = 3 + 0.5 * random.nextGaussian();
        }
        ParameterEstimate mu = fitLevel(y, 60).parameters().get(0);
        assertEquals(Interval.WALD_T, mu.ci95().method(), mu.ci95().note());
        // REF: the mean of n independent samples has SE s / sqrt(n) [common practice]
        double mean = java.util.Arrays.stream(y).average().orElseThrow();
        double s = Math.sqrt(java.util.Arrays.stream(y).map(v -> (v - mean) * (v - mean)).sum() / (y.length - 1));
        assertEquals(s / Math.sqrt(y.length), mu.standardError(), 1e-9, "standard error of the mean");
    }

    @Test
    void correlatedNoiseWidensTheIntervalByTheLongRunFactor() {
        Random random = new Random(20261207L);
        int columns = 120;
        int rows = 120;
        double rx = 0.5;
        double rt = 0.3;
        double[] y = ar1Field(columns, rows, rx, rt, random);
        ParameterEstimate mu = fitLevel(y, columns).parameters().get(0);
        assertTrue(mu.ci95().isRobust(), "the interval is the robust one: " + mu.ci95());
        Interval wald = mu.otherIntervals().get(0);
        assertEquals(Interval.WALD_T, wald.method());
        double ratio = mu.ci95().width() / wald.width();
        // REF: variance of the mean of a separable AR(1) field, (1 + rx)(1 + rt) / ((1 - rx)(1 - rt)) times the
        // independent one [from memory: Hamilton 1994 ch. 7, applied along each direction; sure]
        double expected = Math.sqrt((1 + rx) * (1 + rt) / ((1 - rx) * (1 - rt)));
        // 25%: one field's kernel estimate, its degrees of freedom and the fixed-b correction
        assertEquals(expected, ratio, 0.25 * expected, "robust / Wald width");
    }

    /** A separable AR(1) field of unit marginal variance, row-major. */
    static double[] ar1Field(int columns, int rows, double rx, double rt, Random random) {
        double[] e = new double[columns * rows];
        double cx = Math.sqrt(1 - rx * rx);
        double ct = Math.sqrt(1 - rt * rt);
        double[] row = new double[columns];
        for (int f = 0; f < rows; f++) {
            for (int c = 0; c < columns; c++) {
                double z = random.nextGaussian();
                row[c] = c == 0 ? z : rx * row[c - 1] + cx * z;
            }
            for (int c = 0; c < columns; c++) {
                int i = f * columns + c;
                e[i] = f == 0 ? row[c] : rt * e[i - columns] + ct * row[c];
            }
        }
        return e;
    }

    @Test
    void pointsStoredInAnOrderOfTheirOwnKeepTheirGrid() {
        // A tree's data are stored branch by branch; FitData.onGrid tells the fit where each point sits. Stored
        // column by column and named so, a field must give the robust interval it gives stored row by row.
        Random random = new Random(20261209L);
        int columns = 90;
        int rows = 70;
        double[] rowMajor = ar1Field(columns, rows, 0.6, 0.2, random);
        double[] stored = new double[rowMajor.length];
        int[] pointAt = new int[rowMajor.length];
        for (int f = 0; f < rows; f++) {
            for (int c = 0; c < columns; c++) {
                int point = c * rows + f;
                stored[point] = rowMajor[f * columns + c];
                pointAt[f * columns + c] = point;
            }
        }
        double[] sigma = new double[stored.length];
        java.util.Arrays.fill(sigma, 1);
        Interval expected = fitLevel(rowMajor, columns).parameters().get(0).ci95();
        FitData data = FitData.onGrid(stored, sigma, columns, pointAt);
        assertFalse(data.rowMajor());
        assertEquals(pointAt[5 * columns + 7], data.point(5, 7));
        Interval got = ModelFit.fit(new Level(stored.length), data, List.of(new double[] {0}),
                ModelFit.Options.defaults(), Progress.NONE).parameters().get(0).ci95();
        assertTrue(expected.isRobust(), "the row-major fit found the correlation: " + expected);
        assertEquals(expected.method(), got.method());
        assertEquals(expected.lower(), got.lower(), 1e-9 * expected.width());
        assertEquals(expected.upper(), got.upper(), 1e-9 * expected.width());
        // the same points taken as if row by row lose their neighbours along the path: a different interval
        Interval scrambled = fitLevel(stored, columns).parameters().get(0).ci95();
        assertTrue(Math.abs(scrambled.width() - expected.width()) > 0.05 * expected.width(),
                "a wrong grid changes the interval: " + scrambled + " vs " + expected);

        int[] twice = pointAt.clone();
        twice[1] = twice[0];
        assertThrows(IllegalArgumentException.class, () -> FitData.onGrid(stored, sigma, columns, twice));
    }

    @Test
    void dataWithoutAGridGetNoRobustInterval() {
        Random random = new Random(20261208L);
        double[] y = ar1Field(400, 1, 0.8, 0, random);
        double[] sigma = new double[y.length];
        java.util.Arrays.fill(sigma, 1);
        FitResult f = ModelFit.fit(new Level(y.length), new FitData(y, sigma), List.of(new double[] {0}),
                ModelFit.Options.defaults(), Progress.NONE);
        assertFalse(f.parameters().get(0).ci95().isRobust(), "no neighbours, no kernel");
        assertEquals("", f.parameters().get(0).ci95().note());
    }
}
