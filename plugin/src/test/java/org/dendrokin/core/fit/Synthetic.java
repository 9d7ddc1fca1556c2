package org.dendrokin.core.fit;

import java.util.List;
import java.util.Random;

import org.dendrokin.core.kymo.Kymograph;
import org.dendrokin.core.model.Boundary;
import org.dendrokin.core.model.Domain;
import org.dendrokin.core.model.ScalarRun;
import org.dendrokin.core.model.SolverSettings;
import org.dendrokin.core.model.Stimulus;
import org.dendrokin.core.units.Unit;

/** Synthetic kymographs with known truth for recovery tests; every random number is seeded. */
final class Synthetic {
    private Synthetic() {
    }

    static double[] grid(double step, int n) {
        double[] g = new double[n];
        for (int i = 0; i < n; i++) {
            g[i] = i * step;
        }
        return g;
    }

    /** Closed-form pulse (open dendrite) plus Gaussian noise of SD sigma. */
    static Kymograph pulse(int nx, int nt, double dxUm, double dtS, double d, double k, double amp, double x0,
                           double s0, double base, double t0, double sigma, long seed) {
        double[] x = grid(dxUm, nx);
        double[] t = grid(dtS, nt);
        DiffusionDecayPulse m = new DiffusionDecayPulse(x, t, t0, x0, null, Unit.DF_F0);
        double[] v = new double[m.size()];
        m.evaluate(m.pack(d, k, amp, x0, s0, base, t0), v, null);
        addNoise(v, sigma, seed);
        return new Kymograph(x, t, v, "dF/F0");
    }

    /** Engine run of a scalar model (sealed ends, fine grid), scaled as base + amp u, plus noise. */
    static Kymograph engine(String model, double[] params, int nx, int nt, double dxUm, double dtS, double amp,
                            double base, double t0, double x0, double widthUm, double sigma, long seed) {
        double[] x = grid(dxUm, nx);
        double[] t = grid(dtS, nt);
        double length = x[nx - 1];
        ScalarRun run = ScalarRun.prepare(model, new Domain(length, Math.min(dxUm / 4, widthUm / 8), Boundary.NO_FLUX),
                t, x, List.of(Stimulus.pulse(t0, x0, widthUm, 1.0)), SolverSettings.DEFAULT.withStepFactor(0.1));
        double[] u = new double[nx * nt];
        run.solve(params, u);
        for (int i = 0; i < u.length; i++) {
            u[i] = base + amp * u[i];
        }
        addNoise(u, sigma, seed);
        return new Kymograph(x, t, u, "dF/F0");
    }

    static void addNoise(double[] v, double sigma, long seed) {
        Random r = new Random(seed);
        for (int i = 0; i < v.length; i++) {
            v[i] += sigma * r.nextGaussian();
        }
    }
}
