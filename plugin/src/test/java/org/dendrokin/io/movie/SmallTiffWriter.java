package org.dendrokin.io.movie;

import java.io.ByteArrayOutputStream;
import java.io.IOException;
import java.nio.ByteBuffer;
import java.nio.ByteOrder;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.TreeMap;
import java.util.zip.Deflater;

/**
 * Writes the test TIFFs that no TIFF writer on the class path can make: predictors on 16- and 32-bit samples
 * (Java's TIFF writer applies predictor 2 to 8-bit samples only and never writes predictor 3; ImageJ writes no
 * predictor), several grey samples a pixel in the planar configuration (Java's writer writes chunky pixels only;
 * ImageJ writes one sample a pixel), descriptions in UTF-8 (both write one byte a character), and tags of
 * compression schemes nothing here encodes. Baseline TIFF 6.0 structure: an 8-byte header, the pixel data, then
 * one image directory an image with its entries in ascending tag order; one strip an image (one a sample plane in
 * the planar configuration); Deflate through java.util.zip (zlib format, TIFF compression 8).
 *
 * <p>Predictor 2 (TIFF 6.0 section 14) differences each sample from the one before it in the row, as unsigned
 * words of the sample's size (for 32-bit floating point, of its bit pattern, as libtiff does). Predictor 3 (Adobe
 * Photoshop TIFF Technical Note 3) splits each row's samples into byte planes, most significant byte first, and
 * differences the bytes along the row.
 */
final class SmallTiffWriter {
    static final int NONE = 1;
    static final int DEFLATE = 8;

    /** Sample layout and encoding. */
    record Format(int bits, int sampleFormat, int samples, int planar, int compression, int predictor,
            ByteOrder order, byte[] description) {
        static Format of(int bits, int sampleFormat) {
            return new Format(bits, sampleFormat, 1, 1, NONE, 1, ByteOrder.LITTLE_ENDIAN, null);
        }

        Format compressed(int scheme, int withPredictor) {
            return new Format(bits, sampleFormat, samples, planar, scheme, withPredictor, order, description);
        }

        Format samples(int count, int planarConfiguration) {
            return new Format(bits, sampleFormat, count, planarConfiguration, compression, predictor, order,
                    description);
        }

        Format order(ByteOrder byteOrder) {
            return new Format(bits, sampleFormat, samples, planar, compression, predictor, byteOrder, description);
        }

        Format description(byte[] text) {
            return new Format(bits, sampleFormat, samples, planar, compression, predictor, order, text);
        }
    }

    private SmallTiffWriter() {
    }

    /**
     * Writes the images.
     *
     * @param images images[i][s][y * width + x]: sample s of image i (stored as the format's sample type)
     */
    static Path write(Path file, Format f, int width, int height, double[][][] images) throws IOException {
        int bytes = f.bits() / 8;
        ByteArrayOutputStream out = new ByteArrayOutputStream();
        out.write(new byte[8]);
        List<long[]> offsets = new ArrayList<>();
        List<long[]> counts = new ArrayList<>();
        for (double[][] image : images) {
            int strips = f.planar() == 2 ? f.samples() : 1;
            int perRow = f.planar() == 2 ? 1 : f.samples();
            long[] o = new long[strips];
            long[] c = new long[strips];
            for (int s = 0; s < strips; s++) {
                ByteBuffer strip = ByteBuffer.allocate(width * height * perRow * bytes).order(ByteOrder.BIG_ENDIAN);
                for (int y = 0; y < height; y++) {
                    long[] row = new long[width * perRow];
                    for (int x = 0; x < width; x++) {
                        for (int k = 0; k < perRow; k++) {
                            row[x * perRow + k] = word(f, image[f.planar() == 2 ? s : k][y * width + x]);
                        }
                    }
                    strip.put(encodeRow(f, row, perRow));
                }
                byte[] data = f.compression() == DEFLATE ? deflate(strip.array())
                        : f.compression() == NONE ? strip.array() : new byte[] {1, 2, 3, 4, 5, 6, 7, 8};
                o[s] = out.size();
                c[s] = data.length;
                out.write(data);
            }
            offsets.add(o);
            counts.add(c);
        }
        long firstIfd = align(out);
        for (int i = 0; i < images.length; i++) {
            long here = align(out);
            TreeMap<Integer, byte[][]> entries = entries(f, width, height, offsets.get(i), counts.get(i));
            int n = entries.size();
            long dataAt = here + 2 + 12L * n + 4;
            ByteArrayOutputStream extra = new ByteArrayOutputStream();
            ByteBuffer ifd = ByteBuffer.allocate(2 + 12 * n + 4).order(f.order());
            ifd.putShort((short) n);
            for (var e : entries.entrySet()) {
                byte[] value = e.getValue()[1];
                ifd.putShort(e.getKey().shortValue());
                ifd.putShort(ByteBuffer.wrap(e.getValue()[0]).getShort());
                ifd.putInt(ByteBuffer.wrap(e.getValue()[0], 2, 4).getInt());
                if (value.length <= 4) {
                    ifd.put(value);
                    ifd.put(new byte[4 - value.length]);
                } else {
                    ifd.putInt((int) (dataAt + extra.size()));
                    extra.write(value);
                    if (extra.size() % 2 == 1) {
                        extra.write(0);
                    }
                }
            }
            long next = i + 1 < images.length ? dataAt + extra.size() : 0;
            ifd.putInt((int) next);
            out.write(ifd.array());
            out.write(extra.toByteArray());
        }
        byte[] all = out.toByteArray();
        ByteBuffer header = ByteBuffer.wrap(all, 0, 8).order(f.order());
        header.put(f.order() == ByteOrder.LITTLE_ENDIAN ? (byte) 'I' : (byte) 'M');
        header.put(f.order() == ByteOrder.LITTLE_ENDIAN ? (byte) 'I' : (byte) 'M');
        header.putShort((short) 42);
        header.putInt((int) firstIfd);
        Files.write(file, all);
        return file;
    }

    private static long align(ByteArrayOutputStream out) {
        if (out.size() % 2 == 1) {
            out.write(0);
        }
        return out.size();
    }

    /** The sample as an unsigned word of the format's size (a float's bit pattern for floating point). */
    private static long word(Format f, double v) {
        if (f.sampleFormat() == 3) {
            return f.bits() == 32 ? Float.floatToRawIntBits((float) v) & 0xffffffffL
                    : f.bits() == 16 ? 0x3c00 : Double.doubleToRawLongBits(v);
        }
        long mask = f.bits() == 64 ? -1L : (1L << f.bits()) - 1;
        return Math.round(v) & mask;
    }

    /** One row of words, predicted, as bytes in the file's order. */
    private static byte[] encodeRow(Format f, long[] row, int stride) {
        int bytes = f.bits() / 8;
        long mask = f.bits() == 64 ? -1L : (1L << f.bits()) - 1;
        if (f.predictor() == 2) {
            for (int i = row.length - 1; i >= stride; i--) {
                row[i] = (row[i] - row[i - stride]) & mask;
            }
        }
        ByteBuffer b = ByteBuffer.allocate(row.length * bytes);
        if (f.predictor() == 3) {
            byte[] planes = new byte[row.length * bytes];
            for (int i = 0; i < row.length; i++) {
                for (int k = 0; k < bytes; k++) {
                    planes[k * row.length + i] = (byte) (row[i] >>> (8 * (bytes - 1 - k)));
                }
            }
            for (int i = planes.length - 1; i >= stride; i--) {
                planes[i] = (byte) (planes[i] - planes[i - stride]);
            }
            return planes;
        }
        b.order(f.order());
        for (long w : row) {
            switch (bytes) {
                case 1:
                    b.put((byte) w);
                    break;
                case 2:
                    b.putShort((short) w);
                    break;
                case 4:
                    b.putInt((int) w);
                    break;
                default:
                    b.putLong(w);
            }
        }
        return b.array();
    }

    private static byte[] deflate(byte[] data) {
        Deflater d = new Deflater(6);
        d.setInput(data);
        d.finish();
        ByteArrayOutputStream out = new ByteArrayOutputStream();
        byte[] buf = new byte[8192];
        while (!d.finished()) {
            out.write(buf, 0, d.deflate(buf));
        }
        d.end();
        return out.toByteArray();
    }

    /** Entries by tag: {type and count (6 bytes), value bytes in the file's order}. */
    private static TreeMap<Integer, byte[][]> entries(Format f, int width, int height, long[] offsets, long[] counts) {
        TreeMap<Integer, byte[][]> e = new TreeMap<>();
        ByteOrder o = f.order();
        e.put(256, longs(o, width));
        e.put(257, longs(o, height));
        int[] bits = new int[f.samples()];
        int[] formats = new int[f.samples()];
        java.util.Arrays.fill(bits, f.bits());
        java.util.Arrays.fill(formats, f.sampleFormat());
        e.put(258, shorts(o, bits));
        e.put(259, shorts(o, f.compression()));
        e.put(262, shorts(o, 1));
        if (f.description() != null) {
            byte[] text = java.util.Arrays.copyOf(f.description(), f.description().length + 1);
            e.put(270, new byte[][] {typeAndCount(2, text.length), text});
        }
        e.put(273, longs(o, offsets));
        e.put(277, shorts(o, f.samples()));
        e.put(278, longs(o, height));
        e.put(279, longs(o, counts));
        e.put(284, shorts(o, f.planar()));
        if (f.predictor() != 1) {
            e.put(317, shorts(o, f.predictor()));
        }
        e.put(339, shorts(o, formats));
        return e;
    }

    private static byte[] typeAndCount(int type, int count) {
        return ByteBuffer.allocate(6).putShort((short) type).putInt(count).array();
    }

    private static byte[][] shorts(ByteOrder o, int... v) {
        ByteBuffer b = ByteBuffer.allocate(2 * v.length).order(o);
        for (int x : v) {
            b.putShort((short) x);
        }
        return new byte[][] {typeAndCount(3, v.length), b.array()};
    }

    private static byte[][] longs(ByteOrder o, long... v) {
        ByteBuffer b = ByteBuffer.allocate(4 * v.length).order(o);
        for (long x : v) {
            b.putInt((int) x);
        }
        return new byte[][] {typeAndCount(4, v.length), b.array()};
    }
}
