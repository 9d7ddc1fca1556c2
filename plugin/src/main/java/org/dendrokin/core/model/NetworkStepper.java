package org.dendrokin.core.model;

import java.util.Arrays;

/**
 * The time step of a reaction network on a cable, as {@link TimeMarcher} drives it: one field per species,
 * dc_s/dt = D_s (L c_s) + sum_r N[s][r] v_r(c). One step of length dt is a Strang splitting: a reaction half step
 * at every node by the two-stage L-stable Rosenbrock method ROS2 (Verwer et al. 1999) with the exact Jacobian of
 * the rate expressions (an m x m solve per node, m = number of species, so stiff reactions such as fast buffering
 * stay stable), one Crank-Nicolson diffusion step per species (Thomas algorithm; two backward-Euler half steps
 * when damped), and another reaction half step. At fixed ends every species keeps its resting value and does not
 * react. On a tree ({@link TreeGrid}) the diffusion step is the tree's Crank-Nicolson step ({@link TreeSystem}) and
 * the open ends are reset to the resting values after each reaction half step, which is the same as not reacting
 * there. Allocation-free after construction; not thread-safe.
 */
final class NetworkStepper implements Stepper {
    private static final double GAMMA = ScalarModel.ROS2_GAMMA;

    private final ReactionNetwork network;
    /** The cable, or null on a tree. */
    private final CableGrid grid;
    /** The tree, or null on a cable. */
    private final TreeGrid tree;
    private final TreeCrankNicolsonCache[] treeCaches;
    /** On a tree: the sources of immobile species as given (not multiplied by B). */
    private final double[][] rawSource;
    private final int n;
    private final int m;
    private final double[] d;
    private final CrankNicolsonCache[] caches;

    private final double[][] c;
    private final double[] rhs;
    private final double[][] source;
    private final double[][] wm;
    private final double[][] fm;
    private final double[][] k1m;
    private final double[][] stagem;
    private final int[][] pivots;
    private final double[] k1;
    private final double[] k2;
    private final double[] w;
    private final int[] pivot;
    private final double[] work;

    /** @param network a network for this thread only ({@link ReactionNetwork#forThread()}) */
    NetworkStepper(ReactionNetwork network, CableGrid grid) {
        this(network, grid, null);
    }

    /** A network on a tree. @param network a network for this thread only */
    NetworkStepper(ReactionNetwork network, TreeGrid tree) {
        this(network, null, tree);
    }

    private NetworkStepper(ReactionNetwork network, CableGrid grid, TreeGrid tree) {
        this.network = network;
        this.grid = grid;
        this.tree = tree;
        this.n = grid != null ? grid.n : tree.n;
        this.m = network.speciesCount();
        this.d = network.diffusionUm2PerS();
        caches = new CrankNicolsonCache[m];
        treeCaches = new TreeCrankNicolsonCache[m];
        for (int s = 0; s < m; s++) {
            if (d[s] != 0 && grid != null) {
                caches[s] = new CrankNicolsonCache(grid, false);
            } else if (d[s] != 0) {
                treeCaches[s] = new TreeCrankNicolsonCache(tree);
            }
        }
        rawSource = tree != null ? new double[m][n] : null;
        c = new double[m][n];
        rhs = new double[n];
        source = new double[m][n];
        wm = new double[m * m][n];
        fm = new double[m][n];
        k1m = new double[m][n];
        stagem = new double[m][n];
        pivots = new int[m > 3 ? m : 0][n];
        network.reserveBatch(n);
        k1 = new double[m];
        k2 = new double[m];
        w = new double[m * m];
        pivot = new int[m];
        work = new double[n];
    }

    /** Starts a run: every species at its resting value, no source. */
    void reset() {
        double[] init = network.initial();
        for (int s = 0; s < m; s++) {
            Arrays.fill(c[s], init[s]);
            Arrays.fill(source[s], 0);
        }
    }

    /** The largest diffusion coefficient, um^2/s. */
    double maxDiffusionUm2PerS() {
        double dMax = 0;
        for (double v : d) {
            dMax = Math.max(dMax, v);
        }
        return dMax;
    }

    @Override
    public int nodeCount() {
        return n;
    }

    @Override
    public double[] field(int f) {
        return c[f];
    }

    /** Sources enter as B q, like the time derivative (B = I unless compact). */
    @Override
    public void setSources(double[][] rates) {
        for (int s = 0; s < m; s++) {
            if (rates[s] == null) {
                Arrays.fill(source[s], 0);
                if (rawSource != null) {
                    Arrays.fill(rawSource[s], 0);
                }
            } else if (grid != null) {
                grid.applyMass(rates[s], source[s]);
            } else {
                tree.mass.apply(rates[s], source[s]);
                System.arraycopy(rates[s], 0, rawSource[s], 0, n);
            }
        }
    }

    @Override
    public void hold(int f, boolean[] nodes, double value) {
        double[] row = c[f];
        for (int i = 0; i < n; i++) {
            if (nodes[i]) {
                row[i] = value;
            }
        }
    }

    @Override
    public void step(double dt, boolean damped) {
        react(0.5 * dt);
        for (int s = 0; s < m; s++) {
            diffuse(s, dt, damped);
        }
        react(0.5 * dt);
    }

    /** Crank-Nicolson (B - c L) u1 = (B + c L) u0 + dt B q for one species, or two backward-Euler half steps. */
    private void diffuse(int s, double dt, boolean damped) {
        if (tree != null) {
            diffuseOnTree(s, dt, damped);
            return;
        }
        double ds = d[s];
        double[] u = c[s];
        double[] q = source[s];
        if (ds == 0) {
            if (grid.compact) {
                // B u_t = B q: an immobile species just accumulates its source
                for (int i = 0; i < n; i++) {
                    work[i] = dt * q[i];
                }
                TridiagonalSolver.solve(grid.massLower, grid.massDiag, grid.massUpper, work, work, rhs);
                for (int i = 0; i < n; i++) {
                    u[i] += work[i];
                }
            } else {
                for (int i = 0; i < n; i++) {
                    u[i] += dt * q[i];
                }
            }
            return;
        }
        CrankNicolsonCache.Factors f = caches[s].get(0.5 * dt * ds);
        double[] lower = f.lower;
        double[] cPrime = f.cPrime;
        double[] invPivot = f.invPivot;
        if (damped) {
            double half = 0.5 * dt;
            for (int sub = 0; sub < 2; sub++) {
                grid.applyMass(u, rhs);
                for (int i = 0; i < n; i++) {
                    rhs[i] += half * q[i];
                }
                TridiagonalSolver.solveFactored(lower, cPrime, invPivot, rhs, u);
            }
            return;
        }
        double[] pl = f.pLower;
        double[] pd = f.pDiag;
        double[] pu = f.pUpper;
        int last = n - 1;
        rhs[0] = pd[0] * u[0] + pu[0] * u[1] + dt * q[0];
        for (int i = 1; i < last; i++) {
            rhs[i] = pl[i] * u[i - 1] + pd[i] * u[i] + pu[i] * u[i + 1] + dt * q[i];
        }
        rhs[last] = pl[last] * u[last - 1] + pd[last] * u[last] + dt * q[last];
        TridiagonalSolver.solveFactored(lower, cPrime, invPivot, rhs, u);
    }

    /** {@link #diffuse} on a tree: the same equations with the tree's matrices. */
    private void diffuseOnTree(int s, double dt, boolean damped) {
        double[] u = c[s];
        if (d[s] == 0) {
            // B u_t = B q: an immobile species accumulates its source
            double[] q = rawSource[s];
            for (int i = 0; i < n; i++) {
                u[i] += dt * q[i];
            }
            return;
        }
        double[] q = source[s];
        TreeCrankNicolsonCache cache = treeCaches[s];
        TreeCrankNicolsonCache.Factors f = cache.get(0.5 * dt * d[s]);
        if (damped) {
            double half = 0.5 * dt;
            for (int sub = 0; sub < 2; sub++) {
                tree.mass.apply(u, rhs);
                for (int i = 0; i < n; i++) {
                    rhs[i] += half * q[i];
                }
                cache.solve(f, rhs, u);
            }
            return;
        }
        f.explicit.apply(u, rhs);
        for (int i = 0; i < n; i++) {
            rhs[i] += dt * q[i];
        }
        cache.solve(f, rhs, u);
    }

    /** On a tree: the open ends back at the resting values (as if they had not reacted). */
    private void restOpenEnds() {
        double[] init = network.initial();
        for (int i : tree.fixedNodes) {
            for (int s = 0; s < m; s++) {
                c[s][i] = init[s];
            }
        }
    }

    /**
     * ROS2 at every node: W k1 = f(u), W k2 = f(u + tau k1) - 2 k1, u1 = u + tau (3 k1 + k2) / 2,
     * W = I - gamma tau J. All nodes move together, a row per species (struct of arrays): the rate programs
     * sweep whole rows, and W is inverted once per node (explicitly for up to 3 species, by LU otherwise) and
     * used for both stages.
     */
    private void react(double tau) {
        if (network.reactions().isEmpty()) {
            return;
        }
        int from = grid != null && grid.fixedEnds ? 1 : 0;
        int to = grid != null && grid.fixedEnds ? n - 1 : n;
        network.stepMatrixBatch(c, from, to, -GAMMA * tau, wm);
        network.ratesBatch(c, from, to, fm);
        switch (m) {
            case 1 -> {
                double[] w0 = wm[0];
                double[] f0 = fm[0];
                double[] r0 = k1m[0];
                double[] u0 = c[0];
                double[] s0 = stagem[0];
                for (int i = from; i < to; i++) {
                    double inv = 1 / w0[i];
                    w0[i] = inv;
                    double k = inv * f0[i];
                    r0[i] = k;
                    s0[i] = u0[i] + tau * k;
                }
                network.ratesBatch(stagem, from, to, fm);
                for (int i = from; i < to; i++) {
                    double k = r0[i];
                    double k2 = w0[i] * (f0[i] - 2 * k);
                    u0[i] += tau * (1.5 * k + 0.5 * k2);
                }
            }
            case 2 -> react2(tau, from, to);
            case 3 -> react3(tau, from, to);
            default -> reactGeneral(tau, from, to);
        }
        if (tree != null) {
            restOpenEnds();
        }
    }

    private void react2(double tau, int from, int to) {
        double[] w00 = wm[0];
        double[] w01 = wm[1];
        double[] w10 = wm[2];
        double[] w11 = wm[3];
        double[] f0 = fm[0];
        double[] f1 = fm[1];
        double[] r0 = k1m[0];
        double[] r1 = k1m[1];
        double[] u0 = c[0];
        double[] u1 = c[1];
        double[] s0 = stagem[0];
        double[] s1 = stagem[1];
        for (int i = from; i < to; i++) {
            double a = w00[i];
            double b = w01[i];
            double cc = w10[i];
            double dd = w11[i];
            double inv = 1 / (a * dd - b * cc);
            double i00 = dd * inv;
            double i01 = -b * inv;
            double i10 = -cc * inv;
            double i11 = a * inv;
            w00[i] = i00;
            w01[i] = i01;
            w10[i] = i10;
            w11[i] = i11;
            double g0 = f0[i];
            double g1 = f1[i];
            double x0 = i00 * g0 + i01 * g1;
            double x1 = i10 * g0 + i11 * g1;
            r0[i] = x0;
            r1[i] = x1;
            s0[i] = u0[i] + tau * x0;
            s1[i] = u1[i] + tau * x1;
        }
        network.ratesBatch(stagem, from, to, fm);
        for (int i = from; i < to; i++) {
            double x0 = r0[i];
            double x1 = r1[i];
            double g0 = f0[i] - 2 * x0;
            double g1 = f1[i] - 2 * x1;
            double y0 = w00[i] * g0 + w01[i] * g1;
            double y1 = w10[i] * g0 + w11[i] * g1;
            u0[i] += tau * (1.5 * x0 + 0.5 * y0);
            u1[i] += tau * (1.5 * x1 + 0.5 * y1);
        }
    }

    private void react3(double tau, int from, int to) {
        double[] w00 = wm[0];
        double[] w01 = wm[1];
        double[] w02 = wm[2];
        double[] w10 = wm[3];
        double[] w11 = wm[4];
        double[] w12 = wm[5];
        double[] w20 = wm[6];
        double[] w21 = wm[7];
        double[] w22 = wm[8];
        double[] f0 = fm[0];
        double[] f1 = fm[1];
        double[] f2 = fm[2];
        double[] r0 = k1m[0];
        double[] r1 = k1m[1];
        double[] r2 = k1m[2];
        double[] u0 = c[0];
        double[] u1 = c[1];
        double[] u2 = c[2];
        double[] s0 = stagem[0];
        double[] s1 = stagem[1];
        double[] s2 = stagem[2];
        for (int i = from; i < to; i++) {
            double a = w00[i];
            double b = w01[i];
            double cc = w02[i];
            double d = w10[i];
            double e = w11[i];
            double ff = w12[i];
            double g = w20[i];
            double h = w21[i];
            double q = w22[i];
            // the inverse as adjugate / determinant
            double c00 = e * q - ff * h;
            double c10 = ff * g - d * q;
            double c20 = d * h - e * g;
            double inv = 1 / (a * c00 + b * c10 + cc * c20);
            double i00 = c00 * inv;
            double i01 = (cc * h - b * q) * inv;
            double i02 = (b * ff - cc * e) * inv;
            double i10 = c10 * inv;
            double i11 = (a * q - cc * g) * inv;
            double i12 = (cc * d - a * ff) * inv;
            double i20 = c20 * inv;
            double i21 = (b * g - a * h) * inv;
            double i22 = (a * e - b * d) * inv;
            w00[i] = i00;
            w01[i] = i01;
            w02[i] = i02;
            w10[i] = i10;
            w11[i] = i11;
            w12[i] = i12;
            w20[i] = i20;
            w21[i] = i21;
            w22[i] = i22;
            double g0 = f0[i];
            double g1 = f1[i];
            double g2 = f2[i];
            double x0 = i00 * g0 + i01 * g1 + i02 * g2;
            double x1 = i10 * g0 + i11 * g1 + i12 * g2;
            double x2 = i20 * g0 + i21 * g1 + i22 * g2;
            r0[i] = x0;
            r1[i] = x1;
            r2[i] = x2;
            s0[i] = u0[i] + tau * x0;
            s1[i] = u1[i] + tau * x1;
            s2[i] = u2[i] + tau * x2;
        }
        network.ratesBatch(stagem, from, to, fm);
        for (int i = from; i < to; i++) {
            double x0 = r0[i];
            double x1 = r1[i];
            double x2 = r2[i];
            double g0 = f0[i] - 2 * x0;
            double g1 = f1[i] - 2 * x1;
            double g2 = f2[i] - 2 * x2;
            double y0 = w00[i] * g0 + w01[i] * g1 + w02[i] * g2;
            double y1 = w10[i] * g0 + w11[i] * g1 + w12[i] * g2;
            double y2 = w20[i] * g0 + w21[i] * g1 + w22[i] * g2;
            u0[i] += tau * (1.5 * x0 + 0.5 * y0);
            u1[i] += tau * (1.5 * x1 + 0.5 * y1);
            u2[i] += tau * (1.5 * x2 + 0.5 * y2);
        }
    }

    /** More than 3 species: W gathered per node, LU with partial pivoting, kept for the second stage. */
    private void reactGeneral(double tau, int from, int to) {
        for (int i = from; i < to; i++) {
            for (int a = 0; a < m * m; a++) {
                w[a] = wm[a][i];
            }
            luFactor();
            for (int a = 0; a < m * m; a++) {
                wm[a][i] = w[a];
            }
            for (int s = 0; s < m; s++) {
                pivots[s][i] = pivot[s];
                k1[s] = fm[s][i];
            }
            luSolve(k1);
            for (int s = 0; s < m; s++) {
                k1m[s][i] = k1[s];
                stagem[s][i] = c[s][i] + tau * k1[s];
            }
        }
        network.ratesBatch(stagem, from, to, fm);
        for (int i = from; i < to; i++) {
            for (int a = 0; a < m * m; a++) {
                w[a] = wm[a][i];
            }
            for (int s = 0; s < m; s++) {
                pivot[s] = pivots[s][i];
                k2[s] = fm[s][i] - 2 * k1m[s][i];
            }
            luSolve(k2);
            for (int s = 0; s < m; s++) {
                c[s][i] += tau * (1.5 * k1m[s][i] + 0.5 * k2[s]);
            }
        }
    }

    /** In-place LU with partial pivoting of the m x m matrix w. */
    private void luFactor() {
        for (int col = 0; col < m; col++) {
            int best = col;
            double big = Math.abs(w[col * m + col]);
            for (int r = col + 1; r < m; r++) {
                double v = Math.abs(w[r * m + col]);
                if (v > big) {
                    big = v;
                    best = r;
                }
            }
            pivot[col] = best;
            if (best != col) {
                for (int k = 0; k < m; k++) {
                    double t = w[col * m + k];
                    w[col * m + k] = w[best * m + k];
                    w[best * m + k] = t;
                }
            }
            double p = w[col * m + col];
            if (p == 0) {
                throw new IllegalStateException(
                        "singular reaction step matrix; the reactions are too stiff for the step");
            }
            for (int r = col + 1; r < m; r++) {
                double factor = w[r * m + col] / p;
                w[r * m + col] = factor;
                for (int k = col + 1; k < m; k++) {
                    w[r * m + k] -= factor * w[col * m + k];
                }
            }
        }
    }

    private void luSolve(double[] b) {
        for (int col = 0; col < m; col++) {
            int p = pivot[col];
            if (p != col) {
                double t = b[col];
                b[col] = b[p];
                b[p] = t;
            }
            for (int r = col + 1; r < m; r++) {
                b[r] -= w[r * m + col] * b[col];
            }
        }
        for (int r = m - 1; r >= 0; r--) {
            double sum = b[r];
            for (int k = r + 1; k < m; k++) {
                sum -= w[r * m + k] * b[k];
            }
            b[r] = sum / w[r * m + r];
        }
    }
}
