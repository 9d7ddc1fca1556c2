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
        for (int q = 0; q < index.length; q++) {
            int i = index[q];
            target[base + q] = field[i] + weight[q] * (field[next[q]] - field[i]);
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
