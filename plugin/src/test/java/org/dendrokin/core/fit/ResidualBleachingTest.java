package org.dendrokin.core.fit;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.List;
import java.util.Random;

import org.dendrokin.core.Progress;
import org.dendrokin.core.units.Unit;
import org.junit.jupiter.api.Test;

/** The diffusion-decay model with the bleaching a correction left over: its derivatives and its recovery. */
class ResidualBleachingTest {
    private static final double[] X = grid(0, 0.25, 80);
    private static final double[] T = grid(0, 0.5, 120);

    private static double[] grid(double from, double step, int n) {
        double[] g = new double[n];
        for (int i = 0; i < n; i++) {
            g[i] = from + step * i;
        }
        return g;
    }

    private static ResidualBleaching model() {
        return new ResidualBleaching(new DiffusionDecayPulse(X, T, 5, 10, null, Unit.DF_F0), T, X.length, 2.5);
    }

    @Test
    void jacobianMatchesCentralDifferences() {
        ResidualBleaching m = model();
        DiffusionDecayPulse inner = new DiffusionDecayPulse(X, T, 5, 10, null, Unit.DF_F0);
        double[] theta = ResidualBleaching.start(inner.pack(0.6, 0.08, 1.4, 10, 1.1, 0.02, 5));
        theta[theta.length - 1] = 0.004;
        int p = theta.length;
        double[] values = new double[m.size()];
        double[] jac = new double[m.size() * p];
        m.evaluate(theta, values, jac);
        for (int c = 0; c < p; c++) {
            double h = 1e-6 * Math.max(1, Math.abs(theta[c]));
            double[] up = theta.clone();
            double[] dn = theta.clone();
            up[c] += h;
            dn[c] -= h;
            double[] vu = new double[m.size()];
            double[] vd = new double[m.size()];
            m.evaluate(up, vu, null);
            m.evaluate(dn, vd, null);
            for (int i = 0; i < m.size(); i += 97) {
                // REF: central differences of the model's own values [common practice]
                assertEquals((vu[i] - vd[i]) / (2 * h), jac[i * p + c], 1e-6 * Math.max(1, Math.abs(jac[i * p + c])),
                        "d value / d parameter " + c + " at point " + i);
            }
        }
    }

    @Test
    void aLeftoverBleachingIsRecoveredAndKeptOutOfTheDecayRate() {
        ResidualBleaching m = model();
        DiffusionDecayPulse inner = new DiffusionDecayPulse(X, T, 5, 10, null, Unit.DF_F0);
        double epsilon = 0.003;   // a correction 3e-3 1/s too weak
        double[] truth = ResidualBleaching.start(inner.pack(0.6, 0.08, 1.4, 10, 1.1, 0.0, 5));
        truth[truth.length - 1] = epsilon;
        double[] y = new double[m.size()];
        m.evaluate(truth, y, null);
        Random random = new Random(17);
        for (int i = 0; i < y.length; i++) {
            y[i] += 0.02 * random.nextGaussian();
        }
        FitData data = FitData.unweighted(y);
        List<double[]> starts = List.of(ResidualBleaching.start(inner.pack(0.5, 0.1, 1.2, 10, 1.0, 0.0, 5)));
        FitResult with = ModelFit.fit(m, data, starts, ModelFit.Options.defaults().withProfiles(false),
                Progress.NONE);
        FitResult without = ModelFit.fit(inner, data, List.of(inner.pack(0.5, 0.1, 1.2, 10, 1.0, 0.0, 5)),
                ModelFit.Options.defaults().withProfiles(false), Progress.NONE);
        // REF: parameter recovery on data made by the model itself with known truth [common practice]
        assertEquals(epsilon, with.estimate(ResidualBleaching.PARAMETER).orElseThrow().value(), 3e-4,
                "residual bleaching rate, 1/s");
        assertEquals(0.08, with.estimate("k").orElseThrow().value(), 0.004, "k with the leftover fitted, 1/s");
        assertTrue(Math.abs(without.estimate("k").orElseThrow().value() - 0.08)
                > 3 * Math.abs(with.estimate("k").orElseThrow().value() - 0.08), "without it, k takes up the leftover");
    }
}
