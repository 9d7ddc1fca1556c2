package org.dendrokin.core.fit;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNull;

import java.util.ArrayList;
import java.util.List;

import org.dendrokin.core.units.Unit;
import org.junit.jupiter.api.Test;

/** Wald-t standard errors and intervals from a given Jacobian, without the optimiser. */
class WaldTTest {
    @Test
    void studentQuantilesMatchTables() {
        // REF: t(0.975, df) tables, Abramowitz & Stegun ch. 26 [published: standard tables]; sheet s8.2
        assertEquals(12.70620, WaldT.tQuantile(1), 1e-5);
        assertEquals(2.570582, WaldT.tQuantile(5), 1e-6);
        assertEquals(2.228139, WaldT.tQuantile(10), 1e-6);
        assertEquals(2.048407, WaldT.tQuantile(28), 1e-6);
    }

    @Test
    void standardErrorsAndIntervalAtTheCertifiedMgh17Fit() {
        // REF: NIST StRD MGH17 (certified values), data file as shipped in commons-math3 3.6.1 tests jar
        NistStrdTest.Dataset set = NistStrdTest.read("MGH17");
        double[] b = set.certified();
        int n = set.x().length;
        int p = b.length;
        double[][] jac = new double[n][p];
        double rss = 0;
        for (int i = 0; i < n; i++) {
            double f = NistStrdTest.MGH17.value(b, set.x()[i], jac[i]);
            rss += (set.y()[i] - f) * (set.y()[i] - f);
        }
        double[][] cov = WaldT.covariance(jac, rss / (n - p));
        for (int j = 0; j < p; j++) {
            // REF: NIST StRD MGH17 certified SDs = sqrt of s^2 (J^T J)^-1 [published: NIST StRD MGH17.dat]; sheet s8.2, s8.4
            assertEquals(set.certifiedSd()[j], Math.sqrt(cov[j][j]), 1e-6 * set.certifiedSd()[j], "SD of b" + (j + 1));
        }
        List<ParameterSpec> specs = new ArrayList<>();
        for (int j = 0; j < p; j++) {
            specs.add(ParameterSpec.linear("b" + (j + 1), Unit.DIMENSIONLESS));
        }
        Interval b4 = WaldT.intervals(specs, b, cov, WaldT.tQuantile(n - p))[3];
        // REF: derived check value, 95% CI of b4 [published: NIST StRD + t(0.975, 28)]; sheet s8.4
        assertEquals(0.01194859, b4.lower(), 1e-7, "MGH17 b4 CI lower");
        assertEquals(0.01378648, b4.upper(), 1e-7, "MGH17 b4 CI upper");
        assertEquals(Interval.WALD_T, b4.method());
    }

    @Test
    void lineFitStandardErrorsMatchTheWorkedExample() {
        // REF: straight-line worked example, SE (0.09811024, 0.01837773) [common practice: standard regression]; sheet s8.3
        double[] y = {1.2, 2.9, 5.1, 7.2, 8.8, 11.1, 13.0, 14.8, 17.2, 19.1};
        double[][] jac = new double[y.length][];
        double a = 1.056364;
        double slope = 1.996364;
        double rss = 0;
        for (int i = 0; i < y.length; i++) {
            jac[i] = new double[] {1, i};
            rss += (y[i] - a - slope * i) * (y[i] - a - slope * i);
        }
        double[][] cov = WaldT.covariance(jac, rss / (y.length - 2));
        assertEquals(0.09811024, Math.sqrt(cov[0][0]), 1e-6, "SE of the intercept");
        assertEquals(0.01837773, Math.sqrt(cov[1][1]), 1e-6, "SE of the slope");
    }

    @Test
    void logScaleIntervalIsTheExponentOfTheSymmetricOne() {
        List<ParameterSpec> specs = List.of(ParameterSpec.positive("D", Unit.DIFFUSION));
        double[][] cov = {{0.04}};
        Interval d = WaldT.intervals(specs, new double[] {Math.log(0.5)}, cov, 2.0)[0];
        // REF: an interval for ln D mapped back by exp keeps its coverage and is positive [common practice]; sheet s8.2
        assertEquals(0.5 * Math.exp(-0.4), d.lower(), 1e-12);
        assertEquals(0.5 * Math.exp(0.4), d.upper(), 1e-12);
    }

    @Test
    void singularJacobianGivesNoCovariance() {
        // two identical columns: J^T J has rank 1 [derived in the test]
        double[][] jac = {{1, 1}, {2, 2}, {3, 3}};
        assertNull(WaldT.covariance(jac, 1.0), "a singular J^T J has no inverse");
    }
}
