package org.dendrokin.io.movie;

import java.io.IOException;
import java.nio.ByteBuffer;
import java.nio.ByteOrder;
import java.nio.channels.FileChannel;
import java.nio.file.Path;
import java.nio.file.StandardOpenOption;
import java.util.HashSet;
import java.util.Locale;
import java.util.Set;

import org.dendrokin.io.InputException;

/**
 * Checks the lengths a TIFF's directory entries claim against the file's size, before ImageJ's or Java's TIFF reader
 * sees the file. Both readers allocate an array of the claimed count before reading an entry's values (ImageJ an
 * image description of {@code count} bytes, an {@code int[count]} of strip offsets, its metadata tables), so one
 * damaged count asks for gigabytes. Nothing is decoded: each entry whose values lie outside the entry (more than 4
 * bytes) must lie inside the file, and the strip and tile tables may not hold more entries than the file has groups
 * of 4 bytes (a valid file holds both tables, each entry at least 2 bytes). Problems of the chain of directories
 * themselves are left to {@link MovieLayout}, which reports them as a truncated file.
 */
final class TiffBounds {
    /** Strip offsets, strip byte counts, tile offsets, tile byte counts. */
    private static final int[] TABLE_TAGS = {273, 279, 324, 325};

    private TiffBounds() {
    }

    /**
     * Walks every directory of a classic TIFF and refuses an entry that claims more than the file holds.
     *
     * @param intel true for little-endian ("II") byte order
     * @throws InputException naming the file, the image, the tag and the claim
     */
    static void check(Path file, boolean intel) {
        ByteOrder order = intel ? ByteOrder.LITTLE_ENDIAN : ByteOrder.BIG_ENDIAN;
        try (FileChannel ch = FileChannel.open(file, StandardOpenOption.READ)) {
            long size = ch.size();
            ByteBuffer head = read(ch, 4, 4, order);
            long ifd = head == null ? 0 : head.getInt(0) & 0xffffffffL;
            Set<Long> seen = new HashSet<>();
            int image = 0;
            while (ifd >= 8 && ifd + 2 <= size && seen.add(ifd)) {
                image++;
                int count = read(ch, ifd, 2, order).getShort(0) & 0xffff;
                ByteBuffer entries = read(ch, ifd + 2, 12L * count + 4, order);
                if (entries == null) {
                    return;
                }
                for (int i = 0; i < count; i++) {
                    int tag = entries.getShort(12 * i) & 0xffff;
                    int type = entries.getShort(12 * i + 2) & 0xffff;
                    long n = entries.getInt(12 * i + 4) & 0xffffffffL;
                    long at = entries.getInt(12 * i + 8) & 0xffffffffL;
                    long bytes = n * typeSize(type);
                    if (bytes > 4 && at + bytes > size) {
                        throw new InputException(file, String.format(Locale.ROOT, "the TIFF is damaged: tag %d of "
                                + "image %d claims %d values (%d bytes) from byte %d on, beyond the end of the %d-byte "
                                + "file", tag, image, n, bytes, at, size));
                    }
                    if (isTable(tag) && 4 * n > size) {
                        throw new InputException(file, String.format(Locale.ROOT, "the TIFF is damaged: tag %d of "
                                + "image %d claims %d strips or tiles, more than a %d-byte file can hold", tag, image, n,
                                size));
                    }
                }
                ifd = entries.getInt(12 * count) & 0xffffffffL;
            }
        } catch (IOException e) {
            throw new InputException(file, "the movie could not be read (" + MovieLayout.oneLine(e) + ")", e);
        }
    }

    /** {@code length} bytes from {@code at}, or null when the file ends first. */
    private static ByteBuffer read(FileChannel ch, long at, long length, ByteOrder order) throws IOException {
        if (at + length > ch.size()) {
            return null;
        }
        ByteBuffer b = ByteBuffer.allocate((int) length).order(order);
        while (b.hasRemaining()) {
            if (ch.read(b, at + b.position()) < 0) {
                return null;
            }
        }
        return b.flip();
    }

    /** Bytes of one value of a TIFF field type (TIFF 6.0 section 2, and LONG8 of BigTIFF); 1 for unknown types. */
    private static int typeSize(int type) {
        return switch (type) {
            case 3, 8 -> 2;
            case 4, 9, 11, 13 -> 4;
            case 5, 10, 12, 16, 17, 18 -> 8;
            default -> 1;
        };
    }

    private static boolean isTable(int tag) {
        for (int t : TABLE_TAGS) {
            if (t == tag) {
                return true;
            }
        }
        return false;
    }
}
