package org.dendrokin.core.model;

import java.util.List;

import org.dendrokin.core.Checks;

/**
 * The stimuli laid out on a cable's or a tree's grid, once per prepared run: the spatial profile of each pulse or
 * injection at every node, the nodes each clamp holds, and the narrowest stimulus width (which the step rule
 * needs). Fixed-value end nodes take no stimulus. Shared by the scalar and the network runs; {@link TimeMarcher}
 * applies it.
 */
final class StimulusLayout {
    /** Number of nodes every profile and mask covers. */
    final int nodeCount;
    /** Per stimulus, its profile at each node (null for a clamp). */
    final double[][] profile;
    /** Per stimulus, the nodes it holds (null for a pulse or injection). */
    final boolean[][] clampMask;
    /** Narrowest stimulus width, um (the grid spacing for a clamp); infinite without stimuli. */
    final double minWidthUm;

    StimulusLayout(CableGrid grid, List<Stimulus> stimuli) {
        int n = grid.n;
        nodeCount = n;
        int count = stimuli.size();
        profile = new double[count][];
        clampMask = new boolean[count][];
        double narrowest = Double.POSITIVE_INFINITY;
        for (int s = 0; s < count; s++) {
            Stimulus st = stimuli.get(s);
            if (st.kind() == Stimulus.Kind.CLAMP) {
                clampMask[s] = new boolean[n];
                boolean any = false;
                for (int i = 0; i < n; i++) {
                    clampMask[s][i] = !isFixedEnd(grid, i) && st.clamps(grid.x(i));
                    any |= clampMask[s][i];
                }
                Checks.require(any, "the clamp at " + st.positionUm() + " um covers no grid node: make width_um at"
                        + " least half the grid spacing (" + grid.h + " um) or move it inside the domain");
                narrowest = Math.min(narrowest, grid.h);
            } else {
                profile[s] = new double[n];
                for (int i = 0; i < n; i++) {
                    profile[s][i] = isFixedEnd(grid, i) ? 0 : st.profile(grid.x(i));
                }
                narrowest = Math.min(narrowest, st.widthUm());
            }
        }
        minWidthUm = narrowest;
    }

    /**
     * The stimuli on a tree: a pulse's or injection's profile is its Gaussian in the distance along the tree from
     * its position (so a stimulus near a junction spreads into every branch there), a clamp holds the nodes within
     * its half-width along the tree. Open ends take no stimulus.
     */
    StimulusLayout(TreeGrid grid, List<TreeStimulus> stimuli) {
        int n = grid.n;
        nodeCount = n;
        TreeGeometry tree = grid.domain.tree();
        int count = stimuli.size();
        profile = new double[count][];
        clampMask = new boolean[count][];
        double narrowest = Double.POSITIVE_INFINITY;
        for (int s = 0; s < count; s++) {
            TreeStimulus ts = stimuli.get(s);
            Stimulus st = ts.stimulus();
            int branch = tree.indexOf(ts.branch());
            Checks.require(branch >= 0, "a stimulus names branch " + ts.branch() + ", which is not in the tree "
                    + tree.branchNames());
            double[] vertexDistances = tree.vertexDistancesUm(branch, st.positionUm());
            double[] distance = new double[n];
            for (int i = 0; i < n; i++) {
                int b = grid.nodeBranch[i];
                distance[i] = b == branch ? Math.abs(grid.nodeUm[i] - st.positionUm())
                        : tree.distanceTo(vertexDistances, branch, b, grid.nodeUm[i]);
            }
            if (st.kind() == Stimulus.Kind.CLAMP) {
                clampMask[s] = new boolean[n];
                boolean any = false;
                for (int i = 0; i < n; i++) {
                    clampMask[s][i] = !grid.fixed[i] && st.clamps(st.positionUm() + distance[i]);
                    any |= clampMask[s][i];
                }
                Checks.require(any, "the clamp at " + st.positionUm() + " um on branch " + ts.branch() + " covers no"
                        + " grid node: make width_um at least half the grid spacing ("
                        + grid.domain.spacingUm(branch) + " um)");
                narrowest = Math.min(narrowest, grid.domain.smallestSpacingUm());
            } else {
                profile[s] = new double[n];
                for (int i = 0; i < n; i++) {
                    profile[s][i] = grid.fixed[i] ? 0 : st.profile(st.positionUm() + distance[i]);
                }
                narrowest = Math.min(narrowest, st.widthUm());
            }
        }
        minWidthUm = narrowest;
    }

    private static boolean isFixedEnd(CableGrid grid, int i) {
        return grid.fixedEnds && (i == 0 || i == grid.n - 1);
    }
}
