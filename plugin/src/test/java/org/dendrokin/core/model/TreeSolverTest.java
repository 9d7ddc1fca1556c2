package org.dendrokin.core.model;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;

import java.util.List;
import java.util.Random;

import org.ejml.data.DMatrixRMaj;
import org.ejml.dense.row.CommonOps_DDRM;
import org.junit.jupiter.api.Test;

class TreeSolverTest {
    /** A random tree on n nodes: each node's parent is a random later node (the last is the root). */
    private static int[] randomTree(Random random, int n, double chainBias) {
        int[] parent = new int[n];
        for (int i = 0; i < n - 1; i++) {
            parent[i] = random.nextDouble() < chainBias ? i + 1 : i + 1 + random.nextInt(n - 1 - i);
        }
        parent[n - 1] = -1;
        return parent;
    }

    private static double[] solveDense(int[] parent, double[] diag, double[] toParent, double[] fromParent,
            double[] rhs) {
        int n = parent.length;
        DMatrixRMaj a = new DMatrixRMaj(n, n);
        DMatrixRMaj b = new DMatrixRMaj(n, 1);
        for (int i = 0; i < n; i++) {
            a.set(i, i, diag[i]);
            if (parent[i] >= 0) {
                a.set(i, parent[i], toParent[i]);
                a.set(parent[i], i, fromParent[i]);
            }
            b.set(i, 0, rhs[i]);
        }
        DMatrixRMaj x = new DMatrixRMaj(n, 1);
        CommonOps_DDRM.solve(a, b, x);
        return x.getData();
    }

    @Test
    void agreesWithEjmlDenseSolveOnRandomTrees() {
        Random random = new Random(20261214);
        for (int n : new int[] {1, 2, 3, 5, 17, 60, 300}) {
            for (double bias : new double[] {0, 0.5, 0.95}) {
                int[] parent = randomTree(random, n, bias);
                double[] diag = new double[n];
                double[] toParent = new double[n];
                double[] fromParent = new double[n];
                double[] rhs = new double[n];
                double[] rowSum = new double[n];
                for (int i = 0; i < n; i++) {
                    if (parent[i] >= 0) {
                        toParent[i] = random.nextDouble() * 2 - 1;
                        fromParent[i] = random.nextDouble() * 2 - 1;
                        rowSum[i] += Math.abs(toParent[i]);
                        rowSum[parent[i]] += Math.abs(fromParent[i]);
                    }
                    rhs[i] = random.nextGaussian();
                }
                for (int i = 0; i < n; i++) {
                    diag[i] = rowSum[i] + 0.1 + random.nextDouble();   // diagonally dominant rows
                }
                TreeSolver solver = new TreeSolver(parent);
                TreeSolver.Factors f = new TreeSolver.Factors(n);
                solver.factor(diag, toParent, fromParent, f, new double[n]);
                double[] x = new double[n];
                double[] work = rhs.clone();
                solver.solve(f, work, x);
                // REF: EJML CommonOps_DDRM.solve (dense LU) as an independent implementation [common practice]
                assertArrayEquals(solveDense(parent, diag, toParent, fromParent, rhs), x, 1e-11,
                        "n = " + n + ", chain bias " + bias);
                double[] inPlace = rhs.clone();
                solver.solve(f, inPlace, inPlace);
                assertArrayEquals(x, inPlace, 0, "solving in place, n = " + n);
            }
        }
    }

    @Test
    void aChainIsTheThomasAlgorithm() {
        int n = 40;
        int[] parent = new int[n];
        double[] lower = new double[n];
        double[] diag = new double[n];
        double[] upper = new double[n];
        double[] toParent = new double[n];
        double[] fromParent = new double[n];
        double[] rhs = new double[n];
        Random random = new Random(7);
        for (int i = 0; i < n; i++) {
            parent[i] = i < n - 1 ? i + 1 : -1;
            upper[i] = i < n - 1 ? -random.nextDouble() : 0;
            lower[i] = i > 0 ? -random.nextDouble() : 0;
            diag[i] = 2.5;
            rhs[i] = random.nextGaussian();
        }
        for (int i = 0; i < n - 1; i++) {
            toParent[i] = upper[i];
            fromParent[i] = lower[i + 1];
        }
        double[] thomas = new double[n];
        TridiagonalSolver.solve(lower, diag, upper, rhs, thomas, new double[n]);
        TreeSolver solver = new TreeSolver(parent);
        TreeSolver.Factors f = new TreeSolver.Factors(n);
        solver.factor(diag, toParent, fromParent, f, new double[n]);
        double[] x = new double[n];
        solver.solve(f, rhs.clone(), x);
        // REF: Thomas algorithm (Thomas 1949) [published: standard]; sheet s6.3
        assertArrayEquals(thomas, x, 1e-13);
    }

    @Test
    void theGridOfATreeIsSolvedLikeADenseMatrix() {
        TreeGeometry tree = TreeGeometry.of(List.of(new TreeGeometry.Branch("trunk", 10, 1.0),
                new TreeGeometry.Branch("a", 6, 0.5), new TreeGeometry.Branch("b", 4, 0.7),
                new TreeGeometry.Branch("c", 3, 0.4), new TreeGeometry.Branch("d", 5, 0.3)),
                List.of(TreeGeometry.Junction.of(end("trunk", TreeGeometry.End.END), end("a", TreeGeometry.End.START),
                        end("b", TreeGeometry.End.START)), TreeGeometry.Junction.of(end("b", TreeGeometry.End.END),
                        end("c", TreeGeometry.End.START), end("d", TreeGeometry.End.START))))
                .withBoundary(end("d", TreeGeometry.End.END), Boundary.FIXED);
        TreeGrid grid = new TreeGrid(new TreeDomain(tree, 0.5), 4);
        TreeCrankNicolsonCache cache = new TreeCrankNicolsonCache(grid);
        TreeCrankNicolsonCache.Factors f = cache.get(0.3);
        int n = grid.n;
        int[] parent = grid.solver.parents();
        double[] diag = new double[n];
        double[] toParent = new double[n];
        double[] fromParent = new double[n];
        for (int i = 0; i < n; i++) {
            diag[i] = grid.mass.diag[i] - 0.3 * grid.lap.diag[i];
            toParent[i] = grid.mass.toParent[i] - 0.3 * grid.lap.toParent[i];
            fromParent[i] = grid.mass.fromParent[i] - 0.3 * grid.lap.fromParent[i];
        }
        Random random = new Random(11);
        double[] rhs = new double[n];
        for (int i = 0; i < n; i++) {
            rhs[i] = random.nextGaussian();
        }
        double[] x = new double[n];
        cache.solve(f, rhs.clone(), x);
        // REF: EJML CommonOps_DDRM.solve (dense LU) [common practice]
        assertArrayEquals(solveDense(parent, diag, toParent, fromParent, rhs), x, 1e-12, "branch by branch");
        TreeSolver.Factors hines = new TreeSolver.Factors(n);
        grid.solver.factor(diag, toParent, fromParent, hines, new double[n]);
        double[] y = rhs.clone();
        grid.solver.solve(hines, y, y);
        // REF: EJML CommonOps_DDRM.solve (dense LU) [common practice]
        assertArrayEquals(solveDense(parent, diag, toParent, fromParent, rhs), y, 1e-12, "Hines' order");
        double[] inPlace = rhs.clone();
        cache.solve(f, inPlace, inPlace);
        assertArrayEquals(x, inPlace, 0, "branch by branch, in place");
    }

    @Test
    void everyBranchLengthFromOneInnerNodeUpIsSolved() {
        Random random = new Random(5);
        for (double dx : new double[] {2.5, 1.7, 1.25, 1.0, 0.7, 0.45}) {
            TreeGeometry tree = TreeGeometry.of(List.of(new TreeGeometry.Branch("p", 5, 1.0),
                    new TreeGeometry.Branch("q", 3.4, 0.5), new TreeGeometry.Branch("r", 2.5, 0.7),
                    new TreeGeometry.Branch("s", 7, 0.4)),
                    List.of(TreeGeometry.Junction.of(end("p", TreeGeometry.End.START), end("q", TreeGeometry.End.END),
                            end("r", TreeGeometry.End.START), end("s", TreeGeometry.End.END))))
                    .withBoundary(end("q", TreeGeometry.End.START), Boundary.FIXED);
            TreeGrid grid = new TreeGrid(new TreeDomain(tree, dx), 4);
            int n = grid.n;
            TreeCrankNicolsonCache cache = new TreeCrankNicolsonCache(grid);
            double c = 0.1 + random.nextDouble();
            TreeCrankNicolsonCache.Factors f = cache.get(c);
            int[] parent = grid.solver.parents();
            double[] diag = new double[n];
            double[] toParent = new double[n];
            double[] fromParent = new double[n];
            double[] rhs = new double[n];
            for (int i = 0; i < n; i++) {
                diag[i] = grid.mass.diag[i] - c * grid.lap.diag[i];
                toParent[i] = grid.mass.toParent[i] - c * grid.lap.toParent[i];
                fromParent[i] = grid.mass.fromParent[i] - c * grid.lap.fromParent[i];
                rhs[i] = random.nextGaussian();
            }
            double[] x = new double[n];
            cache.solve(f, rhs.clone(), x);
            // REF: EJML CommonOps_DDRM.solve (dense LU) [common practice]
            assertArrayEquals(solveDense(parent, diag, toParent, fromParent, rhs), x, 1e-12, "dx = " + dx);
        }
    }

    @Test
    void refusesAnArrayThatIsNotATree() {
        assertThrows(IllegalArgumentException.class, () -> new TreeSolver(new int[] {0, -1}));
        assertThrows(IllegalArgumentException.class, () -> new TreeSolver(new int[] {2, 0, -1}));
        assertThrows(IllegalArgumentException.class, () -> new TreeSolver(new int[] {1, 2}));
    }

    private static TreeGeometry.BranchEnd end(String b, TreeGeometry.End e) {
        return new TreeGeometry.BranchEnd(b, e);
    }
}
