package org.dendrokin.core.model;

import java.util.Arrays;

/**
 * The time step of a one-species model on a tree and, on request, of its forward sensitivities, as
 * {@link TimeMarcher} drives it; the tree counterpart of {@link ScalarStepper}, with the same scheme. Field 0 is u;
 * fields 1 .. p are du/d(parameter j - 1) when sensitivities are on.
 * <p>
 * One step of length dt is a Strang splitting (Strang 1968; sheet s6.4): a reaction half step (the model's own
 * row-wide sub-step, {@link ScalarModel#react}, over every node of the tree at once), a Crank-Nicolson diffusion step
 * (B - c L) u1 = (B + c L) u0 + dt B q with c = dt D / 2 and B, L of {@link TreeGrid}, solved by Hines' method
 * ({@link TreeSolver}), and another reaction half step. A damped step takes the diffusion part as two backward-Euler
 * half steps (B - c L) u' = B u + (dt/2) B q. Sensitivities follow the differentiated sub-steps exactly: only D
 * enters the diffusion part's derivative, (B - c L) s1 = (B + c L) s0 + (dt/2) L (u0 + u1). Open ends keep their
 * value through diffusion (zero rows) and are reset to zero after the reaction (the resting value of every scalar
 * model, where f(0) = 0 anyway).
 * <p>
 * Allocation-free after construction; not thread-safe.
 */
final class TreeStepper implements Stepper {
    private final ScalarModel model;
    private final TreeGrid grid;
    private final int n;
    private final TreeCrankNicolsonCache cache;

    private final double[] u;
    private final double[][] sens;
    private final double[] source;
    private final double[] rhs;
    private final double[] lapU;
    private final double[] stage;
    private final double[][] scratch;
    private double[] p;
    private double d;
    private boolean withSens;
    private boolean sourceActive;

    TreeStepper(ScalarModel model, TreeGrid grid) {
        this.model = model;
        this.grid = grid;
        this.n = grid.n;
        int np = model.parameters().size();
        cache = new TreeCrankNicolsonCache(grid);
        u = new double[n];
        sens = new double[np][n];
        source = new double[n];
        rhs = new double[n];
        lapU = new double[n];
        stage = new double[n];
        scratch = new double[model.scratchRows()][n];
    }

    /** Starts a run: parameters (kept, not copied), the initial state (null for zero), no source, zero sensitivities. */
    void reset(double[] parameters, double[] initial, boolean sensitivities) {
        p = parameters;
        d = parameters[0];
        withSens = sensitivities;
        if (initial != null) {
            System.arraycopy(initial, 0, u, 0, n);
        } else {
            Arrays.fill(u, 0);
        }
        Arrays.fill(source, 0);
        sourceActive = false;
        if (sensitivities) {
            for (double[] s : sens) {
                Arrays.fill(s, 0);
            }
        }
    }

    /** Number of fields: u and one sensitivity per parameter. */
    int fieldCount() {
        return 1 + sens.length;
    }

    @Override
    public int nodeCount() {
        return n;
    }

    @Override
    public double[] field(int f) {
        return f == 0 ? u : sens[f - 1];
    }

    /** The source enters as B q, like the time derivative. */
    @Override
    public void setSources(double[][] rates) {
        if (rates[0] == null) {
            Arrays.fill(source, 0);
            sourceActive = false;
        } else {
            grid.mass.apply(rates[0], source);
            sourceActive = true;
        }
    }

    @Override
    public void hold(int f, boolean[] nodes, double value) {
        for (int i = 0; i < n; i++) {
            if (nodes[i]) {
                u[i] = value;
                if (withSens) {
                    for (double[] sv : sens) {
                        sv[i] = 0;
                    }
                }
            }
        }
    }

    @Override
    public void step(double dt, boolean damped) {
        TreeCrankNicolsonCache.Factors f = cache.get(0.5 * dt * d);
        double tau = 0.5 * dt;
        if (!damped && !withSens) {
            model.react(p, tau, u, stage, n);
            f.explicit.apply(stage, rhs);
            if (sourceActive) {
                addScaled(source, dt, rhs, n);
            }
            cache.solve(f, rhs, u);
            model.react(p, tau, u, u, n);
        } else {
            react(tau);
            diffuse(f, dt, damped);
            react(tau);
        }
        for (int i : grid.fixedNodes) {
            u[i] = 0;
            if (withSens) {
                for (double[] sv : sens) {
                    sv[i] = 0;
                }
            }
        }
    }

    private static void addScaled(double[] v, double s, double[] out, int n) {
        for (int i = 0; i < n; i++) {
            out[i] += s * v[i];
        }
    }

    private void react(double tau) {
        if (withSens) {
            model.reactWithSensitivities(p, tau, u, sens, n, scratch);
        } else {
            model.react(p, tau, u, u, n);
        }
    }

    /** Crank-Nicolson, or two backward-Euler half steps when damped; sensitivities differentiated (only D enters). */
    private void diffuse(TreeCrankNicolsonCache.Factors f, double dt, boolean damped) {
        double half = 0.5 * dt;
        if (damped) {
            for (int sub = 0; sub < 2; sub++) {
                grid.mass.apply(u, rhs);
                addScaled(source, half, rhs, n);
                cache.solve(f, rhs, u);
                if (withSens) {
                    // d/dD of (B - c L) u' = B u + ...: (B - c L) s' = B s + (dt/2) L u'
                    grid.lap.apply(u, lapU);
                    for (int q = 0; q < sens.length; q++) {
                        double[] s = sens[q];
                        grid.mass.apply(s, rhs);
                        if (q == 0) {
                            addScaled(lapU, half, rhs, n);
                        }
                        cache.solve(f, rhs, s);
                    }
                }
            }
            return;
        }
        if (withSens) {
            grid.lap.apply(u, lapU);
        }
        f.explicit.apply(u, rhs);
        addScaled(source, dt, rhs, n);
        cache.solve(f, rhs, u);
        if (withSens) {
            // d/dD: (B - c L) s1 = (B + c L) s0 + (dt/2) L (u0 + u1)
            grid.lap.addApplied(1, u, lapU);
            for (int q = 0; q < sens.length; q++) {
                double[] s = sens[q];
                f.explicit.apply(s, rhs);
                if (q == 0) {
                    addScaled(lapU, half, rhs, n);
                }
                cache.solve(f, rhs, s);
            }
        }
    }
}
