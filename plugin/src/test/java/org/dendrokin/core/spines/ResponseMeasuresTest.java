package org.dendrokin.core.spines;

import static org.junit.jupiter.api.Assertions.assertEquals;

import org.junit.jupiter.api.Test;

/** Model-free measures of a head's response. */
class ResponseMeasuresTest {
    @Test
    void decayTimeOfAnExponentialIsItsTimeConstant() {
        // REF: exp(-t / tau) falls to 1/e at t = tau [common practice]; the 3-frame average shifts it by under a frame
        int n = 4000;
        double dt = 0.001;
        double tau = 0.8;
        double ts = 0.5;
        double[] t = new double[n];
        double[] y = new double[n];
        for (int f = 0; f < n; f++) {
            t[f] = f * dt;
            y[f] = t[f] < ts - 1e-12 ? 0 : 2 * Math.exp(-(t[f] - ts) / tau);
        }
        ResponseMeasures m = ResponseMeasures.of(t, y, ts);
        assertEquals(2, m.peak(), 0.01, "peak");
        assertEquals(0, m.timeToPeakS(), 2 * dt, "time to peak (s)");
        assertEquals(tau, m.decayTimeS(), 2 * dt, "decay time (s)");
    }
}
