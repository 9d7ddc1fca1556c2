package org.dendrokin.core.model;

import java.util.Objects;

/**
 * The Crank-Nicolson matrices of one cable for the last few values of c = dt D / 2, factored once and reused for
 * every step with that c: A = B - c L (the implicit side, tridiagonal, factored by the Thomas algorithm and, for
 * the scalar solver's fused sweeps, also by the twisted factorisation of {@link TridiagonalSolver#factorTwisted})
 * and P = B + c L (the explicit side), with B and L those of {@link CableGrid}. A run uses one c per gap between
 * events, and a few distinct gaps recur (before and after each stimulus), so a handful of slots, replaced in
 * turn, hold them all. Not thread-safe; allocates only at construction.
 */
final class CrankNicolsonCache {
    /** Slots kept; a protocol's distinct gap lengths rarely exceed it. */
    private static final int SLOTS = 4;

    /** The matrices for one c. Arrays have one entry per node; read-only outside this class. */
    static final class Factors {
        /** c = dt D / 2 (um^2 / um^2, dimensionless with L in 1/um^2); NaN while the slot is empty. */
        double c = Double.NaN;
        /** Sub-diagonal of A and its Thomas factorisation ({@link TridiagonalSolver#factor}). */
        final double[] lower;
        final double[] cPrime;
        final double[] invPivot;
        /** P = B + c L. */
        final double[] pLower;
        final double[] pDiag;
        final double[] pUpper;
        /** Twisted factorisation of A (null unless asked for). */
        final double[] elim;
        final double[] subst;
        final double[] twistedInvPivot;
        /** P's rows and L's rows, each divided by the twisted pivot of its row (null unless asked for). */
        final double[] sLower;
        final double[] sDiag;
        final double[] sUpper;
        final double[] lapLower;
        final double[] lapDiag;
        final double[] lapUpper;

        private Factors(int n, boolean twisted) {
            lower = new double[n];
            cPrime = new double[n];
            invPivot = new double[n];
            pLower = new double[n];
            pDiag = new double[n];
            pUpper = new double[n];
            elim = twisted ? new double[n] : null;
            subst = twisted ? new double[n] : null;
            twistedInvPivot = twisted ? new double[n] : null;
            sLower = twisted ? new double[n] : null;
            sDiag = twisted ? new double[n] : null;
            sUpper = twisted ? new double[n] : null;
            lapLower = twisted ? new double[n] : null;
            lapDiag = twisted ? new double[n] : null;
            lapUpper = twisted ? new double[n] : null;
        }
    }

    private final CableGrid grid;
    private final boolean twisted;
    private final Factors[] slots = new Factors[SLOTS];
    private final double[] diag;
    private final double[] upper;
    private int next;
    private Factors last;

    /**
     * @param grid    the cable
     * @param twisted also keep the twisted factorisation and the pivot-scaled rows (needs at least 3 nodes to be
     *                used; with fewer they stay zero)
     */
    CrankNicolsonCache(CableGrid grid, boolean twisted) {
        this.grid = Objects.requireNonNull(grid, "grid");
        this.twisted = twisted;
        for (int k = 0; k < SLOTS; k++) {
            slots[k] = new Factors(grid.n, twisted);
        }
        diag = new double[grid.n];
        upper = new double[grid.n];
        last = slots[0];
    }

    /** The matrices for c = dt D / 2, computed on a miss into the slot used longest ago. */
    Factors get(double c) {
        if (last.c == c) {
            return last;
        }
        for (Factors f : slots) {
            if (f.c == c) {
                last = f;
                return f;
            }
        }
        Factors f = slots[next];
        next = (next + 1) % SLOTS;
        fill(f, c);
        last = f;
        return f;
    }

    private void fill(Factors f, double c) {
        CableGrid g = grid;
        int n = g.n;
        double[] lower = f.lower;
        for (int i = 0; i < n; i++) {
            lower[i] = g.massLower[i] - c * g.lower[i];
            diag[i] = g.massDiag[i] - c * g.diag[i];
            upper[i] = g.massUpper[i] - c * g.upper[i];
            f.pLower[i] = g.massLower[i] + c * g.lower[i];
            f.pDiag[i] = g.massDiag[i] + c * g.diag[i];
            f.pUpper[i] = g.massUpper[i] + c * g.upper[i];
        }
        TridiagonalSolver.factor(lower, diag, upper, f.cPrime, f.invPivot);
        if (twisted && n >= 3) {
            TridiagonalSolver.factorTwisted(lower, diag, upper, f.elim, f.subst, f.twistedInvPivot);
            for (int i = 0; i < n; i++) {
                double ip = f.twistedInvPivot[i];
                f.sLower[i] = f.pLower[i] * ip;
                f.sDiag[i] = f.pDiag[i] * ip;
                f.sUpper[i] = f.pUpper[i] * ip;
                f.lapLower[i] = g.lower[i] * ip;
                f.lapDiag[i] = g.diag[i] * ip;
                f.lapUpper[i] = g.upper[i] * ip;
            }
        }
        f.c = c;
    }
}
