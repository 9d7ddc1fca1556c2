package org.dendrokin.core.model;

import org.apache.commons.math3.stat.regression.SimpleRegression;
import org.dendrokin.core.kymo.Kymograph;

/**
 * Speed of a travelling front in a kymograph: in each frame, the farthest position from the stimulus site
 * (on the side with more room) where the signal is still at least half of the kymograph's maximum,
 * interpolated linearly between columns; the speed is the least-squares slope of that position against
 * time over the frames where it lies between 10% and 90% of the way to the end of the cable. NaN when
 * fewer than five frames qualify (nothing travels, or the signal only spreads and fades).
 */
public final class FrontSpeed {
    private FrontSpeed() {
    }

    /**
     * @param k         the kymograph (distance um, time s)
     * @param originUm  where the signal starts, um
     * @return the speed, um/s, away from the origin, or NaN
     */
    public static double measure(Kymograph k, double originUm) {
        double max = Double.NEGATIVE_INFINITY;
        for (double v : k.values()) {
            if (Double.isFinite(v)) {
                max = Math.max(max, v);
            }
        }
        if (!(max > 0)) {
            return Double.NaN;
        }
        double half = 0.5 * max;
        double[] x = k.distancesUm();
        double first = x[0];
        double last = x[x.length - 1];
        boolean right = last - originUm >= originUm - first;
        double span = right ? last - originUm : originUm - first;
        SimpleRegression fit = new SimpleRegression();
        for (int f = 0; f < k.frameCount(); f++) {
            double[] row = k.row(f);
            double pos = Double.NaN;
            if (right) {
                for (int i = x.length - 1; i > 0; i--) {
                    if (row[i - 1] >= half && x[i - 1] >= originUm - 1e-9) {
                        pos = row[i] >= half ? x[i]
                                : x[i - 1] + (row[i - 1] - half) / (row[i - 1] - row[i]) * (x[i] - x[i - 1]);
                        break;
                    }
                }
            } else {
                for (int i = 0; i < x.length - 1; i++) {
                    if (row[i + 1] >= half && x[i + 1] <= originUm + 1e-9) {
                        pos = row[i] >= half ? x[i]
                                : x[i + 1] - (row[i + 1] - half) / (row[i + 1] - row[i]) * (x[i + 1] - x[i]);
                        break;
                    }
                }
            }
            if (Double.isNaN(pos)) {
                continue;
            }
            double travelled = Math.abs(pos - originUm);
            if (travelled >= 0.1 * span && travelled <= 0.9 * span) {
                fit.addData(k.timeS(f), travelled);
            }
        }
        return fit.getN() >= 5 ? fit.getSlope() : Double.NaN;
    }
}
