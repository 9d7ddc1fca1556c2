package org.dendrokin.io.movie;

import javax.imageio.plugins.tiff.BaselineTIFFTagSet;
import javax.imageio.plugins.tiff.TIFFDirectory;
import javax.imageio.plugins.tiff.TIFFField;

/**
 * The tags of one TIFF image directory that decide whether and how its pixels can be read, as Java's TIFF reader
 * ({@code javax.imageio.plugins.tiff}) parses them. Values absent from the file take the TIFF 6.0 defaults.
 * The description is as that reader gives it: non-ASCII bytes are lost (use ImageJ's copy of the bytes for
 * anything but ASCII).
 */
final class TiffTags {
    static final int COMPRESSION_NONE = 1;
    static final int COMPRESSION_LZW = 5;
    static final int COMPRESSION_OLD_JPEG = 6;
    static final int COMPRESSION_JPEG = 7;
    static final int COMPRESSION_DEFLATE = 8;
    static final int COMPRESSION_PACKBITS = 32773;
    static final int COMPRESSION_OLD_DEFLATE = 32946;
    static final int PREDICTOR_NONE = 1;
    static final int PREDICTOR_HORIZONTAL = 2;
    static final int PREDICTOR_FLOATING_POINT = 3;
    static final int SAMPLE_UNSIGNED = 1;
    static final int SAMPLE_SIGNED = 2;
    static final int SAMPLE_FLOAT = 3;

    final int width;
    final int height;
    /** Bits of the first sample; the others must match (checked by {@link #mixedSampleSizes()}). */
    final int bitsPerSample;
    final int samplesPerPixel;
    final int sampleFormat;
    /** TIFF PhotometricInterpretation, or -1 if absent. */
    final int photometric;
    final int compression;
    final int predictor;
    final boolean tiled;
    final int planarConfiguration;
    final long[] dataOffsets;
    final long[] dataByteCounts;
    /** Pixels per resolution unit (x, y), or 0 if absent. */
    final double xResolution;
    final double yResolution;
    /** 1 none, 2 inch, 3 centimetre. */
    final int resolutionUnit;
    final String description;
    private final int[] allBits;

    private TiffTags(TIFFDirectory d) {
        width = intValue(d, BaselineTIFFTagSet.TAG_IMAGE_WIDTH, 0);
        height = intValue(d, BaselineTIFFTagSet.TAG_IMAGE_LENGTH, 0);
        TIFFField bits = d.getTIFFField(BaselineTIFFTagSet.TAG_BITS_PER_SAMPLE);
        allBits = bits == null ? new int[] {1} : bits.getAsInts();
        bitsPerSample = allBits.length == 0 ? 1 : allBits[0];
        samplesPerPixel = intValue(d, BaselineTIFFTagSet.TAG_SAMPLES_PER_PIXEL, 1);
        sampleFormat = intValue(d, BaselineTIFFTagSet.TAG_SAMPLE_FORMAT, SAMPLE_UNSIGNED);
        photometric = intValue(d, BaselineTIFFTagSet.TAG_PHOTOMETRIC_INTERPRETATION, -1);
        compression = intValue(d, BaselineTIFFTagSet.TAG_COMPRESSION, COMPRESSION_NONE);
        predictor = intValue(d, BaselineTIFFTagSet.TAG_PREDICTOR, PREDICTOR_NONE);
        tiled = d.containsTIFFField(BaselineTIFFTagSet.TAG_TILE_WIDTH)
                || d.containsTIFFField(BaselineTIFFTagSet.TAG_TILE_OFFSETS);
        planarConfiguration = intValue(d, BaselineTIFFTagSet.TAG_PLANAR_CONFIGURATION, 1);
        dataOffsets = longs(d.getTIFFField(tiled ? BaselineTIFFTagSet.TAG_TILE_OFFSETS
                : BaselineTIFFTagSet.TAG_STRIP_OFFSETS));
        dataByteCounts = longs(d.getTIFFField(tiled ? BaselineTIFFTagSet.TAG_TILE_BYTE_COUNTS
                : BaselineTIFFTagSet.TAG_STRIP_BYTE_COUNTS));
        xResolution = doubleValue(d, BaselineTIFFTagSet.TAG_X_RESOLUTION);
        yResolution = doubleValue(d, BaselineTIFFTagSet.TAG_Y_RESOLUTION);
        resolutionUnit = intValue(d, BaselineTIFFTagSet.TAG_RESOLUTION_UNIT, 2);
        TIFFField text = d.getTIFFField(BaselineTIFFTagSet.TAG_IMAGE_DESCRIPTION);
        description = text == null || text.getCount() == 0 ? null : text.getAsString(0);
    }

    /** Reads the tags of a directory parsed by Java's TIFF reader. */
    static TiffTags of(TIFFDirectory directory) {
        return new TiffTags(directory);
    }

    private static int intValue(TIFFDirectory d, int tag, int fallback) {
        TIFFField f = d.getTIFFField(tag);
        return f == null || f.getCount() == 0 ? fallback : f.getAsInt(0);
    }

    private static double doubleValue(TIFFDirectory d, int tag) {
        TIFFField f = d.getTIFFField(tag);
        return f == null || f.getCount() == 0 ? 0 : f.getAsDouble(0);
    }

    private static long[] longs(TIFFField f) {
        if (f == null) {
            return new long[0];
        }
        long[] v = new long[f.getCount()];
        for (int i = 0; i < v.length; i++) {
            v[i] = f.getAsLong(i);
        }
        return v;
    }

    /** True if the samples of one pixel have different sizes (ImageJ and this tool read one size only). */
    boolean mixedSampleSizes() {
        for (int b : allBits) {
            if (b != bitsPerSample) {
                return true;
            }
        }
        return false;
    }

    /** True for grey values: no colour interpretation (black or white is zero), or none given. */
    boolean grey() {
        return photometric == -1 || photometric == 0 || photometric == 1;
    }

    /** True if the compression scheme applies a predictor (TIFF 6.0 section 14; Adobe's Deflate note). */
    boolean predictorApplies() {
        return predictor != PREDICTOR_NONE && (compression == COMPRESSION_LZW || compression == COMPRESSION_DEFLATE
                || compression == COMPRESSION_OLD_DEFLATE);
    }

    /** True if every strip or tile lies inside a file of {@code size} bytes. */
    boolean dataInside(long size) {
        if (dataOffsets.length == 0 || dataByteCounts.length != dataOffsets.length) {
            return dataOffsets.length > 0;
        }
        for (int i = 0; i < dataOffsets.length; i++) {
            if (dataOffsets[i] < 0 || dataByteCounts[i] < 0 || dataOffsets[i] + dataByteCounts[i] > size) {
                return false;
            }
        }
        return true;
    }

    /** The name users know a compression scheme by, with its TIFF number. */
    static String compressionName(int compression) {
        switch (compression) {
            case COMPRESSION_NONE:
                return "no compression";
            case 2:
            case 3:
            case 4:
                return "CCITT fax compression (" + compression + ")";
            case COMPRESSION_LZW:
                return "LZW";
            case COMPRESSION_OLD_JPEG:
            case COMPRESSION_JPEG:
                return "JPEG";
            case COMPRESSION_DEFLATE:
            case COMPRESSION_OLD_DEFLATE:
                return "Deflate (ZIP)";
            case COMPRESSION_PACKBITS:
                return "PackBits";
            case 34712:
                return "JPEG 2000 (34712)";
            case 34887:
                return "LERC (34887)";
            case 34925:
                return "LZMA (34925)";
            case 50000:
                return "Zstandard (50000)";
            case 50001:
                return "WebP (50001)";
            case 50002:
                return "JPEG XL (50002)";
            default:
                return "compression scheme " + compression;
        }
    }
}
