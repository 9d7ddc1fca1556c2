package org.dendrokin.core.preprocess;

import org.dendrokin.core.Checks;
import org.dendrokin.core.kymo.Kymograph;
import org.dendrokin.core.units.Unit;

/**
 * dF/F0 per position: F0(x) is the median over the baseline frames of the background-subtracted (and, if
 * chosen, bleach-corrected) intensity at x, and dF/F0(x, t) = (F(x, t) - F0(x)) / F0(x), dimensionless.
 * Positions whose F0 is not positive (background at or above the signal) are NaN throughout.
 */
public final class DeltaF {
    private DeltaF() {
    }

    /**
     * @param kymograph  dF/F0 kymograph, unit {@code dF/F0}
     * @param f0         F0 at each position, units of the input intensity (NaN where unusable)
     * @param noiseSd    standard deviation of dF/F0 over the baseline frames at each position (1.4826 MAD)
     * @param unusable   number of positions whose F0 was not positive
     */
    public record Result(Kymograph kymograph, double[] f0, double[] noiseSd, int unusable) {
        /** Median over positions of the baseline noise standard deviation of dF/F0. */
        public double typicalNoiseSd() {
            return Robust.median(noiseSd);
        }
    }

    /**
     * @param intensity  background-subtracted intensity. Not modified.
     * @param firstFrame first baseline frame, 0-based, inclusive
     * @param lastFrame  last baseline frame, inclusive
     */
    public static Result compute(Kymograph intensity, int firstFrame, int lastFrame) {
        int nt = intensity.frameCount();
        int nx = intensity.positionCount();
        Checks.require(firstFrame >= 0 && firstFrame <= lastFrame && lastFrame < nt,
                "baseline frames [" + firstFrame + ", " + lastFrame + "] must lie within the " + nt + " frames");
        double[] values = intensity.values();
        double[] f0 = new double[nx];
        double[] noise = new double[nx];
        int unusable = 0;
        double[] base = new double[lastFrame - firstFrame + 1];
        for (int p = 0; p < nx; p++) {
            for (int f = firstFrame; f <= lastFrame; f++) {
                base[f - firstFrame] = values[f * nx + p];
            }
            double m = Robust.median(base);
            if (!(m > 0)) {
                if (!Double.isNaN(m)) {
                    unusable++;
                }
                f0[p] = Double.NaN;
                noise[p] = Double.NaN;
                for (int f = 0; f < nt; f++) {
                    values[f * nx + p] = Double.NaN;
                }
                continue;
            }
            f0[p] = m;
            for (int f = 0; f < nt; f++) {
                values[f * nx + p] = (values[f * nx + p] - m) / m;
            }
            for (int f = firstFrame; f <= lastFrame; f++) {
                base[f - firstFrame] = values[f * nx + p];
            }
            noise[p] = Robust.madSd(base);
        }
        return new Result(intensity.withValues(values, Unit.DF_F0.symbol()), f0, noise, unusable);
    }
}
