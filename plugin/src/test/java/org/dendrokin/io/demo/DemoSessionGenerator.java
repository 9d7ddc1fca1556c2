package org.dendrokin.io.demo;

import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Locale;
import java.util.Random;

import org.dendrokin.io.AtomicFiles;

import ij.ImagePlus;
import ij.ImageStack;
import ij.gui.PolygonRoi;
import ij.gui.Roi;
import ij.io.FileSaver;
import ij.io.RoiEncoder;
import ij.measure.Calibration;
import ij.process.ShortProcessor;

/**
 * Writes a synthetic session folder: a 16-bit TIFF time series of a spiny dendrite segment, a polyline
 * {@code dendrite.roi} along it and a {@code session.json}. Re-runnable and seeded: the same scenario gives the
 * same bytes.
 *
 * <p>Scenario (our own, for demonstration): an activity reporter fills a dendrite about 1.2 um thick with
 * spines every 1.6 um on alternating sides. A focal stimulus (like glutamate uncaging at one spine) releases
 * activity at {@code stimulusPositionUm} along the dendrite at {@code stimulusTimeS}. The activity spreads by
 * diffusion with first-order decay from a Gaussian of standard deviation s0, so along the dendrite
 * dF/F0(s, t) = M / sqrt(2 pi (s0^2 + 2 D tau)) exp(-(s - s_stim)^2 / (2 (s0^2 + 2 D tau))) exp(-k tau),
 * tau = t - t_stim (Crank 1975, sheet s2.2, s2.3). The indicator bleaches as exp(-t / tBleach); the camera adds
 * a constant offset plus autofluorescence that does not bleach, photon (Poisson-like, variance = counts) noise
 * and read noise.
 *
 * <p>Usage: {@code java -cp "$(bench/test-classpath.sh)" org.dendrokin.io.demo.DemoSessionGenerator [OUT_DIR]}
 * (default {@code test-images/demo-session}). Test code, not shipped: the {@code demo} command analyses the
 * session this wrote, which the jar carries.
 */
public final class DemoSessionGenerator {
    private DemoSessionGenerator() {
    }

    /**
     * The scenario and its true values. Lengths in um, times in s, intensities in camera counts.
     *
     * @param widthPx           image width, pixels
     * @param heightPx          image height, pixels
     * @param frames            number of frames
     * @param pixelSizeUm       pixel size, um
     * @param frameIntervalS    frame interval, s
     * @param stimulusTimeS     stimulus time, s
     * @param stimulusPositionUm stimulus position along the path from its first vertex, um
     * @param dUm2PerS          diffusion coefficient, um^2/s
     * @param kPerS             first-order decay rate, 1/s
     * @param sigma0Um          initial standard deviation of the released activity, um
     * @param peakDeltaF        dF/F0 at the stimulated site just after the stimulus (dimensionless)
     * @param restCounts        resting indicator brightness on the dendrite axis, counts
     * @param backgroundCounts  camera offset plus autofluorescence (does not bleach), counts
     * @param bleachTimeS       bleaching time constant, s
     * @param readNoise         camera read noise standard deviation, counts
     * @param seed              random seed
     */
    public record Scenario(int widthPx, int heightPx, int frames, double pixelSizeUm, double frameIntervalS,
            double stimulusTimeS, double stimulusPositionUm, double dUm2PerS, double kPerS, double sigma0Um,
            double peakDeltaF, double restCounts, double backgroundCounts, double bleachTimeS, double readNoise,
            long seed) {

        /** The shipped demo: 192 x 64 pixels, 200 frames. */
        public static Scenario demo() {
            return new Scenario(192, 64, 200, 0.2, 0.5, 9.75, 15.0, 0.8, 0.05, 1.0, 1.5, 600, 120, 150, 3, 20261201L);
        }

        /** Amount M released, um (dF/F0 times um), from the peak dF/F0 and s0. */
        public double amountUm() {
            return peakDeltaF * Math.sqrt(2 * Math.PI) * sigma0Um;
        }

        /** True dF/F0 at distance s along the path and time t. */
        public double deltaF(double sUm, double tS) {
            double tau = tS - stimulusTimeS;
            if (tau < 0) {
                return 0;
            }
            double var = sigma0Um * sigma0Um + 2 * dUm2PerS * tau;
            double x = sUm - stimulusPositionUm;
            return amountUm() / Math.sqrt(2 * Math.PI * var) * Math.exp(-x * x / (2 * var)) * Math.exp(-kPerS * tau);
        }
    }

    public static void main(String[] args) {
        Path out = Path.of(args.length > 0 ? args[0] : "test-images/demo-session");
        write(out, Scenario.demo());
        System.out.println("Wrote the demo session to " + out.toAbsolutePath());
    }

    /** The polyline path of a scenario in ImageJ pixel coordinates: a gentle S across the frame. */
    public static double[][] pathVertices(Scenario s) {
        int n = 7;
        double[] x = new double[n];
        double[] y = new double[n];
        for (int i = 0; i < n; i++) {
            double u = i / (n - 1.0);
            x[i] = 0.05 * s.widthPx() + u * 0.9 * s.widthPx();
            y[i] = s.heightPx() * (0.5 + 0.18 * Math.sin(2 * Math.PI * u * 0.9) - 0.08 * u);
        }
        return new double[][] {x, y};
    }

    /** Writes {@code dendrite.tif}, {@code dendrite.roi} and {@code session.json} into {@code dir}. */
    public static void write(Path dir, Scenario s) {
        double[][] v = pathVertices(s);
        ImagePlus movie = render(s, v[0], v[1]);
        writeTiff(movie, dir.resolve("dendrite.tif"));
        float[] xs = new float[v[0].length];
        float[] ys = new float[v[1].length];
        for (int i = 0; i < xs.length; i++) {
            xs[i] = (float) v[0][i];
            ys[i] = (float) v[1][i];
        }
        PolygonRoi roi = new PolygonRoi(xs, ys, xs.length, Roi.POLYLINE);
        roi.setName("dendrite");
        byte[] roiBytes = RoiEncoder.saveAsByteArray(roi);
        AtomicFiles.write(dir.resolve("dendrite.roi"), o -> o.write(roiBytes));
        AtomicFiles.writeString(dir.resolve("session.json"), String.format(Locale.ROOT, """
                {
                  "description": "Synthetic demo: focal stimulus on a spiny dendrite, activity spreading by diffusion with decay; made by org.dendrokin.io.demo.DemoSessionGenerator",
                  "movie": "dendrite.tif",
                  "path": "dendrite.roi",
                  "path_width_um": 1.0,
                  "calibration": {"method": "none"}
                }
                """));
    }

    private static ImagePlus render(Scenario s, double[] vx, double[] vy) {
        int w = s.widthPx();
        int h = s.heightPx();
        double px = s.pixelSizeUm();
        // Arc length (um) of the nearest path point and distance from the axis (um), per pixel centre.
        double[] arc = new double[w * h];
        double[] dist = new double[w * h];
        double[] side = new double[w * h];
        double[] cumulative = new double[vx.length];
        for (int i = 1; i < vx.length; i++) {
            cumulative[i] = cumulative[i - 1] + Math.hypot(vx[i] - vx[i - 1], vy[i] - vy[i - 1]);
        }
        for (int j = 0; j < h; j++) {
            for (int i = 0; i < w; i++) {
                double cx = i + 0.5;
                double cy = j + 0.5;
                double best = Double.POSITIVE_INFINITY;
                for (int seg = 0; seg + 1 < vx.length; seg++) {
                    double ex = vx[seg + 1] - vx[seg];
                    double ey = vy[seg + 1] - vy[seg];
                    double len2 = ex * ex + ey * ey;
                    double u = Math.max(0, Math.min(1, ((cx - vx[seg]) * ex + (cy - vy[seg]) * ey) / len2));
                    double qx = vx[seg] + u * ex;
                    double qy = vy[seg] + u * ey;
                    double d = Math.hypot(cx - qx, cy - qy);
                    if (d < best) {
                        best = d;
                        arc[j * w + i] = (cumulative[seg] + u * Math.sqrt(len2)) * px;
                        side[j * w + i] = Math.signum(ex * (cy - vy[seg]) - ey * (cx - vx[seg]));
                    }
                }
                dist[j * w + i] = best * px;
            }
        }
        double lengthUm = cumulative[vx.length - 1] * px;
        // Resting brightness: a Gaussian cross-section (sd 0.5 um) plus spine heads 1.0 um off the axis.
        double[] rest = new double[w * h];
        double spacing = 1.6;
        for (int k = 0; k < w * h; k++) {
            double axis = Math.exp(-dist[k] * dist[k] / (2 * 0.5 * 0.5));
            double spine = 0;
            if (arc[k] > 0.5 && arc[k] < lengthUm - 0.5) {
                double nearest = Math.round(arc[k] / spacing) * spacing;
                int index = (int) Math.round(arc[k] / spacing);
                double wantSide = index % 2 == 0 ? 1 : -1;
                double along = arc[k] - nearest;
                double across = dist[k] - 1.0;
                if (side[k] == wantSide) {
                    spine = 0.8 * Math.exp(-(along * along + across * across) / (2 * 0.25 * 0.25));
                }
            }
            rest[k] = s.restCounts() * (axis + spine);
        }
        Random random = new Random(s.seed());
        ImageStack stack = new ImageStack(w, h);
        for (int f = 0; f < s.frames(); f++) {
            double t = f * s.frameIntervalS();
            double bleach = Math.exp(-t / s.bleachTimeS());
            short[] pixels = new short[w * h];
            for (int k = 0; k < w * h; k++) {
                double signal = rest[k] * (1 + s.deltaF(arc[k], t)) * bleach;
                double mean = s.backgroundCounts() + signal;
                double noisy = mean + Math.sqrt(signal + s.readNoise() * s.readNoise()) * random.nextGaussian();
                pixels[k] = (short) Math.max(0, Math.min(65535, Math.round(noisy)));
            }
            stack.addSlice("t=" + String.format(Locale.ROOT, "%.2f", t) + " s", new ShortProcessor(w, h, pixels, null));
        }
        ImagePlus imp = new ImagePlus("dendrite", stack);
        imp.setDimensions(1, 1, s.frames());
        imp.setOpenAsHyperStack(true);
        Calibration cal = new Calibration();
        cal.pixelWidth = px;
        cal.pixelHeight = px;
        cal.setUnit("micron");
        cal.frameInterval = s.frameIntervalS();
        cal.setTimeUnit("sec");
        imp.setCalibration(cal);
        return imp;
    }

    private static void writeTiff(ImagePlus imp, Path target) {
        try {
            Path dir = target.toAbsolutePath().getParent();
            Files.createDirectories(dir);
            Path tmp = Files.createTempFile(dir, ".dendrite.", ".tif");
            try {
                if (!new FileSaver(imp).saveAsTiffStack(tmp.toString())) {
                    throw new IOException("ImageJ could not save the stack");
                }
                byte[] bytes = Files.readAllBytes(tmp);
                AtomicFiles.write(target, o -> o.write(bytes));
            } finally {
                Files.deleteIfExists(tmp);
            }
        } catch (IOException e) {
            throw new UncheckedIOException("could not write " + target + ": " + e.getMessage(), e);
        }
    }
}
