package org.dendrokin.core.model;

import org.dendrokin.core.Checks;

/**
 * Solves A x = r for the implicit diffusion matrix of a {@link TreeGrid} branch by branch. Each branch's inner nodes
 * form a tridiagonal block T_b coupled to the rest of the tree only through its two end vertices (a junction or a
 * free end), so by linearity x on the inner nodes is z_b - y_far x_far - y_near x_near, with z_b = T_b^-1 r_b and
 * the responses y = T_b^-1 (coupling column) computed once per matrix. Putting that into the vertex rows leaves a
 * small system on the vertices alone (static condensation), which has the same tree shape as the branches and is
 * solved by Hines' method ({@link TreeSolver}); a last pass corrects the inner nodes. In elimination terms this is
 * Gaussian elimination in the order: inner nodes of every branch, then vertices from the leaves to the root; the
 * only fill is one entry per branch (its two vertices), already present in the vertex tree's shape.
 * <p>
 * Why not eliminate the whole grid in Hines' order: each branch's block is solved by the two-ended (twisted)
 * elimination of {@link TridiagonalSolver#factorTwisted}, two independent recurrences interleaved, as the cable's
 * solver does, so a step on a tree costs about what it costs on one cable of the same number of nodes; a single
 * leaves-to-root sweep is one recurrence, about twice the latency. The result is the same to rounding (tested
 * against {@link TreeSolver} and a dense solve).
 * <p>
 * Immutable structure; {@link Factors} hold one matrix. {@link #solve} allocates nothing.
 */
final class TreeSystem {
    private final int n;
    private final int[] from;
    private final int[] to;
    private final int[] farNode;
    private final int[] nearNode;
    private final int[] farVertex;
    private final int[] nearVertex;
    private final int[] vertexNodes;
    private final TreeSolver vertexSolver;

    /** The factorisation of one matrix; arrays over the grid's nodes (inner nodes used) or its vertices. */
    static final class Factors {
        final double[] elim;
        final double[] subst;
        final double[] invPivot;
        final double[] yFar;
        final double[] yNear;
        /** Per branch: A[far][first inner] and A[near][last inner]. */
        final double[] farRow;
        final double[] nearRow;
        final TreeSolver.Factors vertex;
        final double[] vertexRhs;
        final double[] vertexX;

        Factors(int n, int branches, int vertices) {
            elim = new double[n];
            subst = new double[n];
            invPivot = new double[n];
            yFar = new double[n];
            yNear = new double[n];
            farRow = new double[branches];
            nearRow = new double[branches];
            vertex = new TreeSolver.Factors(vertices);
            vertexRhs = new double[vertices];
            vertexX = new double[vertices];
        }
    }

    TreeSystem(TreeGrid grid) {
        n = grid.n;
        from = grid.innerFrom.clone();
        to = grid.innerTo.clone();
        farNode = grid.farNode.clone();
        nearNode = grid.nearNode.clone();
        vertexNodes = grid.vertexNodes.clone();
        int vertices = vertexNodes.length;
        int[] vertexOf = new int[n];
        java.util.Arrays.fill(vertexOf, -1);
        for (int k = 0; k < vertices; k++) {
            vertexOf[vertexNodes[k]] = k;
        }
        int branches = from.length;
        farVertex = new int[branches];
        nearVertex = new int[branches];
        int[] parent = new int[vertices];
        parent[vertices - 1] = -1;
        for (int b = 0; b < branches; b++) {
            farVertex[b] = vertexOf[farNode[b]];
            nearVertex[b] = vertexOf[nearNode[b]];
            parent[farVertex[b]] = nearVertex[b];
            Checks.require(to[b] > from[b], "every branch needs an inner node");
        }
        vertexSolver = new TreeSolver(parent);
    }

    Factors newFactors() {
        return new Factors(n, from.length, vertexNodes.length);
    }

    /**
     * Factors A, given by parent as in {@link TreeMatrix} on the grid's numbering.
     *
     * @param a    the matrix. Not modified.
     * @param out  receives the factors. Modified.
     * @param work scratch of n values. Modified.
     */
    void factor(TreeMatrix a, Factors out, double[] work) {
        int vertices = vertexNodes.length;
        double[] diag = new double[vertices];
        double[] toParent = new double[vertices];
        double[] fromParent = new double[vertices];
        for (int k = 0; k < vertices; k++) {
            diag[k] = a.diag[vertexNodes[k]];
        }
        for (int b = 0; b < from.length; b++) {
            int s = from[b];
            int e = to[b];
            factorBranch(a, s, e, out);
            // responses to a unit value at the far and near vertices: T y = -(coupling column), sign folded below
            java.util.Arrays.fill(work, s, e, 0);
            work[s] = a.fromParent[farNode[b]];            // A[first inner][far]
            solveBranch(out, s, e, work, out.yFar);
            java.util.Arrays.fill(work, s, e, 0);
            work[e - 1] = a.toParent[e - 1];               // A[last inner][near]
            solveBranch(out, s, e, work, out.yNear);
            double farRow = a.toParent[farNode[b]];        // A[far][first inner]
            double nearRow = a.fromParent[e - 1];          // A[near][last inner]
            out.farRow[b] = farRow;
            out.nearRow[b] = nearRow;
            int kf = farVertex[b];
            int kn = nearVertex[b];
            diag[kf] -= farRow * out.yFar[s];
            toParent[kf] = -farRow * out.yNear[s];
            diag[kn] -= nearRow * out.yNear[e - 1];
            fromParent[kf] = -nearRow * out.yFar[e - 1];
        }
        vertexSolver.factor(diag, toParent, fromParent, out.vertex, new double[vertices]);
    }

    /**
     * Solves A x = r.
     *
     * @param f   factors from {@link #factor}
     * @param rhs r; overwritten by intermediate values. Modified.
     * @param x   receives x; may be {@code rhs}. Modified.
     */
    void solve(Factors f, double[] rhs, double[] x) {
        double[] g = f.vertexRhs;
        for (int k = 0; k < vertexNodes.length; k++) {
            g[k] = rhs[vertexNodes[k]];
        }
        for (int b = 0; b < from.length; b++) {
            int s = from[b];
            int e = to[b];
            solveBranch(f, s, e, rhs, x);
            g[farVertex[b]] -= f.farRow[b] * x[s];
            g[nearVertex[b]] -= f.nearRow[b] * x[e - 1];
        }
        double[] xv = f.vertexX;
        vertexSolver.solve(f.vertex, g, xv);
        for (int k = 0; k < vertexNodes.length; k++) {
            x[vertexNodes[k]] = xv[k];
        }
        for (int b = 0; b < from.length; b++) {
            correct(x, f.yFar, f.yNear, xv[farVertex[b]], xv[nearVertex[b]], from[b], to[b]);
        }
    }

    /** x -= y_far x_far + y_near x_near over one branch's inner nodes (a loop the JIT vectorises). */
    private static void correct(double[] x, double[] yFar, double[] yNear, double far, double near, int s, int e) {
        for (int i = s; i < e; i++) {
            x[i] -= yFar[i] * far + yNear[i] * near;
        }
    }

    /**
     * Twisted factorisation of the block of nodes s .. e - 1 (rows without their couplings to the vertices): down
     * from s and up from e - 1, meeting at m = s + (e - s) / 2, as in {@link TridiagonalSolver#factorTwisted}; also
     * valid for blocks of one and two nodes.
     */
    private static void factorBranch(TreeMatrix a, int s, int e, Factors f) {
        int m = s + (e - s) / 2;
        int last = e - 1;
        // lower(i) = A[i][i - 1] = fromParent[i - 1], upper(i) = A[i][i + 1] = toParent[i], inside the block
        double[] elim = f.elim;
        double[] subst = f.subst;
        double[] invPivot = f.invPivot;
        for (int i = s; i < m; i++) {
            double lower = i > s ? a.fromParent[i - 1] : 0;
            double pivot = a.diag[i] - (i > s ? lower * subst[i - 1] : 0);
            double ip = 1 / checked(pivot, i);
            invPivot[i] = ip;
            subst[i] = a.toParent[i] * ip;
            elim[i] = lower * ip;
        }
        for (int i = last; i > m; i--) {
            double upper = i < last ? a.toParent[i] : 0;
            double pivot = a.diag[i] - (i < last ? upper * subst[i + 1] : 0);
            double ip = 1 / checked(pivot, i);
            invPivot[i] = ip;
            subst[i] = a.fromParent[i - 1] * ip;
            elim[i] = upper * ip;
        }
        double lower = m > s ? a.fromParent[m - 1] : 0;
        double upper = m < last ? a.toParent[m] : 0;
        double pivot = a.diag[m] - (m > s ? lower * subst[m - 1] : 0) - (m < last ? upper * subst[m + 1] : 0);
        double ip = 1 / checked(pivot, m);
        invPivot[m] = ip;
        elim[m] = lower * ip;
        subst[m] = upper * ip;
    }

    private static double checked(double pivot, int row) {
        Checks.require(pivot != 0 && Double.isFinite(pivot), "zero or non-finite pivot at node " + row);
        return pivot;
    }

    /**
     * Solves the block of nodes s .. e - 1 with its twisted factors: rhs holds r there and is overwritten by the
     * eliminated values; x receives the block's solution (x may be rhs).
     */
    private static void solveBranch(Factors f, int s, int e, double[] rhs, double[] x) {
        double[] elim = f.elim;
        double[] subst = f.subst;
        double[] ip = f.invPivot;
        int m = s + (e - s) / 2;
        int last = e - 1;
        double top = 0;
        double bottom = 0;
        if (m > s) {
            top = rhs[s] * ip[s];
            rhs[s] = top;
        }
        if (m < last) {
            bottom = rhs[last] * ip[last];
            rhs[last] = bottom;
        }
        int i = s + 1;
        int j = last - 1;
        for (; i < m && j > m; i++, j--) {
            top = Math.fma(-elim[i], top, rhs[i] * ip[i]);
            rhs[i] = top;
            bottom = Math.fma(-elim[j], bottom, rhs[j] * ip[j]);
            rhs[j] = bottom;
        }
        for (; i < m; i++) {
            top = Math.fma(-elim[i], top, rhs[i] * ip[i]);
            rhs[i] = top;
        }
        for (; j > m; j--) {
            bottom = Math.fma(-elim[j], bottom, rhs[j] * ip[j]);
            rhs[j] = bottom;
        }
        double value = rhs[m] * ip[m] - elim[m] * top - subst[m] * bottom;
        x[m] = value;
        double up = value;
        double down = value;
        i = m - 1;
        j = m + 1;
        for (; i >= s && j <= last; i--, j++) {
            up = Math.fma(-subst[i], up, rhs[i]);
            x[i] = up;
            down = Math.fma(-subst[j], down, rhs[j]);
            x[j] = down;
        }
        for (; i >= s; i--) {
            up = Math.fma(-subst[i], up, rhs[i]);
            x[i] = up;
        }
        for (; j <= last; j++) {
            down = Math.fma(-subst[j], down, rhs[j]);
            x[j] = down;
        }
    }
}
