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
 * Planes of an uncompressed TIFF, each one contiguous block of {@code width * height} samples at an offset taken
 * from the TIFF's own header (through ImageJ's {@link ij.io.TiffDecoder}).
 *
 * <p>Reads. A request (some rows, or the pixels of a band or a window) covers one contiguous byte range of a
 * plane, from its first to its last pixel. Ranges up to {@value #MAX_POSITIONAL_READ} bytes are copied with one
 * positional read of the file ({@link FileChannel#read(ByteBuffer, long)}) into a buffer kept per thread (at most that size); larger ones
 * are read from a read-only memory map of the file. A path crosses a band of rows of each frame, so either way only
 * that part of the file is read; the positional read is the faster of the two for the ranges that paths and motion
 * windows need, because it copies the bytes in one call where a fresh map takes a page fault for every 4 KiB touched
 * (on a 1 GB movie: 0.2 s against about 0.07 s for a kymograph, docs/benchmarks.md). The map is in pieces of at
 * most 1 GiB, each holding whole planes. Only the operating system's page cache and the per-thread buffers hold the
 * data. Safe for concurrent readers (only absolute reads). If a positional read fails (a thread interrupted while
 * reading closes the channel), every later read goes through the map.
 */
final class MappedPlanes implements PlaneStore {
    private static final long MAX_CHUNK = 1L << 30;
    /** Largest byte range read by one positional read; larger ones come from the map. */
    static final int MAX_POSITIONAL_READ = 16 << 20;
    /**
     * Each thread's read buffer, shared by every open movie (so that a batch over many movies keeps one buffer per
     * thread, not one per movie and thread); direct, so that the read needs no second copy.
     */
    private static final ThreadLocal<ByteBuffer> SCRATCH = new ThreadLocal<>();

    private final int width;
    private final int fileType;
    private final int bytesPerPixel;
    private final ByteBuffer[] chunks;
    private final int[] planeChunk;
    private final int[] planeStart;
    private final long[] planeOffset;
    private final ByteOrder order;
    private final FileChannel channel;
    private volatile boolean positional = true;

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
        this.order = intel ? ByteOrder.LITTLE_ENDIAN : ByteOrder.BIG_ENDIAN;
        this.planeOffset = offsets.clone();
        planeChunk = new int[offsets.length];
        planeStart = new int[offsets.length];
        List<ByteBuffer> mapped = new ArrayList<>();
        channel = FileChannel.open(file, StandardOpenOption.READ);
        try {
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
        } catch (IOException | RuntimeException e) {
            channel.close();
            throw e;
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
        int n = rowCount * width;
        int first = firstRow * width * bytesPerPixel;
        ByteBuffer b = positionalRead(plane, first, n * bytesPerPixel);
        int base = b != null ? 0 : planeStart[plane] + first;
        if (b == null) {
            b = chunks[planeChunk[plane]];
        }
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
        if (pixelIndices.length == 0) {
            return;
        }
        // the indices are ascending: one range from the first to the last
        int first = pixelIndices[0] * bytesPerPixel;
        int span = (pixelIndices[pixelIndices.length - 1] - pixelIndices[0] + 1) * bytesPerPixel;
        ByteBuffer b = positionalRead(plane, first, span);
        int base = b != null ? -first : planeStart[plane];
        if (b == null) {
            b = chunks[planeChunk[plane]];
        }
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

    /**
     * Bytes [from, from + length) of a plane read into this thread's buffer (position 0 holds byte {@code from}), or
     * null when the range is too large or positional reads have failed: the caller then reads the map.
     */
    private ByteBuffer positionalRead(int plane, int from, int length) {
        if (!positional || length > MAX_POSITIONAL_READ || length <= 0) {
            return null;
        }
        ByteBuffer b = SCRATCH.get();
        if (b == null || b.capacity() < length) {
            b = ByteBuffer.allocateDirect(Math.max(length, 64 << 10));
            SCRATCH.set(b);
        }
        b.order(order).clear().limit(length);
        long at = planeOffset[plane] + from;
        try {
            while (b.hasRemaining()) {
                if (channel.read(b, at + b.position()) < 0) {
                    throw new IOException("the file ended inside an image plane");
                }
            }
        } catch (IOException e) {
            // e.g. closed by an interrupted reader: the map still serves
            positional = false;
            return null;
        }
        return b;
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
        // The maps are released by the garbage collector; the channel is closed here.
        try {
            channel.close();
        } catch (IOException e) {
            // nothing was written, so nothing can be lost
        }
    }
}
