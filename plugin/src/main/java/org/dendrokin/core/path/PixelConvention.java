package org.dendrokin.core.path;

/**
 * The one place where ImageJ's path coordinates meet array indices. In ImageJ (and in our paths) pixel i
 * covers [i, i+1), so its centre is at i + 0.5. Array interpolation (ours and ImgLib2's) puts sample i at
 * coordinate i. Converting a path coordinate to an array coordinate therefore subtracts one half.
 */
public final class PixelConvention {
    private PixelConvention() {
    }

    /**
     * Array coordinate of an ImageJ pixel coordinate: {@code px - 0.5}. A point at a pixel centre
     * (i + 0.5) maps to index i exactly; a point on the border between pixels i and i+1 maps to i + 0.5.
     *
     * @param px coordinate in ImageJ convention, pixels
     * @return coordinate in array-index convention, pixels
     */
    public static double toArrayIndex(double px) {
        return px - 0.5;
    }

    /** ImageJ pixel coordinate of an array coordinate: {@code index + 0.5}; the inverse of {@link #toArrayIndex}. */
    public static double fromArrayIndex(double index) {
        return index + 0.5;
    }
}
