package org.dendrokin.io.movie;

import java.io.IOException;
import java.io.InputStream;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;

import org.dendrokin.core.kymo.FrameSource;
import org.dendrokin.io.InputException;

/**
 * A TIFF movie opened for reading a few rows or pixels at a time; the whole movie is never loaded.
 *
 * <p>How the file is read is decided by {@link MovieLayout}: uncompressed grey strips through a memory map of the
 * planes at the offsets in the header ({@link MappedPlanes}); compressed strips (LZW, Deflate, PackBits) through
 * ImageJ's own decoder, one plane at a time ({@link StripPlanes}); tiled files and files with several grey samples
 * a pixel through Java's own TIFF reader ({@link ImageIoPlanes}); compressed files neither library decodes
 * correctly (the floating-point predictor, horizontal differencing on 32-bit samples) are refused with the reason.
 * Every route decodes at most one frame at a time. The dimensions (channels, slices, frames) and the calibration
 * come from ImageJ's own image description, from OME-TIFF metadata (OME-XML in the first image description), or,
 * for other TIFFs, from the resolution tags.
 *
 * <p>Frames are read by channel and time point. A movie with several slices and one frame is read as a time
 * series (with a warning); one with several slices and several frames is refused.
 *
 * <p>Checks made on opening, each an {@link InputException} naming the file: the file is not a TIFF; the file
 * is shorter than its header promises (ImageJ's own reader would silently return fewer frames); the samples
 * are colour (RGB) or of a type or compression that cannot be read correctly; a 32-bit movie holds only NaN in the
 * first, middle and last frames of every channel; the pixel size or frame interval is in neither the TIFF nor the
 * arguments.
 */
public final class Movie implements AutoCloseable {
    private final Path file;
    private final int width;
    private final int height;
    private final int channels;
    private final int frames;
    private final int bitDepth;
    private final double pixelSizeUm;
    private final double frameIntervalS;
    private final List<String> warnings;
    private final List<String> channelNames;
    private final MovieLayout layout;
    private final PlaneStore planes;

    private Movie(Path file, MovieLayout layout, double pixelSizeUm, double frameIntervalS, List<String> warnings,
            PlaneStore planes) {
        this.file = file;
        this.width = layout.width;
        this.height = layout.height;
        this.channels = layout.channels;
        this.frames = layout.timePoints();
        this.bitDepth = layout.bitDepth;
        this.pixelSizeUm = pixelSizeUm;
        this.frameIntervalS = frameIntervalS;
        this.warnings = List.copyOf(warnings);
        this.channelNames = List.copyOf(layout.channelNames);
        this.layout = layout;
        this.planes = planes;
    }

    /**
     * Opens a TIFF (8-, 16- or 32-bit; a stack or a hyperstack) and checks it against its own header.
     *
     * @param file           the TIFF; never written
     * @param pixelSizeUm    pixel size, um; null = take it from the TIFF's calibration
     * @param frameIntervalS time between frames, s; null = take it from the TIFF's calibration
     * @throws InputException for unreadable files and for a calibration missing in both the TIFF and the
     *                        arguments (naming the session.json key to set)
     */
    public static Movie open(Path file, Double pixelSizeUm, Double frameIntervalS) {
        boolean intel = checkIsTiff(file);
        MovieLayout layout = MovieLayout.read(file, intel);
        PlaneStore planes = null;
        try {
            List<String> warnings = new ArrayList<>(layout.warnings);
            double pixel = pixelSizeUm != null ? overrideValue(file, pixelSizeUm, "pixel_size_um")
                    : layout.pixelSizeUm;
            double interval = frameIntervalS != null ? overrideValue(file, frameIntervalS, "frame_interval_s")
                    : layout.frameIntervalS;
            boolean noPixel = !(pixel > 0);
            boolean noInterval = !(interval > 0);
            if (noPixel || noInterval) {
                String what = noPixel && noInterval ? "no pixel size and no frame interval"
                        : noPixel ? "no pixel size" : "no frame interval";
                String keys = noPixel && noInterval ? "\"pixel_size_um\" and \"frame_interval_s\""
                        : noPixel ? "\"pixel_size_um\"" : "\"frame_interval_s\"";
                throw new InputException(file, "the movie has " + what + " in its calibration; set " + keys
                        + " in session.json");
            }
            if (pixelSizeUm == null && layout.pixelAspect != 1) {
                warnings.add(String.format(Locale.ROOT, "The pixels of %s are not square (height/width %.4g); "
                        + "the pixel width %.4g um is used along the path.", file.getFileName(), layout.pixelAspect,
                        pixel));
            }
            planes = layout.openPlanes(file);
            Movie movie = new Movie(file, layout, pixel, interval, warnings, planes);
            movie.checkDecodable();
            return movie;
        } catch (RuntimeException e) {
            layout.discard();
            if (planes != null) {
                planes.close();
            }
            throw e;
        }
    }

    private static double overrideValue(Path file, double value, String key) {
        if (!(value > 0) || !Double.isFinite(value)) {
            throw new InputException(file, "\"" + key + "\" must be a positive number, got " + value);
        }
        return value;
    }

    /** Refuses what is not a classic TIFF; returns true for little-endian ("II") byte order. */
    private static boolean checkIsTiff(Path file) {
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
        return intel;
    }

    /**
     * Decodes the first frame (a file Java's reader cannot decode fails here, not halfway through an analysis) and
     * refuses a 32-bit movie whose first, middle and last frames of every channel hold only NaN.
     */
    private void checkDecodable() {
        float[] row = new float[width];
        planes.readRows(plane(0, 0), 0, 1, row);
        if (bitDepth != 32) {
            return;
        }
        for (int c = 0; c < channels; c++) {
            for (int t : new int[] {0, frames / 2, frames - 1}) {
                for (int y = 0; y < height; y++) {
                    planes.readRows(plane(c, t), y, 1, row);
                    for (float v : row) {
                        if (!Float.isNaN(v)) {
                            return;
                        }
                    }
                }
            }
        }
        throw new InputException(file, "the 32-bit movie holds only NaN values (checked its first, middle and "
                + "last frames)");
    }

    private int plane(int channel, int frame) {
        return layout.storePlane(channel, frame);
    }

    public int width() {
        return width;
    }

    public int height() {
        return height;
    }

    /** Number of time points. */
    public int frameCount() {
        return frames;
    }

    public int channelCount() {
        return channels;
    }

    /** Pixel size, um (from the override, else the TIFF). */
    public double pixelSizeUm() {
        return pixelSizeUm;
    }

    /** Time between frames, s (from the override, else the TIFF). */
    public double frameIntervalS() {
        return frameIntervalS;
    }

    /** 8, 16 or 32. */
    public int bitDepth() {
        return bitDepth;
    }

    public Path file() {
        return file;
    }

    /**
     * One name a channel, as the file gives it (OME-TIFF metadata); an empty string where the file names none.
     */
    public List<String> channelNames() {
        return channelNames;
    }

    /** Plain sentences about how the file was read, e.g. slices read as time points. */
    public List<String> warnings() {
        return warnings;
    }

    /** Focal planes at each time point: more than 1 for a z-stack recorded over time. */
    public int zSlices() {
        return layout.zSlices();
    }

    /**
     * The frames of one channel. The source may be used from one thread at a time (compressed movies keep the
     * last decoded frame); open the movie once per thread for parallel work. In a z-stack over time this is the
     * first focal plane.
     *
     * @param channel 0-based channel index
     * @throws IllegalArgumentException if there is no such channel
     */
    public FrameSource channel(int channel) {
        return slice(channel, 0);
    }

    /**
     * The frames of one channel at one focal plane.
     *
     * @param channel 0-based channel index
     * @param slice   0-based focal plane
     * @throws IllegalArgumentException if there is no such channel or plane
     */
    public FrameSource slice(int channel, int slice) {
        checkChannel(channel);
        if (slice < 0 || slice >= layout.zSlices()) {
            throw new IllegalArgumentException("the movie has " + layout.zSlices() + " focal plane(s); there is no "
                    + "plane " + (slice + 1));
        }
        return new Source() {
            @Override
            public float[] readRows(int frame, int firstRow, int rowCount, float[] dst) {
                checkRows(frame, firstRow, rowCount);
                planes.readRows(layout.storePlane(channel, slice, frame), firstRow, rowCount, dst);
                return dst;
            }

            @Override
            public float[] gather(int frame, int[] pixelIndices, float[] dst) {
                checkFrame(frame);
                planes.gather(layout.storePlane(channel, slice, frame), pixelIndices, dst);
                return dst;
            }
        };
    }

    /**
     * The frames of one channel projected over the focal planes at each time point: the largest value of each
     * pixel ({@code max}) or the mean ({@code mean}). Reads every plane of a frame for each request.
     *
     * @param channel    0-based channel index
     * @param projection "max" or "mean"
     */
    public FrameSource projected(int channel, String projection) {
        checkChannel(channel);
        boolean max = projection.equals("max");
        if (!max && !projection.equals("mean")) {
            throw new IllegalArgumentException("a projection is \"max\" or \"mean\", not " + projection);
        }
        int zs = layout.zSlices();
        return new Source() {
            private float[] scratch = new float[0];

            @Override
            public float[] readRows(int frame, int firstRow, int rowCount, float[] dst) {
                checkRows(frame, firstRow, rowCount);
                int n = rowCount * width;
                scratch = scratch.length < n ? new float[n] : scratch;
                for (int z = 0; z < zs; z++) {
                    planes.readRows(layout.storePlane(channel, z, frame), firstRow, rowCount, z == 0 ? dst : scratch);
                    if (z > 0) {
                        combine(dst, scratch, n, max);
                    }
                }
                finish(dst, n, max, zs);
                return dst;
            }

            @Override
            public float[] gather(int frame, int[] pixelIndices, float[] dst) {
                checkFrame(frame);
                int n = pixelIndices.length;
                scratch = scratch.length < n ? new float[n] : scratch;
                for (int z = 0; z < zs; z++) {
                    planes.gather(layout.storePlane(channel, z, frame), pixelIndices, z == 0 ? dst : scratch);
                    if (z > 0) {
                        combine(dst, scratch, n, max);
                    }
                }
                finish(dst, n, max, zs);
                return dst;
            }
        };
    }

    private static void combine(float[] into, float[] plane, int n, boolean max) {
        for (int i = 0; i < n; i++) {
            into[i] = max ? Math.max(into[i], plane[i]) : into[i] + plane[i];
        }
    }

    private static void finish(float[] sum, int n, boolean max, int planes) {
        if (!max) {
            for (int i = 0; i < n; i++) {
                sum[i] /= planes;
            }
        }
    }

    private void checkChannel(int channel) {
        if (channel < 0 || channel >= channels) {
            throw new IllegalArgumentException("the movie has " + channels + " channel(s); there is no channel "
                    + (channel + 1));
        }
    }

    /** The frame source of this movie's size; subclasses read one plane or combine several. */
    private abstract class Source implements FrameSource {
        @Override
        public int width() {
            return width;
        }

        @Override
        public int height() {
            return height;
        }

        @Override
        public int frameCount() {
            return frames;
        }

        void checkRows(int frame, int firstRow, int rowCount) {
            checkFrame(frame);
            if (firstRow < 0 || rowCount < 0 || firstRow + rowCount > height) {
                throw new IllegalArgumentException("rows " + firstRow + " to " + (firstRow + rowCount - 1)
                        + " are outside a frame of " + height + " rows");
            }
        }

        void checkFrame(int frame) {
            if (frame < 0 || frame >= frames) {
                throw new IllegalArgumentException("frame " + frame + " is outside 0.." + (frames - 1));
            }
        }
    }

    @Override
    public void close() {
        planes.close();
    }
}
