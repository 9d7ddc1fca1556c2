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
import org.dendrokin.core.path.DendritePath;
import org.dendrokin.io.movie.Movie;
import org.dendrokin.io.movie.PathExtraction;

/**
 * Benchmark (not a test): kymograph extraction from a generated 512 x 512 x 2000 16-bit uncompressed TIFF (1 GB)
 * along a 100 um curved path, against a plain sequential read of the same file through a FileChannel into a
 * reused buffer. Both run in this JVM after warm-up, with the file in the page cache. Prints GB/s for both, the
 * ratio and the peak heap. Run with -Xmx512m (see docs/benchmarks.md). The movie is written to a temporary
 * folder (or the folder given as the first argument) frame by frame, never held whole, and deleted at the end.
 */
public final class KymographExtractionBenchmark {
    private static final int WIDTH = 512;
    private static final int HEIGHT = 512;
    private static final int FRAMES = 2000;
    private static final double PIXEL_UM = 0.3;
    private static final double FRAME_S = 0.05;
    private static final double PATH_UM = 100;
    private static final double BAND_UM = 1.0;
    private static final int REPEATS = 5;
    private static final double MIB = 1024.0 * 1024.0;

    private KymographExtractionBenchmark() {
    }

    public static void main(String[] args) throws IOException {
        Path dir = args.length > 0 ? Path.of(args[0]) : Files.createTempDirectory("dendrokin-bench");
        Path file = dir.resolve("bench-512x512x2000-16bit.tif");
        try {
            long t0 = System.nanoTime();
            write(file);
            double bytes = Files.size(file);
            System.out.printf(Locale.ROOT, "movie: %s, %.3f GB, written in %.1f s%n", file, bytes / 1e9,
                    (System.nanoTime() - t0) / 1e9);
            DendritePath path = curvedPath();
            DendritePath steep = verticalPath();
            System.out.printf(Locale.ROOT, "path: %.1f um (%.1f px) S-curve over rows %.0f-%.0f, band %.1f um, "
                    + "%d samples a frame%n", path.lengthPx() * PIXEL_UM, path.lengthPx(), min(path.yPx()),
                    max(path.yPx()), BAND_UM, path.resample(1.0).size());
            System.out.printf(Locale.ROOT, "steep path: %.1f um vertical line over rows %.0f-%.0f%n",
                    steep.lengthPx() * PIXEL_UM, min(steep.yPx()), max(steep.yPx()));
            for (int i = 0; i < 2; i++) {
                plainRead(file);
                extract(file, path);
                extract(file, steep);
            }
            resetPeaks();
            double[] plain = new double[REPEATS];
            double[] extract = new double[REPEATS];
            double[] extractSteep = new double[REPEATS];
            Extraction last = null;
            for (int i = 0; i < REPEATS; i++) {
                long a = System.nanoTime();
                plainRead(file);
                plain[i] = (System.nanoTime() - a) / 1e9;
                a = System.nanoTime();
                last = extract(file, path);
                extract[i] = (System.nanoTime() - a) / 1e9;
                a = System.nanoTime();
                extract(file, steep);
                extractSteep[i] = (System.nanoTime() - a) / 1e9;
            }
            Arrays.sort(plain);
            Arrays.sort(extract);
            Arrays.sort(extractSteep);
            double plainMedian = plain[REPEATS / 2];
            double extractMedian = extract[REPEATS / 2];
            double steepMedian = extractSteep[REPEATS / 2];
            System.out.printf(Locale.ROOT, "plain FileChannel read: median %.3f s (best %.3f s) = %.2f GB/s%n",
                    plainMedian, plain[0], bytes / plainMedian / 1e9);
            System.out.printf(Locale.ROOT, "kymograph extraction, S-curve (open + extract): median %.3f s (best %.3f s)"
                    + " = %.2f GB/s%n", extractMedian, extract[0], bytes / extractMedian / 1e9);
            System.out.printf(Locale.ROOT, "ratio extraction / plain read speed, S-curve: %.2f (median), %.2f (best)%n",
                    plainMedian / extractMedian, plain[0] / extract[0]);
            System.out.printf(Locale.ROOT, "kymograph extraction, vertical line: median %.3f s (best %.3f s) = "
                    + "%.2f GB/s, ratio %.2f (median)%n", steepMedian, extractSteep[0], bytes / steepMedian / 1e9,
                    plainMedian / steepMedian);
            System.out.printf(Locale.ROOT, "kymograph: %d frames x %d positions, %d NaN%n",
                    last.kymograph().frameCount(), last.kymograph().positionCount(), last.samplesOutside());
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

    /** A gentle S-curve across the middle of the frame, 100 um long. */
    static DendritePath curvedPath() {
        int n = 400;
        double[] x = new double[n + 1];
        double[] y = new double[n + 1];
        double spanPx = 300;
        for (int i = 0; i <= n; i++) {
            double u = i / (double) n;
            x[i] = 100 + spanPx * u;
            y[i] = 256 + 40 * Math.sin(2 * Math.PI * u);
        }
        // stretch the span so the length is 100 um
        DendritePath draft = DendritePath.of(x, y, false);
        double scale = PATH_UM / PIXEL_UM / draft.lengthPx();
        for (int i = 0; i <= n; i++) {
            x[i] = 100 + (x[i] - 100) * scale;
            y[i] = 256 + (y[i] - 256) * scale;
        }
        return DendritePath.of(x, y, false);
    }

    /** A vertical line through the middle of the frame, 100 um long: the band touches most rows. */
    static DendritePath verticalPath() {
        double lengthPx = PATH_UM / PIXEL_UM;
        double top = 256 - lengthPx / 2;
        return DendritePath.of(new double[] {256.5, 256.5}, new double[] {top, top + lengthPx}, false);
    }

    private static double min(double[] v) {
        return Arrays.stream(v).min().orElse(Double.NaN);
    }

    private static double max(double[] v) {
        return Arrays.stream(v).max().orElse(Double.NaN);
    }

    private static Extraction extract(Path file, DendritePath path) {
        try (Movie movie = Movie.open(file, null, null)) {
            return PathExtraction.extract(movie, 0, path, file, BAND_UM, Progress.NONE);
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

    private static final ByteBuffer REUSED = ByteBuffer.allocateDirect(4 << 20);

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

    /** Writes the movie through ImageJ's FileSaver from a stack that makes each frame when asked for it. */
    private static void write(Path file) {
        ImagePlus imp = new ImagePlus("bench", new GeneratedStack());
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
     * Frames of a demo scenario: a dendrite (a bright band along a sine curve) over a dim background with noise,
     * and a wave of brightness travelling along it. Made one frame at a time from a seeded generator.
     */
    private static final class GeneratedStack extends VirtualStack {
        private final short[] base = new short[WIDTH * HEIGHT];
        private final float[] ridge = new float[WIDTH * HEIGHT];

        GeneratedStack() {
            super(WIDTH, HEIGHT, null, null);
            for (int yy = 0; yy < HEIGHT; yy++) {
                for (int xx = 0; xx < WIDTH; xx++) {
                    double centre = 256 + 45 * Math.sin(2 * Math.PI * (xx - 100) / 340.0);
                    double r = Math.exp(-Math.pow((yy + 0.5 - centre) / 3.0, 2));
                    ridge[yy * WIDTH + xx] = (float) r;
                    base[yy * WIDTH + xx] = (short) (300 + 900 * r);
                }
            }
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
            SplittableRandom random = new SplittableRandom(20261201L + n);
            short[] pixels = base.clone();
            double front = 60 + 0.25 * n;  // column the wave has reached, px
            for (int i = 0; i < pixels.length; i++) {
                int xx = i % WIDTH;
                double wave = ridge[i] > 0.01 && xx < front ? 1500 * ridge[i] * Math.exp(-(front - xx) / 80.0) : 0;
                pixels[i] = (short) Math.min(65535, (pixels[i] & 0xffff) + wave + random.nextInt(40));
            }
            return new ShortProcessor(WIDTH, HEIGHT, pixels, null);
        }
    }
}
