package org.dendrokin.bench;

import java.io.IOException;
import java.lang.management.ManagementFactory;
import java.lang.management.MemoryPoolMXBean;
import java.lang.management.MemoryType;
import java.nio.ByteBuffer;
import java.nio.channels.FileChannel;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.StandardOpenOption;
import java.util.Arrays;
import java.util.Locale;
import java.util.SplittableRandom;

import ij.ImagePlus;
import ij.VirtualStack;
import ij.io.FileSaver;
import ij.measure.Calibration;
import ij.process.ImageProcessor;
import ij.process.ShortProcessor;

import org.dendrokin.core.Progress;
import org.dendrokin.core.kymo.Extraction;
import org.dendrokin.core.kymo.FrameSource;
import org.dendrokin.core.motion.MotionCorrection;
import org.dendrokin.core.motion.MotionSettings;
import org.dendrokin.core.motion.MotionTrace;
import org.dendrokin.core.motion.PixelBox;
import org.dendrokin.core.motion.StimulusRegion;
import org.dendrokin.core.path.DendritePath;
import org.dendrokin.io.movie.Movie;
import org.dendrokin.io.movie.PathExtraction;

/**
 * Benchmark (not a test): motion measurement and motion-corrected kymograph extraction from a generated
 * 512 x 512 x 2000 16-bit uncompressed TIFF (1 GB) of a drifting dendrite, against the plain kymograph extraction
 * along the same path and a plain sequential read of the file. All in this JVM, after warm-up, with the file in the
 * page cache. Prints the medians, the ratios, the accuracy of the measured drift against the drift the movie was
 * made with, and the peak heap. Run with -Xmx512m (see docs/benchmarks.md). The movie is written frame by frame
 * through ImageJ's FileSaver from a stack that renders each frame when asked (never whole in memory) into a temporary
 * folder (or the folder given as the first argument), and deleted at the end.
 */
public final class MotionCorrectionBenchmark {
    private static final int WIDTH = 512;
    private static final int HEIGHT = 512;
    private static final int FRAMES = 2000;
    private static final double PIXEL_UM = 0.3;
    private static final double FRAME_S = 0.05;
    private static final double BAND_UM = 1.0;
    private static final int BASELINE_LAST = 199;
    private static final int REPEATS = 5;
    private static final double MIB = 1024.0 * 1024.0;
    private static final ByteBuffer REUSED = ByteBuffer.allocateDirect(4 << 20);

    private MotionCorrectionBenchmark() {
    }

    public static void main(String[] args) throws IOException {
        Path dir = args.length > 0 ? Path.of(args[0]) : Files.createTempDirectory("dendrokin-motion-bench");
        Path file = dir.resolve("motion-512x512x2000-16bit.tif");
        try {
            long t0 = System.nanoTime();
            Scene scene = new Scene();
            write(file, scene);
            double bytes = Files.size(file);
            System.out.printf(Locale.ROOT, "movie: %s, %.3f GB, written in %.1f s%n", file, bytes / 1e9,
                    (System.nanoTime() - t0) / 1e9);
            DendritePath path = scene.path();
            System.out.printf(Locale.ROOT, "path: %.1f um (%.1f px) along the dendrite, band %.1f um, %d samples a "
                    + "frame; drift: %.2f um over the movie, a %.2f um jump at frame %d, jitter up to %.2f um%n",
                    path.lengthPx() * PIXEL_UM, path.lengthPx(), BAND_UM, path.resample(1.0).size(),
                    Scene.DRIFT_PX * PIXEL_UM, Math.hypot(Scene.JUMP_X_PX, Scene.JUMP_Y_PX) * PIXEL_UM,
                    Scene.JUMP_FRAME, Scene.JITTER_PX * PIXEL_UM);
            for (int i = 0; i < 2; i++) {
                plainRead(file);
                extract(file, path);
                corrected(file, path, scene, measureOnly(file, path, scene));
            }
            resetPeaks();
            double[] plain = new double[REPEATS];
            double[] extract = new double[REPEATS];
            double[] motion = new double[REPEATS];
            double[] measureOnly = new double[REPEATS];
            Result last = null;
            for (int i = 0; i < REPEATS; i++) {
                long a = System.nanoTime();
                plainRead(file);
                plain[i] = (System.nanoTime() - a) / 1e9;
                a = System.nanoTime();
                extract(file, path);
                extract[i] = (System.nanoTime() - a) / 1e9;
                measureOnly[i] = measureOnly(file, path, scene);
                a = System.nanoTime();
                last = corrected(file, path, scene, measureOnly[i]);
                motion[i] = (System.nanoTime() - a) / 1e9;
            }
            Arrays.sort(plain);
            Arrays.sort(extract);
            Arrays.sort(motion);
            Arrays.sort(measureOnly);
            double plainMedian = plain[REPEATS / 2];
            double extractMedian = extract[REPEATS / 2];
            double motionMedian = motion[REPEATS / 2];
            System.out.printf(Locale.ROOT, "(a) plain kymograph extraction (open + extract): median %.3f s (best %.3f"
                    + " s)%n", extractMedian, extract[0]);
            System.out.printf(Locale.ROOT, "(b) motion measurement + corrected extraction (open + measure and extract "
                    + "in one pass): median %.3f s (best %.3f s); the measurement alone %.3f s%n", motionMedian,
                    motion[0],
                    measureOnly[REPEATS / 2]);
            System.out.printf(Locale.ROOT, "ratio (b) / (a): %.2f (median), %.2f (best)%n",
                    motionMedian / extractMedian, motion[0] / extract[0]);
            System.out.printf(Locale.ROOT, "plain FileChannel read of the file: median %.3f s (best %.3f s) = %.2f "
                    + "GB/s; ratio (b) / plain read: %.2f (median)%n", plainMedian, plain[0],
                    bytes / plainMedian / 1e9, motionMedian / plainMedian);
            MotionTrace trace = last.trace;
            System.out.printf(Locale.ROOT, "measured motion: max %.3f um, RMS %.3f um; error against the true "
                    + "drift: RMS %.3f px, max %.3f px; median peak height %.3f; window %s%n", trace.maxShiftUm(),
                    trace.rmsShiftUm(), last.rmsErrorPx, last.maxErrorPx, trace.medianPeakHeight(),
                    trace.reference().describe());
            System.out.printf(Locale.ROOT, "kymograph: %d frames x %d positions, %d NaN%n",
                    last.extraction.kymograph().frameCount(), last.extraction.kymograph().positionCount(),
                    last.extraction.samplesOutside());
            System.out.printf(Locale.ROOT, "peak heap during the timed runs (sum of heap pool peaks): %.1f MiB; "
                    + "max heap (-Xmx) %.0f MiB%n", peakHeapBytes() / MIB, Runtime.getRuntime().maxMemory() / MIB);
            System.out.printf(Locale.ROOT, "system load average (1 min) at the end: %.2f on %d cores%n",
                    ManagementFactory.getOperatingSystemMXBean().getSystemLoadAverage(),
                    Runtime.getRuntime().availableProcessors());
        } finally {
            Files.deleteIfExists(file);
            if (args.length == 0) {
                Files.deleteIfExists(dir);
            }
        }
    }

    private record Result(MotionTrace trace, Extraction extraction, double measureS, double rmsErrorPx,
            double maxErrorPx) {
    }

    private static Extraction extract(Path file, DendritePath path) {
        try (Movie movie = Movie.open(file, null, null)) {
            return PathExtraction.extract(movie, 0, path, file, BAND_UM, Progress.NONE);
        }
    }

    /** The motion measurement alone (after opening the movie), s; for the record, not part of (b). */
    private static double measureOnly(Path file, DendritePath path, Scene scene) {
        try (Movie movie = Movie.open(file, null, null)) {
            long a = System.nanoTime();
            MotionCorrection.measure(movie.channel(0), PixelBox.around(path, 0), 0, BASELINE_LAST,
                    scene.stimulusRegion(), MotionSettings.of(movie.pixelSizeUm(), BAND_UM), Progress.NONE);
            return (System.nanoTime() - a) / 1e9;
        }
    }

    /**
     * (b): open, measure and extract along the moving path in one pass, as an analysis with motion correction does
     * ({@link MotionCorrection#measureAndExtract}).
     */
    private static Result corrected(Path file, DendritePath path, Scene scene, double measureS) {
        try (Movie movie = Movie.open(file, null, null)) {
            FrameSource frames = movie.channel(0);
            MotionCorrection.Corrected both = MotionCorrection.measureAndExtract(frames, PixelBox.around(path, 0), 0,
                    BASELINE_LAST, scene.stimulusRegion(), MotionSettings.of(movie.pixelSizeUm(), BAND_UM), frames,
                    path, movie.frameIntervalS(), BAND_UM, movie.pixelSizeUm(), Progress.NONE);
            MotionTrace trace = both.trace();
            Extraction e = both.extraction();
            double[] dx = trace.dxPx();
            double[] dy = trace.dyPx();
            double sum = 0;
            double max = 0;
            for (int f = 0; f < FRAMES; f++) {
                // the reference is the mean of the baseline frames, which did not move
                double err = Math.hypot(dx[f] - Scene.dxPx(f), dy[f] - Scene.dyPx(f));
                sum += err * err;
                max = Math.max(max, err);
            }
            return new Result(trace, e, measureS, Math.sqrt(sum / FRAMES), max);
        }
    }

    private static long plainRead(Path file) throws IOException {
        ByteBuffer buffer = REUSED;
        long sum = 0;
        try (FileChannel ch = FileChannel.open(file, StandardOpenOption.READ)) {
            buffer.clear();
            while (ch.read(buffer) >= 0) {
                buffer.flip();
                sum += buffer.get(0);
                buffer.clear();
            }
        }
        return sum;
    }

    private static void resetPeaks() {
        System.gc();
        for (MemoryPoolMXBean pool : ManagementFactory.getMemoryPoolMXBeans()) {
            if (pool.getType() == MemoryType.HEAP) {
                pool.resetPeakUsage();
            }
        }
    }

    private static long peakHeapBytes() {
        long sum = 0;
        for (MemoryPoolMXBean pool : ManagementFactory.getMemoryPoolMXBeans()) {
            if (pool.getType() == MemoryType.HEAP) {
                sum += pool.getPeakUsage().getUsed();
            }
        }
        return sum;
    }

    /** Writes the movie through ImageJ's FileSaver from a stack that renders each frame when asked for it. */
    private static void write(Path file, Scene scene) {
        ImagePlus imp = new ImagePlus("motion-bench", new RenderedStack(scene));
        imp.setDimensions(1, 1, FRAMES);
        Calibration c = imp.getCalibration();
        c.pixelWidth = PIXEL_UM;
        c.pixelHeight = PIXEL_UM;
        c.setUnit("micron");
        c.frameInterval = FRAME_S;
        c.setTimeUnit("sec");
        if (!new FileSaver(imp).saveAsTiff(file.toString())) {
            throw new IllegalStateException("could not write " + file);
        }
    }

    /**
     * A demo scene (invented numbers): a dendrite along a sine curve with spines, some out-of-focus haze, a release
     * at frame 200 that spreads along the dendrite and fades, and Poisson-like noise. Every frame shows the scene
     * moved by a slow drift, a jump and sub-pixel jitter, evaluated exactly at the moved pixel centres.
     */
    private static final class Scene {
        static final double DRIFT_PX = 0.8 / PIXEL_UM;
        static final int JUMP_FRAME = 1200;
        static final double JUMP_X_PX = 1.5;
        static final double JUMP_Y_PX = -1.0;
        static final double JITTER_PX = 0.3;
        private static final double CENTRE_Y = 256;
        private static final double RIDGE_SIGMA = 1.6;
        private static final int STIMULUS_FRAME = BASELINE_LAST + 1;
        private final double[] blobX;
        private final double[] blobY;
        private final double[] blobSigma;
        private final double[] blobPeak;
        private final boolean[] spine;

        Scene() {
            SplittableRandom random = new SplittableRandom(20261203L);
            int spines = 90;
            int haze = 40;
            int n = spines + haze;
            blobX = new double[n];
            blobY = new double[n];
            blobSigma = new double[n];
            blobPeak = new double[n];
            spine = new boolean[n];
            for (int i = 0; i < n; i++) {
                if (i < spines) {
                    double x = random.nextDouble(40, 472);
                    blobX[i] = x;
                    blobY[i] = centreY(x) + (random.nextBoolean() ? 1 : -1) * random.nextDouble(3.5, 6);
                    blobSigma[i] = random.nextDouble(0.9, 1.5);
                    blobPeak[i] = random.nextDouble(300, 800);
                    spine[i] = true;
                } else {
                    blobX[i] = random.nextDouble(0, WIDTH);
                    blobY[i] = random.nextDouble(0, HEIGHT);
                    blobSigma[i] = random.nextDouble(4, 10);
                    blobPeak[i] = random.nextDouble(60, 200);
                }
            }
        }

        static double centreY(double x) {
            return CENTRE_Y + 40 * Math.sin(2 * Math.PI * (x - 90) / 340.0);
        }

        static double dxPx(int f) {
            return DRIFT_PX * f / (FRAMES - 1) * (f > BASELINE_LAST ? 1 : 0) + (f >= JUMP_FRAME ? JUMP_X_PX : 0)
                    + jitter(f, 1);
        }

        static double dyPx(int f) {
            return -0.4 * DRIFT_PX * f / (FRAMES - 1) * (f > BASELINE_LAST ? 1 : 0)
                    + (f >= JUMP_FRAME ? JUMP_Y_PX : 0) + jitter(f, 2);
        }

        private static double jitter(int f, int axis) {
            return f > BASELINE_LAST ? JITTER_PX * (2 * new SplittableRandom(f * 7L + axis).nextDouble() - 1) : 0;
        }

        /** The path along the dendrite, 100 um. */
        DendritePath path() {
            double lengthPx = 100 / PIXEL_UM;
            int n = 600;
            double[] x = new double[n + 1];
            double[] y = new double[n + 1];
            double length = 0;
            x[0] = 90;
            y[0] = centreY(90);
            int last = 0;
            for (int i = 1; i <= n && length < lengthPx; i++) {
                x[i] = x[i - 1] + 0.6;
                y[i] = centreY(x[i]);
                length += Math.hypot(x[i] - x[i - 1], y[i] - y[i - 1]);
                last = i;
            }
            return DendritePath.of(Arrays.copyOf(x, last + 1), Arrays.copyOf(y, last + 1), false);
        }

        StimulusRegion stimulusRegion() {
            return new StimulusRegion(256, centreY(256), 5 / PIXEL_UM);
        }

        /** Frame f, photons, at the pixel centres moved back by the frame's shift. */
        short[] render(int f) {
            float[] v = new float[WIDTH * HEIGHT];
            Arrays.fill(v, 100);
            double sx = dxPx(f);
            double sy = dyPx(f);
            double front = f < STIMULUS_FRAME ? 0 : 3 * Math.sqrt(f - STIMULUS_FRAME + 1.0);
            double fade = f < STIMULUS_FRAME ? 0 : 2.0 * Math.exp(-(f - STIMULUS_FRAME) / 600.0);
            for (int i = 0; i < WIDTH; i++) {
                double x = i + 0.5 - sx;
                double c = centreY(x) + sy;
                double gain = 1 + (front > 0 ? fade * Math.exp(-Math.pow((x - 256) / front, 2)) : 0);
                int j0 = Math.max(0, (int) (c - 6 * RIDGE_SIGMA));
                int j1 = Math.min(HEIGHT - 1, (int) (c + 6 * RIDGE_SIGMA));
                for (int j = j0; j <= j1; j++) {
                    double d = j + 0.5 - c;
                    v[j * WIDTH + i] += (float) (600 * gain * Math.exp(-d * d / (2 * RIDGE_SIGMA * RIDGE_SIGMA)));
                }
            }
            for (int b = 0; b < blobX.length; b++) {
                double bx = blobX[b] + sx;
                double by = blobY[b] + sy;
                double reach = 4 * blobSigma[b];
                double gain = spine[b] && front > 0 ? 1 + fade * Math.exp(-Math.pow((blobX[b] - 256) / front, 2)) : 1;
                for (int j = Math.max(0, (int) (by - reach)); j <= Math.min(HEIGHT - 1, (int) (by + reach)); j++) {
                    for (int i = Math.max(0, (int) (bx - reach)); i <= Math.min(WIDTH - 1, (int) (bx + reach)); i++) {
                        double dx = i + 0.5 - bx;
                        double dy = j + 0.5 - by;
                        v[j * WIDTH + i] += (float) (gain * blobPeak[b]
                                * Math.exp(-(dx * dx + dy * dy) / (2 * blobSigma[b] * blobSigma[b])));
                    }
                }
            }
            SplittableRandom random = new SplittableRandom(20261204L + f);
            short[] pixels = new short[WIDTH * HEIGHT];
            for (int p = 0; p < pixels.length; p++) {
                // Poisson-like: the square root of the mean as standard deviation (a cheap approximate normal)
                double noise = (random.nextDouble() + random.nextDouble() + random.nextDouble() - 1.5) * 2;
                pixels[p] = (short) Math.min(65535, Math.max(0, Math.round(v[p] + Math.sqrt(v[p]) * noise)));
            }
            return pixels;
        }
    }

    private static final class RenderedStack extends VirtualStack {
        private final Scene scene;

        RenderedStack(Scene scene) {
            super(WIDTH, HEIGHT, null, null);
            this.scene = scene;
        }

        @Override
        public int getSize() {
            return FRAMES;
        }

        @Override
        public String getSliceLabel(int n) {
            return null;
        }

        @Override
        public ImageProcessor getProcessor(int n) {
            return new ShortProcessor(WIDTH, HEIGHT, scene.render(n - 1), null);
        }
    }
}
