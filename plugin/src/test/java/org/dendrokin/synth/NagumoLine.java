package org.dendrokin.synth;

import java.util.Arrays;

import org.apache.commons.math3.ode.FirstOrderDifferentialEquations;
import org.apache.commons.math3.ode.nonstiff.ClassicalRungeKuttaIntegrator;
import org.dendrokin.core.Checks;

/**
 * The bistable (Nagumo) equation u_t = D u_ss + k u (1 - u)(u - a) on a line segment [sLo, sHi] with sealed ends,
 * solved by the method of lines: the 3-point Laplacian on a uniform grid of spacing h (mirror nodes at the ends),
 * and Commons Math's classical fourth-order Runge-Kutta integrator in time with a fixed step 0.4 h^2 / D (inside
 * its stability limit of about 0.7 h^2 / D for the diffusion part). The spatial error of the front speed is about
 * 1e-4 relative at h / w = 0.07, w = sqrt(2 D / k) (sheet s5.4). Written for the test movies only; it shares no
 * code with the project's engine.
 *
 * <p>The state is stored at the given times ({@link #solve}) and read back by linear interpolation in space and
 * time ({@link Solution#value}).
 */
final class NagumoLine implements FirstOrderDifferentialEquations {
    private final double d;
    private final double k;
    private final double a;
    private final double h;
    private final int n;

    /**
     * @param dUm2PerS D, um^2/s
     * @param kPerS    k, 1/s
     * @param a        threshold (dimensionless)
     * @param hUm      grid spacing, um
     * @param nodes    grid nodes, at least 3
     */
    NagumoLine(double dUm2PerS, double kPerS, double a, double hUm, int nodes) {
        Checks.positiveFinite(dUm2PerS, "dUm2PerS");
        Checks.positiveFinite(hUm, "hUm");
        Checks.require(nodes >= 3, "at least 3 nodes");
        this.d = dUm2PerS;
        this.k = kPerS;
        this.a = a;
        this.h = hUm;
        this.n = nodes;
    }

    @Override
    public int getDimension() {
        return n;
    }

    @Override
    public void computeDerivatives(double t, double[] u, double[] du) {
        double c = d / (h * h);
        du[0] = c * 2 * (u[1] - u[0]) + reaction(u[0]);
        for (int i = 1; i < n - 1; i++) {
            du[i] = c * (u[i - 1] - 2 * u[i] + u[i + 1]) + reaction(u[i]);
        }
        du[n - 1] = c * 2 * (u[n - 2] - u[n - 1]) + reaction(u[n - 1]);
    }

    private double reaction(double u) {
        return k * u * (1 - u) * (u - a);
    }

    /** The fixed time step used, s. */
    double stepS() {
        return 0.4 * h * h / d;
    }

    /**
     * Integrates from u0 at time t0 and keeps the state at t0 and at each of {@code times} (increasing, all after
     * t0).
     *
     * @param sLoUm position of node 0, um
     * @param u0    initial state, one value per node. Not modified.
     * @param t0    start time, s
     * @param times output times, s, increasing, > t0. Not modified.
     */
    Solution solve(double sLoUm, double[] u0, double t0, double[] times) {
        Checks.require(u0.length == n, "one initial value per node");
        ClassicalRungeKuttaIntegrator rk = new ClassicalRungeKuttaIntegrator(stepS());
        double[][] states = new double[times.length + 1][];
        double[] allTimes = new double[times.length + 1];
        double[] u = u0.clone();
        states[0] = u.clone();
        allTimes[0] = t0;
        double t = t0;
        for (int j = 0; j < times.length; j++) {
            Checks.require(times[j] > t, "output times must increase after t0");
            rk.integrate(this, t, u, times[j], u);
            t = times[j];
            states[j + 1] = u.clone();
            allTimes[j + 1] = t;
        }
        return new Solution(sLoUm, h, allTimes, states);
    }

    /** Stored states of one run: u = 0 before the first time, linear interpolation between stored times and nodes. */
    static final class Solution {
        private final double sLo;
        private final double h;
        private final double[] times;
        private final double[][] states;

        Solution(double sLo, double h, double[] times, double[][] states) {
            this.sLo = sLo;
            this.h = h;
            this.times = times;
            this.states = states;
        }

        double firstTime() {
            return times[0];
        }

        double lastTime() {
            return times[times.length - 1];
        }

        /** The stored state at stored time index j (0 = the initial state). Not a copy. */
        double[] state(int j) {
            return states[j];
        }

        int timeCount() {
            return times.length;
        }

        double time(int j) {
            return times[j];
        }

        double nodePosition(int i) {
            return sLo + i * h;
        }

        double value(double sUm, double tS) {
            if (tS < times[0]) {
                return 0;
            }
            int j = Arrays.binarySearch(times, tS);
            if (j >= 0) {
                return inSpace(states[j], sUm);
            }
            j = -j - 2;
            if (j >= times.length - 1) {
                return inSpace(states[times.length - 1], sUm);
            }
            double w = (tS - times[j]) / (times[j + 1] - times[j]);
            return (1 - w) * inSpace(states[j], sUm) + w * inSpace(states[j + 1], sUm);
        }

        private double inSpace(double[] u, double sUm) {
            double p = (sUm - sLo) / h;
            if (p <= 0) {
                return u[0];
            }
            if (p >= u.length - 1) {
                return u[u.length - 1];
            }
            int i = (int) p;
            double w = p - i;
            return (1 - w) * u[i] + w * u[i + 1];
        }
    }
}
