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
}
