package org.dendrokin.io.movie;

import java.nio.file.Path;
import java.util.List;

import org.dendrokin.core.kymo.FrameSource;

/**
 * A TIFF movie opened for reading a few rows at a time. Uncompressed files are read through memory-mapped
 * strips located from the TIFF's own offsets; compressed ones through ImageJ's virtual stack. The whole movie
 * is never loaded. Close it when done.
 */
public final class Movie implements AutoCloseable {
    private Movie() {
    }

    /**
     * Opens a TIFF (8-, 16- or 32-bit; a stack or a hyperstack) and checks it against its own header: a file
     * shorter than its header promises, a file that is not a TIFF, or a 32-bit movie holding only NaN is an
     * {@link org.dendrokin.io.InputException} naming the file.
     *
     * @param file           the TIFF
     * @param pixelSizeUm    pixel size, um; null = take it from the TIFF's calibration
     * @param frameIntervalS time between frames, s; null = take it from the TIFF's calibration
     * @throws org.dendrokin.io.InputException for unreadable files and for a calibration missing in both the
     *                                         TIFF and the arguments (naming the session.json key to set)
     */
    public static Movie open(Path file, Double pixelSizeUm, Double frameIntervalS) {
        throw new UnsupportedOperationException("not yet implemented");
    }

    public int width() {
        throw new UnsupportedOperationException("not yet implemented");
    }

    public int height() {
        throw new UnsupportedOperationException("not yet implemented");
    }

    /** Number of time points. */
    public int frameCount() {
        throw new UnsupportedOperationException("not yet implemented");
    }

    public int channelCount() {
        throw new UnsupportedOperationException("not yet implemented");
    }

    /** Pixel size, um (from the override, else the TIFF). */
    public double pixelSizeUm() {
        throw new UnsupportedOperationException("not yet implemented");
    }

    /** Time between frames, s (from the override, else the TIFF). */
    public double frameIntervalS() {
        throw new UnsupportedOperationException("not yet implemented");
    }

    /** 8, 16 or 32. */
    public int bitDepth() {
        throw new UnsupportedOperationException("not yet implemented");
    }

    public Path file() {
        throw new UnsupportedOperationException("not yet implemented");
    }

    /** Plain sentences about how the file was read, e.g. slices read as time points. */
    public List<String> warnings() {
        throw new UnsupportedOperationException("not yet implemented");
    }

    /**
     * The frames of one channel.
     *
     * @param channel 0-based channel index
     */
    public FrameSource channel(int channel) {
        throw new UnsupportedOperationException("not yet implemented");
    }

    @Override
    public void close() {
    }
}
