package org.dendrokin.core.fit;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.List;
import java.util.Random;

import org.dendrokin.core.model.Boundary;
import org.dendrokin.core.model.Domain;
import org.dendrokin.core.model.ScalarRun;
import org.dendrokin.core.model.SolverSettings;
import org.dendrokin.core.model.Stimulus;
import org.dendrokin.core.units.Unit;
import org.junit.jupiter.api.Test;

/**
 * The engine fit model's derivatives: its forward-difference Jacobian against the engine's exact forward
 * sensitivities, and its one-pass normal equations against sums formed from its own values and Jacobian.
 */
class EngineFitModelTest {
    private static final double STEP_S = 0.1;

    private static double[] range(double first, double step, int count) {
        double[] v = new double[count];
        for (int i = 0; i < count; i++) {
            v[i] = first + step * i;
        }
        return v;
    }

    @Test
    void forwardDifferencesAgreeWithTheEnginesExactSensitivities() {
        Domain domain = new Domain(30, 0.5, Boundary.NO_FLUX);
        double[] x = range(0, 0.5, 61);
        double[] t = range(0, 0.5, 41);
        List<Stimulus> pulse = List.of(Stimulus.pulse(2, 6, 1.5, 1.0));
        EngineFitModel model = new EngineFitModel("nagumo", domain, t, x, pulse, STEP_S, Unit.DF_F0);
        double[] p = {1.1, 0.6, 0.22, 1.4, 0.05};
        int n = model.size();
        int np = p.length;
        double[] values = new double[n];
        double[] jac = new double[n * np];
        model.evaluate(p, values, jac);

        ScalarRun run = ScalarRun.prepare("nagumo", domain, t, x, pulse,
                SolverSettings.DEFAULT.withFixedStepS(STEP_S));
        double[] u = new double[n];
        double[][] sens = new double[3][n];
        run.solveWithSensitivities(new double[] {p[0], p[1], p[2]}, u, sens);
        for (int j = 0; j < 3; j++) {
            double scale = 0;
            double err = 0;
            for (int g = 0; g < n; g++) {
                double exact = p[3] * sens[j][g];
                scale = Math.max(scale, Math.abs(exact));
                err = Math.max(err, Math.abs(jac[g * np + j] - exact));
            }
            // REF: a forward difference with relative step h has error O(h) times the second derivative
            // (common practice); the engine's forward sensitivities are its exact derivatives
            assertTrue(err < 1e-5 * scale, "column " + j + ": max difference " + err + " of scale " + scale);
        }
        for (int g = 0; g < n; g++) {
            assertEquals(p[4] + p[3] * u[g], values[g], 1e-12, "value at " + g);
            assertEquals(u[g], jac[g * np + 3], 1e-12, "amplitude column at " + g);
            assertEquals(1, jac[g * np + 4], 0, "baseline column at " + g);
        }
    }

    @Test
    void theOnePassNormalEquationsEqualSumsOverTheFullJacobian() {
        Domain domain = new Domain(30, 0.5, Boundary.NO_FLUX);
        double[] x = range(0, 0.5, 61);
        double[] t = range(0, 0.5, 41);
        List<Stimulus> pulse = List.of(Stimulus.pulse(2, 6, 1.5, 1.0));
        EngineFitModel model = new EngineFitModel("nagumo", domain, t, x, pulse, STEP_S, Unit.DF_F0);
        int n = model.size();
        int np = 5;
        double[] truth = {1.0, 0.5, 0.2, 1.5, 0.0};
        double[] y = new double[n];
        model.evaluate(truth, y, null);
        Random random = new Random(41);
        double[] sigma = new double[n];
        for (int g = 0; g < n; g++) {
            sigma[g] = 0.05 + 0.05 * (g % 61) / 60.0;
            y[g] += sigma[g] * random.nextGaussian();
        }
        y[17] = Double.NaN;   // a missing sample is left out of every sum
        FitData data = new FitData(y, sigma);
        double[] p = {1.2, 0.45, 0.25, 1.3, 0.02};
        NormalEquations ne = new NormalEquations(np);
        double[] fitted = new double[n];
        model.normalEquations(p, data, ne, fitted);

        double[] values = new double[n];
        double[] jac = new double[n * np];
        model.evaluate(p, values, jac);
        double[][] a = new double[np][np];
        double[] grad = new double[np];
        double chi = 0;
        for (int i = 0; i < data.usedCount(); i++) {
            int g = data.usedIndex(i);
            double w = data.weight(g);
            double r = data.value(g) - values[g];
            chi += w * r * r;
            for (int j = 0; j < np; j++) {
                grad[j] += w * jac[g * np + j] * r;
                for (int k = 0; k < np; k++) {
                    a[j][k] += w * jac[g * np + j] * jac[g * np + k];
                }
            }
        }
        assertEquals(n - 1, data.usedCount());
        // REF: J^T W J, J^T W r and chi^2 by their definitions (Levenberg 1944; Marquardt 1963), sheet s8.1
        assertEquals(chi, ne.chiSquare(), 1e-10 * chi, "chi^2");
        for (int j = 0; j < np; j++) {
            assertEquals(grad[j], ne.gradient(j), 1e-9 * Math.sqrt(a[j][j] * chi), "gradient " + j);
            for (int k = 0; k < np; k++) {
                assertEquals(a[j][k], ne.matrix(j, k), 1e-9 * Math.sqrt(a[j][j] * a[k][k]), "matrix " + j + "," + k);
            }
        }
        for (int g = 0; g < n; g++) {
            assertEquals(values[g], fitted[g], 1e-12, "fitted value at " + g);
        }
    }
}
