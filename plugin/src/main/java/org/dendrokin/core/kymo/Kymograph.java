package org.dendrokin.core.kymo;

import java.util.Arrays;

import org.dendrokin.core.Checks;

/**
 * A signal sampled along a dendrite path over time: one row a frame, one column a position. Immutable;
 * arrays are copied in and out. Values may be NaN where the path left the image or a calibration could
 * not give a finite value.
 */
public final class Kymograph {
    private final double[] distancesUm;
    private final double[] timesS;
    private final double[] values;
    private final String signalUnit;
    private final double[] sampleDelaysS;

    /**
     * @param distancesUm distance of each column from the path's first vertex, um, increasing
     * @param timesS      time of each row, s, increasing
     * @param values      row-major signal, {@code values[frame * distancesUm.length + position]}
     * @param signalUnit  unit of the values, e.g. {@code "dF/F0"} or {@code "uM"}
     */
    public Kymograph(double[] distancesUm, double[] timesS, double[] values, String signalUnit) {
        Checks.require(distancesUm.length > 0, "a kymograph needs at least one position");
        Checks.require(timesS.length > 0, "a kymograph needs at least one frame");
        Checks.require(values.length == distancesUm.length * timesS.length,
                "kymograph has " + values.length + " values, expected " + distancesUm.length * timesS.length);
        this.distancesUm = distancesUm.clone();
        this.timesS = timesS.clone();
        this.values = values.clone();
        this.signalUnit = signalUnit;
        this.sampleDelaysS = null;
    }

    private Kymograph(double[] distancesUm, double[] timesS, double[] values, String signalUnit, double[] delaysS) {
        this.distancesUm = distancesUm;
        this.timesS = timesS;
        this.values = values;
        this.signalUnit = signalUnit;
        this.sampleDelaysS = delaysS;
    }

    /** Builds a kymograph from rows, {@code rows[frame][position]}. */
    public static Kymograph ofRows(double[] distancesUm, double[] timesS, double[][] rows, String signalUnit) {
        int n = distancesUm.length;
        double[] flat = new double[rows.length * n];
        for (int f = 0; f < rows.length; f++) {
            Checks.require(rows[f].length == n, "row " + f + " has " + rows[f].length + " values, expected " + n);
            System.arraycopy(rows[f], 0, flat, f * n, n);
        }
        return new Kymograph(distancesUm, timesS, flat, signalUnit);
    }

    public int positionCount() {
        return distancesUm.length;
    }

    public int frameCount() {
        return timesS.length;
    }

    public double value(int frame, int position) {
        return values[frame * distancesUm.length + position];
    }

    public double distanceUm(int position) {
        return distancesUm[position];
    }

    public double timeS(int frame) {
        return timesS[frame];
    }

    public double[] distancesUm() {
        return distancesUm.clone();
    }

    public double[] timesS() {
        return timesS.clone();
    }

    /** A copy of the row-major values. */
    public double[] values() {
        return values.clone();
    }

    /** A copy of one frame's profile along the path. */
    public double[] row(int frame) {
        return Arrays.copyOfRange(values, frame * distancesUm.length, (frame + 1) * distancesUm.length);
    }

    /** A copy of one position's time course. */
    public double[] column(int position) {
        double[] c = new double[timesS.length];
        for (int f = 0; f < c.length; f++) {
            c[f] = values[f * distancesUm.length + position];
        }
        return c;
    }

    public String signalUnit() {
        return signalUnit;
    }

    /** Spacing of the columns, um (0 for a single column). */
    public double distanceStepUm() {
        return distancesUm.length > 1 ? (distancesUm[distancesUm.length - 1] - distancesUm[0]) / (distancesUm.length - 1) : 0;
    }

    /** Spacing of the rows, s (0 for a single frame). */
    public double timeStepS() {
        return timesS.length > 1 ? (timesS[timesS.length - 1] - timesS[0]) / (timesS.length - 1) : 0;
    }

    /** The same grid (and sample delays) with other values (row-major) and unit. */
    public Kymograph withValues(double[] newValues, String newUnit) {
        Checks.require(newValues.length == values.length,
                "kymograph has " + newValues.length + " values, expected " + values.length);
        return new Kymograph(distancesUm, timesS, newValues.clone(), newUnit, sampleDelaysS);
    }

    /**
     * The same kymograph with each position sampled {@code delaysS[p]} after its frame's time: a raster scan takes a
     * frame line by line, so the sample at frame f and position p was taken at {@code timeS(f) + delaysS[p]}.
     *
     * @param delaysS delay of each position, s, each at least 0 and shorter than the frame interval; null for none.
     *                Not modified.
     */
    public Kymograph withSampleDelays(double[] delaysS) {
        if (delaysS != null) {
            Checks.require(delaysS.length == distancesUm.length, "one sample delay per position is needed");
            for (double d : delaysS) {
                Checks.require(d >= 0 && (timesS.length < 2 || d < timeStepS()),
                        "sample delays must lie between 0 and the frame interval");
            }
        }
        return new Kymograph(distancesUm, timesS, values, signalUnit, delaysS == null ? null : delaysS.clone());
    }

    /** True when the positions were sampled at their own delays after the frame times. */
    public boolean hasSampleDelays() {
        return sampleDelaysS != null;
    }

    /** When position {@code p} was sampled after its frame's time, s (0 without sample delays). */
    public double sampleDelayS(int position) {
        return sampleDelaysS == null ? 0 : sampleDelaysS[position];
    }

    /** The sample delay of every position, s (zeros without sample delays). */
    public double[] sampleDelaysS() {
        return sampleDelaysS == null ? new double[distancesUm.length] : sampleDelaysS.clone();
    }

    /**
     * The first frame at or after a time: the first frame of a response to a stimulus at {@code timeS}. A frame
     * within 1e-9 relative of the time counts as at it. Returns {@link #frameCount()} when every frame is earlier.
     *
     * @param timeS time, s
     */
    public int firstFrameAtOrAfter(double timeS) {
        double tolerance = 1e-9 * Math.max(1, Math.abs(timeS));
        int f = 0;
        while (f < timesS.length && timesS[f] < timeS - tolerance) {
            f++;
        }
        return f;
    }

    /**
     * The frames {@code first} (inclusive) to {@code end} (exclusive), same positions and unit.
     *
     * @throws IllegalArgumentException for an empty or out-of-range span
     */
    public Kymograph frames(int first, int end) {
        Checks.require(first >= 0 && end <= timesS.length && first < end,
                "frames " + first + " to " + (end - 1) + " are not within the " + timesS.length + " frames");
        int nx = distancesUm.length;
        return new Kymograph(distancesUm, Arrays.copyOfRange(timesS, first, end),
                Arrays.copyOfRange(values, first * nx, end * nx), signalUnit, sampleDelaysS);
    }

    /** Number of NaN values. */
    public long nanCount() {
        long n = 0;
        for (double v : values) {
            if (Double.isNaN(v)) {
                n++;
            }
        }
        return n;
    }
}
