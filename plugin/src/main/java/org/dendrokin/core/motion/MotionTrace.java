package org.dendrokin.core.motion;

import java.util.Arrays;
import java.util.List;
import java.util.Locale;

import org.dendrokin.core.Checks;

/**
 * The rigid translation of every frame against a reference image, as measured by
 * {@link MotionCorrection#measure}. A shift (dx, dy) means the image content of that frame lies dx pixels to the
 * right of and dy pixels below where it lies in the reference; a path drawn on the reference follows the content
 * when moved by the same amount. Immutable; arrays are copied in and out.
 */
public final class MotionTrace {
    private final double[] dxPx;
    private final double[] dyPx;
    private final double[] measuredDxPx;
    private final double[] measuredDyPx;
    private final double[] peakHeights;
    private final int framesAtLimit;
    private final double pixelSizeUm;
    private final double warningThresholdUm;
    private final Reference reference;
    private final List<String> warnings;

    /**
     * What the frames were compared with.
     *
     * @param firstFrame       first frame averaged into the reference, 0-based
     * @param lastFrame        last frame averaged into the reference, 0-based, inclusive
     * @param xPx              left edge of the measurement window, ImageJ pixel coordinates
     * @param yPx              top edge of the window, pixels
     * @param widthPx          window width, pixels
     * @param heightPx         window height, pixels
     * @param stimulusFadedOut true if a stimulus region overlapped the window and was faded out of the comparison
     */
    public record Reference(int firstFrame, int lastFrame, int xPx, int yPx, int widthPx, int heightPx,
            boolean stimulusFadedOut) {
        /** One sentence, e.g. "the mean of frames 0 to 19, in a 64 x 64 pixel window at x = 100, y = 200". */
        public String describe() {
            return String.format(Locale.ROOT, "the mean of frames %d to %d, in a %d x %d pixel window at x = %d, "
                    + "y = %d%s", firstFrame, lastFrame, widthPx, heightPx, xPx, yPx,
                    stimulusFadedOut ? ", with the stimulus region faded out" : "");
        }
    }

    /**
     * @param dxPx               shift applied to each frame along x, pixels (after any smoothing)
     * @param dyPx               shift applied along y, pixels
     * @param measuredDxPx       shift measured along x, pixels (before smoothing)
     * @param measuredDyPx       shift measured along y, pixels
     * @param peakHeights        quality of each frame's measurement: the normalised correlation peak, dimensionless,
     *                           1 for a frame that is the reference translated, near 0 for no match
     * @param framesAtLimit      number of frames whose shift reached the largest shift looked for
     * @param pixelSizeUm        pixel size, um
     * @param warningThresholdUm shift above which a warning is given, um
     * @param reference          what the frames were compared with
     * @param warnings           plain sentences
     */
    public MotionTrace(double[] dxPx, double[] dyPx, double[] measuredDxPx, double[] measuredDyPx,
            double[] peakHeights, int framesAtLimit, double pixelSizeUm, double warningThresholdUm,
            Reference reference, List<String> warnings) {
        int n = dxPx.length;
        Checks.require(n > 0, "a motion trace needs at least one frame");
        Checks.sameLength(n, dyPx, measuredDxPx, measuredDyPx, peakHeights);
        Checks.positiveFinite(pixelSizeUm, "pixelSizeUm");
        this.dxPx = dxPx.clone();
        this.dyPx = dyPx.clone();
        this.measuredDxPx = measuredDxPx.clone();
        this.measuredDyPx = measuredDyPx.clone();
        this.peakHeights = peakHeights.clone();
        this.framesAtLimit = framesAtLimit;
        this.pixelSizeUm = pixelSizeUm;
        this.warningThresholdUm = warningThresholdUm;
        this.reference = reference;
        this.warnings = List.copyOf(warnings);
    }

    /** The same trace with other warnings. */
    MotionTrace withWarnings(List<String> newWarnings) {
        return new MotionTrace(dxPx, dyPx, measuredDxPx, measuredDyPx, peakHeights, framesAtLimit, pixelSizeUm,
                warningThresholdUm, reference, newWarnings);
    }

    public int frameCount() {
        return dxPx.length;
    }

    /** Shift applied to each frame along x, pixels. */
    public double[] dxPx() {
        return dxPx.clone();
    }

    /** Shift applied to each frame along y, pixels. */
    public double[] dyPx() {
        return dyPx.clone();
    }

    /** Shift applied to each frame along x, um. */
    public double[] dxUm() {
        return scaled(dxPx, pixelSizeUm);
    }

    /** Shift applied to each frame along y, um. */
    public double[] dyUm() {
        return scaled(dyPx, pixelSizeUm);
    }

    /** Shift measured along x before smoothing, pixels (the same as {@link #dxPx()} without smoothing). */
    public double[] measuredDxPx() {
        return measuredDxPx.clone();
    }

    /** Shift measured along y before smoothing, pixels. */
    public double[] measuredDyPx() {
        return measuredDyPx.clone();
    }

    /** The normalised correlation peak of each frame, dimensionless, about 0..1. */
    public double[] peakHeights() {
        return peakHeights.clone();
    }

    public int framesAtLimit() {
        return framesAtLimit;
    }

    public double pixelSizeUm() {
        return pixelSizeUm;
    }

    public double warningThresholdUm() {
        return warningThresholdUm;
    }

    public Reference reference() {
        return reference;
    }

    /** Plain sentences: motion above the threshold, unreliable frames, shifts at the search limit. */
    public List<String> warnings() {
        return warnings;
    }

    /** Largest distance of a frame from the reference, sqrt(dx^2 + dy^2), um. */
    public double maxShiftUm() {
        double max = 0;
        for (int f = 0; f < dxPx.length; f++) {
            max = Math.max(max, Math.hypot(dxPx[f], dyPx[f]));
        }
        return max * pixelSizeUm;
    }

    /** Root mean square distance of the frames from the reference, sqrt(mean(dx^2 + dy^2)), um. */
    public double rmsShiftUm() {
        double sum = 0;
        for (int f = 0; f < dxPx.length; f++) {
            sum += dxPx[f] * dxPx[f] + dyPx[f] * dyPx[f];
        }
        return Math.sqrt(sum / dxPx.length) * pixelSizeUm;
    }

    /** Median of the per-frame peak heights, dimensionless. */
    public double medianPeakHeight() {
        return MotionCorrection.median(peakHeights.clone());
    }

    /** Smallest per-frame peak height, dimensionless. */
    public double minPeakHeight() {
        return Arrays.stream(peakHeights).min().orElse(Double.NaN);
    }

    /** True if the largest shift exceeds the warning threshold. */
    public boolean exceedsThreshold() {
        return maxShiftUm() > warningThresholdUm;
    }

    private static double[] scaled(double[] v, double factor) {
        double[] out = new double[v.length];
        for (int i = 0; i < v.length; i++) {
            out[i] = v[i] * factor;
        }
        return out;
    }
}
