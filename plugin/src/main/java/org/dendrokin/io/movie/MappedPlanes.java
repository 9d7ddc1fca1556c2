package org.dendrokin.io.movie;

import java.io.IOException;
import java.nio.ByteBuffer;
import java.nio.ByteOrder;
import java.nio.MappedByteBuffer;
import java.nio.channels.FileChannel;
import java.nio.file.Path;
import java.nio.file.StandardOpenOption;
import java.util.ArrayList;
import java.util.List;

import ij.io.FileInfo;

/**
 * Planes of an uncompressed TIFF read straight from a read-only memory map of the file: each plane is one
 * contiguous block of {@code width * height} samples at an offset taken from the TIFF's own header (through
 * ImageJ's {@link ij.io.TiffDecoder}). Reading a pixel touches only the page that holds it, so a path that
 * crosses a small part of each frame reads a small part of the file. The file is mapped in pieces of at most
 * 1 GiB, each holding whole planes. Only the operating system's page cache holds the data; the Java heap holds
 * none of it. Safe for concurrent readers (only absolute reads are used).
 */
final class MappedPlanes implements PlaneStore {
    private static final long MAX_CHUNK = 1L << 30;

    private final int width;
    private final int fileType;
    private final int bytesPerPixel;
    private final ByteBuffer[] chunks;
    private final int[] planeChunk;
    private final int[] planeStart;

    /**
     * @param file     the TIFF, opened read-only
     * @param width    plane width, pixels
     * @param height   plane height, pixels
     * @param fileType an ImageJ {@link FileInfo} type: GRAY8, GRAY16_UNSIGNED, GRAY16_SIGNED, GRAY32_FLOAT,
     *                 GRAY32_INT or GRAY32_UNSIGNED
     * @param intel    true for little-endian samples
     * @param offsets  byte offset of each plane in the file
     */
    MappedPlanes(Path file, int width, int height, int fileType, boolean intel, long[] offsets) throws IOException {
        this.width = width;
        this.fileType = fileType;
        this.bytesPerPixel = bytesPerPixel(fileType);
        long planeBytes = (long) width * height * bytesPerPixel;
        if (planeBytes > MAX_CHUNK) {
            throw new IOException("a single image of " + planeBytes + " bytes is too large to map");
        }
        ByteOrder order = intel ? ByteOrder.LITTLE_ENDIAN : ByteOrder.BIG_ENDIAN;
        planeChunk = new int[offsets.length];
        planeStart = new int[offsets.length];
        List<ByteBuffer> mapped = new ArrayList<>();
        try (FileChannel channel = FileChannel.open(file, StandardOpenOption.READ)) {
            int p = 0;
            while (p < offsets.length) {
                long chunkStart = offsets[p];
                int q = p;
                long chunkEnd = chunkStart + planeBytes;
                while (q + 1 < offsets.length && offsets[q + 1] >= chunkStart
                        && offsets[q + 1] + planeBytes - chunkStart <= MAX_CHUNK) {
                    q++;
                    chunkEnd = Math.max(chunkEnd, offsets[q] + planeBytes);
                }
                MappedByteBuffer buffer = channel.map(FileChannel.MapMode.READ_ONLY, chunkStart, chunkEnd - chunkStart);
                buffer.order(order);
                for (int i = p; i <= q; i++) {
                    planeChunk[i] = mapped.size();
                    planeStart[i] = (int) (offsets[i] - chunkStart);
                }
                mapped.add(buffer);
                p = q + 1;
            }
        }
        chunks = mapped.toArray(new ByteBuffer[0]);
    }

    /** True if planes of this ImageJ file type can be read by this class. */
    static boolean supports(int fileType) {
        return bytesPerPixel(fileType) > 0;
    }

    private static int bytesPerPixel(int fileType) {
        switch (fileType) {
            case FileInfo.GRAY8:
                return 1;
            case FileInfo.GRAY16_UNSIGNED:
            case FileInfo.GRAY16_SIGNED:
                return 2;
            case FileInfo.GRAY32_FLOAT:
            case FileInfo.GRAY32_INT:
            case FileInfo.GRAY32_UNSIGNED:
                return 4;
            default:
                return 0;
        }
    }

    @Override
    public void readRows(int plane, int firstRow, int rowCount, float[] dst) {
        ByteBuffer b = chunks[planeChunk[plane]];
        int base = planeStart[plane] + firstRow * width * bytesPerPixel;
        int n = rowCount * width;
        switch (fileType) {
            case FileInfo.GRAY8:
                for (int i = 0; i < n; i++) {
                    dst[i] = b.get(base + i) & 0xff;
                }
                break;
            case FileInfo.GRAY16_UNSIGNED:
                for (int i = 0; i < n; i++) {
                    dst[i] = b.getShort(base + 2 * i) & 0xffff;
                }
                break;
            default:
                for (int i = 0; i < n; i++) {
                    dst[i] = value(b, base + bytesPerPixel * i);
                }
        }
    }

    @Override
    public void gather(int plane, int[] pixelIndices, float[] dst) {
        ByteBuffer b = chunks[planeChunk[plane]];
        int base = planeStart[plane];
        switch (fileType) {
            case FileInfo.GRAY8:
                for (int i = 0; i < pixelIndices.length; i++) {
                    dst[i] = b.get(base + pixelIndices[i]) & 0xff;
                }
                break;
            case FileInfo.GRAY16_UNSIGNED:
                for (int i = 0; i < pixelIndices.length; i++) {
                    dst[i] = b.getShort(base + 2 * pixelIndices[i]) & 0xffff;
                }
                break;
            default:
                for (int i = 0; i < pixelIndices.length; i++) {
                    dst[i] = value(b, base + bytesPerPixel * pixelIndices[i]);
                }
        }
    }

    private float value(ByteBuffer b, int at) {
        switch (fileType) {
            case FileInfo.GRAY8:
                return b.get(at) & 0xff;
            case FileInfo.GRAY16_UNSIGNED:
                return b.getShort(at) & 0xffff;
            case FileInfo.GRAY16_SIGNED:
                return b.getShort(at);
            case FileInfo.GRAY32_FLOAT:
                return b.getFloat(at);
            case FileInfo.GRAY32_INT:
                return b.getInt(at);
            case FileInfo.GRAY32_UNSIGNED:
                return b.getInt(at) & 0xffffffffL;
            default:
                throw new IllegalStateException("unsupported sample type " + fileType);
        }
    }

    @Override
    public void close() {
        // The maps are released by the garbage collector; nothing else is held open.
    }
}
