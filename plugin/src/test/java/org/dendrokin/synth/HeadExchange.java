package org.dendrokin.synth;

import java.util.function.DoubleUnaryOperator;

import org.dendrokin.core.Checks;

/**
 * A spine head exchanging with the shaft through its neck, a well-mixed compartment:
 * dc_h/dt = (c_d(t) - c_h) / tau - kHead c_h, with the shaft's value c_d at the spine's base given as a function of
 * time. Integrated exactly for c_d linear over each sub-step (exponential integrator):
 * <pre>
 *   c(t + h) = c(t) e^(-L h) + g0 (1 - e^(-L h)) / L
 *              + (g1 - g0) / h * (h (1 - e^(-L h)) / L - (1 - e^(-L h) (1 + L h)) / L^2)
 * </pre>
 * with L = 1/tau + kHead and g = c_d / tau at the sub-step's ends. Sub-steps are at most tau / 8 and an eighth of the
 * output spacing, and one ends exactly at the stimulus time, where a stimulated head's value jumps by {@code kick}.
 */
final class HeadExchange {
    private HeadExchange() {
    }

    /**
     * @param shaft    c_d(t), dimensionless; t in s
     * @param tauS     neck exchange time constant, s
     * @param kHead    decay rate inside the head, 1/s
     * @param kickTimeS stimulus time, s
     * @param kick     jump of the head's value at the stimulus time (0 for a head that was not stimulated)
     * @param times    output times, s, increasing. Not modified.
     * @return c_h at each output time; at times[0] the head is in equilibrium with the shaft's value there
     */
    static double[] integrate(DoubleUnaryOperator shaft, double tauS, double kHead, double kickTimeS, double kick,
            double[] times) {
        Checks.positiveFinite(tauS, "tauS");
        double lambda = 1 / tauS + kHead;
        double[] out = new double[times.length];
        double c = shaft.applyAsDouble(times[0]) / tauS / lambda;
        if (times[0] == kickTimeS) {
            c += kick;
        }
        out[0] = c;
        for (int j = 0; j + 1 < times.length; j++) {
            double t0 = times[j];
            double t1 = times[j + 1];
            if (kickTimeS > t0 && kickTimeS <= t1) {
                c = advance(shaft, c, t0, Math.nextDown(kickTimeS), tauS, lambda);
                c += kick;
                if (t1 > kickTimeS) {
                    c = advance(shaft, c, kickTimeS, t1, tauS, lambda);
                }
            } else {
                c = advance(shaft, c, t0, t1, tauS, lambda);
            }
            out[j + 1] = c;
        }
        return out;
    }

    private static double advance(DoubleUnaryOperator shaft, double c, double ta, double tb, double tauS,
            double lambda) {
        if (tb <= ta) {
            return c;
        }
        int n = (int) Math.ceil((tb - ta) / (tauS / 8));
        n = Math.max(8, n);
        double h = (tb - ta) / n;
        double decay = Math.exp(-lambda * h);
        double phi1 = -Math.expm1(-lambda * h) / lambda;
        double x = lambda * h;
        // The closed form cancels badly for tiny L h; two Taylor terms are exact to double precision there.
        double phi2 = x < 1e-4 ? h / 2 - lambda * h * h / 6
                : (h * phi1 - (-Math.expm1(-x) - x * decay) / (lambda * lambda)) / h;
        double g0 = shaft.applyAsDouble(ta) / tauS;
        for (int i = 0; i < n; i++) {
            double g1 = shaft.applyAsDouble(i == n - 1 ? tb : ta + (i + 1) * h) / tauS;
            c = c * decay + g0 * phi1 + (g1 - g0) * phi2;
            g0 = g1;
        }
        return c;
    }
}
