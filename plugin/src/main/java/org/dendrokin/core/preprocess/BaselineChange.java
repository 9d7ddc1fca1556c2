package org.dendrokin.core.preprocess;

import org.dendrokin.core.Checks;
import org.dendrokin.core.kymo.Kymograph;

/**
 * The change of a signal from its baseline, for the spread measures, which need a zero baseline: at each
 * position the median over the baseline frames is subtracted (same unit). For dF/F0 this changes almost nothing;
 * for a concentration it removes the resting level. The noise level is the median over positions of the robust
 * standard deviation (1.4826 MAD) over the baseline frames.
 */
public final class BaselineChange {
    private BaselineChange() {
    }

    /**
     * @param kymograph the change from baseline, same unit as the input
     * @param noiseSd   typical baseline standard deviation of one sample, same unit (NaN if not measurable)
     */
    public record Result(Kymograph kymograph, double noiseSd) {
    }

    /**
     * @param signal     the analysed signal. Not modified.
     * @param firstFrame first baseline frame, inclusive
     * @param lastFrame  last baseline frame, inclusive
     */
    public static Result of(Kymograph signal, int firstFrame, int lastFrame) {
        int nt = signal.frameCount();
        int nx = signal.positionCount();
        Checks.require(firstFrame >= 0 && firstFrame <= lastFrame && lastFrame < nt,
                "baseline frames [" + firstFrame + ", " + lastFrame + "] must lie within the " + nt + " frames");
        double[] v = signal.values();
        double[] base = new double[lastFrame - firstFrame + 1];
        double[] sd = new double[nx];
        for (int p = 0; p < nx; p++) {
            for (int f = firstFrame; f <= lastFrame; f++) {
                base[f - firstFrame] = v[f * nx + p];
            }
            double m = Robust.median(base);
            sd[p] = Robust.madSd(base);
            for (int f = 0; f < nt; f++) {
                v[f * nx + p] = Double.isFinite(m) ? v[f * nx + p] - m : Double.NaN;
            }
        }
        return new Result(signal.withValues(v, signal.signalUnit()), Robust.median(sd));
    }
}
