package org.dendrokin.core.fit;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.List;

import org.dendrokin.core.model.Boundary;
import org.dendrokin.core.model.Domain;
import org.dendrokin.core.model.ScalarRun;
import org.dendrokin.core.model.SolverSettings;
import org.dendrokin.core.model.Stimulus;
import org.dendrokin.core.units.Unit;
import org.junit.jupiter.api.Test;

class DiffusionDecayPulseTest {
    @Test
    void matchesTheGaussianPulseWorkedExample() {
        // one point: x = x0, t - t0 = 1 s; peak A s0 / sqrt(V) with A = 1 / sqrt(2 pi s0^2) gives sheet (2.2) with M = 1
        double s0 = 0.5;
        double a = 1 / Math.sqrt(2 * Math.PI * s0 * s0);
        DiffusionDecayPulse m = new DiffusionDecayPulse(new double[] {0, 1}, new double[] {1}, 0, 0, null, Unit.DF_F0);
        double[] v = new double[2];
        m.evaluate(m.pack(1, 0, a, 0, s0, 0, 0), v, null);
        // REF: Crank 1975 Gaussian pulse, M = 1, s0 = 0.5, D = 1, t = 1: peak 0.2659615 [published formula]; sheet s2.2
        assertEquals(0.2659615, v[0], 1e-7, "peak of the spread pulse");
        // REF: same, x = 1 um: M / sqrt(2 pi 2.25) exp(-1 / 4.5) [published formula]; sheet s2.2
        assertEquals(0.2659615 * Math.exp(-1 / 4.5), v[1], 1e-7, "value 1 um from the peak");
    }

    @Test
    void decayMultipliesByExpMinusKt() {
        // plane-source limit: s0 tiny, M = A s0 sqrt(2 pi)
        double s0 = 1e-6;
        double a = 1 / (s0 * Math.sqrt(2 * Math.PI));
        DiffusionDecayPulse m = new DiffusionDecayPulse(new double[] {1}, new double[] {1}, 0, 0, null, Unit.DF_F0);
        double[] v = new double[1];
        m.evaluate(m.pack(1, 0.5, a, 0, s0, 0, 0), v, null);
        // REF: plane source with decay, M = 1, D = 1, t = 1, x = 1, k = 0.5: 0.1332521 [published formula]; sheet s2.1, s2.3
        assertEquals(0.1332521, v[0], 1e-7, "plane source with decay");
    }

    @Test
    void analyticJacobianAgreesWithCentralDifferences() {
        double[] x = grid(0, 20, 41);
        double[] t = grid(0, 10, 21);
        for (double[] walls : new double[][] {null, {0, 20}}) {
            DiffusionDecayPulse m = new DiffusionDecayPulse(x, t, Double.NaN, Double.NaN, walls, Unit.DF_F0);
            double[] p = m.pack(0.8, 0.07, 1.3, 6.5, 1.2, 0.1, 1.7);
            int np = p.length;
            double[] v = new double[m.size()];
            double[] jac = new double[m.size() * np];
            m.evaluate(p, v, jac);
            for (int j = 0; j < np; j++) {
                double h = 1e-6 * Math.max(1, Math.abs(p[j]));
                double[] up = p.clone();
                double[] dn = p.clone();
                up[j] += h;
                dn[j] -= h;
                double[] vu = new double[m.size()];
                double[] vd = new double[m.size()];
                m.evaluate(up, vu, null);
                m.evaluate(dn, vd, null);
                for (int g = 0; g < m.size(); g++) {
                    if (Math.abs(t[g / x.length] - p[np - 1]) < 0.01) {
                        continue;  // the switch-on frame is not differentiable in t0
                    }
                    double fd = (vu[g] - vd[g]) / (2 * h);
                    // REF: central differences, error O(h^2) [common practice]
                    assertEquals(fd, jac[g * np + j], 1e-6 * (1 + Math.abs(fd)),
                            "d value / d " + m.parameters().get(j).name() + " at grid point " + g);
                }
            }
        }
    }

    @Test
    void sealedEndsMatchTheEngineOnAShortDendrite() {
        // A pulse 5 widths from a sealed end of a 20 um dendrite (so the engine loses no tail at the start): the images must reproduce the engine's reflection.
        double lengthUm = 20;
        double[] x = grid(0, lengthUm, 41);
        double[] t = grid(0, 20, 21);
        double d = 1.0;
        double k = 0.05;
        double s0 = 1.0;
        ScalarRun run = ScalarRun.prepare("diffusion-decay", new Domain(lengthUm, 0.05, Boundary.NO_FLUX), t, x,
                List.of(Stimulus.pulse(2.0, 5.0, s0, 1.0)), SolverSettings.DEFAULT.withFixedStepS(0.005));
        double[] engine = new double[x.length * t.length];
        run.solve(new double[] {d, k}, engine);
        DiffusionDecayPulse m = new DiffusionDecayPulse(x, t, 2.0, 5.0, new double[] {0, lengthUm}, Unit.DF_F0);
        double[] closed = new double[m.size()];
        m.evaluate(m.pack(d, k, 1.0, 5.0, s0, 0, 2.0), closed, null);
        double maxErr = 0;
        for (int g = 0; g < closed.length; g++) {
            maxErr = Math.max(maxErr, Math.abs(closed[g] - engine[g]));
        }
        // REF: Crank 1975 method of images for a sealed end [published formula]; sheet s2.2, s2.3
        // Second-order engine at h = 0.05 um, dt = 5 ms: errors of order 1e-4 of the unit peak.
        assertTrue(maxErr < 2e-3, "max |closed form - engine| = " + maxErr);
        DiffusionDecayPulse open = new DiffusionDecayPulse(x, t, 2.0, 5.0, null, Unit.DF_F0);
        double[] openValues = new double[m.size()];
        open.evaluate(open.pack(d, k, 1.0, 5.0, s0, 0, 2.0), openValues, null);
        double openErr = 0;
        for (int g = 0; g < closed.length; g++) {
            openErr = Math.max(openErr, Math.abs(openValues[g] - engine[g]));
        }
        assertTrue(openErr > 10 * maxErr, "without images the sealed end is missed: " + openErr + " vs " + maxErr);
    }

    @Test
    void onePassNormalEquationsAgreeWithTheJacobianOfEvaluate() {
        double[] even = grid(0, 20, 81);
        double[] uneven = even.clone();
        for (int c = 0; c < uneven.length; c++) {
            uneven[c] += 0.03 * Math.sin(c);   // columns not evenly spaced: exact exponentials instead of the recurrence
        }
        double[] t = grid(0, 12, 25);
        for (double[] x : new double[][] {even, uneven}) {
            for (double[] walls : new double[][] {null, {0, 20}}) {
                for (double t0 : new double[] {1.7, Double.NaN}) {
                    for (double x0 : new double[] {6.5, Double.NaN}) {
                        check(new DiffusionDecayPulse(x, t, t0, x0, walls, Unit.DF_F0), walls != null);
                    }
                }
            }
        }
    }

    @Test
    void rangesAgreeWithTheWholeGrid() {
        double[] even = grid(0, 20, 81);
        double[] uneven = even.clone();
        for (int c = 0; c < uneven.length; c++) {
            uneven[c] += 0.03 * Math.sin(c);
        }
        double[] t = grid(0, 12, 25);
        for (double[] x : new double[][] {even, uneven}) {
            for (double[] walls : new double[][] {null, {0, 20}}) {
                for (double t0 : new double[] {1.7, Double.NaN}) {
                    DiffusionDecayPulse m = new DiffusionDecayPulse(x, t, t0, Double.NaN, walls, Unit.DF_F0);
                    int np = m.parameters().size();
                    double[] p = m.pack(0.8, 0.07, 1.3, 6.5, 0.9, 0.1, 1.7);
                    double[] values = new double[m.size()];
                    double[] jac = new double[m.size() * np];
                    m.evaluate(p, values, jac);
                    // whole frames, and ranges that start and end inside frames
                    for (int[] r : new int[][] {{0, m.size()}, {81 * 3, 81 * 4}, {40, 81 * 7 + 13}, {500, 501}}) {
                        double[] v = new double[r[1] - r[0]];
                        double[] j = new double[v.length * np];
                        m.evaluateRange(p, r[0], r[1], v, j);
                        for (int i = r[0]; i < r[1]; i++) {
                            // REF: the same closed form through its exact Gaussians and through the recurrence [common practice]
                            assertEquals(values[i], v[i - r[0]], 1e-12 * (1 + Math.abs(values[i])), "value " + i);
                            for (int a = 0; a < np; a++) {
                                double want = jac[i * np + a];
                                assertEquals(want, j[(i - r[0]) * np + a], 1e-10 * (1 + Math.abs(want)),
                                        "d value " + i + " / d " + m.parameters().get(a).name());
                            }
                        }
                    }
                }
            }
        }
    }

    @Test
    void onePassSumsDoNotDependOnHowTheBlocksAreScheduled() {
        // enough frames for several blocks summed in parallel; the blocks are added in a fixed order
        double[] x = grid(0, 40, 161);
        double[] t = grid(0, 60, 241);
        DiffusionDecayPulse m = new DiffusionDecayPulse(x, t, 1.0, Double.NaN, new double[] {0, 40}, Unit.DF_F0);
        double[] y = new double[m.size()];
        m.evaluate(m.pack(0.6, 0.05, 1.5, 12, 1.1, 0.12, 1.0), y, null);
        double[] sigma = new double[m.size()];
        java.util.Arrays.fill(sigma, 0.05);
        FitData data = new FitData(y, sigma);
        double[] p = m.pack(0.7, 0.04, 1.4, 12.5, 1.0, 0.1, 1.0);
        NormalEquations first = new NormalEquations(p.length);
        m.normalEquations(p, data, first, null);
        for (int repeat = 0; repeat < 5; repeat++) {
            NormalEquations again = new NormalEquations(p.length);
            m.normalEquations(p, data, again, null);
            // REF: reproducible results from seeded, fixed-order computations [common practice]
            assertEquals(first.chiSquare(), again.chiSquare(), 0.0, "chi^2 identical to the last bit");
            for (int a = 0; a < p.length; a++) {
                assertEquals(first.gradient(a), again.gradient(a), 0.0, "g identical to the last bit");
                for (int b = 0; b < p.length; b++) {
                    assertEquals(first.matrix(a, b), again.matrix(a, b), 0.0, "A identical to the last bit");
                }
            }
        }
    }

    private static void check(DiffusionDecayPulse m, boolean walls) {
        int np = m.parameters().size();
        double[] p = m.pack(0.8, 0.07, 1.3, 6.5, 0.9, 0.1, 1.7);
        double[] y = new double[m.size()];
        double[] sigma = new double[m.size()];
        java.util.Random random = new java.util.Random(7);
        double[] truth = new double[m.size()];
        m.evaluate(m.pack(0.6, 0.05, 1.5, 7.0, 1.1, 0.12, 1.5), truth, null);
        for (int g = 0; g < y.length; g++) {
            y[g] = g % 37 == 5 ? Double.NaN : truth[g] + 0.02 * random.nextGaussian();   // some points missing
            sigma[g] = 0.02 + 0.01 * (g % 3);
        }
        FitData data = new FitData(y, sigma);
        double[] values = new double[m.size()];
        double[] jac = new double[m.size() * np];
        m.evaluate(p, values, jac);
        NormalEquations expected = new NormalEquations(np);
        double[] row = new double[np];
        for (int i = 0; i < data.usedCount(); i++) {
            int g = data.usedIndex(i);
            System.arraycopy(jac, g * np, row, 0, np);
            expected.addPoint(row, 1 / (sigma[g] * sigma[g]), y[g] - values[g]);
        }
        NormalEquations got = new NormalEquations(np);
        double[] fitted = new double[m.size()];
        m.normalEquations(p, data, got, fitted);
        String what = m.parameters() + (walls ? " with sealed ends" : "");
        // REF: definition of the weighted normal equations A = J^T W J, g = J^T W r, chi^2 = r^T W r [common practice]
        assertEquals(expected.chiSquare(), got.chiSquare(), 1e-11 * expected.chiSquare(), "chi^2, " + what);
        for (int a = 0; a < np; a++) {
            double scaleA = Math.sqrt(expected.matrix(a, a));
            assertEquals(expected.gradient(a), got.gradient(a), 1e-11 * scaleA * Math.sqrt(expected.chiSquare()),
                    "g_" + a + ", " + what);
            for (int b = 0; b < np; b++) {
                double scale = scaleA * Math.sqrt(expected.matrix(b, b));
                assertEquals(expected.matrix(a, b), got.matrix(a, b), 1e-11 * scale, "A_" + a + b + ", " + what);
            }
        }
        for (int g = 0; g < values.length; g++) {
            assertEquals(values[g], fitted[g], 1e-12 * (1 + Math.abs(values[g])), "prediction at " + g + ", " + what);
        }
    }

    static double[] grid(double from, double to, int n) {
        double[] g = new double[n];
        for (int i = 0; i < n; i++) {
            g[i] = from + (to - from) * i / (n - 1);
        }
        return g;
    }
}
