package org.dendrokin.io.path;

import java.nio.ByteBuffer;
import java.nio.ByteOrder;

/**
 * Checks the lengths an ImageJ {@code .roi} file claims against the bytes it holds, before ImageJ's
 * {@link ij.io.RoiDecoder} sees it. The decoder allocates arrays of the sizes the header gives (vertex count,
 * composite shape size, name, text, properties, point counters, embedded image) before it reads them, and some of its
 * own bounds checks overflow, so a damaged header can ask for gigabytes. Nothing is decoded here: only each claimed
 * length is compared with the file's size. The offsets are those of ImageJ's format (ImageJ 1.54,
 * {@code ij.io.RoiDecoder}; big-endian fields; a 64-byte header, an optional 64-byte second header).
 */
public final class RoiBytes {
    private static final int HEADER = 64;
    private static final int VERSION = 4;
    private static final int TYPE = 6;
    private static final int N_COORDINATES = 16;
    private static final int SIZE = 18;
    private static final int SHAPE_ROI_SIZE = 36;
    private static final int SUBTYPE = 48;
    private static final int OPTIONS = 50;
    private static final int HEADER2_OFFSET = 60;
    private static final int NAME_OFFSET = 16;
    private static final int NAME_LENGTH = 20;
    private static final int IMAGE_SIZE = 32;
    private static final int PROPS_OFFSET = 40;
    private static final int PROPS_LENGTH = 44;
    private static final int COUNTERS_OFFSET = 48;
    private static final int GROUP = 30;
    private static final int SUB_PIXEL_RESOLUTION = 128;
    private static final int SUBTYPE_TEXT = 1;
    private static final int SUBTYPE_IMAGE = 4;
    /** ROI types whose vertices follow the header: polygon, freeline, polyline, freehand, traced, angle, point. */
    private static final int[] VERTEX_TYPES = {0, 4, 5, 7, 8, 9, 10};

    private RoiBytes() {
    }

    /**
     * A copy of the bytes with the ROI's group (a byte of the second header that only colours the ROI in ImageJ's
     * display) set to none: for a group, ImageJ's decoder looks up a colour table that a headless installation does
     * not have and prints "LUT not found" to the terminal. The group means nothing for a path or a spine, so it is
     * dropped before decoding.
     */
    public static byte[] withoutGroup(byte[] bytes) {
        byte[] copy = bytes.clone();
        if (copy.length >= HEADER) {
            int header2 = ByteBuffer.wrap(copy).order(ByteOrder.BIG_ENDIAN).getInt(HEADER2_OFFSET);
            if (header2 > 0 && (long) header2 + GROUP < copy.length) {
                copy[header2 + GROUP] = 0;
            }
        }
        return copy;
    }

    /**
     * The first length in the header that the file cannot hold, as words for a message, or null when every claimed
     * length fits.
     */
    static String overclaim(byte[] bytes) {
        long size = bytes.length;
        if (size < HEADER || bytes[0] != 'I' || bytes[1] != 'o' || bytes[2] != 'u' || bytes[3] != 't') {
            return "it does not start with an ImageJ ROI header";
        }
        ByteBuffer b = ByteBuffer.wrap(bytes).order(ByteOrder.BIG_ENDIAN);
        int version = b.getShort(VERSION);
        int type = b.get(TYPE) & 0xff;
        int subtype = b.getShort(SUBTYPE);
        int options = b.getShort(OPTIONS);
        long n = b.getShort(N_COORDINATES) & 0xffff;
        if (n == 0) {
            n = b.getInt(SIZE);
        }
        int shape = b.getInt(SHAPE_ROI_SIZE);
        if (shape > 0 && HEADER + 4L * shape > size) {
            return "its header claims a shape of " + shape + " values";
        }
        if (shape <= 0 && isVertexType(type)) {
            long perVertex = 4 + ((options & SUB_PIXEL_RESOLUTION) != 0 && version >= 222 ? 8 : 0);
            if (n < 0 || HEADER + perVertex * n > size) {
                return "its header claims " + n + " vertices";
            }
        }
        if (version >= 218 && subtype == SUBTYPE_TEXT) {
            long name = size >= HEADER + 16 ? b.getInt(HEADER + 8) : -1;
            long text = size >= HEADER + 16 ? b.getInt(HEADER + 12) : -1;
            if (name < 0 || text < 0 || HEADER + 20 + 2 * (name + text) > size) {
                return "its header claims a text of " + text + " characters in a font named by " + name;
            }
        }
        int header2 = b.getInt(HEADER2_OFFSET);
        if (header2 <= 0 || header2 + 64L > size) {
            return null;
        }
        if (!fits(b.getInt(header2 + NAME_OFFSET), b.getInt(header2 + NAME_LENGTH), 2, size)) {
            return "its header claims a name of " + b.getInt(header2 + NAME_LENGTH) + " characters";
        }
        if (version >= 224 && !fits(b.getInt(header2 + PROPS_OFFSET), b.getInt(header2 + PROPS_LENGTH), 2, size)) {
            return "its header claims properties of " + b.getInt(header2 + PROPS_LENGTH) + " characters";
        }
        int counters = b.getInt(header2 + COUNTERS_OFFSET);
        if (version >= 227 && counters != 0 && (counters < 0 || n < 0 || counters + 4 * n > size)) {
            return "its header claims " + n + " point counters";
        }
        int image = b.getInt(header2 + IMAGE_SIZE);
        if (version >= 221 && subtype == SUBTYPE_IMAGE && image > 0 && HEADER + (long) image > size) {
            return "its header claims an image of " + image + " bytes";
        }
        return null;
    }

    /** True when a (offset, length) pair is absent (either 0) or lies inside the file. */
    private static boolean fits(int offset, int length, int bytesEach, long size) {
        if (offset == 0 || length == 0) {
            return true;
        }
        return offset > 0 && length > 0 && offset + (long) bytesEach * length <= size;
    }

    private static boolean isVertexType(int type) {
        for (int t : VERTEX_TYPES) {
            if (t == type) {
                return true;
            }
        }
        return false;
    }
}
