package org.dendrokin.io.movie;

import java.nio.file.Path;

import ij.ImagePlus;
import ij.ImageStack;
import ij.io.FileSaver;
import ij.measure.Calibration;
import ij.process.ByteProcessor;
import ij.process.FloatProcessor;
import ij.process.ImageProcessor;
import ij.process.ShortProcessor;

/** Small movies written by ImageJ's own FileSaver, with a known value at every pixel. */
final class TestMovies {
    private TestMovies() {
    }

    /** The value written at (column, row) of stack image {@code plane} (0-based, ImageJ order). */
    static int value(int plane, int column, int row) {
        return (7 * plane + 3 * column + 5 * row) % 200;
    }

    /** A stack of {@code planes} images of the given bit depth, each pixel holding {@link #value}. */
    static ImagePlus stack(int bitDepth, int width, int height, int planes) {
        ImageStack stack = new ImageStack(width, height);
        for (int p = 0; p < planes; p++) {
            ImageProcessor ip = bitDepth == 8 ? new ByteProcessor(width, height)
                    : bitDepth == 16 ? new ShortProcessor(width, height) : new FloatProcessor(width, height);
            for (int y = 0; y < height; y++) {
                for (int x = 0; x < width; x++) {
                    ip.setf(x, y, value(p, x, y) + (bitDepth == 16 ? 1000 : 0) + (bitDepth == 32 ? 0.25f : 0));
                }
            }
            stack.addSlice(ip);
        }
        return new ImagePlus("movie", stack);
    }

    /** Sets a calibration: pixel width in microns, frame interval in the given time unit. */
    static void calibrate(ImagePlus imp, double pixelMicron, double interval, String timeUnit) {
        Calibration c = imp.getCalibration();
        c.pixelWidth = pixelMicron;
        c.pixelHeight = pixelMicron;
        c.setUnit("micron");
        c.frameInterval = interval;
        c.setTimeUnit(timeUnit);
    }

    static Path save(ImagePlus imp, Path file) {
        if (!new FileSaver(imp).saveAsTiff(file.toString())) {
            throw new IllegalStateException("ImageJ could not write " + file);
        }
        return file;
    }
}
