package org.dendrokin.io.movie;

import java.io.IOException;
import java.nio.ByteBuffer;
import java.nio.ByteOrder;
import java.nio.charset.StandardCharsets;
import java.nio.channels.FileChannel;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.StandardOpenOption;
import java.util.ArrayList;
import java.util.Collections;
import java.util.List;
import java.util.Locale;
import java.util.Properties;
import java.util.Set;

import ij.io.FileInfo;
import ij.io.FileOpener;
import ij.io.TiffDecoder;

import org.dendrokin.io.InputException;

/**
 * What a TIFF's header says (dimensions, sample type, where the planes lie, calibration) and which library reads
 * its pixels. Built once per {@link Movie#open}. It is one file because the reader's route, the plane offsets and
 * the dimensions are decided together from the same tags (ImageJ's description, OME-XML or a plain stack), and
 * each choice constrains the others; the tags themselves ({@link TiffTags}) and the OME-XML ({@link OmeXml}) are
 * read elsewhere.
 *
 * <p>Which reader: the first image directory's tags are read by Java's TIFF reader ({@link TiffTags}). Files that
 * ImageJ reads correctly (grey strips, uncompressed or compressed with LZW, Deflate or PackBits, a predictor only on
 * 8- and 16-bit samples) go to ImageJ: uncompressed ones through a memory map of the planes ({@link MappedPlanes}),
 * compressed ones decoded by ImageJ's reader one plane at a time ({@link StripPlanes}). Tiled files, files with
 * several grey samples a pixel (each sample a channel), and JPEG-compressed strips go to Java's TIFF reader
 * ({@link ImageIoPlanes}). What neither decodes correctly is refused with the reason: the floating-point
 * predictor (TIFF predictor 3), horizontal differencing (predictor 2) on 32-bit samples (ImageJ adds the
 * differences as floating-point numbers, not as the 32-bit words the TIFF specification differences, and Java's
 * reader accepts predictor 2 on 8-bit samples only), 16-bit floating point, compression schemes neither knows,
 * colour images.
 *
 * <p>Dimensions come from ImageJ's image description (channels, slices, frames), else from an OME-XML description
 * ({@link OmeXml}: sizes, dimension order, which directory holds which plane), else the images are a plain stack.
 * Planes are addressed in ImageJ's order (channel fastest, then time point) through {@link #storePlane}.
 */
final class MovieLayout {
    /** Compression schemes ImageJ's reader decodes in strips. */
    private static final Set<Integer> IMAGEJ_COMPRESSIONS = Set.of(TiffTags.COMPRESSION_NONE,
            TiffTags.COMPRESSION_LZW, TiffTags.COMPRESSION_DEFLATE, TiffTags.COMPRESSION_OLD_DEFLATE,
            TiffTags.COMPRESSION_PACKBITS);
    /** Compression schemes Java's TIFF reader decodes for grey samples of 8 bits and more. */
    private static final Set<Integer> JAVA_COMPRESSIONS = Set.of(TiffTags.COMPRESSION_NONE, TiffTags.COMPRESSION_LZW,
            TiffTags.COMPRESSION_OLD_JPEG, TiffTags.COMPRESSION_JPEG, TiffTags.COMPRESSION_DEFLATE,
            TiffTags.COMPRESSION_OLD_DEFLATE, TiffTags.COMPRESSION_PACKBITS);
    private static final String SAVE_PLAIN = "save the movie uncompressed, or compressed with LZW or Deflate "
            + "without a predictor";

    int width;
    int height;
    int channels;
    int slices;
    int framesInHeader;
    int bitDepth;
    double pixelSizeUm = Double.NaN;
    double pixelAspect = 1;
    double frameIntervalS = Double.NaN;
    List<String> channelNames = List.of();
    final List<String> warnings = new ArrayList<>();

    /** Number of planes in the store: image directories times samples a pixel. */
    private int planeCount;
    /** Store plane of each (channel + channels * time point); null means the same index. */
    private int[] storePlane;
    /** For the ImageJ route. */
    private int fileType;
    private boolean intel;
    private long[] offsets;
    private boolean mappable;
    private FileInfo[] planeInfo;
    /** For Java's route: the open file, handed to the plane store. */
    private JavaTiff javaTiff;
    private int samples = 1;
    private boolean unsigned32;

    private MovieLayout() {
    }

    int timePoints() {
        return framesInHeader > 1 ? framesInHeader : slices;
    }

    /** Focal planes at each time point: the slices of a z-stack over time, else 1. */
    int zSlices() {
        return framesInHeader > 1 ? slices : 1;
    }

    /** The store plane of a channel (0-based) at a time point (0-based), in the first focal plane. */
    int storePlane(int channel, int timePoint) {
        return storePlane(channel, 0, timePoint);
    }

    /**
     * The store plane of a channel at a focal plane and a time point (all 0-based), in ImageJ's order: channel
     * fastest, then slice, then time point.
     */
    int storePlane(int channel, int slice, int timePoint) {
        int index = channel + channels * (slice + zSlices() * timePoint);
        return storePlane == null ? index : storePlane[index];
    }

    /** Reads the header, choosing the reader, and refuses what cannot be read correctly. */
    static MovieLayout read(Path file, boolean intelHeader) {
        JavaTiff tiff = null;
        TiffTags first = null;
        try {
            tiff = JavaTiff.open(file);
            first = tiff.tags(0);
        } catch (IOException | RuntimeException e) {
            // Java's reader cannot parse even the first directory: ImageJ's reader has the last word below
            first = null;
        }
        boolean imageJ = first == null || chooseImageJ(file, first);
        try {
            Decoded decoded = decodeWithImageJ(file, imageJ);
            MovieLayout l = new MovieLayout();
            if (imageJ) {
                l.fromImageJ(file, decoded.info, decoded.description);
            } else {
                l.fromJava(file, tiff, first, decoded.description, intelHeader);
                l.javaTiff = tiff;
                tiff = null;
            }
            return l;
        } finally {
            if (tiff != null) {
                tiff.close();
            }
        }
    }

    /**
     * True if ImageJ reads the file correctly, false if Java's TIFF reader does; throws if neither does.
     */
    private static boolean chooseImageJ(Path file, TiffTags t) {
        int bits = t.bitsPerSample;
        if (!t.grey() || t.samplesPerPixel > 1 && t.photometric == -1) {
            throw colour(file);
        }
        if (t.mixedSampleSizes()) {
            throw new InputException(file, "the movie's samples differ in size within a pixel; save each channel as "
                    + "8-, 16- or 32-bit grey values");
        }
        if (t.sampleFormat == TiffTags.SAMPLE_FLOAT && bits == 16) {
            throw new InputException(file, "the movie has 16-bit floating-point samples, which neither ImageJ nor "
                    + "Java's TIFF reader reads; save it as 32-bit floating point");
        }
        if (t.predictorApplies()) {
            if (t.predictor == TiffTags.PREDICTOR_FLOATING_POINT) {
                throw new InputException(file, "the movie is compressed with " + TiffTags.compressionName(t.compression)
                        + " and the floating-point predictor (TIFF predictor 3), which neither ImageJ nor Java's TIFF "
                        + "reader decodes; " + SAVE_PLAIN);
            }
            if (t.predictor != TiffTags.PREDICTOR_HORIZONTAL) {
                throw new InputException(file, "the movie is compressed with an unknown predictor (TIFF predictor "
                        + t.predictor + "); " + SAVE_PLAIN);
            }
            if (bits > 16) {
                throw new InputException(file, "the movie's " + bits + "-bit samples are compressed with "
                        + TiffTags.compressionName(t.compression) + " and horizontal differencing (TIFF predictor 2), "
                        + "which ImageJ decodes wrongly and Java's TIFF reader does not decode; " + SAVE_PLAIN);
            }
        }
        if (!t.tiled && t.samplesPerPixel == 1 && IMAGEJ_COMPRESSIONS.contains(t.compression)) {
            return true;
        }
        String layout = t.tiled ? "in tiles" : t.samplesPerPixel > 1 ? "with " + t.samplesPerPixel
                + " samples a pixel" : "compressed with " + TiffTags.compressionName(t.compression);
        if (!JAVA_COMPRESSIONS.contains(t.compression)) {
            throw new InputException(file, "the movie is compressed with " + TiffTags.compressionName(t.compression)
                    + ", which neither ImageJ nor Java's TIFF reader decodes; " + SAVE_PLAIN);
        }
        if (t.predictorApplies() && bits != 8) {
            throw new InputException(file, "the movie's " + bits + "-bit samples are stored " + layout + " and "
                    + "compressed with horizontal differencing (TIFF predictor 2): ImageJ cannot read this layout "
                    + "and Java's TIFF reader undoes that predictor only for 8-bit samples; " + SAVE_PLAIN);
        }
        boolean readableSize = bits == 8 || bits == 16 || bits == 32 || bits == 64 && t.sampleFormat
                == TiffTags.SAMPLE_FLOAT;
        if (!readableSize) {
            throw new InputException(file, "the movie has " + bits + "-bit samples stored " + layout + ", which "
                    + "neither ImageJ nor Java's TIFF reader reads as grey values; save it as 8-, 16- or 32-bit grey "
                    + "values in strips");
        }
        return false;
    }

    private static InputException colour(Path file) {
        return new InputException(file, "the movie is a colour (RGB) image; save each channel as 8-, 16- or "
                + "32-bit grey values");
    }

    private record Decoded(FileInfo[] info, byte[] description) {
    }

    /**
     * Runs ImageJ's TIFF decoder over the file. Its copy of the first image description keeps the bytes as they are
     * in the file (Java's reader keeps only ASCII), which an OME-XML description in UTF-8 needs.
     *
     * @param required true if ImageJ is to read the file: a failure is then the file's problem
     */
    private static Decoded decodeWithImageJ(Path file, boolean required) {
        Path abs = file.toAbsolutePath();
        DescriptionKeeper decoder = new DescriptionKeeper(abs.getParent().toString() + java.io.File.separator,
                abs.getFileName().toString());
        FileInfo[] info;
        try {
            info = decoder.getTiffInfo();
        } catch (IOException | RuntimeException e) {
            if (required) {
                throw new InputException(file, "the TIFF header could not be read (" + oneLine(e) + ")", e);
            }
            info = null;
        }
        if (required && (info == null || info.length == 0)) {
            throw new InputException(file, "the TIFF holds no image");
        }
        return new Decoded(info, decoder.description);
    }

    static String oneLine(Throwable e) {
        String m = e.getMessage() == null ? e.getClass().getSimpleName() : e.getMessage();
        return m.replaceAll("\\s+", " ").trim();
    }

    /** ImageJ's TIFF decoder, keeping the bytes of the first image description it meets. */
    private static final class DescriptionKeeper extends TiffDecoder {
        byte[] description;

        DescriptionKeeper(String directory, String name) {
            super(directory, name);
        }

        @Override
        public void saveImageDescription(byte[] bytes, FileInfo fi) {
            if (description == null && bytes != null) {
                description = bytes.clone();
            }
            super.saveImageDescription(bytes, fi);
        }
    }

    private void fromImageJ(Path file, FileInfo[] info, byte[] description) {
        FileInfo first = info[0];
        width = first.width;
        height = first.height;
        fileType = first.fileType;
        intel = first.intelByteOrder;
        if (first.fileType == FileInfo.RGB || first.fileType == FileInfo.RGB48 || first.fileType == FileInfo.BGR
                || first.fileType == FileInfo.ARGB || first.fileType == FileInfo.RGB_PLANAR
                || first.fileType == FileInfo.RGB48_PLANAR || first.fileType == FileInfo.COLOR8
                || first.fileType == FileInfo.CMYK || first.samplesPerPixel > 1) {
            throw colour(file);
        }
        bitDepth = bitDepth(first.fileType);
        if (bitDepth == 0 || first.width <= 0 || first.height <= 0) {
            throw new InputException(file, "the movie's sample type cannot be read; save it as 8-, 16- or "
                    + "32-bit grey values");
        }
        Properties props = imageJProperties(first.description);
        planeCount = info.length == 1 ? Math.max(1, first.nImages) : info.length;
        if (props != null && props.getProperty("images") != null) {
            int promised = intProperty(props, "images", planeCount);
            if (promised > planeCount) {
                throw truncated(file, promised, planeCount);
            }
        } else {
            checkDirectoryChain(file, first.intelByteOrder, info.length);
        }
        OmeXml ome = props == null ? ome(file, description, planeCount) : null;
        dimensions(file, props, ome, planeCount, 1);
        locatePlanes(file, info);
        calibration(first.pixelWidth, first.pixelHeight, first.unit, props, ome, file);
    }

    private void fromJava(Path file, JavaTiff tiff, TiffTags first, byte[] description, boolean intelHeader) {
        width = first.width;
        height = first.height;
        samples = first.samplesPerPixel;
        bitDepth = first.bitsPerSample <= 8 ? 8 : first.bitsPerSample <= 16 ? 16 : 32;
        unsigned32 = first.bitsPerSample == 32 && first.sampleFormat == TiffTags.SAMPLE_UNSIGNED;
        if (width <= 0 || height <= 0) {
            throw new InputException(file, "the TIFF gives an image size of " + width + " x " + height + " pixels");
        }
        if (first.compression == TiffTags.COMPRESSION_JPEG || first.compression == TiffTags.COMPRESSION_OLD_JPEG) {
            warnings.add("The movie " + file.getFileName() + " is JPEG-compressed, which loses information: its "
                    + "intensities are not exactly those recorded.");
        }
        checkDirectoryChain(file, intelHeader, Integer.MAX_VALUE);
        long size = fileSize(file);
        int images;
        try {
            images = tiff.imageCount();
            for (int i = 0; i < images; i++) {
                TiffTags t = i == 0 ? first : tiff.tags(i);
                if (t.width != width || t.height != height || t.samplesPerPixel != samples
                        || t.bitsPerSample != first.bitsPerSample || t.sampleFormat != first.sampleFormat) {
                    throw new InputException(file, String.format(Locale.ROOT, "image %d of the TIFF is %d x %d "
                            + "pixels of %d %d-bit samples, unlike the first (%d x %d pixels of %d %d-bit samples); "
                            + "save the movie as images of one size and type", i + 1, t.width, t.height,
                            t.samplesPerPixel, t.bitsPerSample, width, height, samples, first.bitsPerSample));
                }
                if (!t.dataInside(size)) {
                    throw truncated(file, images, i);
                }
            }
        } catch (IOException e) {
            throw new InputException(file, "the TIFF header could not be read by Java's TIFF reader (" + oneLine(e)
                    + ")", e);
        }
        byte[] text = description != null ? description
                : first.description != null ? first.description.getBytes(StandardCharsets.ISO_8859_1) : null;
        Properties props = imageJProperties(text == null ? null : new String(text, StandardCharsets.ISO_8859_1));
        OmeXml ome = props == null ? ome(file, text, images) : null;
        planeCount = images * samples;
        dimensions(file, props, ome, images, samples);
        double pixelWidth = first.xResolution > 0 ? 1 / first.xResolution : Double.NaN;
        double pixelHeight = first.yResolution > 0 ? 1 / first.yResolution : Double.NaN;
        String unit = first.resolutionUnit == 3 ? "cm" : first.resolutionUnit == 2 ? "inch" : null;
        calibration(pixelWidth, pixelHeight, unit, props, ome, file);
    }

    private static Properties imageJProperties(String description) {
        if (description == null || !description.startsWith("ImageJ")) {
            return null;
        }
        FileInfo fi = new FileInfo();
        fi.description = description;
        return new FileOpener(fi).decodeDescriptionString(fi);
    }

    private OmeXml ome(Path file, byte[] description, int ifdCount) {
        if (!OmeXml.looksLikeOme(description)) {
            return null;
        }
        OmeXml ome = OmeXml.parse(description, ifdCount, file, warnings);
        if (ome == null) {
            return null;
        }
        if (ome.sizeX != width || ome.sizeY != height) {
            warnings.add(String.format(Locale.ROOT, "The OME metadata of %s describes %d x %d pixel images, but "
                    + "the TIFF's images are %d x %d; the metadata was ignored.", file.getFileName(), ome.sizeX,
                    ome.sizeY, width, height));
            return null;
        }
        if (ome.imageCount > 1) {
            warnings.add("The OME-TIFF " + file.getFileName() + " holds " + ome.imageCount + " images (series); "
                    + "the first was read.");
        }
        for (String note : ome.notes) {
            warnings.add("In the OME metadata of " + file.getFileName() + ", " + note + "; it was not used.");
        }
        return ome;
    }

    /**
     * Channels, slices and frames: from ImageJ's description, else the OME metadata, else a plain stack (with
     * several samples a pixel: one channel a sample).
     *
     * @param images  image directories in the file
     * @param samples samples a pixel
     */
    private void dimensions(Path file, Properties props, OmeXml ome, int images, int samples) {
        channels = samples;
        slices = images;
        framesInHeader = 1;
        if (samples == 1 && props != null) {
            int c = intProperty(props, "channels", 1);
            int z = intProperty(props, "slices", 1);
            int t = intProperty(props, "frames", 1);
            if ((long) c * z * t == images) {
                channels = c;
                slices = z;
                framesInHeader = t;
            }
            // otherwise no hyperstack information that fits: a plain stack of images
        } else if (ome != null && samples == 1) {
            channels = ome.sizeC;
            slices = ome.sizeZ;
            framesInHeader = ome.sizeT;
        } else if (ome != null && ome.sizeC == samples && (long) ome.sizeZ * ome.sizeT == images) {
            slices = ome.sizeZ;
            framesInHeader = ome.sizeT;
        }
        if (slices > 1 && framesInHeader == 1) {
            warnings.add("The " + slices + " images of " + file.getFileName() + " are marked as z-slices, "
                    + "not time points; they are read as time points.");
        }
        if (ome != null && ome.channelNames.size() == channels) {
            channelNames = ome.channelNames;
        } else {
            channelNames = Collections.nCopies(channels, "");
        }
        if (ome != null && samples == 1) {
            int timePoints = timePoints();
            int zs = zSlices();
            storePlane = new int[channels * zs * timePoints];
            for (int tp = 0; tp < timePoints; tp++) {
                for (int z = 0; z < zs; z++) {
                    for (int c = 0; c < channels; c++) {
                        storePlane[c + channels * (z + zs * tp)] = zs == 1 && slices > 1 ? ome.ifdOf(c, tp, 0)
                                : ome.ifdOf(c, z, tp);
                    }
                }
            }
        }
    }

    private static int bitDepth(int fileType) {
        switch (fileType) {
            case FileInfo.GRAY8:
                return 8;
            case FileInfo.GRAY16_SIGNED:
            case FileInfo.GRAY16_UNSIGNED:
            case FileInfo.GRAY12_UNSIGNED:
            case FileInfo.GRAY10_UNSIGNED:
                return 16;
            case FileInfo.GRAY32_FLOAT:
            case FileInfo.GRAY32_INT:
            case FileInfo.GRAY32_UNSIGNED:
            case FileInfo.GRAY24_UNSIGNED:
            case FileInfo.GRAY64_FLOAT:
                return 32;
            default:
                return 0;
        }
    }

    private static int intProperty(Properties props, String key, int fallback) {
        String v = props.getProperty(key);
        if (v == null) {
            return fallback;
        }
        try {
            int n = Integer.parseInt(v.trim());
            return n > 0 ? n : fallback;
        } catch (NumberFormatException e) {
            return fallback;
        }
    }

    private static InputException truncated(Path file, long promised, long present) {
        return new InputException(file, "the TIFF is truncated: its header promises " + promised
                + " images but the file holds only " + present + " complete ones");
    }

    private static long fileSize(Path file) {
        try {
            return Files.size(file);
        } catch (IOException e) {
            throw new InputException(file, "the movie's size could not be read (" + e.getMessage() + ")", e);
        }
    }

    /**
     * Follows the chain of image directories (each one's entry count and its pointer to the next, nothing else)
     * and refuses a chain that points past the end of the file, where ImageJ's decoder would silently return the
     * images before the break.
     *
     * @param decoded images a reader found, for the message (or Integer.MAX_VALUE if none has counted them)
     */
    private static void checkDirectoryChain(Path file, boolean intel, int decoded) {
        try (FileChannel channel = FileChannel.open(file, StandardOpenOption.READ)) {
            long size = channel.size();
            ByteBuffer b = ByteBuffer.allocate(4).order(intel ? ByteOrder.LITTLE_ENDIAN : ByteOrder.BIG_ENDIAN);
            long offset = readUnsigned(channel, b, 4, 4);
            int count = 0;
            while (offset != 0 && count <= size / 14) {
                if (offset + 2 > size) {
                    throw chainBroken(file, count, decoded);
                }
                long entries = readUnsigned(channel, b, offset, 2);
                long next = offset + 2 + 12 * entries;
                if (next + 4 > size) {
                    throw chainBroken(file, count, decoded);
                }
                offset = readUnsigned(channel, b, next, 4);
                count++;
            }
        } catch (IOException e) {
            throw new InputException(file, "the TIFF header could not be read (" + e.getMessage() + ")", e);
        }
    }

    private static long readUnsigned(FileChannel channel, ByteBuffer b, long at, int bytes) throws IOException {
        b.clear().limit(bytes);
        while (b.hasRemaining()) {
            if (channel.read(b, at + b.position()) < 0) {
                throw new IOException("unexpected end of file");
            }
        }
        b.flip();
        return bytes == 2 ? b.getShort() & 0xffffL : b.getInt() & 0xffffffffL;
    }

    private static InputException chainBroken(Path file, int complete, int decoded) {
        return new InputException(file, "the TIFF is truncated: the directory of image " + (complete + 1)
                + " lies past the end of the file, so only " + Math.min(complete, decoded)
                + " images can be read");
    }

    /** Finds each plane's offset and checks the file is as long as the header says. */
    private void locatePlanes(Path file, FileInfo[] info) {
        long size = fileSize(file);
        long planeBytes = (long) width * height * Math.max(1, info[0].getBytesPerPixel());
        boolean uncompressed = true;
        for (FileInfo fi : info) {
            uncompressed &= fi.compression == FileInfo.COMPRESSION_NONE && fi.width == width
                    && fi.height == height && fi.fileType == fileType && contiguousStrips(fi, planeBytes);
        }
        if (uncompressed) {
            offsets = new long[planeCount];
            if (info.length == 1) {
                long gap = info[0].getGap();
                for (int i = 0; i < planeCount; i++) {
                    offsets[i] = info[0].getOffset() + i * (planeBytes + gap);
                }
            } else {
                for (int i = 0; i < planeCount; i++) {
                    offsets[i] = info[i].getOffset();
                }
            }
            long present = 0;
            for (long o : offsets) {
                if (o + planeBytes <= size) {
                    present++;
                }
            }
            if (present < planeCount) {
                throw truncated(file, planeCount, present);
            }
            planeInfo = new FileInfo[planeCount];
            for (int i = 0; i < planeCount; i++) {
                planeInfo[i] = info.length == planeCount ? info[i] : (FileInfo) info[0].clone();
                planeInfo[i].longOffset = offsets[i];
                planeInfo[i].offset = 0;
            }
        } else {
            // compressed: every strip of every image must lie inside the file
            long present = 0;
            for (FileInfo fi : info) {
                boolean complete = fi.stripOffsets != null && fi.stripLengths != null;
                for (int s = 0; complete && s < fi.stripOffsets.length; s++) {
                    complete = (fi.stripOffsets[s] & 0xffffffffL) + (fi.stripLengths[s] & 0xffffffffL) <= size;
                }
                if (!complete) {
                    break;
                }
                present++;
            }
            if (present < planeCount) {
                throw truncated(file, planeCount, present);
            }
            planeInfo = info;
        }
        mappable = uncompressed && MappedPlanes.supports(fileType);
    }

    private static boolean contiguousStrips(FileInfo fi, long planeBytes) {
        if (fi.stripOffsets == null || fi.stripOffsets.length <= 1) {
            return true;
        }
        long expected = fi.stripOffsets[0] & 0xffffffffL;
        long total = 0;
        for (int s = 0; s < fi.stripOffsets.length; s++) {
            if ((fi.stripOffsets[s] & 0xffffffffL) != expected) {
                return false;
            }
            long length = fi.stripLengths == null ? 0 : fi.stripLengths[s] & 0xffffffffL;
            expected += length;
            total += length;
        }
        return total >= planeBytes || fi.stripLengths == null;
    }

    /**
     * Pixel size from the OME metadata, else from the unit and resolution; frame interval from the OME metadata,
     * else from ImageJ's description.
     *
     * @param pixelWidth  width of a pixel in {@code unit} (the inverse of the TIFF resolution), or NaN
     * @param pixelHeight height of a pixel in {@code unit}, or NaN
     * @param unit        the resolution unit (ImageJ's spelling), or null
     */
    private void calibration(double pixelWidth, double pixelHeight, String unit, Properties props, OmeXml ome,
            Path file) {
        String u = props != null && props.getProperty("unit") != null ? props.getProperty("unit") : unit;
        double scale = micrometresPer(u);
        if (scale > 0 && pixelWidth > 0 && Double.isFinite(pixelWidth)) {
            pixelSizeUm = pixelWidth * scale;
            if (pixelHeight > 0 && Math.abs(pixelHeight / pixelWidth - 1) > 1e-6) {
                pixelAspect = pixelHeight / pixelWidth;
            }
        }
        if (props != null && props.getProperty("finterval") != null) {
            try {
                double value = Double.parseDouble(props.getProperty("finterval").trim());
                double perUnit = secondsPer(props.getProperty("tunit", "sec"));
                if (value > 0 && perUnit > 0) {
                    frameIntervalS = value * perUnit;
                }
            } catch (NumberFormatException e) {
                frameIntervalS = Double.NaN;
            }
        }
        if (ome != null && ome.pixelWidthUm > 0) {
            pixelSizeUm = ome.pixelWidthUm;
            pixelAspect = ome.pixelHeightUm > 0 && Math.abs(ome.pixelHeightUm / ome.pixelWidthUm - 1) > 1e-6
                    ? ome.pixelHeightUm / ome.pixelWidthUm : 1;
        }
        if (ome != null && ome.timeIncrementS > 0) {
            frameIntervalS = ome.timeIncrementS;
        }
    }

    /**
     * Micrometres per unit of length (ImageJ's spellings), or 0 for no usable unit. Inches are ignored: many
     * programs write 72 dots per inch into images that have no calibration at all.
     */
    static double micrometresPer(String unit) {
        if (unit == null) {
            return 0;
        }
        switch (unit.trim().toLowerCase(Locale.ROOT)) {
            case "um":
            case "micron":
            case "microns":
            case "micrometer":
            case "micrometre":
            case "\u00b5m":
            case "\u03bcm":
                return 1;
            case "nm":
            case "nanometer":
            case "nanometre":
                return 1e-3;
            case "mm":
                return 1e3;
            case "cm":
                return 1e4;
            default:
                return 0;
        }
    }

    /** Seconds per unit of time (ImageJ's spellings), or 0 for an unknown unit. */
    static double secondsPer(String unit) {
        switch (unit.trim().toLowerCase(Locale.ROOT)) {
            case "s":
            case "sec":
            case "secs":
            case "second":
            case "seconds":
                return 1;
            case "ms":
            case "msec":
                return 1e-3;
            case "us":
            case "\u00b5s":
            case "\u03bcs":
                return 1e-6;
            case "min":
            case "minute":
            case "minutes":
                return 60;
            case "h":
            case "hr":
            case "hour":
            case "hours":
                return 3600;
            default:
                return 0;
        }
    }

    /** Closes the file if {@link #openPlanes} was not called (it hands the open file to the store). */
    void discard() {
        if (javaTiff != null) {
            javaTiff.close();
            javaTiff = null;
        }
    }

    /** Opens the plane store; called once. */
    PlaneStore openPlanes(Path file) {
        if (javaTiff != null) {
            PlaneStore planes = new ImageIoPlanes(file, javaTiff, width, height, samples, unsigned32);
            javaTiff = null;
            return planes;
        }
        if (mappable) {
            try {
                return new MappedPlanes(file, width, height, fileType, intel, offsets);
            } catch (IOException e) {
                throw new InputException(file, "the movie could not be read (" + e.getMessage() + ")", e);
            }
        }
        try {
            return new StripPlanes(file, planeInfo);
        } catch (IOException e) {
            throw new InputException(file, "the movie could not be read (" + e.getMessage() + ")", e);
        }
    }
}
