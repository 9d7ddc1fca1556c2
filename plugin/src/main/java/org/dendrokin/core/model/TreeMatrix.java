package org.dendrokin.core.model;

import java.util.Arrays;

/**
 * A matrix with the sparsity of a tree (see {@link TreeSolver}), kept two ways: by parent ({@code diag},
 * {@code toParent[i]} = M[i][parent(i)], {@code fromParent[i]} = M[parent(i)][i]), which the factorisation reads,
 * and as a tridiagonal part plus a few "jumps", which the product M v reads in one vectorisable sweep: {@code lower[i]}
 * = M[i][i - 1] where node i - 1's parent is i, {@code upper[i]} = M[i][i + 1] where node i's parent is i + 1, and
 * for every node whose parent is not the next node (a branch's last node joining its parent junction elsewhere in
 * the numbering) the two entries between it and its parent. Allocation-free after construction.
 */
final class TreeMatrix {
    final int n;
    final double[] diag;
    final double[] toParent;
    final double[] fromParent;
    final double[] lower;
    final double[] upper;
    private final int[] parentOf;
    private final int[] jumpChild;
    private final int[] jumpParent;
    private final double[] jumpTo;
    private final double[] jumpFrom;

    /** A zero matrix on the tree of {@code parent} (see {@link TreeSolver}); fill by parent, then {@link #sync}. */
    TreeMatrix(int[] parent) {
        n = parent.length;
        diag = new double[n];
        toParent = new double[n];
        fromParent = new double[n];
        lower = new double[n];
        upper = new double[n];
        int jumps = 0;
        for (int i = 0; i < n; i++) {
            if (parent[i] >= 0 && parent[i] != i + 1) {
                jumps++;
            }
        }
        jumpChild = new int[jumps];
        jumpParent = new int[jumps];
        jumpTo = new double[jumps];
        jumpFrom = new double[jumps];
        int j = 0;
        for (int i = 0; i < n; i++) {
            if (parent[i] >= 0 && parent[i] != i + 1) {
                jumpChild[j] = i;
                jumpParent[j] = parent[i];
                j++;
            }
        }
        parentOf = parent.clone();
    }

    /** Rebuilds the product's form from the by-parent entries. */
    void sync() {
        Arrays.fill(lower, 0);
        Arrays.fill(upper, 0);
        for (int i = 0; i < n; i++) {
            int p = parentOf[i];
            if (p == i + 1) {
                upper[i] = toParent[i];
                lower[p] = fromParent[i];
            }
        }
        for (int j = 0; j < jumpChild.length; j++) {
            jumpTo[j] = toParent[jumpChild[j]];
            jumpFrom[j] = fromParent[jumpChild[j]];
        }
    }

    /** this = a + s b, entry by entry (the same tree). */
    void setSum(TreeMatrix a, double s, TreeMatrix b) {
        for (int i = 0; i < n; i++) {
            diag[i] = a.diag[i] + s * b.diag[i];
            toParent[i] = a.toParent[i] + s * b.toParent[i];
            fromParent[i] = a.fromParent[i] + s * b.fromParent[i];
        }
        sync();
    }

    /** out = M v. {@code out} must not be {@code v}. */
    void apply(double[] v, double[] out) {
        applyTridiagonal(v, lower, diag, upper, out, n);
        for (int j = 0; j < jumpChild.length; j++) {
            int c = jumpChild[j];
            int p = jumpParent[j];
            out[c] += jumpTo[j] * v[p];
            out[p] += jumpFrom[j] * v[c];
        }
    }

    /** out += s M v. */
    void addApplied(double s, double[] v, double[] out) {
        int last = n - 1;
        if (n == 1) {
            out[0] += s * diag[0] * v[0];
            return;
        }
        out[0] += s * (diag[0] * v[0] + upper[0] * v[1]);
        for (int i = 1; i < last; i++) {
            out[i] += s * (lower[i] * v[i - 1] + diag[i] * v[i] + upper[i] * v[i + 1]);
        }
        out[last] += s * (lower[last] * v[last - 1] + diag[last] * v[last]);
        for (int j = 0; j < jumpChild.length; j++) {
            int c = jumpChild[j];
            int p = jumpParent[j];
            out[c] += s * jumpTo[j] * v[p];
            out[p] += s * jumpFrom[j] * v[c];
        }
    }

    /** The three-point part, in a static method of its own so that the JIT vectorises it. */
    private static void applyTridiagonal(double[] v, double[] lo, double[] d, double[] up, double[] out, int n) {
        if (n == 1) {
            out[0] = d[0] * v[0];
            return;
        }
        int last = n - 1;
        out[0] = d[0] * v[0] + up[0] * v[1];
        for (int i = 1; i < last; i++) {
            out[i] = lo[i] * v[i - 1] + d[i] * v[i] + up[i] * v[i + 1];
        }
        out[last] = lo[last] * v[last - 1] + d[last] * v[last];
    }
}
