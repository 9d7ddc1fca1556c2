package org.dendrokin.core.spines;

import java.util.ArrayList;
import java.util.List;

import org.dendrokin.core.Checks;
import org.dendrokin.core.kymo.Kymograph;

/**
 * The shaft's signal at a point along the path, taken from the kymograph: at position s (um from the path's first
 * vertex) and frame f, the mean of the columns p weighted by w_p(s) = exp(-(x_p - s)^2 / (2 sigma^2)),
 * <pre>
 *   u(s, t_f) = sum_p w_p(s) K(x_p, t_f) / sum_p w_p(s),
 *   du/ds     = sum_p w_p(s) (x_p - s) / sigma^2 (K(x_p, t_f) - u(s, t_f)) / sum_p w_p(s),
 * </pre>
 * over the columns within 4 sigma of the positions asked for. The Gaussian weights make u a smooth function of s,
 * so that a fit can move the point (the spine's base) and see exact derivatives; they also average the noise of
 * a few columns. Missing samples of a column are filled by linear interpolation in time (held at the ends); a
 * column without any value is left out. Immutable.
 */
final class ShaftDriver {
    private final double[] positionsUm;
    /** values[column][frame] */
    private final double[][] values;
    private final double sigmaUm;
    private final int frames;

    /**
     * @param k       the shaft's kymograph
     * @param fromUm  the least position that will be asked for, um
     * @param toUm    the largest, um
     * @param sigmaUm sd of the Gaussian weights, um
     */
    ShaftDriver(Kymograph k, double fromUm, double toUm, double sigmaUm) {
        Checks.positiveFinite(sigmaUm, "shaft smoothing (um)");
        this.sigmaUm = sigmaUm;
        this.frames = k.frameCount();
        List<Double> xs = new ArrayList<>();
        List<double[]> cols = new ArrayList<>();
        int nearest = -1;
        double mid = (fromUm + toUm) / 2;
        for (int p = 0; p < k.positionCount(); p++) {
            double x = k.distanceUm(p);
            double[] filled = NeckExchangeFit.filled(k.column(p), 1);
            if (filled == null) {
                continue;
            }
            if (x >= fromUm - 4 * sigmaUm && x <= toUm + 4 * sigmaUm) {
                xs.add(x);
                cols.add(filled);
            } else if (nearest < 0 || Math.abs(x - mid) < Math.abs(k.distanceUm(nearest) - mid)) {
                nearest = p;
            }
        }
        if (xs.isEmpty() && nearest >= 0) {
            xs.add(k.distanceUm(nearest));
            cols.add(NeckExchangeFit.filled(k.column(nearest), 1));
        }
        this.positionsUm = xs.stream().mapToDouble(Double::doubleValue).toArray();
        this.values = cols.toArray(new double[0][]);
    }

    /** True when at least one column has values. */
    boolean usable() {
        return positionsUm.length > 0;
    }

    int frameCount() {
        return frames;
    }

    /**
     * @param sUm   position along the path, um
     * @param u     receives u(s, t_f) for every frame. Modified.
     * @param duDs  receives du/ds (signal per um), or null. Modified.
     */
    void at(double sUm, double[] u, double[] duDs) {
        int n = positionsUm.length;
        double[] w = new double[n];
        double[] dw = new double[n];
        double total = 0;
        double dTotal = 0;
        // Weights relative to the largest, so that a position far from every column still has a finite mean.
        double nearest = Double.POSITIVE_INFINITY;
        for (double x : positionsUm) {
            nearest = Math.min(nearest, (x - sUm) * (x - sUm));
        }
        for (int p = 0; p < n; p++) {
            double d = positionsUm[p] - sUm;
            w[p] = Math.exp(-(d * d - nearest) / (2 * sigmaUm * sigmaUm));
            dw[p] = w[p] * d / (sigmaUm * sigmaUm);
            total += w[p];
            dTotal += dw[p];
        }
        for (int f = 0; f < frames; f++) {
            double sum = 0;
            double dSum = 0;
            for (int p = 0; p < n; p++) {
                sum += w[p] * values[p][f];
                dSum += dw[p] * values[p][f];
            }
            u[f] = sum / total;
            if (duDs != null) {
                duDs[f] = (dSum - u[f] * dTotal) / total;
            }
        }
    }
}
