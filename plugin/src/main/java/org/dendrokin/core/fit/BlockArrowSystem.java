package org.dendrokin.core.fit;

import java.util.stream.IntStream;

import org.apache.commons.math3.linear.Array2DRowRealMatrix;
import org.apache.commons.math3.linear.CholeskyDecomposition;
import org.apache.commons.math3.linear.DecompositionSolver;
import org.apache.commons.math3.linear.NonPositiveDefiniteMatrixException;
import org.apache.commons.math3.linear.NonSymmetricMatrixException;

/**
 * The normal equations H d = b of a joint fit, kept by blocks: G global coordinates shared by every session, and
 * per session i its q_i local coordinates, which touch only its own data. H is block-arrow shaped:
 * <pre>
 *   [ H_gg      H_gL,1  ...  H_gL,N ]   [ d_g   ]   [ b_g   ]
 *   [ H_Lg,1    H_LL,1               ] . [ d_L,1 ] = [ b_L,1 ]
 *   [   ...               ...        ]   [  ...  ]   [  ...  ]
 *   [ H_Lg,N                 H_LL,N  ]   [ d_L,N ]   [ b_L,N ]
 * </pre>
 * and is solved by eliminating each local block (Schur complement): K_i = H_LL,i (+ damping), X_i = K_i^-1 H_Lg,i,
 * y_i = K_i^-1 b_L,i; then (H_gg - sum H_gL,i X_i) d_g = b_g - sum H_gL,i y_i and d_L,i = y_i - X_i d_g. The cost
 * is O(N (q^3 + q^2 G + q G^2) + G^3), linear in the number of sessions, where a dense solve is O((N q + G)^3).
 * Small dense solves are Commons Math's Cholesky decomposition. Sessions without a block (null) take no part.
 */
final class BlockArrowSystem {
    /** Damping floor relative to the largest diagonal element, for coordinates whose column vanishes. */
    private static final double DIAGONAL_FLOOR = 1e-12;

    /** Global block (G x G) and right-hand side, summed over sessions. */
    final double[][] hgg;
    final double[] bg;
    /** Per session: H_LL (q x q), H_Lg (q x G), b_L (q), and its own parts of H_gg and b_g; null if inactive. */
    final double[][][] hLL;
    final double[][][] hLg;
    final double[][] bL;
    final double[][][] hggOwn;
    final double[][] bgOwn;
    private final int g;

    /** An empty system for G global coordinates and N sessions; {@link #add} fills it. */
    BlockArrowSystem(int globals, int sessions) {
        this.g = globals;
        hgg = new double[g][g];
        bg = new double[g];
        hLL = new double[sessions][][];
        hLg = new double[sessions][][];
        bL = new double[sessions][];
        hggOwn = new double[sessions][][];
        bgOwn = new double[sessions][];
    }

    /**
     * Adds session i's block from its part of H and b over the coordinates (gamma, u_i), global ones first.
     *
     * @param h (G + q) x (G + q). Not modified.
     * @param v G + q. Not modified.
     */
    void add(int i, double[][] h, double[] v) {
        int q = v.length - g;
        hggOwn[i] = new double[g][g];
        bgOwn[i] = new double[g];
        hLL[i] = new double[q][q];
        hLg[i] = new double[q][g];
        bL[i] = new double[q];
        for (int x = 0; x < g; x++) {
            bg[x] += v[x];
            bgOwn[i][x] = v[x];
            for (int y = 0; y < g; y++) {
                hgg[x][y] += h[x][y];
                hggOwn[i][x][y] = h[x][y];
            }
        }
        for (int x = 0; x < q; x++) {
            bL[i][x] = v[g + x];
            for (int y = 0; y < q; y++) {
                hLL[i][x][y] = h[g + x][g + y];
            }
            for (int y = 0; y < g; y++) {
                hLg[i][x][y] = h[g + x][y];
            }
        }
    }

    /** A step on every coordinate: dg (G) and dL per session (null for inactive ones). */
    record Step(double[] dg, double[][] dL) {
        /** d . rhs over every coordinate. */
        double dot(double[] rhsG, double[][] rhsL) {
            double s = 0;
            for (int x = 0; x < dg.length; x++) {
                s += dg[x] * rhsG[x];
            }
            for (int i = 0; i < dL.length; i++) {
                if (dL[i] != null) {
                    for (int x = 0; x < dL[i].length; x++) {
                        s += dL[i][x] * rhsL[i][x];
                    }
                }
            }
            return s;
        }
    }

    /**
     * Solves (H + lambda D) d = rhs, D the diagonal of H with a floor; fixed global coordinates get d = 0 (their rows
     * are dropped). Returns null when a block is not positive definite.
     */
    Step solve(double lambda, boolean[] fixed, double[] rhsG, double[][] rhsL) {
        int nb = hLL.length;
        double[][] s = new double[g][g];
        double[] r = rhsG.clone();
        double[][][] xs = new double[nb][][];
        double[][] ys = new double[nb][];
        for (int i = 0; i < nb; i++) {
            if (hLL[i] == null) {
                continue;
            }
            int q = hLL[i].length;
            double[][] rhs = new double[q][g + 1];
            for (int x = 0; x < q; x++) {
                System.arraycopy(hLg[i][x], 0, rhs[x], 0, g);
                rhs[x][g] = rhsL[i][x];
            }
            double[][] sol = choleskySolve(damped(hLL[i], lambda), rhs);
            if (sol == null) {
                return null;
            }
            double[][] xi = new double[q][g];
            double[] yi = new double[q];
            for (int x = 0; x < q; x++) {
                System.arraycopy(sol[x], 0, xi[x], 0, g);
                yi[x] = sol[x][g];
            }
            xs[i] = xi;
            ys[i] = yi;
            for (int a = 0; a < g; a++) {
                for (int c = 0; c < g; c++) {
                    double acc = 0;
                    for (int x = 0; x < q; x++) {
                        acc += hLg[i][x][a] * xi[x][c];
                    }
                    s[a][c] -= acc;
                }
                double acc = 0;
                for (int x = 0; x < q; x++) {
                    acc += hLg[i][x][a] * yi[x];
                }
                r[a] -= acc;
            }
        }
        double[][] hd = damped(hgg, lambda);
        int[] free = IntStream.range(0, g).filter(a -> !fixed[a]).toArray();
        double[] dg = new double[g];
        if (free.length > 0) {
            double[][] sf = new double[free.length][free.length];
            double[][] rf = new double[free.length][1];
            for (int a = 0; a < free.length; a++) {
                for (int c = 0; c < free.length; c++) {
                    sf[a][c] = s[free[a]][free[c]] + hd[free[a]][free[c]];
                }
                rf[a][0] = r[free[a]];
            }
            double[][] solved = choleskySolve(sf, rf);
            if (solved == null) {
                return null;
            }
            for (int a = 0; a < free.length; a++) {
                dg[free[a]] = solved[a][0];
            }
        }
        double[][] dL = new double[nb][];
        for (int i = 0; i < nb; i++) {
            if (hLL[i] == null) {
                continue;
            }
            int q = ys[i].length;
            dL[i] = new double[q];
            for (int x = 0; x < q; x++) {
                double acc = ys[i][x];
                for (int a = 0; a < g; a++) {
                    acc -= xs[i][x][a] * dg[a];
                }
                dL[i][x] = acc;
            }
        }
        return new Step(dg, dL);
    }

    /** The Levenberg-Marquardt step for the system's own right-hand side. */
    Step solve(double lambda, boolean[] fixed) {
        return solve(lambda, fixed, bg, bL);
    }

    /** d^T D d with D the damping diagonal (floored diag H). */
    double dampingNorm(Step d) {
        double s = 0;
        double top = 0;
        for (int a = 0; a < g; a++) {
            top = Math.max(top, hgg[a][a]);
        }
        for (int a = 0; a < g; a++) {
            s += d.dg()[a] * d.dg()[a] * Math.max(hgg[a][a], DIAGONAL_FLOOR * top);
        }
        for (int i = 0; i < hLL.length; i++) {
            if (hLL[i] == null) {
                continue;
            }
            double[][] k = hLL[i];
            double t = 0;
            for (int x = 0; x < k.length; x++) {
                t = Math.max(t, k[x][x]);
            }
            for (int x = 0; x < k.length; x++) {
                s += d.dL()[i][x] * d.dL()[i][x] * Math.max(k[x][x], DIAGONAL_FLOOR * t);
            }
        }
        return s;
    }

    /**
     * H^-1 by blocks.
     *
     * @param global G x G covariance of the global coordinates (rows and columns of fixed ones are 0)
     * @param local  per session, the variance of each local coordinate (the diagonal of its block of H^-1)
     */
    record Covariance(double[][] global, double[][] local) {
    }

    /** H^-1 with fixed global coordinates held; null if H is singular. */
    Covariance covariance(boolean[] fixed) {
        int nb = hLL.length;
        double[][] cov = new double[g][g];
        double[][] zeroL = new double[nb][];
        for (int i = 0; i < nb; i++) {
            if (hLL[i] != null) {
                zeroL[i] = new double[hLL[i].length];
            }
        }
        // columns of H^-1 for the global coordinates: H d = e_a with zero local right-hand sides
        for (int a = 0; a < g; a++) {
            if (fixed[a]) {
                continue;
            }
            double[] unit = new double[g];
            unit[a] = 1;
            Step d = solve(0, fixed, unit, zeroL);
            if (d == null) {
                return null;
            }
            for (int c = 0; c < g; c++) {
                cov[c][a] = d.dg()[c];
            }
        }
        // local block of H^-1: K^-1 + X cov X^T with X = K^-1 H_Lg
        double[][] local = new double[nb][];
        for (int i = 0; i < nb; i++) {
            if (hLL[i] == null) {
                continue;
            }
            int q = hLL[i].length;
            double[][] rhs = new double[q][q + g];
            for (int x = 0; x < q; x++) {
                rhs[x][x] = 1;
                System.arraycopy(hLg[i][x], 0, rhs[x], q, g);
            }
            double[][] sol = choleskySolve(hLL[i], rhs);
            if (sol == null) {
                return null;
            }
            local[i] = new double[q];
            for (int x = 0; x < q; x++) {
                double v = sol[x][x];
                for (int a = 0; a < g; a++) {
                    for (int c = 0; c < g; c++) {
                        v += sol[x][q + a] * cov[a][c] * sol[x][q + c];
                    }
                }
                local[i][x] = v;
            }
        }
        return new Covariance(cov, local);
    }

    /**
     * Each session's contribution to the reduced system of the global coordinates once its local block is eliminated:
     * S_i = H_gg,i - H_gL,i H_LL,i^-1 H_Lg,i (reduced[i][0..G-1]) and r_i = b_g,i - H_gL,i H_LL,i^-1 b_L,i
     * (reduced[i][G]), as G rows of G + 1; null if a block is singular.
     */
    double[][][] reduced() {
        int nb = hLL.length;
        double[][][] out = new double[nb][][];
        for (int i = 0; i < nb; i++) {
            if (hLL[i] == null) {
                continue;
            }
            int q = hLL[i].length;
            double[][] rhs = new double[q][g + 1];
            for (int x = 0; x < q; x++) {
                System.arraycopy(hLg[i][x], 0, rhs[x], 0, g);
                rhs[x][g] = bL[i][x];
            }
            double[][] sol = q == 0 ? new double[0][g + 1] : choleskySolve(hLL[i], rhs);
            if (sol == null) {
                return null;
            }
            out[i] = new double[g][g + 1];
            for (int a = 0; a < g; a++) {
                System.arraycopy(hggOwn[i][a], 0, out[i][a], 0, g);
                out[i][a][g] = bgOwn[i][a];
                for (int x = 0; x < q; x++) {
                    for (int c = 0; c <= g; c++) {
                        out[i][a][c] -= hLg[i][x][a] * sol[x][c];
                    }
                }
            }
        }
        return out;
    }

    /** M + lambda diag(M), the diagonal floored at DIAGONAL_FLOOR times its largest element. */
    private static double[][] damped(double[][] mtx, double lambda) {
        int q = mtx.length;
        double[][] out = new double[q][];
        double top = 0;
        for (int x = 0; x < q; x++) {
            top = Math.max(top, mtx[x][x]);
        }
        for (int x = 0; x < q; x++) {
            out[x] = mtx[x].clone();
            out[x][x] += lambda * Math.max(mtx[x][x], DIAGONAL_FLOOR * top);
        }
        return out;
    }

    /**
     * Solves K X = R for symmetric positive definite K (Commons Math's Cholesky on K scaled to unit diagonal, so that
     * its thresholds are scale-free); null if K is not positive definite.
     */
    static double[][] choleskySolve(double[][] k, double[][] rhs) {
        int q = k.length;
        if (q == 0) {
            return new double[0][];
        }
        double[] scale = new double[q];
        for (int x = 0; x < q; x++) {
            if (!(k[x][x] > 0) || !Double.isFinite(k[x][x])) {
                return null;
            }
            scale[x] = 1 / Math.sqrt(k[x][x]);
        }
        double[][] ks = new double[q][q];
        for (int x = 0; x < q; x++) {
            for (int y = 0; y < q; y++) {
                ks[x][y] = 0.5 * (k[x][y] + k[y][x]) * scale[x] * scale[y];
            }
        }
        int cols = rhs[0].length;
        double[][] rs = new double[q][cols];
        for (int x = 0; x < q; x++) {
            for (int c = 0; c < cols; c++) {
                rs[x][c] = rhs[x][c] * scale[x];
            }
        }
        DecompositionSolver solver;
        try {
            solver = new CholeskyDecomposition(new Array2DRowRealMatrix(ks, false), 1e-10, 1e-14).getSolver();
        } catch (NonPositiveDefiniteMatrixException | NonSymmetricMatrixException e) {
            return null;
        }
        double[][] sol = solver.solve(new Array2DRowRealMatrix(rs, false)).getData();
        for (int x = 0; x < q; x++) {
            for (int c = 0; c < cols; c++) {
                sol[x][c] *= scale[x];
            }
        }
        return sol;
    }
}
