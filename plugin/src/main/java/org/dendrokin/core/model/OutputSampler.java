package org.dendrokin.core.model;

import org.dendrokin.core.Checks;

/**
 * Samples a field on the grid's nodes at the kymograph's output positions, by linear interpolation between the
 * two nearest nodes, and blends two time levels for frames that fall between steps. Shared by the scalar and
 * network runs on a cable and on a tree (where the two nodes around a position need not be neighbours in the
 * numbering); allocation-free after construction.
 */
final class OutputSampler {
    private final int[] index;
    /** The node after {@code index} along the cable or branch. */
    private final int[] next;
    private final double[] weight;
    /** True when every output position is a node, in order from node 0 (sampling is then a copy). */
    private final boolean identity;
    /**
     * Runs of output positions that are nodes numbered one after another, up or down (a tree's branches sampled at
     * their nodes): run r covers positions runStart[r] .. runStart[r + 1] - 1, from node runNode[r] in direction
     * runStep[r] (+1 or -1), or is interpolated when runStep[r] is 0. Null when not worth it.
     */
    private final int[] runStart;
    private final int[] runNode;
    private final int[] runStep;

    /**
     * @param outputPositionsUm positions along the cable, um, within [0, lengthUm] (a relative 1e-9 tolerance)
     * @param lengthUm          length of the cable, um
     * @param nodeSpacingUm     spacing of the grid's nodes, um
     * @param nodes             number of nodes, at least 2
     */
    OutputSampler(double[] outputPositionsUm, double lengthUm, double nodeSpacingUm, int nodes) {
        int positions = outputPositionsUm.length;
        Checks.require(positions > 0, "at least one output position is needed");
        index = new int[positions];
        next = new int[positions];
        weight = new double[positions];
        for (int p = 0; p < positions; p++) {
            double x = outputPositionsUm[p];
            Checks.require(x >= -1e-9 * lengthUm && x <= lengthUm * (1 + 1e-9),
                    "output position " + x + " um lies outside the domain [0, " + lengthUm + "] um");
            double s = Math.min(Math.max(x / nodeSpacingUm, 0), nodes - 1);
            int i = Math.min((int) Math.floor(s), nodes - 2);
            index[p] = i;
            next[p] = i + 1;
            weight[p] = s - i;
        }
        boolean same = positions == nodes;
        for (int p = 0; p < positions && same; p++) {
            same = (index[p] == p && weight[p] == 0) || (p == nodes - 1 && index[p] == p - 1 && weight[p] == 1);
        }
        identity = same;
        runStart = null;
        runNode = null;
        runStep = null;
    }

    /**
     * Positions given by their two nodes: value = (1 - w) field[from] + w field[to].
     *
     * @param from   first node of each position. Copied.
     * @param to     second node of each position. Copied.
     * @param weight w of each position, in [0, 1]. Copied.
     */
    OutputSampler(int[] from, int[] to, double[] weight) {
        Checks.require(from.length > 0, "at least one output position is needed");
        Checks.require(from.length == to.length && from.length == weight.length, "one node pair and weight per"
                + " output position");
        index = from.clone();
        next = to.clone();
        this.weight = weight.clone();
        identity = false;
        // positions at nodes: weight 0 takes the first node, weight 1 the second
        int positions = from.length;
        int[] node = new int[positions];
        for (int q = 0; q < positions; q++) {
            node[q] = weight[q] == 0 ? from[q] : weight[q] == 1 ? to[q] : -1;
        }
        java.util.List<int[]> runs = new java.util.ArrayList<>();
        int q = 0;
        while (q < positions) {
            int start = q;
            int step = 0;
            if (node[q] >= 0 && q + 1 < positions && node[q + 1] >= 0 && Math.abs(node[q + 1] - node[q]) == 1) {
                step = node[q + 1] - node[q];
                q++;
                while (q + 1 < positions && node[q + 1] >= 0 && node[q + 1] - node[q] == step) {
                    q++;
                }
            }
            q++;
            if (step == 0 && !runs.isEmpty() && runs.get(runs.size() - 1)[2] == 0) {
                continue;   // extends the interpolated run before it
            }
            runs.add(new int[] {start, step == 0 ? -1 : node[start], step});
        }
        runStart = new int[runs.size() + 1];
        runNode = new int[runs.size()];
        runStep = new int[runs.size()];
        for (int r = 0; r < runs.size(); r++) {
            runStart[r] = runs.get(r)[0];
            runNode[r] = runs.get(r)[1];
            runStep[r] = runs.get(r)[2];
        }
        runStart[runs.size()] = positions;
    }

    /** Number of output positions. */
    int positions() {
        return index.length;
    }

    /** Writes the field at the output positions into row {@code frame} of {@code target}. */
    void sample(double[] field, double[] target, int frame) {
        int base = frame * index.length;
        if (identity) {
            System.arraycopy(field, 0, target, base, index.length);
            return;
        }
        if (runStart != null) {
            for (int r = 0; r < runNode.length; r++) {
                int from = runStart[r];
                int to = runStart[r + 1];
                if (runStep[r] > 0) {
                    System.arraycopy(field, runNode[r], target, base + from, to - from);
                } else if (runStep[r] < 0) {
                    copyDown(field, runNode[r], target, base + from, to - from);
                } else {
                    interpolate(field, target, base, from, to);
                }
            }
            return;
        }
        interpolate(field, target, base, 0, index.length);
    }

    private void interpolate(double[] field, double[] target, int base, int from, int to) {
        for (int q = from; q < to; q++) {
            int i = index[q];
            target[base + q] = field[i] + weight[q] * (field[next[q]] - field[i]);
        }
    }

    /** target[at + k] = field[first - k] for k < count. */
    private static void copyDown(double[] field, int first, double[] target, int at, int count) {
        for (int k = 0; k < count; k++) {
            target[at + k] = field[first - k];
        }
    }

    /**
     * Writes {@code (1 - w) before + w after} at the output positions into row {@code frame} of {@code target}:
     * linear in time between two steps, second order like the scheme.
     */
    void blend(double[] before, double[] after, double w, double[] target, int frame) {
        int base = frame * index.length;
        double v = 1 - w;
        for (int q = 0; q < index.length; q++) {
            int i = index[q];
            double x = weight[q];
            int j = next[q];
            double a = before[i] + x * (before[j] - before[i]);
            double b = after[i] + x * (after[j] - after[i]);
            target[base + q] = v * a + w * b;
        }
    }

    /**
     * Writes {@code (1 - w) before + w after} into row {@code frame} of {@code target}, for two fields already
     * sampled at the output positions ({@link #sample} with frame 0): linear in time between two steps.
     */
    void mix(double[] before, double[] after, double w, double[] target, int frame) {
        mixRows(before, after, w, target, frame * index.length, index.length);
    }

    private static void mixRows(double[] before, double[] after, double w, double[] target, int base, int count) {
        double v = 1 - w;
        for (int q = 0; q < count; q++) {
            target[base + q] = v * before[q] + w * after[q];
        }
    }
}
