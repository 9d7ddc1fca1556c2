package org.dendrokin.core.model;

import java.util.ArrayList;
import java.util.List;

/**
 * The discrete Laplacian of a tree of cables, in flux-conservative (finite-volume) form, the tree counterpart of
 * {@link CableGrid}. Branch b has area A_b (um^2), spacing h_b (um) and the nodes of {@link TreeDomain}; a face
 * between two neighbouring nodes of b has conductance A_b / h_b, and a node's control volume V_i is A_b h_b inside a
 * branch and, at a junction, the sum of A_b h_b / 2 over the branches that meet there (A_b h_b / 2 at a free end):
 * <pre>
 *   (L u)_i = sum over neighbours j of (A_b / h_b) (u_j - u_i) / V_i
 * </pre>
 * So a junction node is one concentration shared by its branches (continuity), and its row says that the net flux
 * of its branches into it fills its small volume: as h -&gt; 0, sum_b A_b D du/dx (into the junction) = 0, Kirchhoff's
 * law. The fluxes telescope, so sum_i V_i (L u)_i = 0 and diffusion conserves sum_i V_i u_i exactly. A free end that
 * is open ({@link Boundary#FIXED}) has a zero row and keeps its value.
 * <p>
 * With {@code order} 4 the time derivative goes through the mass matrix of the compact fourth-order scheme,
 * B = I + (h_b^2 / 12) L face by face: rows (1/12, 10/12, 1/12) inside a branch, (10/12, 2/12) at a sealed end, and at
 * a junction 10/12 on the diagonal and (A_b h_b / 12) / V_i towards each branch's neighbour. Then V^T B = V^T (the
 * amount is still conserved), and the junction row is consistent to the same order as the interior: with Kirchhoff's
 * law and its time derivative (sum_b A_b u_b''' = 0) the h^2 and h^3 terms of B u_t - D L u cancel, as they do at a
 * sealed end. Identity at an open end. With order 2, B = I.
 * <p>
 * Nodes are numbered so that a node's parent comes after it ({@link TreeSolver}): the tree is rooted at its vertex of
 * most branches and listed depth-first, children first; each branch contributes its far vertex followed by its inner
 * nodes towards the root, so a branch is one run of consecutive nodes.
 */
final class TreeGrid {
    final TreeDomain domain;
    final int n;
    final TreeSolver solver;
    /** L, 1/um^2 (multiply by D, um^2/s). */
    final TreeMatrix lap;
    /** B (identity unless compact). */
    final TreeMatrix mass;
    /** Control volume of each node, um^3. */
    final double[] volume;
    /** Open (fixed-value) free-end nodes. */
    final boolean[] fixed;
    final boolean anyFixed;
    /** The open free-end nodes, in order. */
    final int[] fixedNodes;
    final boolean compact;
    /** Global node index of node k of branch b (k = 0 at the branch start). */
    final int[][] branchNodes;
    /**
     * Per branch (index in the tree's list): its inner nodes are innerFrom .. innerTo - 1, numbered from the end next
     * to node farNode (the vertex away from the root) towards node nearNode (the vertex towards the root).
     */
    final int[] innerFrom;
    final int[] innerTo;
    final int[] farNode;
    final int[] nearNode;
    /** The vertex nodes (junctions and free ends) in the order of the numbering; the root is last. */
    final int[] vertexNodes;
    /** A branch each node lies on, and its position there, um (for junction nodes, one of their branches). */
    final int[] nodeBranch;
    final double[] nodeUm;

    TreeGrid(TreeDomain domain, int order) {
        this.domain = domain;
        TreeGeometry tree = domain.tree();
        int branches = tree.branchCount();
        int vertices = tree.vertexCount();
        int root = 0;
        for (int v = 1; v < vertices; v++) {
            if (tree.incident(v).length > tree.incident(root).length) {
                root = v;
            }
        }
        // Depth-first from the root, children first. Leaving vertex v, reached through branch b from vertex u, lists
        // v's node and then b's inner nodes from v towards u (every branch has at least one inner node). Each node's
        // parent is then the next node, except the root (none) and a branch's last inner node (u's node, listed
        // later).
        n = domain.totalNodeCount();
        nodeBranch = new int[n];
        nodeUm = new double[n];
        branchNodes = new int[branches][];
        for (int b = 0; b < branches; b++) {
            branchNodes[b] = new int[domain.nodeCount(b)];
        }
        int[] vertexNode = new int[vertices];
        int[] parent = new int[n];
        int[] lastInner = new int[branches];
        int[] nearVertex = new int[branches];
        innerFrom = new int[branches];
        innerTo = new int[branches];
        farNode = new int[branches];
        nearNode = new int[branches];
        vertexNodes = new int[vertices];
        int vertexCount = 0;
        int next = 0;
        List<int[]> stack = new ArrayList<>();
        stack.add(new int[] {root, -1, 0});   // vertex, branch it was reached through, next incident entry
        while (!stack.isEmpty()) {
            int[] top = stack.get(stack.size() - 1);
            int v = top[0];
            int[] incident = tree.incident(v);
            if (top[2] < incident.length) {
                int code = incident[top[2]++];
                int b = code >> 1;
                if (b != top[1]) {
                    stack.add(new int[] {tree.vertex(b, 1 - (code & 1)), b, 0});
                }
                continue;
            }
            stack.remove(stack.size() - 1);
            vertexNode[v] = next;
            vertexNodes[vertexCount++] = next;
            int first = tree.incident(v)[0];
            nodeBranch[next] = first >> 1;
            nodeUm[next] = (first & 1) == 0 ? 0 : tree.branches().get(first >> 1).lengthUm();
            parent[next] = next + 1;
            next++;
            int b = top[1];
            if (b < 0) {
                parent[next - 1] = -1;
                continue;
            }
            int nb = branchNodes[b].length;
            boolean fromStart = tree.vertex(b, 0) == v;
            double h = domain.spacingUm(b);
            farNode[b] = next - 1;
            innerFrom[b] = next;
            for (int step = 1; step < nb - 1; step++) {
                int k = fromStart ? step : nb - 1 - step;
                branchNodes[b][k] = next;
                nodeBranch[next] = b;
                nodeUm[next] = k * h;
                parent[next] = next + 1;
                next++;
            }
            lastInner[b] = next - 1;
            innerTo[b] = next;
            nearVertex[b] = tree.vertex(b, fromStart ? 1 : 0);
        }
        for (int b = 0; b < branches; b++) {
            int nb = branchNodes[b].length;
            branchNodes[b][0] = vertexNode[tree.vertex(b, 0)];
            branchNodes[b][nb - 1] = vertexNode[tree.vertex(b, 1)];
            parent[lastInner[b]] = vertexNode[nearVertex[b]];
            nearNode[b] = vertexNode[nearVertex[b]];
        }
        solver = new TreeSolver(parent);
        lap = new TreeMatrix(parent);
        mass = new TreeMatrix(parent);
        fixed = new boolean[n];
        volume = new double[n];
        boolean open = false;
        for (int v = 0; v < vertices; v++) {
            if (tree.vertexBoundary(v) == Boundary.FIXED) {
                fixed[vertexNode[v]] = true;
                open = true;
            }
        }
        anyFixed = open;
        fixedNodes = java.util.stream.IntStream.range(0, n).filter(i -> fixed[i]).toArray();
        compact = order == 4;
        for (int b = 0; b < branches; b++) {
            double area = tree.branches().get(b).areaUm2();
            double h = domain.spacingUm(b);
            int[] nodes = branchNodes[b];
            for (int k = 0; k < nodes.length; k++) {
                volume[nodes[k]] += area * h * (k == 0 || k == nodes.length - 1 ? 0.5 : 1.0);
            }
        }
        for (int b = 0; b < branches; b++) {
            double area = tree.branches().get(b).areaUm2();
            double h = domain.spacingUm(b);
            int[] nodes = branchNodes[b];
            for (int k = 0; k + 1 < nodes.length; k++) {
                face(nodes[k], nodes[k + 1], area / h, area * h / 12, parent);
            }
        }
        for (int i = 0; i < n; i++) {
            mass.diag[i] += 1;
        }
        lap.sync();
        mass.sync();
    }

    /** Adds one face between nodes a and b: L gets conductance / V, B gets (A h / 12) / V off the diagonal. */
    private void face(int a, int b, double conductance, double massWeight, int[] parent) {
        addEntry(lap, a, b, conductance / volume[a], fixed[a], parent);
        addEntry(lap, b, a, conductance / volume[b], fixed[b], parent);
        if (compact) {
            addEntry(mass, a, b, massWeight / volume[a], fixed[a], parent);
            addEntry(mass, b, a, massWeight / volume[b], fixed[b], parent);
        }
    }

    /** Row i gets +value at column j and -value on its diagonal (a zero row for an open end). */
    private static void addEntry(TreeMatrix m, int i, int j, double value, boolean zeroRow, int[] parent) {
        if (zeroRow) {
            return;
        }
        m.diag[i] -= value;
        if (parent[i] == j) {
            m.toParent[i] += value;
        } else {
            m.fromParent[j] += value;
        }
    }

    /** Amount of a concentration field: sum of volume x value, um^3 x concentration. */
    double amount(double[] u) {
        double s = 0;
        for (int i = 0; i < n; i++) {
            s += volume[i] * u[i];
        }
        return s;
    }

    /** Global index of the node at position k of branch b. */
    int node(int b, int k) {
        return branchNodes[b][k];
    }
}
