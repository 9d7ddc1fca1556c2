package org.dendrokin.core.calib;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotNull;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Random;

import org.junit.jupiter.api.Tag;
import org.junit.jupiter.api.Test;

class StandardsFitTest {
    // Truth of the synthetic standards (invented for the test): Fmin 1, Fmax 10, K 0.144 uM, n 2.9.
    private static final HillCurve TRUTH = new HillCurve(1, 10, 0.144, 2.9);
    private static final double[] LEVELS = {0, 0.025, 0.05, 0.1, 0.2, 0.4, 0.8, 1.6, 100};

    static Standards synthetic(HillCurve truth, double[] levels, int replicates, double noiseSd, Random random) {
        double[] c = new double[levels.length * replicates];
        double[] f = new double[c.length];
        for (int i = 0; i < c.length; i++) {
            c[i] = levels[i / replicates];
            f[i] = truth.signal(c[i]) + (random == null ? 0 : noiseSd * random.nextGaussian());
        }
        return new Standards(c, f);
    }

    @Test
    void recoversExactParametersFromNoiselessStandards() {
        StandardsFit.Result r = StandardsFit.fit(synthetic(TRUTH, LEVELS, 1, 0, null));
        assertTrue(r.converged(), "converged");
        HillCurve fit = r.calibration().curve();
        // REF: self-consistency test of sheet s1.7, parameters back to 1e-8 relative [common practice]; sheet s1.7
        assertEquals(1.0, fit.a(), 1e-8, "Fmin");
        assertEquals(10.0, fit.b(), 1e-8 * 10, "Fmax");
        assertEquals(0.144, fit.kHalfMicromolar(), 1e-8 * 0.144, "K (uM)");
        assertEquals(2.9, fit.n(), 1e-8 * 2.9, "n");
    }

    @Test
    void usesTheStudentTQuantile() {
        StandardsFit.Result r = StandardsFit.fit(synthetic(TRUTH, new double[] {0, 0.05, 0.144, 0.4, 100}, 2, 0.1,
                new Random(7)));
        assertEquals(6, r.dof(), "degrees of freedom m - p");
        // REF: t(0.975, 5) = 2.570582 and t(0.975, 8) = 2.306004; here dof 6 lies between [published: standard tables]; sheet s8.2
        assertTrue(r.tQuantile() > 2.306004 && r.tQuantile() < 2.570582, "t(0.975, 6) = " + r.tQuantile());
        StandardsFit.Result five = StandardsFit.fit(synthetic(TRUTH, new double[] {0, 0.05, 0.1, 0.144, 0.4, 100,
            200, 300, 400}, 1, 0.1, new Random(8)));
        // REF: t(0.975, 5) = 2.570582 [published: standard tables]; sheet s8.2
        assertEquals(2.570582, five.tQuantile(), 1e-6);
    }

    @Test
    void ninetyFivePercentIntervalsCoverTheTruthInMostReplicates() {
        int[] covered = coverage(200, 20260101L);
        // 200 replicates: binomial SD of a 95% coverage is 1.5%, so 90% is more than 3 SD below nominal.
        assertTrue(covered[0] >= 180, "K inside its 95% interval in " + covered[0] + " of 200");
        assertTrue(covered[1] >= 180, "n inside its 95% interval in " + covered[1] + " of 200");
    }

    @Tag("slow")
    @Test
    void coverageStaysNearNominalOverAThousandReplicatesAndTwoDesigns() {
        for (int replicatesPerLevel : new int[] {1, 3}) {
            int[] covered = coverage(1000, 77L + replicatesPerLevel, replicatesPerLevel, 0.3);
            // Binomial SD of 95% coverage over 1000 fits is 0.7%: 92% to 97.5% allows for the linearisation.
            for (int k = 0; k < 2; k++) {
                assertTrue(covered[k] >= 920 && covered[k] <= 975, (k == 0 ? "K" : "n") + " covered in "
                        + covered[k] + " of 1000 with " + replicatesPerLevel + " replicate(s) per level");
            }
        }
    }

    /** Counts, over seeded replicates, how often K and n lie inside their 95% intervals. */
    static int[] coverage(int replicates, long seed) {
        return coverage(replicates, seed, 3, 0.15);
    }

    static int[] coverage(int replicates, long seed, int perLevel, double noiseSd) {
        Random random = new Random(seed);
        int[] covered = new int[2];
        for (int r = 0; r < replicates; r++) {
            StandardsFit.Result fit = StandardsFit.fit(synthetic(TRUTH, LEVELS, perLevel, noiseSd, random));
            assertNotNull(fit.calibration(), "replicate " + r + " produced a fit");
            StandardsFit.Estimate k = fit.estimates().get(2);
            StandardsFit.Estimate n = fit.estimates().get(3);
            if (k.ci95Low() <= 0.144 && 0.144 <= k.ci95High()) {
                covered[0]++;
            }
            if (n.ci95Low() <= 2.9 && 2.9 <= n.ci95High()) {
                covered[1]++;
            }
        }
        return covered;
    }

    @Test
    void concentrationSdFollowsTheFitCovariance() {
        StandardsFit.Result r = StandardsFit.fit(synthetic(TRUTH, LEVELS, 3, 0.15, new Random(3)));
        FittedHill cal = r.calibration();
        double[][] cov = cal.covariance();
        HillCurve c = cal.curve();
        double signal = 6;
        double[] p = {c.a(), c.b(), Math.log(c.kHalfMicromolar()), Math.log(c.n())};
        double[] g = new double[4];
        for (int k = 0; k < 4; k++) {
            double[] up = p.clone();
            double[] down = p.clone();
            up[k] += 1e-6;
            down[k] -= 1e-6;
            g[k] = (curveOf(up).concentration(signal) - curveOf(down).concentration(signal)) / 2e-6;
        }
        double var = 0;
        for (int i = 0; i < 4; i++) {
            for (int j = 0; j < 4; j++) {
                var += g[i] * cov[i][j] * g[j];
            }
        }
        // REF: delta method sqrt(g^T C g) with g by central differences [common practice]; sheet s8.2
        assertEquals(Math.sqrt(var), cal.concentrationSdMicromolar(signal), 1e-5 * Math.sqrt(var));
        assertTrue(cal.signalSd(0.144) > 0, "the curve's band has a width");
    }

    private static HillCurve curveOf(double[] p) {
        return new HillCurve(p[0], p[1], Math.exp(p[2]), Math.exp(p[3]));
    }

    @Test
    void refusesTooFewStandards() {
        Standards few = new Standards(new double[] {0, 0.1, 1}, new double[] {1, 4, 9});
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class, () -> StandardsFit.fit(few));
        assertTrue(e.getMessage().contains("at least 5 standards"), e.getMessage());
        Standards replicatesOnly = new Standards(new double[] {0, 0, 0, 1, 1, 1}, new double[] {1, 1, 1, 9, 9, 9});
        assertThrows(IllegalArgumentException.class, () -> StandardsFit.fit(replicatesOnly));
    }
}
