package org.dendrokin.core.fit;

import java.util.Arrays;
import java.util.Objects;

import org.dendrokin.core.kymo.Kymograph;

/**
 * Observations on a model's grid with their noise standard deviations. Grid points whose value is NaN (or
 * whose sigma is not a positive finite number) are left out of the fit. When the grid is a kymograph the data know
 * its shape (points per row, row-major: {@code frame * columns + position}), so that intervals can take account of
 * residuals that are correlated between neighbouring points; without a shape ({@link #columns()} 0) the points have
 * no neighbours. Data whose points are stored in an order of their own (a tree's branches one after another) can
 * still name their grid: {@link #onGrid} takes the point at each (row, column). Immutable; arrays are copied.
 */
public final class FitData {
    private final double[] values;
    private final double[] sigmas;
    /** Grid indices of the used points, or null when every point is used. */
    private final int[] used;
    private final int usedCount;
    private final double[] weights;
    private final double[] observed;
    private final int columns;
    /** Uncertainty of an input behind the values, or null. */
    private final InputUncertainty inputs;
    /** The point at grid slot row * columns + column, or null when the points are stored row by row. */
    private final int[] pointAt;

    /**
     * Data without a grid shape.
     *
     * @param values observed value at each grid point, signal units; NaN marks a missing point
     * @param sigmas noise standard deviation at each grid point, signal units (weights are 1 / sigma^2)
     */
    public FitData(double[] values, double[] sigmas) {
        this(values, sigmas, 0);
    }

    /**
     * Data on a row-major grid of {@code columns} points per row (a kymograph: positions per frame).
     *
     * @param values  observed value at each grid point, signal units; NaN marks a missing point
     * @param sigmas  noise standard deviation at each grid point, signal units (weights are 1 / sigma^2)
     * @param columns points per row, dividing the number of points; 0 for data without a grid shape
     */
    public FitData(double[] values, double[] sigmas, int columns) {
        this(values.clone(), sigmas.clone(), columns, true);
    }

    /** Takes the arrays as they are: the caller made them for this object alone (owned is only a marker). */
    private FitData(double[] values, double[] sigmas, int columns, boolean owned) {
        this(values, sigmas, columns, (InputUncertainty) null, null);
    }

    /** Takes the arrays as they are, with an input uncertainty or null and a grid order or null. */
    private FitData(double[] values, double[] sigmas, int columns, InputUncertainty inputs, int[] pointAt) {
        this.inputs = inputs;
        this.pointAt = pointAt;
        if (values.length != sigmas.length) {
            throw new IllegalArgumentException("there are " + values.length + " values but " + sigmas.length
                    + " noise levels");
        }
        if (columns < 0 || (columns != 0 && values.length % columns != 0)) {
            // messages built only when needed: fits of many sessions build many FitData
            throw new IllegalArgumentException(columns + " points per row do not divide the " + values.length
                    + " grid points");
        }
        this.columns = columns;
        this.values = values;
        this.sigmas = sigmas;
        this.weights = new double[values.length];
        // one plain loop: a stream's growing buffer cost as much as the rest of a global fit's setup
        int[] all = new int[values.length];
        int count = 0;
        for (int g = 0; g < values.length; g++) {
            if (Double.isFinite(values[g]) && sigmas[g] > 0 && Double.isFinite(sigmas[g])) {
                all[count++] = g;
                weights[g] = 1 / (sigmas[g] * sigmas[g]);
            }
        }
        if (count == values.length) {
            // every point is used: the observed values are the values, and the i-th used point is point i (a joint
            // fit of 100 kymographs holds a third less memory; values is owned and never handed out)
            this.used = null;
            this.observed = values;
        } else {
            this.used = Arrays.copyOf(all, count);
            this.observed = new double[values.length];
            for (int g : used) {
                observed[g] = values[g];
            }
        }
        this.usedCount = count;
    }

    /**
     * Data on a grid of {@code columns} points per row whose points are stored in an order of their own.
     *
     * @param values  observed value at each point, signal units; NaN marks a missing point
     * @param sigmas  noise standard deviation at each point, signal units
     * @param columns points per row, dividing the number of points (positive)
     * @param pointAt the point at each grid slot, {@code pointAt[row * columns + column]}: every point exactly once
     */
    public static FitData onGrid(double[] values, double[] sigmas, int columns, int[] pointAt) {
        if (columns <= 0 || pointAt.length != values.length) {
            throw new IllegalArgumentException("a grid of " + columns + " columns needs one slot for each of the "
                    + values.length + " points, got " + pointAt.length);
        }
        boolean[] seen = new boolean[values.length];
        for (int g : pointAt) {
            if (g < 0 || g >= values.length || seen[g]) {
                throw new IllegalArgumentException("the grid order must name every point exactly once (point " + g
                        + ")");
            }
            seen[g] = true;
        }
        return new FitData(values.clone(), sigmas.clone(), columns, null, pointAt.clone());
    }

    public static FitData unweighted(double[] values) {
        double[] ones = new double[values.length];
        Arrays.fill(ones, 1);
        return new FitData(values, ones);
    }

    /** A kymograph (row-major) with one noise level per position, repeated over frames. */
    public static FitData of(Kymograph k, double[] sigmaPerPosition) {
        int nx = k.positionCount();
        if (sigmaPerPosition.length != nx) {
            throw new IllegalArgumentException("need one noise level per position (" + nx + "), got "
                    + sigmaPerPosition.length);
        }
        double[] s = new double[nx * k.frameCount()];
        for (int f = 0; f < k.frameCount(); f++) {
            System.arraycopy(sigmaPerPosition, 0, s, f * nx, nx);
        }
        // both arrays are fresh copies (Kymograph.values() copies), so they need no second copy
        return new FitData(k.values(), s, nx, true);
    }

    /**
     * A kymograph (row-major) with a noise level for every sample.
     *
     * @param k              the kymograph. Not modified.
     * @param sigmaPerSample noise SD of each sample, signal units, row-major like {@link Kymograph#values()}
     */
    public static FitData ofSamples(Kymograph k, double[] sigmaPerSample) {
        return new FitData(k.values(), sigmaPerSample.clone(), k.positionCount(), true);
    }

    /** Number of grid points, used or not. */
    public int size() {
        return values.length;
    }

    /** Points per row of the grid (positions per frame of a kymograph), or 0 if the data have no grid shape. */
    public int columns() {
        return columns;
    }

    /** Rows of the grid (frames of a kymograph), or 0 if the data have no grid shape. */
    public int rows() {
        return columns == 0 ? 0 : values.length / columns;
    }

    /** The point at a row and column of the grid (row-major unless the data were made {@link #onGrid}). */
    public int point(int row, int column) {
        int slot = row * columns + column;
        return pointAt == null ? slot : pointAt[slot];
    }

    /** True when the grid's points are stored row by row ({@code point(row, column) = row * columns + column}). */
    public boolean rowMajor() {
        return pointAt == null;
    }

    /** Number of points that enter the fit. */
    public int usedCount() {
        return usedCount;
    }

    /** Grid index of the i-th used point. */
    public int usedIndex(int i) {
        if (used == null) {
            Objects.checkIndex(i, usedCount);
            return i;
        }
        return used[i];
    }

    public double value(int gridIndex) {
        return values[gridIndex];
    }

    public double sigma(int gridIndex) {
        return sigmas[gridIndex];
    }

    /** Weight 1 / sigma^2 of a grid point, 0 for a point left out of the fit. */
    public double weight(int gridIndex) {
        return weights[gridIndex];
    }

    /**
     * The observed value of a grid point, 0 for a point left out of the fit (so that weight times residual is
     * always finite; pair it with {@link #weight}).
     */
    public double observed(int gridIndex) {
        return observed[gridIndex];
    }

    /** A copy of the observed values over the whole grid. */
    public double[] values() {
        return values.clone();
    }

    /** A copy of the sigmas over the whole grid. */
    public double[] sigmas() {
        return sigmas.clone();
    }

    /**
     * The same data with the uncertainty of an input they were computed from (see {@link InputUncertainty});
     * every shift must be as long as the grid.
     */
    public FitData withInputUncertainty(InputUncertainty uncertainty) {
        for (double[] shift : uncertainty.shifts()) {
            if (shift.length != values.length) {
                throw new IllegalArgumentException("an input shift has " + shift.length + " points, the data "
                        + values.length);
            }
        }
        return new FitData(values, sigmas, columns, uncertainty, pointAt);
    }

    /** The uncertainty of an input behind the values, or null when none was given. */
    public InputUncertainty inputUncertainty() {
        return inputs;
    }

    /**
     * The same grid and sigmas with other observed values (used for parametric bootstrap replicates); the input
     * uncertainty is not carried over.
     */
    public FitData withValues(double[] newValues) {
        return new FitData(newValues, sigmas, columns);
    }
}
