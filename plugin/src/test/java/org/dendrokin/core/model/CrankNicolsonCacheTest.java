package org.dendrokin.core.model;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotSame;
import static org.junit.jupiter.api.Assertions.assertSame;

import org.ejml.simple.SimpleMatrix;
import org.junit.jupiter.api.Test;

/** The cached Crank-Nicolson factorisations against dense matrices solved by EJML. */
class CrankNicolsonCacheTest {
    /** The tridiagonal matrix B + sign c L of the grid, dense. */
    private static SimpleMatrix dense(CableGrid g, double sign, double c) {
        SimpleMatrix a = new SimpleMatrix(g.n, g.n);
        for (int i = 0; i < g.n; i++) {
            a.set(i, i, g.massDiag[i] + sign * c * g.diag[i]);
            if (i > 0) {
                a.set(i, i - 1, g.massLower[i] + sign * c * g.lower[i]);
            }
            if (i < g.n - 1) {
                a.set(i, i + 1, g.massUpper[i] + sign * c * g.upper[i]);
            }
        }
        return a;
    }

    @Test
    void factorsSolveTheImplicitSideAndHoldTheExplicitOne() {
        Domain compact = new Domain(10, 0.5, Boundary.NO_FLUX);
        Domain tapered = new Domain(10, 0.5, Boundary.FIXED, CrossSection.of(new double[] {0, 10},
                new double[] {1, 3}));
        for (CableGrid g : new CableGrid[] {new CableGrid(compact, 4), new CableGrid(tapered, 2)}) {
            CrankNicolsonCache cache = new CrankNicolsonCache(g, true);
            double c = 0.37;
            CrankNicolsonCache.Factors f = cache.get(c);
            double[] b = new double[g.n];
            for (int i = 0; i < g.n; i++) {
                b[i] = Math.sin(0.7 * i) + 0.2 * i;
            }
            SimpleMatrix exact = dense(g, -1, c).solve(new SimpleMatrix(g.n, 1, true, b));
            double[] x = new double[g.n];
            TridiagonalSolver.solveFactored(f.lower, f.cPrime, f.invPivot, b, x);
            double[] scaled = new double[g.n];
            for (int i = 0; i < g.n; i++) {
                scaled[i] = b[i] * f.twistedInvPivot[i];
            }
            double[] y = new double[g.n];
            TridiagonalSolver.solveTwisted(f.elim, f.subst, scaled, y);
            SimpleMatrix p = dense(g, 1, c);
            for (int i = 0; i < g.n; i++) {
                // REF: EJML SimpleMatrix.solve (LU with pivoting) [common practice, general-purpose library]
                assertEquals(exact.get(i, 0), x[i], 1e-12, "Thomas solve, row " + i);
                assertEquals(exact.get(i, 0), y[i], 1e-12, "twisted solve, row " + i);
                assertEquals(p.get(i, i), f.pDiag[i], 1e-15, "P diagonal, row " + i);
                assertEquals(p.get(i, i) * f.twistedInvPivot[i], f.sDiag[i], 1e-15, "scaled P, row " + i);
                assertEquals(g.diag[i] * f.twistedInvPivot[i], f.lapDiag[i], 1e-15, "scaled L, row " + i);
            }
        }
    }

    @Test
    void slotsAreReusedUntilReplacedInTurn() {
        CableGrid g = new CableGrid(new Domain(10, 0.5, Boundary.NO_FLUX), 4);
        CrankNicolsonCache cache = new CrankNicolsonCache(g, false);
        CrankNicolsonCache.Factors first = cache.get(0.1);
        assertSame(first, cache.get(0.1), "a repeated c reuses its factors");
        for (double c : new double[] {0.2, 0.3, 0.4}) {
            cache.get(c);
        }
        assertSame(first, cache.get(0.1), "four values fit");
        cache.get(0.5);   // replaces the slot filled longest ago, which held 0.1
        CrankNicolsonCache.Factors again = cache.get(0.1);
        assertEquals(0.1, again.c, 0);
        assertNotSame(cache.get(0.5), again, "0.5 and 0.1 are in different slots");
    }
}
