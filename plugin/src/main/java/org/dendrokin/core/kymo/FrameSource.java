package org.dendrokin.core.kymo;

/**
 * Frames of one channel of a movie, read a band of rows at a time, so that a path touching a small part of
 * each frame never makes the whole movie load. Rows and columns are array indices (row 0 at the top); the
 * pixel at column i, row j covers [i, i+1) x [j, j+1) in ImageJ's path coordinates.
 */
public interface FrameSource {
    /** Frame width, pixels. */
    int width();

    /** Frame height, pixels. */
    int height();

    /** Number of time points. */
    int frameCount();

    /**
     * Copies rows {@code [firstRow, firstRow + rowCount)} of frame {@code frame} (0-based) into {@code dst}
     * (row-major, {@link #width()} values a row) as float intensities.
     *
     * @param frame    0-based frame index, {@code 0 <= frame < frameCount()}
     * @param firstRow first row to copy, {@code 0 <= firstRow}
     * @param rowCount number of rows, {@code firstRow + rowCount <= height()}
     * @param dst      receives the rows; at least {@code rowCount * width()} long. Modified.
     * @return {@code dst}
     */
    float[] readRows(int frame, int firstRow, int rowCount, float[] dst);

    /**
     * Copies single pixels of frame {@code frame} into {@code dst}: {@code dst[i]} receives the pixel at array
     * index {@code pixelIndices[i]} ({@code row * width() + column}). The default reads the band of rows from
     * the first to the last index through {@link #readRows}; sources that can reach single pixels cheaply
     * (memory-mapped files) override it.
     *
     * @param frame        0-based frame index
     * @param pixelIndices pixel indices in ascending order, each in {@code [0, width() * height())}. Not modified.
     * @param dst          receives the values; at least {@code pixelIndices.length} long. Modified.
     * @return {@code dst}
     */
    default float[] gather(int frame, int[] pixelIndices, float[] dst) {
        if (pixelIndices.length == 0) {
            return dst;
        }
        int w = width();
        int firstRow = pixelIndices[0] / w;
        int rowCount = pixelIndices[pixelIndices.length - 1] / w - firstRow + 1;
        float[] rows = readRows(frame, firstRow, rowCount, new float[rowCount * w]);
        int base = firstRow * w;
        for (int i = 0; i < pixelIndices.length; i++) {
            dst[i] = rows[pixelIndices[i] - base];
        }
        return dst;
    }
}
