package org.dendrokin.io.model;

import java.nio.file.Path;
import java.util.Random;

import org.dendrokin.core.kymo.Kymograph;
import org.dendrokin.io.AtomicFiles;

import ij.ImagePlus;
import ij.ImageStack;
import ij.io.FileSaver;
import ij.measure.Calibration;
import ij.process.FloatProcessor;

/**
 * Renders a simulated kymograph as the movie a microscope would record along a drawn path: each pixel
 * centre (i + 0.5, j + 0.5) is projected onto the nearest point of the path polyline, at distance s along
 * it (um, from the first vertex) and d across it (um); its intensity is
 * baseline + gain x u(t, s) x exp(-d^2 / (2 radius^2)) plus seeded Gaussian noise. Beyond the simulated
 * length the signal is zero. Written as a 32-bit calibrated TIFF stack (pixel size in um, frame interval
 * in s) with ImageJ's FileSaver, through a temporary file.
 */
public final class SyntheticMovie {
    private SyntheticMovie() {
    }

    public static ImagePlus render(Kymograph k, MovieSettings m) {
        int w = m.widthPx();
        int h = m.heightPx();
        double[] along = new double[w * h];
        double[] weight = new double[w * h];
        double px = m.pixelSizeUm();
        double[] xs = m.pathXPx();
        double[] ys = m.pathYPx();
        for (int j = 0; j < h; j++) {
            for (int i = 0; i < w; i++) {
                double cx = i + 0.5;
                double cy = j + 0.5;
                double best = Double.POSITIVE_INFINITY;
                double bestS = 0;
                double start = 0;
                for (int v = 0; v < xs.length - 1; v++) {
                    double dx = xs[v + 1] - xs[v];
                    double dy = ys[v + 1] - ys[v];
                    double len2 = dx * dx + dy * dy;
                    double t = len2 > 0 ? ((cx - xs[v]) * dx + (cy - ys[v]) * dy) / len2 : 0;
                    t = Math.max(0, Math.min(1, t));
                    double ex = xs[v] + t * dx - cx;
                    double ey = ys[v] + t * dy - cy;
                    double dist2 = ex * ex + ey * ey;
                    if (dist2 < best) {
                        best = dist2;
                        bestS = start + t * Math.sqrt(len2);
                    }
                    start += Math.sqrt(len2);
                }
                double dUm = Math.sqrt(best) * px;
                along[j * w + i] = bestS * px;
                weight[j * w + i] = Math.exp(-dUm * dUm / (2 * m.radiusUm() * m.radiusUm()));
            }
        }
        double[] dist = k.distancesUm();
        Random noise = new Random(m.seed());
        ImageStack stack = new ImageStack(w, h);
        for (int f = 0; f < k.frameCount(); f++) {
            double[] row = k.row(f);
            float[] pixels = new float[w * h];
            for (int p = 0; p < pixels.length; p++) {
                double u = interpolate(dist, row, along[p]);
                double value = m.baseline() + m.gain() * u * weight[p];
                if (m.noiseSd() > 0) {
                    value += m.noiseSd() * noise.nextGaussian();
                }
                pixels[p] = (float) value;
            }
            String label = String.format(java.util.Locale.ROOT, "t=%.4g s", k.timeS(f));
            stack.addSlice(label, new FloatProcessor(w, h, pixels));
        }
        ImagePlus imp = new ImagePlus("simulated", stack);
        imp.setDimensions(1, 1, k.frameCount());
        Calibration cal = imp.getCalibration();
        cal.pixelWidth = px;
        cal.pixelHeight = px;
        cal.setUnit("micron");
        cal.frameInterval = k.timeStepS();
        cal.setTimeUnit("s");
        return imp;
    }

    private static double interpolate(double[] x, double[] y, double at) {
        if (at < x[0] || at > x[x.length - 1]) {
            return 0;
        }
        int i = java.util.Arrays.binarySearch(x, at);
        if (i >= 0) {
            return y[i];
        }
        int hi = -i - 1;
        int lo = hi - 1;
        double w = (at - x[lo]) / (x[hi] - x[lo]);
        double v = y[lo] + w * (y[hi] - y[lo]);
        return Double.isFinite(v) ? v : 0;
    }

    /** Renders and writes the movie. */
    public static void write(Kymograph k, MovieSettings m, Path target) {
        ImagePlus imp = render(k, m);
        byte[] bytes = new FileSaver(imp).serialize();
        if (bytes == null) {
            throw new IllegalStateException("ImageJ could not encode the synthetic movie");
        }
        AtomicFiles.write(target, out -> out.write(bytes));
    }
}
