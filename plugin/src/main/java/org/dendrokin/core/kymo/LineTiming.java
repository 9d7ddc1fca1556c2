package org.dendrokin.core.kymo;

import java.util.Locale;

import org.dendrokin.core.Checks;

/**
 * Scan-line timing of a raster-scanned movie. A laser-scanning microscope takes a frame line by line, top to
 * bottom: the pixels of image row y are taken y line periods after the frame's first line, so at 30 frames per
 * second across 512 lines the bottom row is about 30 ms later than the top [common practice]. A kymograph sample at
 * position p lies on the row of its band's centre, y_p, and is given the delay delta_p = floor(y_p) * linePeriod
 * after its frame's time. The band's own height (a few rows) and the shift of the path by motion (a pixel or two)
 * change the delay by a few line periods, which is neglected; the line's own duration (left to right) is within
 * one line period.
 */
public final class LineTiming {
    private LineTiming() {
    }

    /**
     * The delay of every position of a kymograph, or null when there is no line timing.
     *
     * @param linePeriodS    time between scan lines, s; 0 for none
     * @param heightPx       the frame's height in lines
     * @param frameIntervalS time between frames, s
     * @param yPx            each position's band centre, y in pixels (ImageJ coordinates, 0 at the top). Not
     *                       modified.
     * @return delays in s, each in [0, (heightPx - 1) linePeriodS], or null when {@code linePeriodS} is 0
     * @throws IllegalArgumentException when the frame's lines take longer than the frame interval (the message
     *                                  gives both)
     */
    public static double[] delays(double linePeriodS, int heightPx, double frameIntervalS, double[] yPx) {
        Checks.nonNegativeFinite(linePeriodS, "line period (s)");
        if (linePeriodS == 0) {
            return null;
        }
        double scan = linePeriodS * heightPx;
        Checks.require(scan <= frameIntervalS * (1 + 1e-9), String.format(Locale.ROOT, "the line period (%.4g s) "
                + "times the frame's %d lines is %.4g s, longer than the frame interval (%.4g s); a frame cannot take "
                + "longer to scan than the time between frames", linePeriodS, heightPx, scan, frameIntervalS));
        double[] d = new double[yPx.length];
        for (int p = 0; p < d.length; p++) {
            double row = Double.isFinite(yPx[p]) ? Math.floor(yPx[p]) : 0;
            row = Math.max(0, Math.min(heightPx - 1, row));
            d[p] = row * linePeriodS;
        }
        return d;
    }
}
