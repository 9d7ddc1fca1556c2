package org.dendrokin.core.spines;

import static org.junit.jupiter.api.Assertions.assertEquals;

import org.dendrokin.core.kymo.Kymograph;
import org.junit.jupiter.api.Test;

/** The head's response to simple shaft signals against the closed-form solutions of dc/dt = (u - c)/tau - k c. */
class NeckExchangeModelTest {
    private static final double DT = 0.05;
    private static final int N = 80;

    private static double[] times() {
        double[] t = new double[N];
        for (int f = 0; f < N; f++) {
            t[f] = f * DT;
        }
        return t;
    }

    /** One kymograph column holding u at every frame: the driver then returns u itself. */
    private static ShaftDriver driver(double[] times, double[] u) {
        double[][] rows = new double[times.length][1];
        for (int f = 0; f < times.length; f++) {
            rows[f][0] = u[f];
        }
        return new ShaftDriver(Kymograph.ofRows(new double[] {0}, times, rows, "dF/F0"), 0, 0, 0.3);
    }

    @Test
    void stepOfTheShaftBetweenFramesIsFollowedExponentially() {
        // REF: first-order linear ODE with a step input, c = U/(1 + k tau) (1 - exp(-(1/tau + k)(t - ts)))
        // [common practice: textbook solution]
        double[] t = times();
        double ts = 1.013;
        double level = 2.0;
        double tau = 0.3;
        double k = 0.4;
        double[] u = new double[N];
        for (int f = 0; f < N; f++) {
            u[f] = t[f] >= ts ? level : 0;
        }
        NeckExchangeModel m = new NeckExchangeModel(t, driver(t, u), 0, 0.5, ts, k, false);
        double[] c = new double[N];
        m.filter(tau, u, c, null);
        double rate = 1 / tau + k;
        for (int f = 0; f < N; f++) {
            double expected = t[f] < ts ? 0 : level / (1 + k * tau) * (1 - Math.exp(-rate * (t[f] - ts)));
            assertEquals(expected, c[f], 1e-12, "frame " + f);
        }
    }

    @Test
    void rampOfTheShaftIsFollowedWithALagOfTau() {
        // REF: dc/dt = (a t - c)/tau, c(0) = 0: c = a (t - tau (1 - exp(-t/tau))) [common practice: textbook solution]
        double[] t = times();
        double a = 1.5;
        double tau = 0.02;
        double[] u = new double[N];
        for (int f = 0; f < N; f++) {
            u[f] = a * t[f];
        }
        NeckExchangeModel m = new NeckExchangeModel(t, driver(t, u), 0, 0.5, Double.NaN, 0, false);
        double[] c = new double[N];
        m.filter(tau, u, c, null);
        for (int f = 0; f < N; f++) {
            assertEquals(a * (t[f] - tau * (1 - Math.exp(-t[f] / tau))), c[f], 1e-12, "frame " + f);
        }
    }

    @Test
    void jumpOfAStimulatedHeadLeavesWithTheExchangeRate() {
        // REF: dc/dt = -c/tau - k c after a jump J: c = J exp(-(1/tau + k) t) [common practice: textbook solution]
        double[] t = times();
        double ts = 1.0;
        double[] u = new double[N];
        NeckExchangeModel m = new NeckExchangeModel(t, driver(t, u), 0, 0.5, ts, 0.2, true);
        double tau = 0.4;
        double[] p = {tau, 0, 1, 0.1, 0, 3};
        double[] y = new double[m.size()];
        m.evaluate(p, y, null);
        for (int f = 0; f < N; f++) {
            double expected = 0.1 + (t[f] >= ts - 1e-12 ? 3 * Math.exp(-(1 / tau + 0.2) * (t[f] - ts)) : 0);
            assertEquals(expected, y[f], 1e-12, "frame " + f);
        }
    }

    @Test
    void jacobianMatchesCentralDifferences() {
        // REF: central finite differences, error O(h^2) [common practice]
        double[] t = times();
        double[] xs = {-1, -0.5, 0, 0.5, 1};
        double[][] rows = new double[N][xs.length];
        for (int f = 0; f < N; f++) {
            for (int q = 0; q < xs.length; q++) {
                double since = t[f] - 1;
                rows[f][q] = since < 0 ? 0 : Math.exp(-xs[q] * xs[q] / (0.5 + 2 * since)) / Math.sqrt(1 + 4 * since);
            }
        }
        ShaftDriver shaft = new ShaftDriver(Kymograph.ofRows(xs, t, rows, "dF/F0"), -0.5, 0.5, 0.3);
        NeckExchangeModel m = new NeckExchangeModel(t, shaft, 0.1, 0.3, 1.0, 0.1, true);
        double[] p = {0.35, 0.12, 0.9, 0.02, 0.05, 1.5};
        int np = p.length;
        double[] jac = new double[m.size() * np];
        double[] y = new double[m.size()];
        m.evaluate(p, y, jac);
        for (int j = 0; j < np; j++) {
            double h = 1e-6 * Math.max(1, Math.abs(p[j]));
            double[] plus = p.clone();
            double[] minus = p.clone();
            plus[j] += h;
            minus[j] -= h;
            double[] yp = new double[m.size()];
            double[] ym = new double[m.size()];
            m.evaluate(plus, yp, null);
            m.evaluate(minus, ym, null);
            for (int g = 0; g < m.size(); g++) {
                assertEquals((yp[g] - ym[g]) / (2 * h), jac[g * np + j], 1e-6, "parameter " + j + ", point " + g);
            }
        }
    }
}
