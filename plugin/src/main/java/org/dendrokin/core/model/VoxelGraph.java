package org.dendrokin.core.model;

import java.util.Arrays;
import java.util.List;

/**
 * The voxels of the stochastic mode ({@link StochasticEnsemble}) as a graph: each voxel's volume, whether it is a
 * fixed (open) end, its neighbours (a fixed number of slots per voxel, -1 for an empty slot) with the coefficient of
 * the deterministic Laplacian towards each (a molecule of species s jumps there at rate D_s x coefficient), the summed
 * coefficients towards fixed neighbours (which feed molecules in), the output sampling (two voxels and a weight per
 * position), and the stimuli's profiles and clamp masks. Built from a cable, as its tridiagonal grid, or from a tree,
 * where a junction's voxel has neighbours on every branch that meets there.
 */
record VoxelGraph(double[] volume, boolean[] fixed, int[][] neighbours, double[][] coefficients, double[] feed,
        int[] sampleFrom, int[] sampleTo, double[] sampleWeight, double[][] profile, boolean[][] clampMask) {
    /** A cable: neighbours left and right, as the cable solver's tridiagonal Laplacian. */
    static VoxelGraph of(Domain domain, double[] outputPositionsUm, List<Stimulus> stimuli) {
        CableGrid grid = new CableGrid(domain);
        int n = grid.n;
        boolean[] fixed = new boolean[n];
        int[][] neighbours = new int[n][];
        double[][] coefficients = new double[n][];
        double[] feed = new double[n];
        for (int i = 0; i < n; i++) {
            fixed[i] = grid.fixedEnds && (i == 0 || i == n - 1);
            neighbours[i] = new int[] {i - 1, i + 1 < n ? i + 1 : -1};
            coefficients[i] = new double[] {grid.lower[i], grid.upper[i]};
        }
        for (int i = 0; i < n; i++) {
            for (int k = 0; k < 2; k++) {
                int j = neighbours[i][k];
                if (j >= 0 && fixed[j] && !fixed[i]) {
                    feed[i] += coefficients[i][k];
                }
            }
        }
        int positions = outputPositionsUm.length;
        int[] from = new int[positions];
        int[] to = new int[positions];
        double[] weight = new double[positions];
        for (int p = 0; p < positions; p++) {
            double sx = Math.min(Math.max(outputPositionsUm[p] / grid.h, 0), n - 1);
            int i = Math.min((int) Math.floor(sx), n - 2);
            from[p] = i;
            to[p] = i + 1;
            weight[p] = sx - i;
        }
        int k = stimuli.size();
        double[][] profile = new double[k][];
        boolean[][] clampMask = new boolean[k][];
        for (int s = 0; s < k; s++) {
            Stimulus st = stimuli.get(s);
            if (st.kind() == Stimulus.Kind.CLAMP) {
                clampMask[s] = new boolean[n];
                for (int i = 0; i < n; i++) {
                    clampMask[s][i] = !fixed[i] && st.clamps(grid.x(i));
                }
            } else {
                profile[s] = new double[n];
                for (int i = 0; i < n; i++) {
                    profile[s][i] = fixed[i] ? 0 : st.profile(grid.x(i));
                }
            }
        }
        return new VoxelGraph(grid.volume, fixed, neighbours, coefficients, feed, from, to, weight, profile,
                clampMask);
    }

    /** A tree: each node's neighbours along its branch, and at a junction along every branch there. */
    static VoxelGraph of(TreeGrid grid, int[] sampleFrom, int[] sampleTo, double[] sampleWeight, StimulusLayout layout) {
        int n = grid.n;
        int[] degree = new int[n];
        for (int i = 0; i < n; i++) {
            int p = grid.solver.parent(i);
            if (p >= 0) {
                degree[i]++;
                degree[p]++;
            }
        }
        int slots = 0;
        for (int v : degree) {
            slots = Math.max(slots, v);
        }
        int[][] neighbours = new int[n][slots];
        double[][] coefficients = new double[n][slots];
        for (int[] row : neighbours) {
            Arrays.fill(row, -1);
        }
        int[] used = new int[n];
        for (int i = 0; i < n; i++) {
            int p = grid.solver.parent(i);
            if (p >= 0) {
                neighbours[i][used[i]] = p;
                coefficients[i][used[i]++] = grid.lap.toParent[i];
                neighbours[p][used[p]] = i;
                coefficients[p][used[p]++] = grid.lap.fromParent[i];
            }
        }
        double[] feed = new double[n];
        for (int i = 0; i < n; i++) {
            for (int k = 0; k < slots; k++) {
                int j = neighbours[i][k];
                if (j >= 0 && grid.fixed[j] && !grid.fixed[i]) {
                    feed[i] += coefficients[i][k];
                }
            }
        }
        return new VoxelGraph(grid.volume, grid.fixed, neighbours, coefficients, feed, sampleFrom, sampleTo,
                sampleWeight, layout.profile, layout.clampMask);
    }
}
