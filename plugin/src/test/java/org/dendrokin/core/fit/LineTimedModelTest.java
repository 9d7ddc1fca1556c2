package org.dendrokin.core.fit;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.List;
import java.util.Random;

import org.dendrokin.core.Progress;
import org.dendrokin.core.kymo.Kymograph;
import org.dendrokin.core.units.Unit;
import org.junit.jupiter.api.Test;

class LineTimedModelTest {
    private static final int NX = 60;
    private static final int NT = 80;

    /** A model linear in time, m = a + b t + c x, on frames 0..NT (one appended). */
    private static FitModel linearInTime(double[] times, double[] x) {
        return new FitModel() {
            @Override
            public String name() {
                return "linear";
            }

            @Override
            public List<ParameterSpec> parameters() {
                return List.of(ParameterSpec.linear("a", Unit.DIMENSIONLESS), ParameterSpec.linear("b", Unit.RATE),
                        ParameterSpec.linear("c", Unit.DIMENSIONLESS));
            }

            @Override
            public int size() {
                return times.length * x.length;
            }

            @Override
            public void evaluate(double[] th, double[] values, double[] jacobian) {
                for (int f = 0; f < times.length; f++) {
                    for (int p = 0; p < x.length; p++) {
                        int i = f * x.length + p;
                        values[i] = th[0] + th[1] * times[f] + th[2] * x[p];
                        if (jacobian != null) {
                            jacobian[3 * i] = 1;
                            jacobian[3 * i + 1] = times[f];
                            jacobian[3 * i + 2] = x[p];
                        }
                    }
                }
            }
        };
    }

    @Test
    void aModelLinearInTimeIsReadExactlyAtEachSamplesOwnTime() {
        double[] t = new double[NT];
        double[] x = new double[NX];
        double[] delays = new double[NX];
        for (int f = 0; f < NT; f++) {
            t[f] = 0.25 * f;
        }
        for (int p = 0; p < NX; p++) {
            x[p] = 0.5 * p;
            delays[p] = 0.24 * p / NX;
        }
        LineTimedModel m = new LineTimedModel(linearInTime(LineTimedModel.extendedTimes(t), x), t, delays);
        double[] theta = {0.3, -1.7, 0.05};
        double[] v = new double[m.size()];
        double[] j = new double[m.size() * 3];
        m.evaluate(theta, v, j);
        double[] r = new double[10 * 3];
        double[] vr = new double[10];
        m.evaluateRange(theta, 2 * NX + 55, 2 * NX + 65, vr, r);
        for (int f = 0; f < NT; f++) {
            for (int p = 0; p < NX; p++) {
                int i = f * NX + p;
                // REF: linear interpolation is exact for a function linear in time [common practice]
                assertEquals(0.3 - 1.7 * (t[f] + delays[p]) + 0.05 * x[p], v[i], 1e-12);
                assertEquals(t[f] + delays[p], j[3 * i + 1], 1e-12, "d value / d b is the sample's own time");
            }
        }
        for (int i = 0; i < 10; i++) {
            assertEquals(v[2 * NX + 55 + i], vr[i], 1e-15, "range evaluation agrees with the whole grid");
        }
    }

    @Test
    void theDiffusionDecayFitOfARasterScannedPulseRecoversDAndKWithTheDelays() {
        // Crank (1975) eq. 2.6 with first-order decay, sampled at each position's own time t_f + delta_p, where
        // delta_p grows along the path as if the path ran down a frame scanned in 90% of the frame interval.
        double dTrue = 4;
        double kTrue = 0.3;
        double s0 = 1.0;
        double t0 = 2.0;
        double x0 = 10.0;
        double dt = 0.25;
        double[] t = new double[NT];
        double[] x = new double[NX];
        double[] delays = new double[NX];
        for (int f = 0; f < NT; f++) {
            t[f] = dt * f;
        }
        for (int p = 0; p < NX; p++) {
            x[p] = 0.5 * p;
            delays[p] = 0.9 * dt * p / NX;
        }
        Random rng = new Random(7);
        double[] v = new double[NX * NT];
        for (int f = 0; f < NT; f++) {
            for (int p = 0; p < NX; p++) {
                double tau = t[f] + delays[p] - t0;
                double u = 0;
                if (tau >= 0) {
                    double var = s0 * s0 + 2 * dTrue * tau;
                    u = 1.5 * s0 / Math.sqrt(var) * Math.exp(-(x[p] - x0) * (x[p] - x0) / (2 * var) - kTrue * tau);
                }
                v[f * NX + p] = u + 0.01 * rng.nextGaussian();
            }
        }
        Kymograph k = new Kymograph(x, t, v, "dF/F0").withSampleDelays(delays);
        KymographFits.Setup setup = KymographFits.Setup.of(t0, x0).withModels(List.of("diffusion-decay"));
        FitResult timed = KymographFits.fit(k, setup, Progress.NONE).fit("diffusion-decay").orElseThrow();
        assertTrue(timed.converged(), timed.reason());
        ParameterEstimate d = timed.estimate("D").orElseThrow();
        ParameterEstimate rate = timed.estimate("k").orElseThrow();
        // REF: the values that made the data (Crank 1975, eq. 2.6, with decay exp(-k t)) [published]
        assertTrue(d.ci95().lower() <= dTrue && dTrue <= d.ci95().upper(), "D " + d.value() + " " + d.ci95());
        assertTrue(rate.ci95().lower() <= kTrue && kTrue <= rate.ci95().upper(), "k " + rate.value() + " " + rate.ci95());
    }
}
