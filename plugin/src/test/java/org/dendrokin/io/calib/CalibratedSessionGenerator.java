package org.dendrokin.io.calib;

import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Locale;
import java.util.Random;

import org.dendrokin.core.calib.HillCurve;
import org.dendrokin.io.AtomicFiles;

import ij.ImagePlus;
import ij.ImageStack;
import ij.Prefs;
import ij.gui.PolygonRoi;
import ij.gui.Roi;
import ij.io.FileSaver;
import ij.io.RoiEncoder;
import ij.process.ShortProcessor;

/**
 * Writes a small synthetic session whose movie is made in concentration and seen through an indicator, so
 * that calibrating it gives the concentration back: {@code dendrite.tif}, {@code dendrite.roi},
 * {@code standards.csv} and a {@code session.json} with {@code {"method": "standards", "table":
 * "standards.csv"}}. Re-runnable and seeded.
 *
 * <p>Scenario (our own, for demonstration; every number is invented): a dendrite with a flat-topped
 * cross-section 1.4 um wide is filled with a single-site indicator (K = 0.4 uM, n = 1) whose band-averaged,
 * background-subtracted brightness runs from Fmin = 60 to Fmax = 1500 counts. The resting concentration is
 * 0.06 uM. At 1.0 s a focal release at 12 um along the path adds a Gaussian of SD s0 = 1.5 um that spreads
 * by diffusion and decays at first order, c(s, t) = c0 + M / sqrt(2 pi (s0^2 + 2 D tau))
 * exp(-(s - s_stim)^2 / (2 (s0^2 + 2 D tau))) exp(-k tau) with D = 6 um^2/s and k = 1 1/s (Crank 1975;
 * sheet s2.2, s2.3). Its peak (3 uM) drives the indicator to 88% of its range, so the calibration flags the
 * centre of the response. The camera adds an offset of 100 counts, photon noise (variance = counts) and read
 * noise (SD 3 counts); there is no bleaching. The standards are the indicator's curve at nine concentrations
 * in triplicate with 1.5% noise, as a user would measure them in the same band on the same setup.
 *
 * <p>Usage: {@code java -cp "$(bench/test-classpath.sh)" org.dendrokin.io.calib.CalibratedSessionGenerator
 * [OUT_DIR]} (default {@code test-images/calibrated-session}). Test code, not shipped.
 */
public final class CalibratedSessionGenerator {
    static final int WIDTH_PX = 150;
    static final int HEIGHT_PX = 40;
    static final int FRAMES = 100;
    static final double PIXEL_UM = 0.2;
    static final double FRAME_S = 0.05;
    static final double BACKGROUND = 100;
    static final double READ_NOISE = 3;
    static final HillCurve INDICATOR = new HillCurve(60, 1500, 0.4, 1.0);
    static final double RESTING_UM = 0.06;
    static final double STIMULUS_S = 1.0;
    static final double STIMULUS_AT_UM = 12;
    static final double SIGMA0_UM = 1.5;
    static final double D_UM2_PER_S = 6;
    static final double K_PER_S = 1.0;
    static final double PEAK_UM = 3.0;
    static final double[] VX = {8, 50, 100, 142};
    static final double[] VY = {22, 16, 24, 19};
    static final long SEED = 20261202L;

    private CalibratedSessionGenerator() {
    }

    public static void main(String[] args) {
        Path out = Path.of(args.length > 0 ? args[0] : "test-images/calibrated-session");
        write(out);
        System.out.println("Wrote the calibrated session to " + out.toAbsolutePath());
    }

    /** True concentration (uM) at distance s (um) along the path and time t (s). */
    public static double concentrationMicromolar(double sUm, double tS) {
        double tau = tS - STIMULUS_S;
        if (tau < 0) {
            return RESTING_UM;
        }
        double var = SIGMA0_UM * SIGMA0_UM + 2 * D_UM2_PER_S * tau;
        double x = sUm - STIMULUS_AT_UM;
        double amount = PEAK_UM * Math.sqrt(2 * Math.PI) * SIGMA0_UM;
        return RESTING_UM + amount / Math.sqrt(2 * Math.PI * var) * Math.exp(-x * x / (2 * var))
                * Math.exp(-K_PER_S * tau);
    }

    /** Writes the four files into {@code dir}. */
    public static void write(Path dir) {
        writeTiff(render(), dir.resolve("dendrite.tif"));
        writeRoi(VX, VY, dir.resolve("dendrite.roi"));
        AtomicFiles.writeString(dir.resolve("standards.csv"), standards());
        AtomicFiles.writeString(dir.resolve("session.json"), String.format(Locale.ROOT, """
                {
                  "description": "Synthetic calibrated session: a focal concentration rise seen through a single-site indicator, calibrated by a table of standards; made by org.dendrokin.io.calib.CalibratedSessionGenerator",
                  "movie": "dendrite.tif",
                  "path": "dendrite.roi",
                  "path_width_um": 1.0,
                  "pixel_size_um": %s,
                  "frame_interval_s": %s,
                  "background": {"value": %s},
                  "bleach_correction": false,
                  "stimulus": {"time_s": %s, "position_um": %s},
                  "calibration": {"method": "standards", "table": "standards.csv"}
                }
                """, PIXEL_UM, FRAME_S, BACKGROUND, STIMULUS_S, STIMULUS_AT_UM));
    }

    /** The standards table: nine concentrations in triplicate, 1.5% noise, background subtracted. */
    static String standards() {
        Random random = new Random(SEED + 1);
        StringBuilder csv = new StringBuilder("concentration_uM,intensity\n");
        for (double c : new double[] {0, 0.05, 0.1, 0.2, 0.4, 0.8, 1.6, 3.2, 39}) {
            for (int r = 0; r < 3; r++) {
                double f = INDICATOR.signal(c) * (1 + 0.015 * random.nextGaussian());
                csv.append(String.format(Locale.ROOT, "%s,%.2f%n", c, f));
            }
        }
        return csv.toString();
    }

    /**
     * Arc length along the path (um) and relative dye brightness (flat top 1.4 um wide, Gaussian edges of SD
     * 0.2 um) at each pixel centre of a w x h frame, row-major.
     */
    private static double[][] geometry(int w, int h, double[] vx, double[] vy) {
        double[] arc = new double[w * h];
        double[] profile = new double[w * h];
        double[] cumulative = new double[vx.length];
        for (int i = 1; i < vx.length; i++) {
            cumulative[i] = cumulative[i - 1] + Math.hypot(vx[i] - vx[i - 1], vy[i] - vy[i - 1]);
        }
        for (int j = 0; j < h; j++) {
            for (int i = 0; i < w; i++) {
                double cx = i + 0.5;  // ImageJ pixel centre
                double cy = j + 0.5;
                double best = Double.POSITIVE_INFINITY;
                for (int seg = 0; seg + 1 < vx.length; seg++) {
                    double ex = vx[seg + 1] - vx[seg];
                    double ey = vy[seg + 1] - vy[seg];
                    double len2 = ex * ex + ey * ey;
                    double u = Math.max(0, Math.min(1, ((cx - vx[seg]) * ex + (cy - vy[seg]) * ey) / len2));
                    double d = Math.hypot(cx - vx[seg] - u * ex, cy - vy[seg] - u * ey);
                    if (d < best) {
                        best = d;
                        arc[j * w + i] = (cumulative[seg] + u * Math.sqrt(len2)) * PIXEL_UM;
                    }
                }
                double edge = Math.max(0, best * PIXEL_UM - 0.7);
                profile[j * w + i] = Math.exp(-edge * edge / (2 * 0.2 * 0.2));
            }
        }
        return new double[][] {arc, profile};
    }

    private static short noisyPixel(double signal, Random random) {
        double sd = Math.sqrt(signal + READ_NOISE * READ_NOISE);
        double noisy = BACKGROUND + signal + sd * random.nextGaussian();
        return (short) Math.max(0, Math.min(65535, Math.round(noisy)));
    }

    private static ImagePlus render() {
        int w = WIDTH_PX;
        int h = HEIGHT_PX;
        double[][] g = geometry(w, h, VX, VY);
        Random random = new Random(SEED);
        ImageStack stack = new ImageStack(w, h);
        for (int f = 0; f < FRAMES; f++) {
            double t = f * FRAME_S;
            short[] pixels = new short[w * h];
            for (int k = 0; k < w * h; k++) {
                pixels[k] = noisyPixel(g[1][k] * INDICATOR.signal(concentrationMicromolar(g[0][k], t)), random);
            }
            stack.addSlice(String.format(Locale.ROOT, "t=%.2f s", t), new ShortProcessor(w, h, pixels, null));
        }
        return calibrated(new ImagePlus("dendrite", stack), 1, FRAMES, FRAME_S);
    }

    /** The ratio indicator of {@link #writeRatio}: counts per unit brightness of free and bound dye. */
    static final double FREE_1 = 150;
    static final double BOUND_1 = 600;
    static final double FREE_2 = 500;
    static final double BOUND_2 = 100;
    static final double RATIO_KD_UM = 0.224;

    /**
     * Writes a small two-channel session for the ratio method: the same concentration scenario seen through
     * a ratiometric dye whose channel 1 brightens and channel 2 dims on binding (free and bound brightness
     * 150 and 600 counts in channel 1, 500 and 100 in channel 2, Kd 0.224 uM; invented for the test), so that
     * Rmin = 0.3, Rmax = 6 and beta = 5 exactly. 80 x 30 pixels, 40 frames; session.json uses the ratio method.
     */
    public static void writeRatio(Path dir) {
        int w = 80;
        int h = 30;
        int frames = 40;
        double[] vx = {4, 40, 76};
        double[] vy = {15, 13, 16};
        double[][] g = geometry(w, h, vx, vy);
        Random random = new Random(SEED + 2);
        ImageStack stack = new ImageStack(w, h);
        for (int f = 0; f < frames; f++) {
            double t = f * 0.1;
            short[] c1 = new short[w * h];
            short[] c2 = new short[w * h];
            for (int k = 0; k < w * h; k++) {
                double c = concentrationMicromolar(g[0][k], t);
                double s = c / (c + RATIO_KD_UM);
                c1[k] = noisyPixel(g[1][k] * (FREE_1 * (1 - s) + BOUND_1 * s), random);
                c2[k] = noisyPixel(g[1][k] * (FREE_2 * (1 - s) + BOUND_2 * s), random);
            }
            stack.addSlice("c1", new ShortProcessor(w, h, c1, null));
            stack.addSlice("c2", new ShortProcessor(w, h, c2, null));
        }
        ImagePlus imp = new ImagePlus("ratio", stack);
        writeTiff(calibrated(imp, 2, frames, 0.1), dir.resolve("ratio.tif"));
        writeRoi(vx, vy, dir.resolve("dendrite.roi"));
        AtomicFiles.writeString(dir.resolve("session.json"), String.format(Locale.ROOT, """
                {
                  "movie": "ratio.tif",
                  "path": "dendrite.roi",
                  "frame_interval_s": 0.1,
                  "background": {"value": %s},
                  "bleach_correction": false,
                  "stimulus": {"time_s": %s, "position_um": %s},
                  "calibration": {"method": "ratio", "kd_uM": %s, "r_min": %s, "r_max": %s, "beta": %s}
                }
                """, BACKGROUND, STIMULUS_S, STIMULUS_AT_UM, RATIO_KD_UM, FREE_1 / FREE_2, BOUND_1 / BOUND_2,
                FREE_2 / BOUND_2));
    }

    private static ImagePlus calibrated(ImagePlus imp, int channels, int frames, double frameIntervalS) {
        imp.setDimensions(channels, 1, frames);
        imp.setOpenAsHyperStack(true);
        ij.measure.Calibration cal = new ij.measure.Calibration();
        cal.pixelWidth = PIXEL_UM;
        cal.pixelHeight = PIXEL_UM;
        cal.setUnit("micron");
        cal.frameInterval = frameIntervalS;
        cal.setTimeUnit("sec");
        imp.setCalibration(cal);
        return imp;
    }

    private static void writeRoi(double[] vx, double[] vy, Path target) {
        float[] xs = new float[vx.length];
        float[] ys = new float[vy.length];
        for (int i = 0; i < xs.length; i++) {
            xs[i] = (float) vx[i];
            ys[i] = (float) vy[i];
        }
        PolygonRoi roi = new PolygonRoi(xs, ys, xs.length, Roi.POLYLINE);
        roi.setName("dendrite");
        byte[] roiBytes = RoiEncoder.saveAsByteArray(roi);
        AtomicFiles.write(target, o -> o.write(roiBytes));
    }

    private static void writeTiff(ImagePlus imp, Path target) {
        try {
            Path dir = target.toAbsolutePath().getParent();
            Files.createDirectories(dir);
            Path tmp = Files.createTempFile(dir, ".dendrite.", ".tif");
            // ImageJ's byte order is a global preference; fix it so that the same scenario gives the same bytes.
            boolean intel = Prefs.intelByteOrder;
            try {
                Prefs.intelByteOrder = true;
                if (!new FileSaver(imp).saveAsTiffStack(tmp.toString())) {
                    throw new IOException("ImageJ could not save the stack");
                }
                byte[] bytes = Files.readAllBytes(tmp);
                AtomicFiles.write(target, o -> o.write(bytes));
            } finally {
                Prefs.intelByteOrder = intel;
                Files.deleteIfExists(tmp);
            }
        } catch (IOException e) {
            throw new UncheckedIOException("could not write " + target + ": " + e.getMessage(), e);
        }
    }
}
