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

    /**
     * The row where the two sweeps of the twisted factorisation meet, for n unknowns: n / 2.
     */
    public static int twistRow(int n) {
        return n / 2;
    }

    /**
     * Twisted (two-ended) factorisation of A for many right-hand sides: Thomas elimination runs down from the
     * first row and up from the last at the same time and the two meet at row m = {@link #twistRow}(n)
     * (the "burn at both ends" variant of Gaussian elimination; e.g. Golub &amp; Van Loan, Matrix Computations,
     * s4.3). The two sweeps are independent, so a solve has two short recurrences to interleave instead of one
     * long one, which halves its latency on a processor that overlaps independent operations. Same stability
     * as {@link #factor} (diagonally dominant A). Requires n &gt;= 3.
     * <p>
     * With top pivots p_i (rows i &lt; m), bottom pivots q_i (rows i &gt; m) and the middle pivot r:
     * {@code invPivot[i]} = 1/p_i, 1/q_i or 1/r; {@code elim[i]} = a_i/p_i above m, c_i/q_i below m, a_m/r at m;
     * {@code subst[i]} = c_i/p_i above m, a_i/q_i below m, c_m/r at m.
     *
     * @param lower, diag, upper as in {@link #solve}. Not modified.
     * @param elim, subst, invPivot length n. Modified.
     */
    public static void factorTwisted(double[] lower, double[] diag, double[] upper, double[] elim, double[] subst,
            double[] invPivot) {
        int n = diag.length;
        Checks.require(n >= 3, "the twisted factorisation needs at least 3 rows");
        int m = twistRow(n);
        int last = n - 1;
        double ip = 1 / pivot(diag[0], 0);
        invPivot[0] = ip;
        subst[0] = upper[0] * ip;
        elim[0] = 0;
        for (int i = 1; i < m; i++) {
            ip = 1 / pivot(diag[i] - lower[i] * subst[i - 1], i);
            invPivot[i] = ip;
            subst[i] = upper[i] * ip;
            elim[i] = lower[i] * ip;
        }
        ip = 1 / pivot(diag[last], last);
        invPivot[last] = ip;
        subst[last] = lower[last] * ip;
        elim[last] = 0;
        for (int i = last - 1; i > m; i--) {
            ip = 1 / pivot(diag[i] - upper[i] * subst[i + 1], i);
            invPivot[i] = ip;
            subst[i] = lower[i] * ip;
            elim[i] = upper[i] * ip;
        }
        ip = 1 / pivot(diag[m] - lower[m] * subst[m - 1] - upper[m] * subst[m + 1], m);
        invPivot[m] = ip;
        elim[m] = lower[m] * ip;
        subst[m] = upper[m] * ip;
    }

    /**
     * Solves with a factorisation from {@link #factorTwisted}, for a right-hand side already multiplied row by
     * row by {@code invPivot} (callers that form the right-hand side can fold that product into their own
     * coefficients).
     *
     * @param elim, subst from {@link #factorTwisted}. Not modified.
     * @param scaled      d_i x invPivot_i; overwritten by intermediate values. Modified.
     * @param out         receives x; must not be {@code scaled}. Modified.
     */
    public static void solveTwisted(double[] elim, double[] subst, double[] scaled, double[] out) {
        int n = scaled.length;
        int m = twistRow(n);
        int last = n - 1;
        double top = scaled[0];
        double bottom = scaled[last];
        // down from row 0 through m - 1 and up from row last through m + 1, interleaved
        int i = 1;
        int j = last - 1;
        for (; i < m && j > m; i++, j--) {
            top = Math.fma(-elim[i], top, scaled[i]);
            scaled[i] = top;
            bottom = Math.fma(-elim[j], bottom, scaled[j]);
            scaled[j] = bottom;
        }
        for (; i < m; i++) {
            top = Math.fma(-elim[i], top, scaled[i]);
            scaled[i] = top;
        }
        for (; j > m; j--) {
            bottom = Math.fma(-elim[j], bottom, scaled[j]);
            scaled[j] = bottom;
        }
        double x = scaled[m] - elim[m] * top - subst[m] * bottom;
        substituteTwisted(subst, scaled, m, x, out, n);
    }

    private static double pivot(double p, int row) {
        if (p == 0 || !Double.isFinite(p)) {
            throw new IllegalArgumentException("tridiagonal system has a zero pivot at row " + row);
        }
        return p;
    }

    /**
     * The back substitution of the two-ended solve: from the middle unknown x = out[m] outwards to both ends,
     * out[i] = work[i] - subst[i] out[i + 1] below m and out[j] = work[j] - subst[j] out[j - 1] above it,
     * the two recurrences interleaved, for the first n unknowns.
     */
    static void substituteTwisted(double[] subst, double[] work, int m, double x, double[] out, int n) {
        out[m] = x;
        double up = x;
        double down = x;
        int i = m - 1;
        int j = m + 1;
        for (; i >= 0 && j < n; i--, j++) {
            up = Math.fma(-subst[i], up, work[i]);
            out[i] = up;
            down = Math.fma(-subst[j], down, work[j]);
            out[j] = down;
        }
        for (; i >= 0; i--) {
            up = Math.fma(-subst[i], up, work[i]);
            out[i] = up;
        }
        for (; j < n; j++) {
            down = Math.fma(-subst[j], down, work[j]);
            out[j] = down;
        }
    }
}
