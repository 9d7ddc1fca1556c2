package org.dendrokin.core.fit;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.List;

import org.dendrokin.core.Progress;
import org.dendrokin.core.units.Unit;
import org.junit.jupiter.api.Test;

/** The optimiser and its standard errors on NIST StRD certified nonlinear regression problems. */
class NistStrdTest {
    // REF: NIST StRD MGH17.dat (More, Garbow & Hillstrom 1981 problem 17, data Osborne 1972) [published: NIST StRD]; sheet s8.4
    static final double[] MGH17_Y = {0.844, 0.908, 0.932, 0.936, 0.925, 0.908, 0.881, 0.850, 0.818, 0.784, 0.751,
        0.718, 0.685, 0.658, 0.628, 0.603, 0.580, 0.558, 0.538, 0.522, 0.506, 0.490, 0.478, 0.467, 0.457, 0.448,
        0.438, 0.431, 0.424, 0.420, 0.414, 0.411, 0.406};
    static final double[] MGH17_B = {3.7541005211E-01, 1.9358469127E+00, -1.4646871366E+00, 1.2867534640E-02,
        2.2122699662E-02};
    static final double[] MGH17_SD = {2.0723153551E-03, 2.2031669222E-01, 2.2175707739E-01, 4.4861358114E-04,
        8.9471996575E-04};

    /** y = b1 + b2 exp(-b4 x) + b3 exp(-b5 x), x = 0, 10, ..., 320; all parameters on the linear scale. */
    static final class Mgh17 implements FitModel {
        private final boolean analytic;

        Mgh17(boolean analytic) {
            this.analytic = analytic;
        }

        @Override
        public String name() {
            return "mgh17";
        }

        @Override
        public List<ParameterSpec> parameters() {
            return List.of(ParameterSpec.linear("b1", Unit.DIMENSIONLESS), ParameterSpec.linear("b2", Unit.DIMENSIONLESS),
                    ParameterSpec.linear("b3", Unit.DIMENSIONLESS), ParameterSpec.linear("b4", Unit.DIMENSIONLESS),
                    ParameterSpec.linear("b5", Unit.DIMENSIONLESS));
        }

        @Override
        public int size() {
            return MGH17_Y.length;
        }

        @Override
        public boolean hasJacobian() {
            return analytic;
        }

        @Override
        public void evaluate(double[] b, double[] values, double[] jac) {
            for (int i = 0; i < values.length; i++) {
                double x = 10.0 * i;
                double e4 = Math.exp(-b[3] * x);
                double e5 = Math.exp(-b[4] * x);
                values[i] = b[0] + b[1] * e4 + b[2] * e5;
                if (jac != null) {
                    jac[i * 5] = 1;
                    jac[i * 5 + 1] = e4;
                    jac[i * 5 + 2] = e5;
                    jac[i * 5 + 3] = -b[1] * x * e4;
                    jac[i * 5 + 4] = -b[2] * x * e5;
                }
            }
        }
    }

    private static FitResult fitMgh17(boolean analytic, double[] start) {
        ModelFit.Options options = ModelFit.Options.defaults().withProfiles(false).withTolerance(1e-14)
                .withMaxEvaluations(5000);
        return ModelFit.fit(new Mgh17(analytic), FitData.unweighted(MGH17_Y), List.of(start), options, Progress.NONE);
    }

    @Test
    void mgh17FromStartTwoGivesCertifiedValuesAndStandardDeviations() {
        FitResult fit = fitMgh17(true, new double[] {0.5, 1.5, -1, 0.01, 0.02});
        assertTrue(fit.converged(), fit.reason());
        for (int j = 0; j < 5; j++) {
            ParameterEstimate e = fit.parameters().get(j);
            // REF: NIST StRD MGH17 certified values [published: NIST StRD MGH17.dat]; sheet s8.4
            assertEquals(MGH17_B[j], e.value(), 1e-6 * Math.abs(MGH17_B[j]), "MGH17 b" + (j + 1));
            // REF: NIST StRD MGH17 certified standard deviations [published: NIST StRD MGH17.dat]; sheet s8.4
            assertEquals(MGH17_SD[j], e.standardError(), 1e-6 * MGH17_SD[j], "MGH17 sd of b" + (j + 1));
        }
        // REF: NIST StRD MGH17 certified residual sum of squares [published: NIST StRD MGH17.dat]; sheet s8.4
        assertEquals(5.4648946975E-05, fit.chiSquare(), 1e-6 * 5.4648946975E-05, "MGH17 RSS");
        // REF: derived check value for this sheet, 95% CI of b4 [published: NIST StRD + t(0.975, 28)]; sheet s8.4
        ParameterEstimate b4 = fit.parameters().get(3);
        assertEquals(0.01194859, b4.ci95().lower(), 1e-7, "MGH17 b4 CI lower");
        assertEquals(0.01378648, b4.ci95().upper(), 1e-7, "MGH17 b4 CI upper");
        // REF: AIC/AICc/BIC with K = p + 1 = 6 at the certified RSS, n = 33 [common practice: sheet s8.3]; sheet s8.4
        assertEquals(-427.2659, fit.aic(), 1e-3, "AIC");
        assertEquals(-424.0351, fit.aicc(), 1e-3, "AICc");
        assertEquals(-418.2869, fit.bic(), 1e-3, "BIC");
    }

    @Test
    void mgh17WithFiniteDifferenceJacobianAgrees() {
        FitResult fit = fitMgh17(false, new double[] {0.5, 1.5, -1, 0.01, 0.02});
        assertTrue(fit.converged(), fit.reason());
        for (int j = 0; j < 5; j++) {
            ParameterEstimate e = fit.parameters().get(j);
            // REF: NIST StRD MGH17 certified values [published: NIST StRD MGH17.dat]; sheet s8.4
            assertEquals(MGH17_B[j], e.value(), 1e-5 * Math.abs(MGH17_B[j]), "MGH17 b" + (j + 1));
            // Forward differences lose about half the digits in the Jacobian, hence 1e-4 on the SDs.
            // REF: NIST StRD MGH17 certified standard deviations [published: NIST StRD MGH17.dat]; sheet s8.4
            assertEquals(MGH17_SD[j], e.standardError(), 1e-4 * MGH17_SD[j], "MGH17 sd of b" + (j + 1));
        }
    }

    @Test
    void mgh17FromStartOneIsRightOrSaysItFailed() {
        FitResult fit = fitMgh17(true, new double[] {50, 150, -100, 1, 2});
        if (fit.converged()) {
            boolean right = true;
            for (int j = 0; j < 5; j++) {
                right &= Math.abs(fit.parameters().get(j).value() - MGH17_B[j]) <= 1e-6 * Math.abs(MGH17_B[j]);
            }
            // A converged fit far from the certified values must at least have a worse RSS, never a silent tie.
            // REF: NIST StRD MGH17 certified RSS [published: NIST StRD MGH17.dat]; sheet s8.4
            assertTrue(right || fit.chiSquare() > 1.01 * 5.4648946975E-05,
                    "a converged fit is either the certified one or visibly worse; RSS " + fit.chiSquare());
        } else {
            assertTrue(!fit.reason().isBlank(), "a failed fit says why");
        }
    }

    @Test
    void studentQuantilesMatchTables() {
        // REF: t(0.975, df) tables, Abramowitz & Stegun ch. 26 [published: standard tables]; sheet s8.2
        assertEquals(12.70620, ModelFit.tQuantile(1), 1e-5);
        assertEquals(2.570582, ModelFit.tQuantile(5), 1e-6);
        assertEquals(2.228139, ModelFit.tQuantile(10), 1e-6);
        assertEquals(2.048407, ModelFit.tQuantile(28), 1e-6);
    }
}
