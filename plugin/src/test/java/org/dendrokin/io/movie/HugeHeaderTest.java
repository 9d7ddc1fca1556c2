package org.dendrokin.io.movie;

import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.nio.ByteBuffer;
import java.nio.ByteOrder;
import java.nio.file.Files;
import java.nio.file.Path;

import org.dendrokin.io.InputException;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * A TIFF header that claims an image far larger than any movie (100000 x 100000 pixels) over a few bytes of Deflate
 * data: refused on opening, before a frame buffer of the claimed size is allocated (that allocation would need 20 GB
 * and end the program with an out-of-memory error).
 */
class HugeHeaderTest {
    @TempDir
    Path dir;

    /** Sets ImageWidth (256) and ImageLength (257) of every directory to the given values (LONG, count 1). */
    private static byte[] claim(byte[] tiff, int width, int height) {
        return claim(tiff, width, height, 1);
    }

    /** The same from the image {@code from} (counted from 1) on. */
    private static byte[] claim(byte[] tiff, int width, int height, int from) {
        ByteBuffer b = ByteBuffer.wrap(tiff.clone()).order(tiff[0] == 'I' ? ByteOrder.LITTLE_ENDIAN
                : ByteOrder.BIG_ENDIAN);
        long ifd = b.getInt(4) & 0xffffffffL;
        int image = 0;
        while (ifd != 0) {
            image++;
            int count = b.getShort((int) ifd) & 0xffff;
            for (int i = 0; i < count; i++) {
                int at = (int) ifd + 2 + 12 * i;
                int tag = b.getShort(at) & 0xffff;
                if (image >= from && (tag == 256 || tag == 257)) {
                    b.putShort(at + 2, (short) 4);
                    b.putInt(at + 4, 1);
                    b.putInt(at + 8, tag == 256 ? width : height);
                }
            }
            ifd = b.getInt((int) ifd + 2 + 12 * count) & 0xffffffffL;
        }
        return b.array();
    }

    /** Sets the count of every entry of {@code tag} in every directory. */
    private static byte[] count(byte[] tiff, int tag, int count) {
        ByteBuffer b = ByteBuffer.wrap(tiff.clone()).order(tiff[0] == 'I' ? ByteOrder.LITTLE_ENDIAN
                : ByteOrder.BIG_ENDIAN);
        long ifd = b.getInt(4) & 0xffffffffL;
        while (ifd != 0) {
            int n = b.getShort((int) ifd) & 0xffff;
            for (int i = 0; i < n; i++) {
                int at = (int) ifd + 2 + 12 * i;
                if ((b.getShort(at) & 0xffff) == tag) {
                    b.putInt(at + 4, count);
                }
            }
            ifd = b.getInt((int) ifd + 2 + 12 * n) & 0xffffffffL;
        }
        return b.array();
    }

    @Test
    void anEntryClaimingMoreValuesThanTheFileHoldsIsRefusedBeforeAReaderAllocatesThem() throws IOException {
        double[][][] images = new double[2][1][8 * 8];
        byte[] description = "ImageJ=1.54p\nimages=2\nframes=2\n".getBytes(java.nio.charset.StandardCharsets.US_ASCII);
        Path small = SmallTiffWriter.write(dir.resolve("described.tif"), SmallTiffWriter.Format.of(16, 1)
                .description(description), 8, 8, images);
        // ImageJ's decoder would allocate the description (2^31 - 16 bytes: over the VM's array limit) and the
        // strip tables (int[2^30]: 4 GB) before reading them.
        int[][] claims = {{270, Integer.MAX_VALUE - 16}, {273, 1 << 30}, {279, 1 << 30}};
        for (int[] claim : claims) {
            Path damaged = Files.write(dir.resolve("count" + claim[0] + ".tif"),
                    count(Files.readAllBytes(small), claim[0], claim[1]));
            InputException e = assertThrows(InputException.class, () -> Movie.open(damaged, 0.2, 0.5).close());
            assertTrue(e.getMessage().startsWith(damaged + ": the TIFF is damaged: tag " + claim[0] + " of image 1"),
                    e.getMessage());
        }
        Movie.open(small, 0.2, 0.5).close();
    }

    @Test
    void aCompressedTiffClaimingAHugeFrameIsRefusedBeforeItIsRead() throws IOException {
        double[][][] images = new double[3][1][8 * 8];
        for (double[][] image : images) {
            java.util.Arrays.fill(image[0], 100);
        }
        for (int predictor : new int[] {1, 2}) {
            Path small = SmallTiffWriter.write(dir.resolve("small" + predictor + ".tif"),
                    SmallTiffWriter.Format.of(16, 1).compressed(SmallTiffWriter.DEFLATE, predictor), 8, 8, images);
            Path huge = Files.write(dir.resolve("huge" + predictor + ".tif"),
                    claim(Files.readAllBytes(small), 100_000, 100_000));
            InputException e = assertThrows(InputException.class, () -> Movie.open(huge, 0.2, 0.5).close());
            assertTrue(e.getMessage().startsWith(huge + ": ") && e.getMessage().contains("100000 x 100000"),
                    e.getMessage());
        }
    }

    @Test
    void aLaterImageClaimingAHugeFrameIsRefusedBeforeItIsRead() throws IOException {
        double[][][] images = new double[3][1][8 * 8];
        for (int compression : new int[] {SmallTiffWriter.NONE, SmallTiffWriter.DEFLATE}) {
            Path small = SmallTiffWriter.write(dir.resolve("three" + compression + ".tif"),
                    SmallTiffWriter.Format.of(16, 1).compressed(compression, 1), 8, 8, images);
            Path huge = Files.write(dir.resolve("later" + compression + ".tif"),
                    claim(Files.readAllBytes(small), 100_000, 100_000, 2));
            InputException e = assertThrows(InputException.class, () -> Movie.open(huge, 0.2, 0.5).close());
            assertTrue(e.getMessage().startsWith(huge + ": image 2 of the TIFF is 100000 x 100000 pixels"),
                    e.getMessage());
        }
    }
}
