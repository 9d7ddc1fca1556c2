package org.dendrokin.core.model;

import org.dendrokin.core.Checks;

/**
 * Solves A x = r for a matrix with the sparsity of a tree by Hines' method (Hines 1984, "Efficient computation of
 * branched nerve equations", Int J Bio-Medical Computing 15:69-76 [from memory: citation fairly sure]): Gaussian
 * elimination in an order where every node comes before its parent, so that eliminating a node changes only its
 * parent's diagonal and right-hand side, and the factorisation has no fill-in; then back substitution from the
 * root. O(n), no pivoting; stable when A is diagonally dominant, as the implicit diffusion matrices of a tree are
 * for any D &gt;= 0 and time step. On a tree that is a single chain this is the Thomas algorithm.
 * <p>
 * The tree is given by {@code parent[i]}: each node's parent has a larger index, and the last node is the root
 * (parent -1). A matrix is given in the same terms: its diagonal, {@code toParent[i]} = A[i][parent(i)] and
 * {@code fromParent[i]} = A[parent(i)][i]; nothing else may be non-zero. Runs of nodes whose parent is the next
 * node ("chains", one per branch in a tree grid) are swept with the running value kept in a register, as the
 * Thomas algorithm does; a chain's last node passes its elimination to a parent elsewhere.
 * <p>
 * Immutable structure; {@link Factors} hold one matrix. Allocation-free after construction.
 */
final class TreeSolver {
    /** Number of nodes. */
    final int n;
    private final int[] parent;
    /** Chain k is nodes chainStart[k] .. chainStart[k + 1] - 1. */
    private final int[] chainStart;

    /** The factorisation of one matrix. Arrays have one entry per node; read-only outside this class. */
    static final class Factors {
        /** A[parent(i)][i] / pivot(i): the multiplier that eliminates node i from its parent's row. */
        final double[] elim;
        /** 1 / pivot(i). */
        final double[] invPivot;
        /** A[i][parent(i)] / pivot(i). */
        final double[] upScaled;

        Factors(int n) {
            elim = new double[n];
            invPivot = new double[n];
            upScaled = new double[n];
        }
    }

    /**
     * @param parent each node's parent, a larger index; -1 for the last node (the root) only. Copied.
     * @throws IllegalArgumentException for an array that is not such a tree
     */
    TreeSolver(int[] parent) {
        n = parent.length;
        Checks.require(n >= 1, "a tree needs at least one node");
        Checks.require(parent[n - 1] == -1, "the last node must be the root (parent -1)");
        int chains = 1;
        for (int i = 0; i < n - 1; i++) {
            Checks.require(parent[i] > i && parent[i] < n, "node " + i + " needs a parent with a larger index, got "
                    + parent[i]);
            if (parent[i] != i + 1) {
                chains++;
            }
        }
        this.parent = parent.clone();
        chainStart = new int[chains + 1];
        int k = 1;
        for (int i = 0; i < n - 1; i++) {
            if (parent[i] != i + 1) {
                chainStart[k++] = i + 1;
            }
        }
        chainStart[chains] = n;
    }

    /** Each node's parent (-1 for the root). A copy. */
    int[] parents() {
        return parent.clone();
    }

    int parent(int i) {
        return parent[i];
    }

    /**
     * Factors A. Elimination in index order: node i's pivot p_i is its diagonal after its children's eliminations;
     * eliminating it subtracts A[parent][i] A[i][parent] / p_i from its parent's diagonal.
     *
     * @param diag       A[i][i]. Not modified.
     * @param toParent   A[i][parent(i)] (ignored at the root). Not modified.
     * @param fromParent A[parent(i)][i] (ignored at the root). Not modified.
     * @param out        receives the factors. Modified.
     * @param work       scratch, length n. Modified.
     * @throws IllegalArgumentException when a pivot is zero or not finite
     */
    void factor(double[] diag, double[] toParent, double[] fromParent, Factors out, double[] work) {
        System.arraycopy(diag, 0, work, 0, n);
        for (int i = 0; i < n; i++) {
            double pivot = work[i];
            Checks.require(pivot != 0 && Double.isFinite(pivot), "zero or non-finite pivot at node " + i);
            double inv = 1 / pivot;
            out.invPivot[i] = inv;
            int p = parent[i];
            if (p >= 0) {
                out.elim[i] = fromParent[i] * inv;
                out.upScaled[i] = toParent[i] * inv;
                work[p] -= out.elim[i] * toParent[i];
            } else {
                out.elim[i] = 0;
                out.upScaled[i] = 0;
            }
        }
    }

    /**
     * Solves A x = r with a factorisation from {@link #factor}.
     *
     * @param f   the factors
     * @param rhs r; overwritten by the eliminated right-hand side. Modified.
     * @param x   receives x; may be {@code rhs}. Modified.
     */
    void solve(Factors f, double[] rhs, double[] x) {
        double[] elim = f.elim;
        double[] invPivot = f.invPivot;
        double[] up = f.upScaled;
        int chains = chainStart.length - 1;
        for (int k = 0; k < chains; k++) {
            int s = chainStart[k];
            int e = chainStart[k + 1];
            double carry = rhs[s];
            for (int i = s + 1; i < e; i++) {
                carry = Math.fma(-elim[i - 1], carry, rhs[i]);
                rhs[i] = carry;
            }
            int p = parent[e - 1];
            if (p >= 0) {
                rhs[p] = Math.fma(-elim[e - 1], carry, rhs[p]);
            }
        }
        for (int k = chains - 1; k >= 0; k--) {
            int s = chainStart[k];
            int e = chainStart[k + 1];
            int last = e - 1;
            int p = parent[last];
            double value = rhs[last] * invPivot[last];
            if (p >= 0) {
                value = Math.fma(-up[last], x[p], value);
            }
            x[last] = value;
            for (int i = last - 1; i >= s; i--) {
                value = Math.fma(-up[i], value, rhs[i] * invPivot[i]);
                x[i] = value;
            }
        }
    }
}
