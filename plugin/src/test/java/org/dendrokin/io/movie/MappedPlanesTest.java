package org.dendrokin.io.movie;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.nio.ByteBuffer;
import java.nio.ByteOrder;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Random;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

import ij.io.FileInfo;

/**
 * Planes read by one positional read per request and through the memory map give the same values, which are the
 * values written; a reader interrupted while reading still gets them (through the map).
 */
class MappedPlanesTest {
    private static final int W = 37;
    private static final int H = 23;
    private static final int PLANES = 5;

    @Test
    void positionalReadsAndTheMapGiveTheWrittenValues(@TempDir Path dir) throws IOException {
        for (int type : new int[] {FileInfo.GRAY8, FileInfo.GRAY16_UNSIGNED, FileInfo.GRAY16_SIGNED,
            FileInfo.GRAY32_FLOAT}) {
            for (boolean intel : new boolean[] {true, false}) {
                Written w = write(dir.resolve("planes-" + type + "-" + intel + ".raw"), type, intel);
                try (MappedPlanes planes = new MappedPlanes(w.file, W, H, type, intel, w.offsets)) {
                    for (int p = 0; p < PLANES; p++) {
                        float[] rows = new float[4 * W];
                        planes.readRows(p, 7, 4, rows);
                        float[] expected = new float[4 * W];
                        System.arraycopy(w.values[p], 7 * W, expected, 0, 4 * W);
                        // REF: the values as written through java.nio.ByteBuffer in the stated byte order [common
                        // practice]
                        assertArrayEquals(expected, rows, "rows, type " + type + ", intel " + intel);
                        int[] pixels = {3, 40, 41, 200, 6 * W + 36, H * W - 1};
                        float[] got = new float[pixels.length];
                        planes.gather(p, pixels, got);
                        float[] want = new float[pixels.length];
                        for (int i = 0; i < pixels.length; i++) {
                            want[i] = w.values[p][pixels[i]];
                        }
                        assertArrayEquals(want, got, "gathered pixels, type " + type + ", intel " + intel);
                    }
                }
            }
        }
    }

    @Test
    void anInterruptedReaderFallsBackToTheMap(@TempDir Path dir) throws IOException {
        Written w = write(dir.resolve("planes.raw"), FileInfo.GRAY16_UNSIGNED, true);
        try (MappedPlanes planes = new MappedPlanes(w.file, W, H, FileInfo.GRAY16_UNSIGNED, true, w.offsets)) {
            float[] rows = new float[W * H];
            Thread.currentThread().interrupt();
            try {
                // an interrupt closes a channel that is read; the values must come through all the same
                planes.readRows(2, 0, H, rows);
            } finally {
                assertTrue(Thread.interrupted(), "the interrupt is left for the caller to see");
            }
            assertArrayEquals(w.values[2], rows);
            planes.readRows(3, 0, H, rows);
            assertArrayEquals(w.values[3], rows, "and later reads too");
        }
    }

    private record Written(Path file, long[] offsets, float[][] values) {
    }

    /** Planes of random values at uneven offsets (a header of 13 bytes and gaps of 5 between planes). */
    private static Written write(Path file, int type, boolean intel) throws IOException {
        int bytes = type == FileInfo.GRAY8 ? 1 : type == FileInfo.GRAY32_FLOAT ? 4 : 2;
        Random random = new Random(type * 2L + (intel ? 1 : 0));
        long[] offsets = new long[PLANES];
        float[][] values = new float[PLANES][W * H];
        ByteBuffer out = ByteBuffer.allocate(13 + PLANES * (W * H * bytes + 5))
                .order(intel ? ByteOrder.LITTLE_ENDIAN : ByteOrder.BIG_ENDIAN);
        out.position(13);
        for (int p = 0; p < PLANES; p++) {
            offsets[p] = out.position();
            for (int i = 0; i < W * H; i++) {
                switch (type) {
                    case FileInfo.GRAY8 -> {
                        int v = random.nextInt(256);
                        out.put((byte) v);
                        values[p][i] = v;
                    }
                    case FileInfo.GRAY16_UNSIGNED -> {
                        int v = random.nextInt(65536);
                        out.putShort((short) v);
                        values[p][i] = v;
                    }
                    case FileInfo.GRAY16_SIGNED -> {
                        short v = (short) (random.nextInt(65536) - 32768);
                        out.putShort(v);
                        values[p][i] = v;
                    }
                    default -> {
                        float v = (float) random.nextGaussian() * 1000;
                        out.putFloat(v);
                        values[p][i] = v;
                    }
                }
            }
            out.position(out.position() + 5);
        }
        Files.write(file, out.array());
        return new Written(file, offsets, values);
    }
}
