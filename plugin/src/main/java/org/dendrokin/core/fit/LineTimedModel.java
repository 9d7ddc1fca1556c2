package org.dendrokin.core.fit;

import java.util.Arrays;
import java.util.List;

import org.dendrokin.core.Checks;

/**
 * A model evaluated at each sample's own time in a raster-scanned kymograph. The sample at frame f and position p
 * was taken at t_f + delta_p (delta_p the scan-line delay of the row it lies on, 0 <= delta_p < t_{f+1} - t_f). The
 * inner model predicts the frame times subdivided into K equal steps, t_f + j h_f (h_f = (t_{f+1} - t_f) / K,
 * j = 0..K-1), with one time appended after the last frame ({@link #extendedTimes}); the prediction at
 * t_f + delta_p is interpolated linearly between the two inner times around it:
 * <pre>
 *   u = K delta_p / (t_{f+1} - t_f),  j = floor(u),  a = u - j
 *   y(f, p) = (1 - a) m(f K + j, p) + a m(f K + j + 1, p)
 * </pre>
 * and its Jacobian is the same combination of the inner model's rows. The data stay as recorded; only the model
 * moves to the sample times, so the noise of neighbouring frames stays independent (re-sampling the data instead
 * would correlate it and bias the residual checks). The interpolation error is at most (h^2 / 8) |d^2 m / dt^2|
 * [common practice]: K = 4 keeps a front that moves two of its widths per frame within a few percent.
 */
public final class LineTimedModel implements FitModel {
    private final FitModel inner;
    private final int positions;
    private final int frames;
    /** For each sample, the inner row (time index) below its time, and the weight of the row above. */
    private final int[] lowerRow;
    private final double[] weightNext;

    /** As {@link #LineTimedModel(FitModel, double[], double[], int)} with one step per frame (K = 1). */
    public LineTimedModel(FitModel inner, double[] timesS, double[] delaysS) {
        this(inner, timesS, delaysS, 1);
    }

    /**
     * @param inner        the model on {@link #extendedTimes}{@code (timesS, subdivisions)}: size
     *                     {@code (frames * subdivisions + 1) * positions}
     * @param timesS       the kymograph's frame times, s (length {@code frames}, at least 2). Not modified.
     * @param delaysS      each position's delay after its frame's time, s. Not modified.
     * @param subdivisions K, the inner steps per frame (at least 1)
     */
    public LineTimedModel(FitModel inner, double[] timesS, double[] delaysS, int subdivisions) {
        this.inner = inner;
        this.positions = delaysS.length;
        this.frames = timesS.length;
        Checks.require(frames >= 2, "line timing needs at least two frames");
        Checks.require(subdivisions >= 1, "at least one step per frame");
        Checks.require(inner.size() == (frames * subdivisions + 1) * positions,
                "the inner model must predict the subdivided frame times and one time more");
        this.lowerRow = new int[frames * positions];
        this.weightNext = new double[frames * positions];
        for (int f = 0; f < frames; f++) {
            double step = f + 1 < frames ? timesS[f + 1] - timesS[f] : timesS[f] - timesS[f - 1];
            for (int p = 0; p < positions; p++) {
                double u = subdivisions * delaysS[p] / step;
                int j = Math.max(0, Math.min(subdivisions - 1, (int) Math.floor(u)));
                lowerRow[f * positions + p] = f * subdivisions + j;
                weightNext[f * positions + p] = u - j;
            }
        }
    }

    /** The frame times with one frame appended, on which the inner model of K = 1 is to be built. */
    public static double[] extendedTimes(double[] timesS) {
        return extendedTimes(timesS, 1);
    }

    /**
     * The times the inner model predicts: each frame interval cut into {@code subdivisions} equal steps, and one
     * time a frame interval after the last frame.
     */
    public static double[] extendedTimes(double[] timesS, int subdivisions) {
        Checks.require(timesS.length >= 2, "line timing needs at least two frames");
        Checks.require(subdivisions >= 1, "at least one step per frame");
        int n = timesS.length;
        double[] t = new double[n * subdivisions + 1];
        for (int f = 0; f < n; f++) {
            double step = f + 1 < n ? timesS[f + 1] - timesS[f] : timesS[f] - timesS[f - 1];
            for (int j = 0; j < subdivisions; j++) {
                t[f * subdivisions + j] = timesS[f] + j * step / subdivisions;
            }
        }
        t[n * subdivisions] = timesS[n - 1] + (timesS[n - 1] - timesS[n - 2]);
        return t;
    }

    @Override
    public String name() {
        return inner.name();
    }

    @Override
    public List<ParameterSpec> parameters() {
        return inner.parameters();
    }

    @Override
    public int size() {
        return frames * positions;
    }

    @Override
    public boolean hasJacobian() {
        return inner.hasJacobian();
    }

    @Override
    public void evaluate(double[] theta, double[] values, double[] jacobian) {
        int q = theta.length;
        double[] m = new double[inner.size()];
        double[] jm = jacobian == null ? null : new double[inner.size() * q];
        inner.evaluate(theta, m, jm);
        combine(m, jm, 0, 0, size(), q, values, jacobian);
    }

    @Override
    public boolean hasRangeEvaluation() {
        return true;
    }

    @Override
    public void evaluateRange(double[] theta, int from, int to, double[] values, double[] jacobian) {
        int q = theta.length;
        // the inner rows from the first point's lower row to the last point's upper row
        int innerFrom = lowerRow[from] * positions;
        int innerTo = (lowerRow[to - 1] + 2) * positions;
        double[] m = new double[innerTo - innerFrom];
        double[] jm = new double[m.length * q];
        if (inner.hasRangeEvaluation()) {
            inner.evaluateRange(theta, innerFrom, innerTo, m, jm);
        } else {
            double[] all = new double[inner.size()];
            double[] allJ = new double[inner.size() * q];
            inner.evaluate(theta, all, allJ);
            System.arraycopy(all, innerFrom, m, 0, m.length);
            System.arraycopy(allJ, innerFrom * q, jm, 0, jm.length);
        }
        combine(m, jacobian == null ? null : jm, innerFrom, from, to, q, values, jacobian);
    }

    /** y_i = (1 - a_i) m(lower_i) + a_i m(lower_i + 1), i in [from, to); m and jm start at inner point offset. */
    private void combine(double[] m, double[] jm, int offset, int from, int to, int q, double[] values,
                         double[] jacobian) {
        for (int i = from; i < to; i++) {
            double a = weightNext[i];
            int here = lowerRow[i] * positions + i % positions - offset;
            int next = here + positions;
            values[i - from] = (1 - a) * m[here] + a * m[next];
            if (jacobian != null) {
                for (int c = 0; c < q; c++) {
                    jacobian[(i - from) * q + c] = (1 - a) * jm[here * q + c] + a * jm[next * q + c];
                }
            }
        }
    }

    @Override
    public boolean hasNormalEquations() {
        return true;
    }

    /** One pass over the grid in blocks of the range evaluation, summing the weighted normal equations. */
    @Override
    public void normalEquations(double[] theta, FitData data, NormalEquations out, double[] fitted) {
        NormalEquations.sumByBlocks(this, theta, data, out, fitted, Math.max(positions, 4096 / positions * positions));
    }

    @Override
    public List<String> headlineParameters() {
        return inner.headlineParameters();
    }

    @Override
    public List<DerivedQuantity> derivedQuantities() {
        return inner.derivedQuantities();
    }

    @Override
    public String poorlyDeterminedAdvice() {
        return inner.poorlyDeterminedAdvice();
    }
}
