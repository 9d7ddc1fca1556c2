package org.dendrokin.core.spread;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Arrays;
import java.util.Random;

import org.junit.jupiter.api.Test;

class TheilSenTest {
    @Test
    void matchesAHandComputedExample() {
        // Pairwise slopes by hand: -1, -1, 1/3, 1/2, 3/4, 1, 1, 4/3, 2, 3; median (3/4 + 1) / 2 = 7/8.
        // Residuals y - 7/8 x: 1/8, 5/4, -5/8, 3/2, -3/8; median 1/8.
        TheilSen.Line line = TheilSen.fit(new double[] {1, 2, 3, 4, 5}, new double[] {1, 3, 2, 5, 4});
        // REF: Theil 1950 / Sen 1968 median of pairwise slopes, worked by hand above [common practice]
        assertEquals(0.875, line.slope(), 1e-15, "slope");
        assertEquals(0.125, line.intercept(), 1e-15, "intercept");
    }

    @Test
    void senIntervalUsesTheRanksOfKendallsStatistic() {
        // n = 10: N = 45 slopes, Var(S) = 10 * 9 * 25 / 18 = 125, C = 1.959964 * sqrt(125) = 21.913;
        // lower rank round((45 - 21.913) / 2) = 12, upper rank round((45 + 21.913) / 2) + 1 = 34.
        Random random = new Random(7);
        double[] x = new double[10];
        double[] y = new double[10];
        for (int i = 0; i < 10; i++) {
            x[i] = i;
            y[i] = 2 * i + random.nextGaussian();
        }
        double[] slopes = new double[45];
        int m = 0;
        for (int i = 0; i < 10; i++) {
            for (int j = i + 1; j < 10; j++) {
                slopes[m++] = (y[j] - y[i]) / (x[j] - x[i]);
            }
        }
        Arrays.sort(slopes);
        TheilSen.Line line = TheilSen.fit(x, y);
        // REF: Sen 1968 J Am Stat Assoc 63:1379, rank interval from Kendall's S [from memory: Sen 1968; fairly sure]
        assertEquals(slopes[11], line.slopeLo95(), 0.0, "lower end is the 12th smallest slope");
        assertEquals(slopes[33], line.slopeHi95(), 0.0, "upper end is the 34th smallest slope");
    }

    @Test
    void senIntervalCoversTheTrueSlopeAboutNinetyFivePercentOfTheTime() {
        Random random = new Random(20261201);
        int hits = 0;
        int replicates = 600;
        for (int r = 0; r < replicates; r++) {
            double[] x = new double[15];
            double[] y = new double[15];
            for (int i = 0; i < 15; i++) {
                x[i] = i * 0.5;
                y[i] = 1.5 * x[i] + 3 + 0.8 * random.nextGaussian();
            }
            TheilSen.Line line = TheilSen.fit(x, y);
            if (line.slopeLo95() <= 1.5 && 1.5 <= line.slopeHi95()) {
                hits++;
            }
        }
        double coverage = hits / (double) replicates;
        // REF: nominal 95% coverage of Sen's interval for continuous errors [published: Sen 1968]
        // 600 replicates: binomial SD of the coverage is 0.9%, so 0.92-0.98 is more than 3 SD either side.
        assertTrue(coverage > 0.92 && coverage < 0.98, "coverage " + coverage);
    }

    @Test
    void oneWildPointDoesNotMoveTheSlope() {
        double[] x = new double[10];
        double[] y = new double[10];
        for (int i = 0; i < 10; i++) {
            x[i] = i;
            y[i] = 3 * i + 1;
        }
        y[4] = 500;
        // REF: breakdown point of the Theil-Sen estimator, about 29% [common practice]
        assertEquals(3.0, TheilSen.fit(x, y).slope(), 1e-12, "slope with one outlier");
    }

    @Test
    void refusesTooFewPoints() {
        assertThrows(IllegalArgumentException.class, () -> TheilSen.fit(new double[] {1, 2}, new double[] {1, 2}));
    }
}
