package org.dendrokin.core.model;

import java.util.Objects;

import org.dendrokin.core.Checks;

/**
 * A tree and the grid spacing a model runs on it with. Each branch b gets its own uniform grid from its start to its
 * end, n_b = max(3, round(length_b / dxUm) + 1) nodes, spacing h_b = length_b / (n_b - 1) (so h_b differs from dxUm
 * only when dxUm does not divide the length, and a branch shorter than 2 dxUm still has a middle node); the end nodes
 * of branches that meet at a junction are one node.
 *
 * @param tree the branches and junctions
 * @param dxUm requested grid spacing, um, positive
 */
public record TreeDomain(TreeGeometry tree, double dxUm) {
    /** Largest number of nodes a tree grid may have. */
    static final int MAX_NODES = 10_000_000;

    public TreeDomain {
        Objects.requireNonNull(tree, "tree");
        Checks.positiveFinite(dxUm, "grid spacing dx (um)");
        long total = 0;
        for (TreeGeometry.Branch b : tree.branches()) {
            total += Math.max(3, Math.round(b.lengthUm() / dxUm) + 1);
        }
        Checks.require(total <= MAX_NODES, "the tree's grid has too many nodes (total length / dx)");
    }

    /** Nodes on branch b (index in the tree's branch list), both ends included. */
    public int nodeCount(int b) {
        return (int) Math.max(3, Math.round(tree.branches().get(b).lengthUm() / dxUm) + 1);
    }

    /** Nodes on the named branch, both ends included. */
    public int nodeCount(String branch) {
        return nodeCount(index(branch));
    }

    /** Spacing on branch b, um. */
    public double spacingUm(int b) {
        return tree.branches().get(b).lengthUm() / (nodeCount(b) - 1);
    }

    /** Spacing on the named branch, um. */
    public double spacingUm(String branch) {
        return spacingUm(index(branch));
    }

    /** Position of node k of the named branch along it, um. */
    public double nodeUm(String branch, int k) {
        return k * spacingUm(branch);
    }

    /** The positions of the named branch's nodes along it, um. */
    public double[] nodesUm(String branch) {
        double[] x = new double[nodeCount(branch)];
        double h = spacingUm(branch);
        for (int k = 0; k < x.length; k++) {
            x[k] = k * h;
        }
        x[x.length - 1] = tree.branch(branch).lengthUm();
        return x;
    }

    /** The smallest spacing over the branches, um. */
    public double smallestSpacingUm() {
        double h = Double.POSITIVE_INFINITY;
        for (int b = 0; b < tree.branchCount(); b++) {
            h = Math.min(h, spacingUm(b));
        }
        return h;
    }

    /** Number of grid nodes of the whole tree (junction nodes counted once). */
    public int totalNodeCount() {
        int total = tree.vertexCount();
        for (int b = 0; b < tree.branchCount(); b++) {
            total += nodeCount(b) - 2;
        }
        return total;
    }

    private int index(String branch) {
        int b = tree.indexOf(branch);
        Checks.require(b >= 0, "there is no branch " + branch + " in the tree " + tree.branchNames());
        return b;
    }
}
