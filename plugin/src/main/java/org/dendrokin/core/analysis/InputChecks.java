package org.dendrokin.core.analysis;

import java.util.List;
import java.util.Locale;

import org.dendrokin.core.kymo.FrameSource;
import org.dendrokin.core.path.DendritePath;

/**
 * Checks of an analysis request that need the movie's size and the path together, made before a pixel is read: each
 * failure is an {@link AnalysisInputException} with one sentence naming what to change. They catch the inputs that
 * would otherwise be found only deep inside the analysis, as an array that cannot be allocated or a result made of
 * nothing:
 * <ul>
 *   <li>a movie of one frame (there is no time axis);</li>
 *   <li>a path that lies mostly outside the image, measured on the polyline itself (a vertex at 1e12 pixels would
 *       otherwise ask for 1e12 samples before the kymograph could show that they are outside);</li>
 *   <li>a band across the path wider than the image's diagonal;</li>
 *   <li>a kymograph of more than {@value #MAX_KYMOGRAPH_VALUES} values (frames times positions);</li>
 *   <li>a given stimulus at or after the last frame (no frame follows it), or given as a spot outside the image
 *       (a stimulus beyond the end of the path is refused where the stimuli are placed, {@link Stimuli}).</li>
 * </ul>
 */
final class InputChecks {
    /** Values a kymograph may hold: 2 GB of doubles, more than the copies an analysis keeps fit in a usual heap. */
    static final long MAX_KYMOGRAPH_VALUES = 1L << 28;
    /** Fraction of the path that may lie outside the image, as {@link SessionAnalysis} allows after extraction. */
    private static final double MAX_OUTSIDE = 0.5;

    private InputChecks() {
    }

    /**
     * Checks the request against the movie's size and the path.
     *
     * @throws AnalysisInputException naming the input to change
     */
    static void check(AnalysisRequest request) {
        FrameSource frames = request.signal();
        int frameCount = frames.frameCount();
        double dt = request.frameIntervalS();
        double px = request.pixelSizeUm();
        if (frameCount < 2) {
            throw new AnalysisInputException(AnalysisInputException.Subject.MOVIE, "the movie has only one frame, and "
                    + "a kymograph needs a time series; if its frames were saved as slices or channels, save it with "
                    + "them as frames (ImageJ: Image > Properties)");
        }
        DendritePath path = request.path();
        double outside = outsideFraction(path, frames.width(), frames.height());
        if (outside > MAX_OUTSIDE) {
            throw new AnalysisInputException(AnalysisInputException.Subject.PATH, String.format(Locale.ROOT,
                    "%.0f%% of the path lies outside the %d x %d pixel movie", 100 * outside, frames.width(),
                    frames.height()));
        }
        double diagonalPx = Math.hypot(frames.width(), frames.height());
        if (request.pathWidthUm() / px > diagonalPx) {
            throw new AnalysisInputException(AnalysisInputException.Subject.SETTINGS, String.format(Locale.ROOT,
                    "key \"path_width_um\" is %s um, wider than the whole %d x %d pixel movie (%s um corner to "
                    + "corner); give the width of the band to average across the dendrite", plain(request.pathWidthUm()),
                    frames.width(), frames.height(), plain(diagonalPx * px)));
        }
        long positions = (long) Math.floor(path.lengthPx()) + 1;
        if (positions * frameCount > MAX_KYMOGRAPH_VALUES) {
            throw new AnalysisInputException(AnalysisInputException.Subject.PATH, String.format(Locale.ROOT,
                    "the path is %s pixels long, so its kymograph of %d frames would hold %s values, more than the "
                    + "%s an analysis can hold; draw a shorter path or analyse fewer frames", plain(path.lengthPx()),
                    frameCount, plain((double) positions * frameCount), plain(MAX_KYMOGRAPH_VALUES)));
        }
        double lastS = (frameCount - 1) * dt;
        List<StimulusSpec> stimuli = request.stimuli();
        for (int i = 0; i < stimuli.size(); i++) {
            StimulusSpec given = stimuli.get(i);
            String name = stimuli.size() == 1 ? "stimulus" : "stimuli[" + i + "]";
            if (given.timeS() != null && given.timeS() >= lastS - 1e-9 * dt) {
                throw new AnalysisInputException(AnalysisInputException.Subject.SETTINGS, String.format(Locale.ROOT,
                        "key \"%s.time_s\" is %s s, but the movie's last frame is at %s s (%d frames %s s apart), "
                        + "so no frame follows the stimulus", name, plain(given.timeS()), plain(lastS), frameCount,
                        plain(dt)));
            }
            if (given.isSpot() && !(given.xPx() >= 0 && given.xPx() <= frames.width() && given.yPx() >= 0
                    && given.yPx() <= frames.height())) {
                throw new AnalysisInputException(AnalysisInputException.Subject.SETTINGS, String.format(Locale.ROOT,
                        "keys \"%s.x_px\" and \"%s.y_px\" place the stimulus spot at (%s, %s) px, outside the %d x"
                        + " %d pixel movie", name, name, plain(given.xPx()), plain(given.yPx()), frames.width(),
                        frames.height()));
            }
        }
    }

    /**
     * Fraction of the polyline's length outside the rectangle [0, width] x [0, height] (ImageJ pixel coordinates),
     * each segment clipped by the Liang-Barsky parametric test (Liang and Barsky 1984). A path whose length is not
     * finite counts as wholly outside.
     */
    static double outsideFraction(DendritePath path, int width, int height) {
        double[] x = path.xPx();
        double[] y = path.yPx();
        double total = 0;
        double inside = 0;
        for (int i = 1; i < x.length; i++) {
            double dx = x[i] - x[i - 1];
            double dy = y[i] - y[i - 1];
            double len = Math.hypot(dx, dy);
            total += len;
            double[] t = {0, 1};
            if (clip(-dx, x[i - 1], t) && clip(dx, width - x[i - 1], t) && clip(-dy, y[i - 1], t)
                    && clip(dy, height - y[i - 1], t)) {
                inside += (t[1] - t[0]) * len;
            }
        }
        if (!Double.isFinite(total) || !(total > 0)) {
            return 1;
        }
        return Math.max(0, Math.min(1, 1 - inside / total));
    }

    /** One Liang-Barsky edge test p t <= q, narrowing t = {t0, t1}; false when nothing of the segment is left. */
    private static boolean clip(double p, double q, double[] t) {
        if (p == 0) {
            return q >= 0;
        }
        double r = q / p;
        if (p < 0) {
            if (r > t[1]) {
                return false;
            }
            t[0] = Math.max(t[0], r);
        } else {
            if (r < t[0]) {
                return false;
            }
            t[1] = Math.min(t[1], r);
        }
        return true;
    }

    /** A number as a user wrote it: whole numbers without a decimal point, others with four significant digits. */
    private static String plain(double v) {
        if (v == Math.rint(v) && Math.abs(v) < 1e15) {
            return Long.toString((long) v);
        }
        return String.format(Locale.ROOT, "%.4g", v).replaceFirst("\\.?0+(e|$)", "$1");
    }
}
