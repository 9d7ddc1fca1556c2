package org.dendrokin.core.fit;

import java.util.Arrays;

import org.dendrokin.core.Checks;
import org.dendrokin.core.kymo.Kymograph;

/**
 * Observations on a model's grid with their noise standard deviations. Grid points whose value is NaN (or
 * whose sigma is not a positive finite number) are left out of the fit. When the grid is a kymograph the data know
 * its shape (points per row, row-major: {@code frame * columns + position}), so that intervals can take account of
 * residuals that are correlated between neighbouring points; without a shape ({@link #columns()} 0) the points have
 * no neighbours. Immutable; arrays are copied.
 */
public final class FitData {
    private final double[] values;
    private final double[] sigmas;
    private final int[] used;
    private final double[] weights;
    private final double[] observed;
    private final int columns;

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
        Checks.require(values.length == sigmas.length,
                "there are " + values.length + " values but " + sigmas.length + " noise levels");
        Checks.require(columns >= 0 && (columns == 0 || values.length % columns == 0),
                columns + " points per row do not divide the " + values.length + " grid points");
        this.columns = columns;
        this.values = values.clone();
        this.sigmas = sigmas.clone();
        this.used = java.util.stream.IntStream.range(0, values.length)
                .filter(i -> Double.isFinite(values[i]) && sigmas[i] > 0 && Double.isFinite(sigmas[i]))
                .toArray();
        this.weights = new double[values.length];
        this.observed = new double[values.length];
        for (int g : used) {
            weights[g] = 1 / (sigmas[g] * sigmas[g]);
            observed[g] = values[g];
        }
    }

    /** Unweighted data: every sigma is 1. */
    public static FitData unweighted(double[] values) {
        double[] ones = new double[values.length];
        Arrays.fill(ones, 1);
        return new FitData(values, ones);
    }

    /** A kymograph (row-major) with one noise level per position, repeated over frames. */
    public static FitData of(Kymograph k, double[] sigmaPerPosition) {
        int nx = k.positionCount();
        Checks.require(sigmaPerPosition.length == nx,
                "need one noise level per position (" + nx + "), got " + sigmaPerPosition.length);
        double[] s = new double[nx * k.frameCount()];
        for (int f = 0; f < k.frameCount(); f++) {
            System.arraycopy(sigmaPerPosition, 0, s, f * nx, nx);
        }
        return new FitData(k.values(), s, nx);
    }

    /**
     * A kymograph (row-major) with a noise level for every sample.
     *
     * @param k              the kymograph. Not modified.
     * @param sigmaPerSample noise SD of each sample, signal units, row-major like {@link Kymograph#values()}
     */
    public static FitData ofSamples(Kymograph k, double[] sigmaPerSample) {
        return new FitData(k.values(), sigmaPerSample, k.positionCount());
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

    /** Number of points that enter the fit. */
    public int usedCount() {
        return used.length;
    }

    /** Grid index of the i-th used point. */
    public int usedIndex(int i) {
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

    /** The same grid and sigmas with other observed values (used for parametric bootstrap replicates). */
    public FitData withValues(double[] newValues) {
        return new FitData(newValues, sigmas, columns);
    }
}
