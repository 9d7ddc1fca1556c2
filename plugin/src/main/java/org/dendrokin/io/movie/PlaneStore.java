package org.dendrokin.io.movie;

/** The image planes of a TIFF in file order, read a few rows or pixels at a time. */
interface PlaneStore extends AutoCloseable {
    /** Copies rows of plane {@code plane} (0-based, file order) into {@code dst} as floats. */
    void readRows(int plane, int firstRow, int rowCount, float[] dst);

    /** Copies the pixels at the given array indices (ascending) of plane {@code plane} into {@code dst}. */
    void gather(int plane, int[] pixelIndices, float[] dst);

    @Override
    void close();
}
