package org.dendrokin.io.movie;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;
import static org.junit.jupiter.api.Assumptions.assumeTrue;

import java.io.IOException;
import java.lang.management.ManagementFactory;
import java.nio.ByteOrder;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.SplittableRandom;

import org.junit.jupiter.api.io.TempDir;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.ValueSource;

/**
 * Reading the last frame of a compressed movie allocates about what reading the first one does: the decoders seek
 * to the frame and never hold the file before it (ImageJ's virtual stack held every byte from the start of the file
 * up to the frame). Measured as bytes allocated by this thread, not as time.
 */
class CompressedReadAllocationTest {
    private static final int SIZE = 96;
    private static final int FRAMES = 80;

    @TempDir
    Path dir;

    @ParameterizedTest(name = "{0}")
    @ValueSource(strings = {"Deflate strips", "Deflate tiles"})
    void theLastFrameCostsNoMoreThanTheFirst(String variant) throws IOException {
        com.sun.management.ThreadMXBean threads = threadBean();
        SplittableRandom random = new SplittableRandom(20261203L);
        double[][][] frames = new double[FRAMES][1][SIZE * SIZE];
        for (double[][] f : frames) {
            for (int p = 0; p < f[0].length; p++) {
                f[0][p] = 1000 + random.nextInt(20000);  // noise: the compressed file stays large
            }
        }
        Path file = variant.endsWith("strips")
                ? SmallTiffWriter.write(dir.resolve("noise-deflate.tif"), SmallTiffWriter.Format.of(16, 1)
                        .compressed(SmallTiffWriter.DEFLATE, 1), SIZE, SIZE, frames)
                : JavaTiffWriter.write(SIZE, SIZE, dir.resolve("noise-tiles.tif"), 16, "Deflate", true,
                        ByteOrder.BIG_ENDIAN, false, null, frames);
        long fileBytes = Files.size(file);
        long frameBytes = 2L * SIZE * SIZE;
        assertTrue(fileBytes > FRAMES * frameBytes / 2, "the noise keeps the file large: " + fileBytes);
        try (Movie movie = Movie.open(file, 0.2, 0.1)) {
            float[] px = new float[1];
            int[] centre = {SIZE / 2 * SIZE + SIZE / 2};
            movie.channel(0).gather(1, centre, px);  // warm up the code paths
            long first = allocated(threads, () -> movie.channel(0).gather(2, centre, px));
            long last = allocated(threads, () -> movie.channel(0).gather(FRAMES - 1, centre, px));
            // REF: the value the writer was given [common practice]
            assertEquals(frames[FRAMES - 1][0][centre[0]], px[0], 0.0, "centre of the last frame");
            // one frame decodes into a few frame-sized buffers; the file before the last frame holds 79 frames
            assertTrue(last < first + 8 * frameBytes, "last frame allocated " + last + " bytes, first " + first
                    + "; a frame is " + frameBytes + " bytes, the file " + fileBytes);
        }
    }

    private static com.sun.management.ThreadMXBean threadBean() {
        java.lang.management.ThreadMXBean bean = ManagementFactory.getThreadMXBean();
        assumeTrue(bean instanceof com.sun.management.ThreadMXBean, "this JVM does not count allocations");
        com.sun.management.ThreadMXBean threads = (com.sun.management.ThreadMXBean) bean;
        assumeTrue(threads.isThreadAllocatedMemorySupported() && threads.isThreadAllocatedMemoryEnabled(),
                "this JVM does not count allocations");
        return threads;
    }

    private static long allocated(com.sun.management.ThreadMXBean threads, Runnable read) {
        long id = Thread.currentThread().getId();
        long before = threads.getThreadAllocatedBytes(id);
        read.run();
        return threads.getThreadAllocatedBytes(id) - before;
    }
}
