package org.dendrokin.io.movie;

import ij.ImageStack;
import ij.process.ImageProcessor;

/**
 * Planes read through ImageJ's virtual stack (one plane decoded at a time), for TIFFs that cannot be mapped:
 * compressed or tiled files, or sample types the map does not handle. The last plane read is kept, so several
 * reads of one frame decode it once. Not safe for concurrent readers.
 */
final class VirtualPlanes implements PlaneStore {
    private final ImageStack stack;
    private final int width;
    private int cachedPlane = -1;
    private ImageProcessor cached;

    VirtualPlanes(ImageStack stack) {
        this.stack = stack;
        this.width = stack.getWidth();
    }

    private ImageProcessor plane(int plane) {
        if (plane != cachedPlane) {
            cached = stack.getProcessor(plane + 1);
            cachedPlane = plane;
        }
        return cached;
    }

    @Override
    public void readRows(int plane, int firstRow, int rowCount, float[] dst) {
        ImageProcessor ip = plane(plane);
        int base = firstRow * width;
        for (int i = 0; i < rowCount * width; i++) {
            dst[i] = ip.getf(base + i);
        }
    }

    @Override
    public void gather(int plane, int[] pixelIndices, float[] dst) {
        ImageProcessor ip = plane(plane);
        for (int i = 0; i < pixelIndices.length; i++) {
            dst[i] = ip.getf(pixelIndices[i]);
        }
    }

    @Override
    public void close() {
        cached = null;
    }
}
