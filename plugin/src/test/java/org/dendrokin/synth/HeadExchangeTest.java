package org.dendrokin.synth;

import static org.junit.jupiter.api.Assertions.assertEquals;

import java.util.function.DoubleUnaryOperator;

import org.apache.commons.math3.ode.FirstOrderDifferentialEquations;
import org.apache.commons.math3.ode.nonstiff.DormandPrince853Integrator;
import org.junit.jupiter.api.Test;

/** The spine head's two-compartment exchange against a closed form and an independent ODE integrator. */
class HeadExchangeTest {
    @Test
    void stimulatedHeadEmptiesIntoARestingShaft() {
        double tau = 0.4;
        double kHead = 0.1;
        double[] times = new double[50];
        for (int j = 0; j < times.length; j++) {
            times[j] = 0.1 * j;
        }
        double[] c = HeadExchange.integrate(t -> 0, tau, kHead, 0.73, 2.0, times);
        for (int j = 0; j < times.length; j++) {
            // REF: dc/dt = -(1/tau + k) c, c = c0 exp(-(1/tau + k)(t - t0)) [common practice: first-order kinetics]
            double expected = times[j] < 0.73 ? 0 : 2.0 * Math.exp(-(1 / tau + kHead) * (times[j] - 0.73));
            assertEquals(expected, c[j], 1e-12, "head dF/F0 at t = " + times[j]);
        }
    }

    @Test
    void headFollowsAPassingPulseAsCommonsMathIntegratesIt() {
        double tau = 1.3;
        double kHead = 0.05;
        double t0 = 2.25;
        SignalField.Pulse pulse = new SignalField.Pulse(0.7, kHead, 1.0, 1.5, t0, 10);
        double base = 12.5;   // um along the axis: 2.5 um from the release
        DoubleUnaryOperator shaft = t -> pulse.value(base, t);
        double[] times = new double[161];
        for (int j = 0; j < times.length; j++) {
            times[j] = 0.0625 * j;
        }
        double kick = 0.8;
        double[] c = HeadExchange.integrate(shaft, tau, kHead, t0, kick, times);
        FirstOrderDifferentialEquations ode = new FirstOrderDifferentialEquations() {
            @Override
            public int getDimension() {
                return 1;
            }

            @Override
            public void computeDerivatives(double t, double[] y, double[] dy) {
                dy[0] = (shaft.applyAsDouble(t) - y[0]) / tau - kHead * y[0];
            }
        };
        // REF: Commons Math DormandPrince853Integrator, tolerances 1e-12, an independent integrator [common practice]
        DormandPrince853Integrator reference = new DormandPrince853Integrator(1e-8, 1, 1e-13, 1e-12);
        double[] y = {kick};
        double t = t0;
        for (int j = 0; j < times.length; j++) {
            if (times[j] <= t0) {
                continue;
            }
            reference.integrate(ode, t, y, times[j], y);
            t = times[j];
            // The exponential integrator is exact for a shaft value linear over each sub-step (<= tau / 8 and an
            // eighth of the 0.0625 s spacing); the pulse's curvature leaves errors of order 1e-7.
            assertEquals(y[0], c[j], 1e-6, "head dF/F0 at t = " + times[j]);
        }
    }
}
