package org.dendrokin.core.fit;

import java.util.Arrays;

/**
 * The weighted normal equations of a fit at one parameter point, summed over the data without keeping the
 * n x p Jacobian: A = sum_i w_i J_i J_i^T, g = sum_i w_i r_i J_i and chi^2 = sum_i w_i r_i^2, where J_i is the
 * row d f_i / d theta on the natural scale, r_i = y_i - f_i the residual and w_i = 1 / sigma_i^2 the weight of
 * the used points (0 for points left out). A model that can form them in one pass over its grid fills them in
 * {@link FitModel#normalEquations}; {@link ModelFit} turns them into a small equivalent problem for the
 * optimiser. Not thread-safe: one instance per evaluation in flight.
 */
public final class NormalEquations {
    private final int p;
    private final double[] matrix;
    private final double[] gradient;
    private double chiSquare;

    /** Empty equations for {@code parameterCount} parameters. */
    public NormalEquations(int parameterCount) {
        this.p = parameterCount;
        this.matrix = new double[parameterCount * parameterCount];
        this.gradient = new double[parameterCount];
    }

    public int parameterCount() {
        return p;
    }

    /** Sets A, g and chi^2 to zero. */
    public void clear() {
        Arrays.fill(matrix, 0);
        Arrays.fill(gradient, 0);
        chiSquare = 0;
    }

    /**
     * Adds one data point.
     *
     * @param row      d f_i / d theta, natural scale, length {@link #parameterCount()}. Not modified.
     * @param weight   w_i = 1 / sigma_i^2 (0 adds nothing but the finite products)
     * @param residual r_i = y_i - f_i
     */
    public void addPoint(double[] row, double weight, double residual) {
        for (int a = 0; a < p; a++) {
            double wa = weight * row[a];
            if (wa != 0) {
                for (int b = 0; b < p; b++) {
                    matrix[a * p + b] += wa * row[b];
                }
                gradient[a] += wa * residual;
            }
        }
        chiSquare += weight * residual * residual;
    }

    /**
     * Packs a partial sum in the layout {@link #addPacked} reads, from the upper triangle of A that a block sweep
     * fills (the lower triangle is mirrored from it).
     *
     * @param upper A row-major (p x p), only its upper triangle read. Not modified.
     * @param g     the gradient, length p. Not modified.
     * @param chi   the weighted sum of squared residuals
     * @param p     the number of parameters
     * @return length p^2 + p + 1
     */
    public static double[] pack(double[] upper, double[] g, double chi, int p) {
        double[] part = new double[p * p + p + 1];
        for (int x = 0; x < p; x++) {
            for (int y = x; y < p; y++) {
                part[x * p + y] = upper[x * p + y];
                part[y * p + x] = upper[x * p + y];
            }
        }
        System.arraycopy(g, 0, part, p * p, p);
        part[p * p + p] = chi;
        return part;
    }

    /**
     * Adds a partial sum (for instance one block of frames) packed in one array: A row-major (p x p), then g (p), then chi^2, the layout the models'
     * block sweeps fill.
     *
     * @param packed length p^2 + p + 1. Not modified.
     */
    public void addPacked(double[] packed) {
        for (int i = 0; i < matrix.length; i++) {
            matrix[i] += packed[i];
        }
        for (int a = 0; a < p; a++) {
            gradient[a] += packed[matrix.length + a];
        }
        chiSquare += packed[matrix.length + p];
    }

    /** A_ab. */
    public double matrix(int a, int b) {
        return matrix[a * p + b];
    }

    /** g_a. */
    public double gradient(int a) {
        return gradient[a];
    }

    /** chi^2. */
    public double chiSquare() {
        return chiSquare;
    }

    /** True if A, g and chi^2 are all finite numbers. */
    public boolean isFinite() {
        if (!Double.isFinite(chiSquare)) {
            return false;
        }
        for (double v : matrix) {
            if (!Double.isFinite(v)) {
                return false;
            }
        }
        for (double v : gradient) {
            if (!Double.isFinite(v)) {
                return false;
            }
        }
        return true;
    }

    /**
     * Sums the weighted normal equations of a model that evaluates ranges of its grid ({@link
     * FitModel#evaluateRange}), one block of points at a time, so that no n x p Jacobian is kept: the
     * {@link FitModel#normalEquations} of models that wrap another one.
     *
     * @param model  the model; {@link FitModel#hasRangeEvaluation()} must be true
     * @param theta  natural parameter values. Not modified.
     * @param data   observations on the model's grid. Not modified.
     * @param out    cleared and filled. Modified.
     * @param fitted if not null, receives the prediction at every grid point. Modified.
     * @param block  points per block, at least 1
     */
    public static void sumByBlocks(FitModel model, double[] theta, FitData data, NormalEquations out, double[] fitted,
                                   int block) {
        out.clear();
        int p = model.parameters().size();
        double[] values = new double[block];
        double[] jac = new double[block * p];
        double[] row = new double[p];
        for (int from = 0; from < model.size(); from += block) {
            int to = Math.min(model.size(), from + block);
            model.evaluateRange(theta, from, to, values, jac);
            for (int i = from; i < to; i++) {
                double v = values[i - from];
                if (fitted != null) {
                    fitted[i] = v;
                }
                double w = data.weight(i);
                if (w > 0) {
                    System.arraycopy(jac, (i - from) * p, row, 0, p);
                    out.addPoint(row, w, data.observed(i) - v);
                }
            }
        }
    }
}
