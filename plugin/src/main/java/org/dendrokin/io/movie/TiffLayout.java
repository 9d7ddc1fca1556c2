package org.dendrokin.io.movie;

import java.io.IOException;
import java.io.InputStream;
import java.nio.ByteBuffer;
import java.nio.ByteOrder;
import java.nio.channels.FileChannel;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.StandardOpenOption;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.Properties;

import ij.IJ;
import ij.ImagePlus;
import ij.io.FileInfo;
import ij.io.FileOpener;
import ij.io.TiffDecoder;

import org.dendrokin.io.InputException;

/**
 * What a TIFF's header says, read by ImageJ's {@link TiffDecoder} and checked against the file: dimensions
 * (channels, slices, frames, from ImageJ's own image description or, for other TIFFs, a plain stack), sample type,
 * the offset of every plane and whether the planes can be memory-mapped, and the calibration (pixel size from the
 * unit and resolution tags, frame interval from ImageJ's description). Refusals are {@link InputException}s naming
 * the file: not a TIFF, a BigTIFF, colour samples, an unreadable sample type, z-slices at several time points, and a
 * file shorter than its header promises. Its fields are filled once, by {@link #read}, and only read afterwards
 * (by {@link Movie#open}, which copies what it keeps).
 */
final class TiffLayout {
    int width;
    int height;
    int channels;
    int slices;
    int framesInHeader;
    int bitDepth;
    int fileType;
    boolean intel;
    long[] offsets;
    boolean mappable;
    double pixelSizeUm = Double.NaN;
    double pixelAspect = 1;
    double frameIntervalS = Double.NaN;
    final List<String> warnings = new ArrayList<>();

    /** Reads and checks the header of {@code file}; the file is only read. */
    static TiffLayout read(Path file) {
        checkIsTiff(file);
        return of(file, decode(file));
    }

    private static void checkIsTiff(Path file) {
        if (!Files.exists(file)) {
            throw new InputException(file, "the movie file does not exist");
        }
        if (!Files.isRegularFile(file) || !Files.isReadable(file)) {
            throw new InputException(file, "the movie is not a readable file");
        }
        byte[] head = new byte[4];
        int n;
        try (InputStream in = Files.newInputStream(file)) {
            n = in.readNBytes(head, 0, 4);
        } catch (IOException e) {
            throw new InputException(file, "the movie could not be read (" + e.getMessage() + ")", e);
        }
        boolean intel = n == 4 && head[0] == 'I' && head[1] == 'I';
        boolean motorola = n == 4 && head[0] == 'M' && head[1] == 'M';
        int magic = intel ? (head[2] & 0xff) | (head[3] & 0xff) << 8 : (head[2] & 0xff) << 8 | (head[3] & 0xff);
        if ((intel || motorola) && magic == 43) {
            throw new InputException(file, "the movie is a BigTIFF, which this tool cannot read; save it as a "
                    + "standard TIFF");
        }
        if (!(intel || motorola) || magic != 42) {
            throw new InputException(file, "the movie is not a TIFF file (it does not start with a TIFF header)");
        }
    }

    private static FileInfo[] decode(Path file) {
        Path abs = file.toAbsolutePath();
        String dir = abs.getParent().toString() + java.io.File.separator;
        FileInfo[] info;
        try {
            info = new TiffDecoder(dir, abs.getFileName().toString()).getTiffInfo();
        } catch (IOException | RuntimeException e) {
            throw new InputException(file, "the TIFF header could not be read (" + e.getMessage() + ")", e);
        }
        if (info == null || info.length == 0) {
            throw new InputException(file, "the TIFF holds no image");
        }
        return info;
    }

    int timePoints() {
        return framesInHeader > 1 ? framesInHeader : slices;
    }

    static TiffLayout of(Path file, FileInfo[] info) {
        FileInfo first = info[0];
        TiffLayout l = new TiffLayout();
        l.width = first.width;
        l.height = first.height;
        l.fileType = first.fileType;
        l.intel = first.intelByteOrder;
        if (first.fileType == FileInfo.RGB || first.fileType == FileInfo.RGB48 || first.fileType == FileInfo.BGR
                || first.fileType == FileInfo.ARGB || first.fileType == FileInfo.RGB_PLANAR
                || first.fileType == FileInfo.RGB48_PLANAR || first.fileType == FileInfo.COLOR8
                || first.fileType == FileInfo.CMYK || first.samplesPerPixel > 1) {
            throw new InputException(file, "the movie is a colour (RGB) image; save each channel as 8-, 16- or "
                    + "32-bit grey values");
        }
        l.bitDepth = bitDepth(first.fileType);
        if (l.bitDepth == 0 || first.width <= 0 || first.height <= 0) {
            throw new InputException(file, "the movie's sample type cannot be read; save it as 8-, 16- or "
                    + "32-bit grey values");
        }
        Properties props = first.description != null && first.description.startsWith("ImageJ")
                ? new FileOpener(first).decodeDescriptionString(first) : null;
        int planeCount = info.length == 1 ? Math.max(1, first.nImages) : info.length;
        if (props != null && props.getProperty("images") != null) {
            int promised = intProperty(props, "images", planeCount);
            if (promised > planeCount) {
                throw truncated(file, promised, planeCount);
            }
        } else {
            checkDirectoryChain(file, first.intelByteOrder, info.length);
        }
        l.channels = props != null ? intProperty(props, "channels", 1) : 1;
        l.slices = props != null ? intProperty(props, "slices", 1) : 1;
        l.framesInHeader = props != null ? intProperty(props, "frames", 1) : 1;
        if (l.channels * l.slices * l.framesInHeader != planeCount) {
            // no hyperstack information that fits: a plain stack of images
            l.channels = 1;
            l.slices = planeCount;
            l.framesInHeader = 1;
        }
        if (l.slices > 1 && l.framesInHeader > 1) {
            throw new InputException(file, "the movie has " + l.slices + " z-slices at each of "
                    + l.framesInHeader + " time points; save one focal plane (or a projection) as a time series");
        }
        if (l.slices > 1) {
            l.warnings.add("The " + l.slices + " images of " + file.getFileName() + " are marked as z-slices, "
                    + "not time points; they are read as time points.");
        }
        l.locatePlanes(file, info, planeCount);
        l.calibration(first, props);
        return l;
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

    /**
     * For TIFFs without ImageJ's image count: follows the chain of image directories (each one's entry count
     * and its pointer to the next, nothing else) and refuses a chain that points past the end of the file,
     * where ImageJ's decoder would silently return the images before the break.
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
    private void locatePlanes(Path file, FileInfo[] info, int planeCount) {
        long size;
        try {
            size = Files.size(file);
        } catch (IOException e) {
            throw new InputException(file, "the movie's size could not be read (" + e.getMessage() + ")", e);
        }
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

    /** Pixel size from the unit and resolution; frame interval from ImageJ's description. */
    private void calibration(FileInfo first, Properties props) {
        String unit = props != null && props.getProperty("unit") != null ? props.getProperty("unit") : first.unit;
        double scale = micrometresPer(unit);
        if (scale > 0 && first.pixelWidth > 0 && Double.isFinite(first.pixelWidth)) {
            pixelSizeUm = first.pixelWidth * scale;
            if (first.pixelHeight > 0 && Math.abs(first.pixelHeight / first.pixelWidth - 1) > 1e-6) {
                pixelAspect = first.pixelHeight / first.pixelWidth;
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
    }

    /**
     * Micrometres per unit of length, or 0 for no usable unit. Inches are ignored: many programs write 72
     * dots per inch into images that have no calibration at all.
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

    /** Seconds per unit of time, or 0 for an unknown unit. */
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

    PlaneStore openPlanes(Path file) {
        if (mappable) {
            try {
                return new MappedPlanes(file, width, height, fileType, intel, offsets);
            } catch (IOException e) {
                throw new InputException(file, "the movie could not be read (" + e.getMessage() + ")", e);
            }
        }
        ImagePlus imp = IJ.openVirtual(file.toAbsolutePath().toString());
        if (imp == null || imp.getStackSize() != channels * timePoints()) {
            throw new InputException(file, "ImageJ could not read the images of this TIFF");
        }
        return new VirtualPlanes(imp.getStack());
    }
}
