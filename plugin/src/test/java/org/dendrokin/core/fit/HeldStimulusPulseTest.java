package org.dendrokin.core.fit;

import static org.junit.jupiter.api.Assertions.assertEquals;

import java.util.Arrays;
import java.util.List;
import java.util.Random;

import org.dendrokin.core.Progress;
import org.dendrokin.core.kymo.Kymograph;
import org.dendrokin.core.units.Unit;
import org.junit.jupiter.api.Test;

/**
 * The held-stimulus sums against the general diffusion-decay model's: the same normal equations on open and sealed
 * dendrites, even and uneven columns, with missing samples and a baseline far from zero.
 */
class HeldStimulusPulseTest {

    @Test
    void normalEquationsEqualTheGeneralModelsSums() {
        double[][] cases = {
            // D, k, amplitude, width, baseline; evenly spaced (1) or not (0); sealed (1) or open (0)
            {0.5, 0.05, 1.5, 1.2, 0.1, 1, 0},
            {0.5, 0.05, 1.5, 1.2, 0.1, 1, 1},
            {2.0, 0.2, 0.3, 0.6, 25.0, 1, 0},
            {0.8, 0.01, 2.0, 1.0, -0.3, 0, 0},
            {0.8, 0.01, 2.0, 1.0, -0.3, 0, 1},
        };
        for (double[] c : cases) {
            double[] x = Synthetic.grid(0.4, 45);
            if (c[5] == 0) {
                for (int i = 0; i < x.length; i++) {
                    x[i] += 0.05 * Math.sin(i);   // columns of a resampled curved path are not evenly spaced
                }
            }
            double[] t = Synthetic.grid(0.5, 60);
            double[] walls = c[6] == 1 ? new double[] {x[0], x[x.length - 1]} : null;
            double t0 = 4.8;
            double x0 = 7.3;
            DiffusionDecayPulse general = new DiffusionDecayPulse(x, t, t0, x0, walls, Unit.DF_F0);
            HeldStimulusPulse held = new HeldStimulusPulse(x, t, t0, x0, walls, Unit.DF_F0);
            double[] truth = general.pack(c[0], c[1], c[2], x0, c[3], c[4], t0);
            double[] y = new double[general.size()];
            general.evaluate(truth, y, null);
            Random r = new Random(5);
            double[] sigma = new double[y.length];
            for (int i = 0; i < y.length; i++) {
                sigma[i] = 0.02 * (1 + (i % 45) / 45.0);
                y[i] += sigma[i] * r.nextGaussian();
                if (i % 97 == 0) {
                    y[i] = Double.NaN;
                }
            }
            FitData data = new FitData(y, sigma);
            // away from the truth, so that the gradient is not small
            double[] p = general.pack(c[0] * 1.3, c[1] * 0.7, c[2] * 0.9, x0, c[3] * 1.2, c[4] + 0.01, t0);
            NormalEquations a = new NormalEquations(5);
            NormalEquations b = new NormalEquations(5);
            general.normalEquations(p, data, a, null);
            held.normalEquations(p, data, b, null);
            String where = Arrays.toString(c);
            // REF: DiffusionDecayPulse's one-pass sums, themselves checked against its Jacobian [derived in the test of
            // that class]; the two share the Gaussian recurrence and differ in summation order only
            assertEquals(a.chiSquare(), b.chiSquare(), 1e-10 * a.chiSquare(), "chi^2, " + where);
            for (int i = 0; i < 5; i++) {
                assertEquals(a.gradient(i), b.gradient(i), 1e-9 * Math.sqrt(a.matrix(i, i) * a.chiSquare()),
                        "g_" + i + ", " + where);
                for (int j = 0; j < 5; j++) {
                    assertEquals(a.matrix(i, j), b.matrix(i, j), 1e-10 * Math.sqrt(a.matrix(i, i) * a.matrix(j, j)),
                            "A_" + i + j + ", " + where);
                }
            }
        }
    }

    @Test
    void aFitThroughItEqualsTheFitThroughTheGeneralModel() {
        Kymograph k = Synthetic.pulse(60, 120, 0.5, 0.5, 0.6, 0.03, 1.2, 15, 1.1, 0.05, 4.8, 0.05, 17);
        double[] sigma = new double[60];
        Arrays.fill(sigma, 0.05);
        FitData data = FitData.of(k, sigma);
        DiffusionDecayPulse general = new DiffusionDecayPulse(k.distancesUm(), k.timesS(), 4.8, 15, null, Unit.DF_F0);
        HeldStimulusPulse held = new HeldStimulusPulse(k.distancesUm(), k.timesS(), 4.8, 15, null, Unit.DF_F0);
        double[] start = general.pack(0.9, 0.02, 1.0, 15, 1.4, 0.0, 4.8);
        ModelFit.Options options = ModelFit.Options.defaults().withProfiles(false);
        FitResult a = ModelFit.fit(general, data, List.of(start), options, Progress.NONE);
        FitResult b = ModelFit.fit(held, data, List.of(start), options, Progress.NONE);
        for (int i = 0; i < 5; i++) {
            // REF: the same optimum through DiffusionDecayPulse, tested against Crank's pulse [published formula]
            assertEquals(a.values()[i], b.values()[i], 1e-6 * Math.abs(a.values()[i]) + 1e-9,
                    a.parameters().get(i).name());
        }
    }
}
