package org.dendrokin.core.fit;

import java.util.Arrays;
import java.util.List;
import java.util.Locale;

import org.dendrokin.core.kymo.Kymograph;
import org.dendrokin.core.preprocess.Robust;

/**
 * Noise standard deviation of each kymograph position, for the fit's weights 1 / sigma^2. From the baseline
 * frames when there are at least 3: the sample standard deviation of each position's baseline values, with its
 * variance shrunk towards the median over positions (weighted as 30 frames) so that few baseline frames do not
 * give noisy weights.
 * Positions with fewer than 3 finite baseline values, or a value below a quarter of the median over positions
 * (which would give one position an outsized weight), take max(own, median / 4) or the median. Without enough
 * baseline frames, one level for all positions from the frame-to-frame differences: 1.4826 MAD(y_f+1 - y_f)
 * / sqrt(2) over the whole kymograph, which is the noise SD for a signal that changes slowly from frame to
 * frame [common practice].
 */
public final class NoiseEstimate {
    /** Weight of the pooled (median) noise level, in frames, when each position's own level is shrunk towards it. */
    static final int PRIOR_FRAMES = 30;

    private NoiseEstimate() {
    }

    /**
     * @param k          the kymograph. Not modified.
     * @param firstFrame first baseline frame (inclusive)
     * @param lastFrame  last baseline frame (inclusive); an empty or reversed range means "no baseline"
     * @param warnings   receives a sentence if the fallback was used. Modified.
     * @return sigma per position, signal units
     */
    public static double[] perPosition(Kymograph k, int firstFrame, int lastFrame, List<String> warnings) {
        int nx = k.positionCount();
        int first = Math.max(0, firstFrame);
        int last = Math.min(k.frameCount() - 1, lastFrame);
        double[] sd = new double[nx];
        Arrays.fill(sd, Double.NaN);
        if (last - first + 1 >= 3) {
            for (int p = 0; p < nx; p++) {
                double sum = 0;
                double sum2 = 0;
                int n = 0;
                double mean = 0;
                for (int f = first; f <= last; f++) {
                    double v = k.value(f, p);
                    if (Double.isFinite(v)) {
                        n++;
                        sum += v;
                    }
                }
                if (n >= 3) {
                    mean = sum / n;
                    for (int f = first; f <= last; f++) {
                        double v = k.value(f, p);
                        if (Double.isFinite(v)) {
                            sum2 += (v - mean) * (v - mean);
                        }
                    }
                    sd[p] = Math.sqrt(sum2 / (n - 1));
                }
            }
        }
        double median = Robust.median(sd);
        if (!(median > 0)) {
            double global = differenceNoise(k);
            if (!(global > 0)) {
                global = 1;
                warnings.add("The noise level could not be estimated (the kymograph has no variation); the fit "
                        + "weights every point equally and its intervals rest on the residuals alone.");
            } else {
                warnings.add(String.format(Locale.ROOT, "Fewer than 3 baseline frames: the noise level (%.3g) was "
                        + "estimated from frame-to-frame differences and taken as equal at every position.", global));
            }
            Arrays.fill(sd, global);
            return sd;
        }
        // Shrink each position's variance towards the median: with few baseline frames a position's own SD is
        // itself noisy (about 1 / sqrt(2 (n - 1)) relative), and weights that follow that noise make the fit's
        // intervals too narrow. The pooled level counts as PRIOR_FRAMES frames of evidence.
        int n = last - first + 1;
        for (int p = 0; p < nx; p++) {
            if (Double.isFinite(sd[p])) {
                double v = ((n - 1) * sd[p] * sd[p] + PRIOR_FRAMES * median * median) / (n - 1 + PRIOR_FRAMES);
                sd[p] = Math.max(Math.sqrt(v), median / 4);
            } else {
                sd[p] = median;
            }
        }
        return sd;
    }

    /** 1.4826 MAD of the frame-to-frame differences over all positions, divided by sqrt(2). */
    static double differenceNoise(Kymograph k) {
        int nx = k.positionCount();
        int nt = k.frameCount();
        if (nt < 2) {
            return Double.NaN;
        }
        double[] diffs = new double[(nt - 1) * nx];
        int i = 0;
        for (int f = 0; f + 1 < nt; f++) {
            for (int p = 0; p < nx; p++) {
                diffs[i++] = k.value(f + 1, p) - k.value(f, p);
            }
        }
        return Robust.madSd(diffs) / Math.sqrt(2);
    }
}
