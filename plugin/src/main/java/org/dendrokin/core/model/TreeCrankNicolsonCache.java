package org.dendrokin.core.model;

import java.util.Objects;

/**
 * The Crank-Nicolson matrices of a tree for the last few values of c = dt D / 2, the tree counterpart of
 * {@link CrankNicolsonCache}: A = B - c L factored by {@link TreeSystem} (each branch by two-ended elimination, the
 * junctions and ends by Hines' method) and P = B + c L for the explicit side, with B and L those of
 * {@link TreeGrid}. A few slots, replaced in turn, hold the step sizes a run's
 * gaps between events use. Not thread-safe; allocates only at construction.
 */
final class TreeCrankNicolsonCache {
    private static final int SLOTS = 4;

    /** The matrices for one c; read-only outside this class. */
    static final class Factors {
        /** c = dt D / 2 (dimensionless with L in 1/um^2 and D dt in um^2); NaN while the slot is empty. */
        double c = Double.NaN;
        /** A = B - c L, factored. */
        final TreeSystem.Factors implicit;
        /** P = B + c L. */
        final TreeMatrix explicit;

        private Factors(TreeGrid grid, TreeSystem system) {
            implicit = system.newFactors();
            explicit = new TreeMatrix(grid.solver.parents());
        }
    }

    private final TreeGrid grid;
    private final TreeSystem system;
    private final Factors[] slots = new Factors[SLOTS];
    private final TreeMatrix scratch;
    private final double[] work;
    private int next;
    private Factors last;

    TreeCrankNicolsonCache(TreeGrid grid) {
        this.grid = Objects.requireNonNull(grid, "grid");
        system = new TreeSystem(grid);
        for (int k = 0; k < SLOTS; k++) {
            slots[k] = new Factors(grid, system);
        }
        scratch = new TreeMatrix(grid.solver.parents());
        work = new double[grid.n];
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
        scratch.setSum(grid.mass, -c, grid.lap);
        system.factor(scratch, f.implicit, work);
        f.explicit.setSum(grid.mass, c, grid.lap);
        f.c = c;
        last = f;
        return f;
    }

    /** Solves A x = r for the factors f. {@code rhs} is overwritten; x may be rhs. */
    void solve(Factors f, double[] rhs, double[] x) {
        system.solve(f.implicit, rhs, x);
    }
}
