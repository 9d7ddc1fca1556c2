package org.dendrokin.core.model;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;

import java.util.Arrays;
import java.util.Random;

import org.ejml.data.DMatrixRMaj;
import org.ejml.dense.row.CommonOps_DDRM;
import org.junit.jupiter.api.Test;

class TridiagonalSolverTest {
    private static double[] fill(int n, double v) {
        double[] a = new double[n];
        Arrays.fill(a, v);
        return a;
    }

    @Test
    void solvesTheWorkedSystems() {
        double[] x = new double[4];
        double[] work = new double[4];
        TridiagonalSolver.solve(fill(4, -1), fill(4, 2), fill(4, -1), new double[] {1, 0, 0, 1}, x, work);
        // REF: Thomas algorithm worked system, exact by substitution [published: standard]; sheet s6.3
        assertArrayEquals(new double[] {1, 1, 1, 1}, x, 1e-14);
        TridiagonalSolver.solve(fill(4, 1), fill(4, 4), fill(4, 1), new double[] {5, 6, 6, 5}, x, work);
        // REF: Thomas algorithm worked system [published: standard]; sheet s6.3
        assertArrayEquals(new double[] {1, 1, 1, 1}, x, 1e-14);
        TridiagonalSolver.solve(fill(4, 1), fill(4, 4), fill(4, 1), new double[] {1, 2, 3, 4}, x, work);
        // REF: Thomas algorithm worked system, (34, 73, 92, 186)/209 [published: standard]; sheet s6.3
        assertArrayEquals(new double[] {34 / 209.0, 73 / 209.0, 92 / 209.0, 186 / 209.0}, x, 1e-14);
    }

    @Test
    void agreesWithEjmlDenseSolveWithAndWithoutFactorisation() {
        Random random = new Random(20261201);
        for (int n : new int[] {1, 2, 3, 4, 5, 17, 200}) {
            double[] lower = new double[n];
            double[] diag = new double[n];
            double[] upper = new double[n];
            double[] rhs = new double[n];
            DMatrixRMaj a = new DMatrixRMaj(n, n);
            DMatrixRMaj b = new DMatrixRMaj(n, 1);
            for (int i = 0; i < n; i++) {
                lower[i] = i > 0 ? random.nextDouble() * 2 - 1 : 0;
                upper[i] = i < n - 1 ? random.nextDouble() * 2 - 1 : 0;
                diag[i] = Math.abs(lower[i]) + Math.abs(upper[i]) + 0.1 + random.nextDouble();
                rhs[i] = random.nextGaussian();
                a.set(i, i, diag[i]);
                if (i > 0) {
                    a.set(i, i - 1, lower[i]);
                }
                if (i < n - 1) {
                    a.set(i, i + 1, upper[i]);
                }
                b.set(i, 0, rhs[i]);
            }
            DMatrixRMaj x = new DMatrixRMaj(n, 1);
            CommonOps_DDRM.solve(a, b, x);
            double[] thomas = new double[n];
            TridiagonalSolver.solve(lower, diag, upper, rhs, thomas, new double[n]);
            // REF: EJML CommonOps_DDRM.solve (dense LU) as an independent implementation [common practice]; sheet s6.3
            assertArrayEquals(x.data, thomas, 1e-12, "n = " + n);
            double[] cPrime = new double[n];
            double[] invPivot = new double[n];
            TridiagonalSolver.factor(lower, diag, upper, cPrime, invPivot);
            double[] factored = rhs.clone();
            TridiagonalSolver.solveFactored(lower, cPrime, invPivot, factored, factored);
            // REF: EJML CommonOps_DDRM.solve (dense LU) [common practice]; sheet s6.3
            assertArrayEquals(x.data, factored, 1e-12, "factored, n = " + n);
            if (n >= 3) {
                double[] elim = new double[n];
                double[] subst = new double[n];
                double[] twInv = new double[n];
                TridiagonalSolver.factorTwisted(lower, diag, upper, elim, subst, twInv);
                double[] scaled = new double[n];
                for (int i = 0; i < n; i++) {
                    scaled[i] = rhs[i] * twInv[i];
                }
                double[] twisted = new double[n];
                TridiagonalSolver.solveTwisted(elim, subst, scaled, twisted);
                // REF: EJML CommonOps_DDRM.solve (dense LU) [common practice]; sheet s6.3
                assertArrayEquals(x.data, twisted, 1e-12, "twisted, n = " + n);
            }
        }
    }

    @Test
    void zeroPivotIsReported() {
        assertThrows(IllegalArgumentException.class, () -> TridiagonalSolver.solve(new double[2], new double[2],
                new double[2], new double[2], new double[2], new double[2]));
    }
}
