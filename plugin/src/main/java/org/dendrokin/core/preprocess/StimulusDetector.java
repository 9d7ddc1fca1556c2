package org.dendrokin.core.preprocess;

import java.util.Locale;

import org.dendrokin.core.kymo.Kymograph;

/**
 * Finds when and where a stimulus started from the kymograph itself, for sessions whose session.json does
 * not say.
 *
 * <p>Method. Each position's time course is divided by its median, so that bright and dim stretches of the
 * dendrite count alike. For every frame f and position p the step score is the mean of the next w frames
 * minus the mean of the previous w frames (w = 3), averaged over three neighbouring positions, and divided by
 * its own noise level, estimated from the frame-to-frame differences of the whole kymograph (1.4826 times
 * their median absolute deviation, over sqrt 2). The largest score marks the onset: the stimulus time is
 * half a frame before the first raised frame, so every frame before it is a baseline frame, and the position
 * is refined to a fraction of a step by a parabola through the scores of the best position and its two
 * neighbours. The score itself (a rise of so many noise standard deviations) is the confidence; below
 * {@link #MIN_STRENGTH} nothing is reported as found.
 */
public final class StimulusDetector {
    /** Smallest step score, in noise standard deviations, that counts as a stimulus. */
    public static final double MIN_STRENGTH = 6.0;
    private static final int WINDOW = 3;

    private StimulusDetector() {
    }

    /**
     * What the detector found.
     *
     * @param found       true when the strongest rise exceeds {@link #MIN_STRENGTH}
     * @param onsetFrame  first frame of the rise (0-based)
     * @param timeS       stimulus time, s: half a frame before the onset frame
     * @param positionUm  stimulus position along the path, um
     * @param strength    the rise in noise standard deviations (dimensionless)
     */
    public record Detection(boolean found, int onsetFrame, double timeS, double positionUm, double strength) {
        /** One sentence for the report. */
        public String describe() {
            if (!found) {
                return String.format(Locale.ROOT, "No clear stimulus was found in the data: the strongest rise was "
                        + "%.1f noise standard deviations, below the %.0f needed.", strength, MIN_STRENGTH);
            }
            return String.format(Locale.ROOT, "The stimulus was detected from the data at t = %.3g s (frame %d is "
                    + "the first raised frame) and %.3g um along the path; the rise there was %.1f times the noise "
                    + "standard deviation.", timeS, onsetFrame, positionUm, strength);
        }
    }

    /**
     * Detects the stimulus in a background-subtracted kymograph.
     *
     * @param signal the kymograph (any positive signal, e.g. intensity after background subtraction). Not modified.
     * @return the detection; {@code found} is false for fewer than 2 w + 1 frames or no clear rise
     */
    public static Detection detect(Kymograph signal) {
        return detect(signal, true);
    }

    /**
     * Detects the stimulus in a kymograph that is already a change from rest or a concentration (dF/F0, dR/R0,
     * uM), as {@code analyze} writes it: the same step score, on the values as they are instead of divided by
     * each position's median (which is near zero, or carries no meaning, for such a signal).
     *
     * @param change the kymograph. Not modified.
     * @return the detection; {@code found} is false for fewer than 2 w + 1 frames or no clear rise
     */
    public static Detection detectInChange(Kymograph change) {
        return detect(change, false);
    }

    private static Detection detect(Kymograph signal, boolean relative) {
        int nt = signal.frameCount();
        int nx = signal.positionCount();
        double dt = signal.timeStepS();
        if (nt < 2 * WINDOW + 1) {
            return new Detection(false, 0, 0, signal.distanceUm(0), 0);
        }
        double[][] r = new double[nt][nx];
        for (int p = 0; p < nx; p++) {
            double[] col = signal.column(p);
            double med = relative ? Robust.median(col) : 1;
            for (int f = 0; f < nt; f++) {
                r[f][p] = med != 0 && Double.isFinite(med) ? col[f] / Math.abs(med) : Double.NaN;
            }
        }
        double[] diffs = new double[(nt - 1) * nx];
        for (int f = 0; f + 1 < nt; f++) {
            for (int p = 0; p < nx; p++) {
                diffs[f * nx + p] = r[f + 1][p] - r[f][p];
            }
        }
        double sd = Robust.madSd(diffs) / Math.sqrt(2);
        // A step score averages w frames on each side and three positions: its noise is sd sqrt(2 / (3 w)).
        double scoreSd = sd * Math.sqrt(2.0 / (3 * WINDOW));
        double best = Double.NEGATIVE_INFINITY;
        int bestF = 0;
        int bestP = 0;
        double[][] score = new double[nt][];
        for (int f = WINDOW; f + WINDOW <= nt; f++) {
            double[] step = new double[nx];
            for (int p = 0; p < nx; p++) {
                double after = 0;
                double before = 0;
                for (int i = 0; i < WINDOW; i++) {
                    after += r[f + i][p];
                    before += r[f - 1 - i][p];
                }
                step[p] = (after - before) / WINDOW;
            }
            score[f] = Robust.movingAverage(step, 1);
            for (int p = 0; p < nx; p++) {
                double z = score[f][p] / scoreSd;
                if (z > best) {
                    best = z;
                    bestF = f;
                    bestP = p;
                }
            }
        }
        if (!(scoreSd > 0) || !Double.isFinite(best)) {
            return new Detection(false, 0, 0, signal.distanceUm(0), 0);
        }
        double position = signal.distanceUm(bestP);
        if (bestP > 0 && bestP < nx - 1) {
            double a = score[bestF][bestP - 1];
            double b = score[bestF][bestP];
            double c = score[bestF][bestP + 1];
            double den = a - 2 * b + c;
            if (den < 0) {
                double shift = 0.5 * (a - c) / den;
                position += Math.max(-0.5, Math.min(0.5, shift)) * signal.distanceStepUm();
            }
        }
        double time = signal.timeS(bestF) - 0.5 * dt;
        return new Detection(best >= MIN_STRENGTH, bestF, time, position, best);
    }
}
