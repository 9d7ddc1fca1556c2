package org.dendrokin.io.calib;

import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Locale;
import java.util.Random;

import org.dendrokin.io.AtomicFiles;

import ij.ImagePlus;
import ij.ImageStack;
import ij.Prefs;
import ij.gui.PolygonRoi;
import ij.gui.Roi;
import ij.io.FileSaver;
import ij.io.RoiEncoder;
import ij.process.FloatProcessor;
import ij.process.ShortProcessor;

/**
 * Writes a small synthetic lifetime session: {@code dendrite.tif} (photon counts per pixel, 16-bit), {@code tau.tif}
 * (mean lifetime per pixel, ns, 32-bit), {@code dendrite.roi} and a {@code session.json} with the lifetime method.
 * Seeded; test code.
 *
 * <p>Scenario (our own, every number invented): a straight dendrite 1.2 um wide across a 90 x 24 pixel field of
 * 0.2 um pixels, 30 frames at 0.1 s. A FRET sensor with tau_free = 2.6 ns and tau_bound = 1.1 ns is 10% bound at
 * rest; at 1.0 s a focal activation at 8 um binds up to 60% more, as a Gaussian of SD 1.2 um that widens with
 * D = 1 um^2/s and fades with k = 0.5 1/s. Each pixel on the dendrite collects Poisson photons with mean 250;
 * pixels off it collect Poisson photons with mean 1 and a lifetime of 0.3 ns (background light, e.g. scattered
 * laser or autofluorescence). A pixel's lifetime is the mixture's mean lifetime plus Gaussian noise of SD tau /
 * sqrt(N), and 0 where no photon arrived (as lifetime exports write it). The path runs along the dendrite's axis
 * through pixel centres, and session.json asks for a band 2 um wide: the dendrite and two rows of background on
 * each side.
 */
final class LifetimeSessionGenerator {
    static final int WIDTH = 90;
    static final int HEIGHT = 24;
    static final int FRAMES = 30;
    static final double PIXEL_UM = 0.2;
    static final double FRAME_S = 0.1;
    static final double TAU_FREE_NS = 2.6;
    static final double TAU_BOUND_NS = 1.1;
    static final double ROW_CENTRE = 12.0;
    /** The path's ends in ImageJ coordinates, on pixel centres of row boundary 12 (the dendrite's axis). */
    static final double START_X = 5.5;
    static final double END_X = 85.5;

    private LifetimeSessionGenerator() {
    }

    /** The true fraction bound at arc length s (um from the path's start) and time t (s). */
    static double fractionBound(double sUm, double tS) {
        double tau = tS - 1.0;
        if (tau < 0) {
            return 0.1;
        }
        double var = 1.2 * 1.2 + 2 * 1.0 * tau;
        double x = sUm - 8;
        return 0.1 + 0.6 * Math.sqrt(1.2 * 1.2 / var) * Math.exp(-x * x / (2 * var)) * Math.exp(-0.5 * tau);
    }

    /** The mean lifetime (ns) of the two-state mixture with fraction bound p (amplitudes = molecule fractions). */
    static double meanLifetimeNs(double p) {
        return ((1 - p) * TAU_FREE_NS * TAU_FREE_NS + p * TAU_BOUND_NS * TAU_BOUND_NS)
                / ((1 - p) * TAU_FREE_NS + p * TAU_BOUND_NS);
    }

    /** Writes the session into {@code dir} with the given calibration block. */
    static void write(Path dir, String calibrationBlock) {
        Random random = new Random(20261213L);
        ImageStack counts = new ImageStack(WIDTH, HEIGHT);
        ImageStack taus = new ImageStack(WIDTH, HEIGHT);
        for (int f = 0; f < FRAMES; f++) {
            short[] n = new short[WIDTH * HEIGHT];
            float[] tau = new float[WIDTH * HEIGHT];
            for (int row = 0; row < HEIGHT; row++) {
                boolean onDendrite = Math.abs(row + 0.5 - ROW_CENTRE) * PIXEL_UM < 0.6;
                for (int col = 0; col < WIDTH; col++) {
                    double sUm = (col + 0.5 - START_X) * PIXEL_UM;
                    double mean = onDendrite ? meanLifetimeNs(fractionBound(sUm, f * FRAME_S)) : 0.3;
                    int photons = poisson(random, onDendrite ? 250 : 1);
                    n[row * WIDTH + col] = (short) photons;
                    tau[row * WIDTH + col] = photons == 0 ? 0f
                            : (float) (mean + mean / Math.sqrt(photons) * random.nextGaussian());
                }
            }
            counts.addSlice(new ShortProcessor(WIDTH, HEIGHT, n, null));
            taus.addSlice(new FloatProcessor(WIDTH, HEIGHT, tau));
        }
        save(new ImagePlus("counts", counts), dir.resolve("dendrite.tif"));
        save(new ImagePlus("tau", taus), dir.resolve("tau.tif"));
        PolygonRoi roi = new PolygonRoi(new float[] {(float) START_X - 0.5f, (float) END_X - 0.5f},
                new float[] {(float) ROW_CENTRE - 0.5f, (float) ROW_CENTRE - 0.5f}, 2, Roi.POLYLINE);
        byte[] roiBytes = RoiEncoder.saveAsByteArray(roi);
        AtomicFiles.write(dir.resolve("dendrite.roi"), o -> o.write(roiBytes));
        AtomicFiles.writeString(dir.resolve("session.json"), String.format(Locale.ROOT, """
                {
                  "movie": "dendrite.tif",
                  "path": "dendrite.roi",
                  "path_width_um": 2.0,
                  "pixel_size_um": %s,
                  "frame_interval_s": %s,
                  "background": {"value": 0},
                  "bleach_correction": false,
                  "motion": "off",
                  "stimulus": {"time_s": 1.0, "position_um": 8},
                  "calibration": %s
                }
                """, PIXEL_UM, FRAME_S, calibrationBlock));
    }

    private static int poisson(Random random, double mean) {
        if (mean > 50) {
            return (int) Math.max(0, Math.round(mean + Math.sqrt(mean) * random.nextGaussian()));
        }
        double limit = Math.exp(-mean);
        double product = random.nextDouble();
        int k = 0;
        while (product > limit) {
            product *= random.nextDouble();
            k++;
        }
        return k;
    }

    private static void save(ImagePlus imp, Path target) {
        imp.setDimensions(1, 1, imp.getStackSize());
        boolean intel = Prefs.intelByteOrder;
        try {
            Files.createDirectories(target.toAbsolutePath().getParent());
            Prefs.intelByteOrder = true;
            if (!new FileSaver(imp).saveAsTiffStack(target.toString())) {
                throw new IOException("ImageJ could not save " + target);
            }
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        } finally {
            Prefs.intelByteOrder = intel;
        }
    }
}
