package org.dendrokin.bench;

import java.awt.image.BufferedImage;
import java.awt.image.WritableRaster;
import java.io.IOException;
import java.lang.management.ManagementFactory;
import java.lang.management.MemoryPoolMXBean;
import java.lang.management.MemoryType;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Arrays;
import java.util.Locale;
import java.util.SplittableRandom;

import javax.imageio.IIOImage;
import javax.imageio.ImageIO;
import javax.imageio.ImageWriteParam;
import javax.imageio.ImageWriter;
import javax.imageio.stream.ImageOutputStream;

import ij.ImagePlus;
import ij.VirtualStack;
import ij.io.FileSaver;
import ij.process.ImageProcessor;
import ij.process.ShortProcessor;

import org.dendrokin.core.Progress;
import org.dendrokin.core.kymo.Extraction;
import org.dendrokin.core.path.DendritePath;
import org.dendrokin.io.movie.Movie;
import org.dendrokin.io.movie.PathExtraction;

/**
 * Benchmark (not a test): one 512 x 512 x 2000 16-bit movie (1.05 GB of pixels) stored three ways, each read by
 * {@code Movie.open} plus a kymograph extraction along a 100 um path over all frames: (a) uncompressed, written by
 * ImageJ (memory map), (b) Deflate in strips, written by Java's TIFF writer (ImageJ's virtual stack), (c) LZW in
 * 256 x 256 tiles, written by Java's TIFF writer (Java's TIFF reader). Prints the time of each (median of three
 * after one warm-up), the ratio to (a) and the peak heap while reading. Run with -Xmx512m (see
 * docs/benchmarks.md): the compressed routes must stream one frame at a time. The files are written frame by frame
 * into a temporary folder (or the folder given as the first argument) and deleted at the end.
 */
public final class CompressedMovieBenchmark {
    private static final int WIDTH = 512;
    private static final int HEIGHT = 512;
    private static final int FRAMES = 2000;
    private static final double PIXEL_UM = 0.3;
    private static final double FRAME_S = 0.05;
    private static final double BAND_UM = 1.0;
    private static final int REPEATS = 3;
    private static final double MIB = 1024.0 * 1024.0;

    private CompressedMovieBenchmark() {
    }

    public static void main(String[] args) throws IOException {
        Path dir = args.length > 0 ? Path.of(args[0]) : Files.createTempDirectory("dendrokin-bench");
        Path plain = dir.resolve("bench-plain.tif");
        Path deflate = dir.resolve("bench-deflate-strips.tif");
        Path tiles = dir.resolve("bench-lzw-tiles.tif");
        try {
            long t0 = System.nanoTime();
            writeWithImageJ(plain);
            System.out.printf(Locale.ROOT, "(a) uncompressed (ImageJ): %.3f GB, written in %.1f s%n",
                    Files.size(plain) / 1e9, (System.nanoTime() - t0) / 1e9);
            t0 = System.nanoTime();
            writeWithJava(deflate, "Deflate", false);
            System.out.printf(Locale.ROOT, "(b) Deflate strips (Java's writer): %.3f GB, written in %.1f s%n",
                    Files.size(deflate) / 1e9, (System.nanoTime() - t0) / 1e9);
            t0 = System.nanoTime();
            writeWithJava(tiles, "LZW", true);
            System.out.printf(Locale.ROOT, "(c) LZW 256 x 256 tiles (Java's writer): %.3f GB, written in %.1f s%n",
                    Files.size(tiles) / 1e9, (System.nanoTime() - t0) / 1e9);
            DendritePath path = KymographExtractionBenchmark.curvedPath();
            double[] reference = null;
            double plainMedian = Double.NaN;
            for (Path file : new Path[] {plain, deflate, tiles}) {
                extract(file, path);
                resetPeaks();
                double[] times = new double[REPEATS];
                Extraction last = null;
                for (int i = 0; i < REPEATS; i++) {
                    long a = System.nanoTime();
                    last = extract(file, path);
                    times[i] = (System.nanoTime() - a) / 1e9;
                }
                Arrays.sort(times);
                double median = times[REPEATS / 2];
                if (reference == null) {
                    reference = last.kymograph().values();
                    plainMedian = median;
                }
                double maxDiff = 0;
                double[] values = last.kymograph().values();
                for (int i = 0; i < values.length; i++) {
                    maxDiff = Math.max(maxDiff, Math.abs(values[i] - reference[i]));
                }
                System.out.printf(Locale.ROOT, "%s: open + extract median %.2f s (best %.2f s), %.1f x the "
                        + "uncompressed time; max |difference| from (a) %.3g; peak heap %.1f MiB%n",
                        file.getFileName(), median, times[0], median / plainMedian, maxDiff, peakHeapBytes() / MIB);
            }
            System.out.printf(Locale.ROOT, "max heap (-Xmx) %.0f MiB; system load average (1 min) at the end: %.2f "
                    + "on %d cores%n", Runtime.getRuntime().maxMemory() / MIB,
                    ManagementFactory.getOperatingSystemMXBean().getSystemLoadAverage(),
                    Runtime.getRuntime().availableProcessors());
        } finally {
            for (Path p : new Path[] {plain, deflate, tiles}) {
                Files.deleteIfExists(p);
            }
            if (args.length == 0) {
                Files.deleteIfExists(dir);
            }
        }
    }

    private static Extraction extract(Path file, DendritePath path) {
        try (Movie movie = Movie.open(file, PIXEL_UM, FRAME_S)) {
            return PathExtraction.extract(movie, 0, path, file, BAND_UM, Progress.NONE);
        }
    }

    /** Frame n: a bright ridge with a travelling wave and seeded noise, as 16-bit samples. */
    private static short[] frame(int n) {
        SplittableRandom random = new SplittableRandom(20261203L + n);
        short[] pixels = new short[WIDTH * HEIGHT];
        double front = 60 + 0.25 * n;
        for (int y = 0; y < HEIGHT; y++) {
            for (int x = 0; x < WIDTH; x++) {
                double centre = 256 + 45 * Math.sin(2 * Math.PI * (x - 100) / 340.0);
                double ridge = Math.exp(-Math.pow((y + 0.5 - centre) / 3.0, 2));
                double wave = x < front ? 1500 * ridge * Math.exp(-(front - x) / 80.0) : 0;
                pixels[y * WIDTH + x] = (short) Math.min(65535, 300 + 900 * ridge + wave + random.nextInt(40));
            }
        }
        return pixels;
    }

    private static void writeWithImageJ(Path file) {
        VirtualStack stack = new VirtualStack(WIDTH, HEIGHT, null, null) {
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
                return new ShortProcessor(WIDTH, HEIGHT, frame(n - 1), null);
            }
        };
        ImagePlus imp = new ImagePlus("bench", stack);
        imp.setDimensions(1, 1, FRAMES);
        if (!new FileSaver(imp).saveAsTiff(file.toString())) {
            throw new IllegalStateException("could not write " + file);
        }
    }

    private static void writeWithJava(Path file, String compression, boolean tiled) throws IOException {
        ImageWriter writer = ImageIO.getImageWritersByFormatName("tiff").next();
        try (ImageOutputStream out = ImageIO.createImageOutputStream(file.toFile())) {
            writer.setOutput(out);
            ImageWriteParam param = writer.getDefaultWriteParam();
            param.setCompressionMode(ImageWriteParam.MODE_EXPLICIT);
            param.setCompressionType(compression);
            if (tiled) {
                param.setTilingMode(ImageWriteParam.MODE_EXPLICIT);
                param.setTiling(256, 256, 0, 0);
            }
            writer.prepareWriteSequence(null);
            BufferedImage image = new BufferedImage(WIDTH, HEIGHT, BufferedImage.TYPE_USHORT_GRAY);
            WritableRaster raster = image.getRaster();
            for (int n = 0; n < FRAMES; n++) {
                short[] pixels = frame(n);
                for (int y = 0; y < HEIGHT; y++) {
                    for (int x = 0; x < WIDTH; x++) {
                        raster.setSample(x, y, 0, pixels[y * WIDTH + x] & 0xffff);
                    }
                }
                writer.writeToSequence(new IIOImage(image, null, null), param);
            }
            writer.endWriteSequence();
        } finally {
            writer.dispose();
        }
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
}
