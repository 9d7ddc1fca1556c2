package org.dendrokin.io.calib;

import java.awt.image.BufferedImage;
import java.nio.file.Path;
import java.util.Locale;

import org.dendrokin.core.calib.Calibration;
import org.dendrokin.core.calib.FittedHill;
import org.dendrokin.core.calib.Standards;
import org.dendrokin.core.calib.StandardsFit;
import org.dendrokin.io.plot.LinePlot;
import org.dendrokin.io.plot.Pictures;

/**
 * The picture of a calibration from standards: the standards as points, the fitted curve (or the monotone
 * interpolant) and, for the Hill fit, its 95% confidence band (delta method, t(0.975, m - 4) times the SD of
 * the fitted mean intensity). Concentration is on a log10 axis, so standards at zero concentration cannot be
 * drawn as points; their mean is drawn as a horizontal line instead.
 */
public final class CalibrationPlot {
    private static final int SAMPLES = 240;

    private CalibrationPlot() {
    }

    /** Renders the picture; {@code fit} may be null (monotone form: no band). */
    public static BufferedImage render(Standards standards, Calibration calibration, StandardsFit.Result fit,
                                       String title) {
        double lo = Double.POSITIVE_INFINITY;
        double hi = 0;
        int positive = 0;
        double zeroSum = 0;
        int zeros = 0;
        for (int i = 0; i < standards.size(); i++) {
            double c = standards.concentrationMicromolar(i);
            if (c > 0) {
                lo = Math.min(lo, c);
                hi = Math.max(hi, c);
                positive++;
            } else {
                zeroSum += standards.intensity(i);
                zeros++;
            }
        }
        if (positive == 0) {
            lo = 0.01;
            hi = 100;
        }
        double xLo = Math.log10(lo) - 0.5;
        double xHi = Math.log10(hi) + 0.3;
        double[] px = new double[positive];
        double[] py = new double[positive];
        int k = 0;
        for (int i = 0; i < standards.size(); i++) {
            if (standards.concentrationMicromolar(i) > 0) {
                px[k] = Math.log10(standards.concentrationMicromolar(i));
                py[k] = standards.intensity(i);
                k++;
            }
        }
        double[] x = new double[SAMPLES];
        double[] y = new double[SAMPLES];
        double[] low = new double[SAMPLES];
        double[] high = new double[SAMPLES];
        FittedHill hill = calibration instanceof FittedHill h ? h : null;
        double t = fit == null ? Double.NaN : fit.tQuantile();
        for (int i = 0; i < SAMPLES; i++) {
            x[i] = xLo + (xHi - xLo) * i / (SAMPLES - 1.0);
            double c = Math.pow(10, x[i]);
            y[i] = calibration.signal(c);
            if (hill != null && Double.isFinite(t)) {
                double sd = hill.signalSd(c);
                low[i] = y[i] - t * sd;
                high[i] = y[i] + t * sd;
            }
        }
        LinePlot plot = new LinePlot(title, "log10 of concentration in uM (-1 is 0.1 uM, 0 is 1 uM, 1 is 10 uM)",
                "intensity (background subtracted)");
        if (hill != null && Double.isFinite(t)) {
            plot.band("95% confidence band of the curve", x, low, high);
        }
        plot.line(hill != null ? "fitted Hill curve" : "monotone interpolant (Fritsch-Carlson)", x, y);
        plot.points(String.format(Locale.ROOT, "standards (%d)", positive), px, py);
        if (zeros > 0) {
            double mean = zeroSum / zeros;
            plot.line(String.format(Locale.ROOT, "mean of the %d zero-concentration standards", zeros),
                    new double[] {xLo, xHi}, new double[] {mean, mean});
        }
        plot.xRange(xLo, xHi);
        double yMin = Double.POSITIVE_INFINITY;
        double yMax = Double.NEGATIVE_INFINITY;
        for (double[] arr : new double[][] {py, y, zeros > 0 ? new double[] {zeroSum / zeros} : new double[0]}) {
            for (double v : arr) {
                if (Double.isFinite(v)) {
                    yMin = Math.min(yMin, v);
                    yMax = Math.max(yMax, v);
                }
            }
        }
        if (yMax > yMin) {
            // room above the data for the legend, which sits in the top right corner
            double span = yMax - yMin;
            plot.yRange(Math.min(0, yMin - 0.05 * span), yMax + 0.4 * span);
        }
        return plot.render(900, 560);
    }

    /** Renders and saves the picture as PNG through a temporary file. */
    public static void save(Standards standards, Calibration calibration, StandardsFit.Result fit, String title,
                            Path target) {
        Pictures.savePng(render(standards, calibration, fit, title), target);
    }
}
