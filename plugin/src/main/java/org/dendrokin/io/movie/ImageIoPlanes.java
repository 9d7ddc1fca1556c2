package org.dendrokin.io.movie;

import java.awt.image.BufferedImage;
import java.awt.image.DataBuffer;
import java.awt.image.Raster;
import java.io.IOException;
import java.nio.file.Path;

import org.dendrokin.io.InputException;

/**
 * Planes decoded by Java's TIFF reader ({@link JavaTiff}), for TIFFs ImageJ cannot read: tiled files and files
 * with several grey samples a pixel (each sample is a channel). Plane {@code p} is sample {@code p % samples} of
 * image directory {@code p / samples}. One image is decoded at a time and its samples are kept as floats, so
 * several reads of one frame decode it once; the heap holds one frame, never the movie. Not safe for concurrent
 * readers.
 */
final class ImageIoPlanes implements PlaneStore {
    private final Path file;
    private final JavaTiff tiff;
    private final int width;
    private final int height;
    private final int samples;
    private final boolean unsigned32;
    private final float[][] bands;
    private int[] intBuffer;
    private BufferedImage destination;
    private int cachedImage = -1;

    /**
     * @param file       the TIFF, named in error messages
     * @param tiff       the open file; closed by {@link #close()}
     * @param width      image width, pixels
     * @param height     image height, pixels
     * @param samples    samples a pixel, at least 1
     * @param unsigned32 true for 32-bit unsigned integer samples (Java reads them as signed)
     */
    ImageIoPlanes(Path file, JavaTiff tiff, int width, int height, int samples, boolean unsigned32) {
        this.file = file;
        this.tiff = tiff;
        this.width = width;
        this.height = height;
        this.samples = samples;
        this.unsigned32 = unsigned32;
        this.bands = new float[samples][];
    }

    private float[] plane(int plane) {
        int image = plane / samples;
        if (image != cachedImage) {
            decode(image);
        }
        return bands[plane % samples];
    }

    private void decode(int image) {
        cachedImage = -1;
        try {
            destination = tiff.read(image, destination);
        } catch (IOException | RuntimeException e) {
            throw new InputException(file, "image " + (image + 1) + " of the movie could not be decoded by Java's "
                    + "TIFF reader (" + oneLine(e) + ")", e);
        }
        Raster r = destination.getRaster();
        if (r.getWidth() != width || r.getHeight() != height || r.getNumBands() < samples) {
            throw new InputException(file, "image " + (image + 1) + " of the movie decoded to " + r.getWidth() + " x "
                    + r.getHeight() + " pixels with " + r.getNumBands() + " samples, not the " + width + " x " + height
                    + " with " + samples + " its header gives");
        }
        int n = width * height;
        for (int b = 0; b < samples; b++) {
            if (bands[b] == null) {
                bands[b] = new float[n];
            }
            if (unsigned32 && r.getDataBuffer().getDataType() == DataBuffer.TYPE_INT) {
                intBuffer = r.getSamples(r.getMinX(), r.getMinY(), width, height, b, intBuffer);
                for (int i = 0; i < n; i++) {
                    bands[b][i] = intBuffer[i] & 0xffffffffL;
                }
            } else {
                r.getSamples(r.getMinX(), r.getMinY(), width, height, b, bands[b]);
            }
        }
        cachedImage = image;
    }

    private static String oneLine(Throwable e) {
        String m = e.getMessage() == null ? e.getClass().getSimpleName() : e.getMessage();
        return m.replaceAll("\\s+", " ").trim();
    }

    @Override
    public void readRows(int plane, int firstRow, int rowCount, float[] dst) {
        System.arraycopy(plane(plane), firstRow * width, dst, 0, rowCount * width);
    }

    @Override
    public void gather(int plane, int[] pixelIndices, float[] dst) {
        float[] p = plane(plane);
        for (int i = 0; i < pixelIndices.length; i++) {
            dst[i] = p[pixelIndices[i]];
        }
    }

    @Override
    public void close() {
        tiff.close();
        destination = null;
    }
}
