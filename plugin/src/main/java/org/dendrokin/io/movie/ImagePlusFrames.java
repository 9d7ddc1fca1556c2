package org.dendrokin.io.movie;

import ij.ImagePlus;

import org.dendrokin.core.kymo.FrameSource;

/**
 * One channel of an open ImageJ image as a {@link FrameSource}, without copying it: each read fetches one
 * plane from the image's stack (virtual stacks load that plane only). Time points are the hyperstack's
 * frames, or its slices when it has one frame and several slices.
 */
public final class ImagePlusFrames implements FrameSource {
    private final ImagePlus image;
    private final int channel;

    /**
     * @param image   the image; not modified
     * @param channel 0-based channel
     */
    public ImagePlusFrames(ImagePlus image, int channel) {
        this.image = image;
        this.channel = channel;
    }

    @Override
    public int width() {
        return image.getWidth();
    }

    @Override
    public int height() {
        return image.getHeight();
    }

    @Override
    public int frameCount() {
        throw new UnsupportedOperationException("not yet implemented");
    }

    @Override
    public float[] readRows(int frame, int firstRow, int rowCount, float[] dst) {
        throw new UnsupportedOperationException("not yet implemented");
    }
}
