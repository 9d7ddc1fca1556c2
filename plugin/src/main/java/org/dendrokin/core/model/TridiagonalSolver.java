package org.dendrokin.core.model;

import org.dendrokin.core.Checks;

/**
 * The Thomas algorithm for tridiagonal systems A x = d (Thomas 1949; sheet s6.3): one forward sweep and one
 * back substitution, O(n), no pivoting. Stable when A is diagonally dominant, which the implicit diffusion
 * matrices of this package are for any D &gt;= 0 and time step. Allocation-free: the caller owns every array.
 */
public final class TridiagonalSolver {
    private TridiagonalSolver() {
    }

    /**
     * Solves A x = d in one call.
     *
     * @param lower sub-diagonal a, length n, lower[0] ignored. Not modified.
     * @param diag  main diagonal b, length n &gt;= 1. Not modified.
     * @param upper super-diagonal c, length n, upper[n-1] ignored. Not modified.
     * @param rhs   right-hand side d, length n. Not modified (unless it is {@code out}).
     * @param out   receives x, length n; may be the same array as rhs. Modified.
     * @param work  scratch, length n. Modified.
     * @throws IllegalArgumentException if the lengths differ or a pivot is zero
     */
    public static void solve(double[] lower, double[] diag, double[] upper, double[] rhs, double[] out,
            double[] work) {
        int n = diag.length;
        Checks.sameLength(n, lower, upper, rhs, out, work);
        double pivot = pivot(diag[0], 0);
        work[0] = upper[0] / pivot;
        out[0] = rhs[0] / pivot;
        for (int i = 1; i < n; i++) {
            pivot = pivot(diag[i] - lower[i] * work[i - 1], i);
            work[i] = upper[i] / pivot;
            out[i] = (rhs[i] - lower[i] * out[i - 1]) / pivot;
        }
        for (int i = n - 2; i >= 0; i--) {
            out[i] -= work[i] * out[i + 1];
        }
    }

    /**
     * Factors A once for many right-hand sides: {@code cPrime[i] = c_i / p_i} and {@code invPivot[i] = 1 / p_i}
     * with the Thomas pivots p_i.
     *
     * @param lower, diag, upper as in {@link #solve}. Not modified.
     * @param cPrime   length n. Modified.
     * @param invPivot length n. Modified.
     */
    public static void factor(double[] lower, double[] diag, double[] upper, double[] cPrime, double[] invPivot) {
        int n = diag.length;
        double pivot = pivot(diag[0], 0);
        invPivot[0] = 1 / pivot;
        cPrime[0] = upper[0] * invPivot[0];
        for (int i = 1; i < n; i++) {
            pivot = pivot(diag[i] - lower[i] * cPrime[i - 1], i);
            invPivot[i] = 1 / pivot;
            cPrime[i] = upper[i] * invPivot[i];
        }
    }

    /**
     * Solves with a factorisation from {@link #factor}.
     *
     * @param lower    the same sub-diagonal given to {@link #factor}. Not modified.
     * @param cPrime   from {@link #factor}. Not modified.
     * @param invPivot from {@link #factor}. Not modified.
     * @param rhs      right-hand side; may be the same array as out. Not modified otherwise.
     * @param out      receives x. Modified.
     */
    public static void solveFactored(double[] lower, double[] cPrime, double[] invPivot, double[] rhs,
            double[] out) {
        int n = cPrime.length;
        double prev = rhs[0] * invPivot[0];
        out[0] = prev;
        for (int i = 1; i < n; i++) {
            prev = (rhs[i] - lower[i] * prev) * invPivot[i];
            out[i] = prev;
        }
        for (int i = n - 2; i >= 0; i--) {
            out[i] -= cPrime[i] * out[i + 1];
        }
    }

    private static double pivot(double p, int row) {
        if (p == 0 || !Double.isFinite(p)) {
            throw new IllegalArgumentException("tridiagonal system has a zero pivot at row " + row);
        }
        return p;
    }
}
