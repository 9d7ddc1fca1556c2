package org.dendrokin.io.movie;

import ij.ImagePlus;
import ij.ImageStack;
import ij.process.ImageProcessor;

import org.dendrokin.core.kymo.FrameSource;

/**
 * One channel of an open ImageJ image as a {@link FrameSource}, without copying it: each read fetches one
 * plane from the image's stack (a virtual stack loads that plane only; the last plane read is kept so several
 * reads of one frame load it once). Time points are the hyperstack's frames; an image with one frame and
 * several slices has its slices read as time points; an image with both uses its current slice. The image is
 * not modified. Not safe for concurrent readers.
 */
public final class ImagePlusFrames implements FrameSource {
    private final ImagePlus image;
    private final ImageStack stack;
    private final int channel;
    private final int slice;
    private final boolean slicesAreTime;
    private int cachedIndex = -1;
    private ImageProcessor cached;

    /**
     * @param image   the image (8-, 16- or 32-bit grey values); not modified
     * @param channel 0-based channel
     * @throws IllegalArgumentException for a colour image or a channel it does not have
     */
    public ImagePlusFrames(ImagePlus image, int channel) {
        if (image.getBitDepth() == 24) {
            throw new IllegalArgumentException("colour (RGB) images are not supported: use 8-, 16- or 32-bit grey "
                    + "values, one channel each");
        }
        if (channel < 0 || channel >= image.getNChannels()) {
            throw new IllegalArgumentException("the image has " + image.getNChannels() + " channel(s); there is "
                    + "no channel " + (channel + 1));
        }
        this.image = image;
        this.stack = image.getStack();
        this.channel = channel;
        this.slicesAreTime = image.getNFrames() == 1 && image.getNSlices() > 1;
        this.slice = slicesAreTime ? 1 : image.getSlice();
    }

    /** True when the image has one frame and several slices, which are then read as time points. */
    public boolean slicesAreTime() {
        return slicesAreTime;
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
        return slicesAreTime ? image.getNSlices() : image.getNFrames();
    }

    private ImageProcessor plane(int frame) {
        if (frame < 0 || frame >= frameCount()) {
            throw new IllegalArgumentException("frame " + frame + " is outside 0.." + (frameCount() - 1));
        }
        int index = slicesAreTime ? image.getStackIndex(channel + 1, frame + 1, 1)
                : image.getStackIndex(channel + 1, slice, frame + 1);
        if (index != cachedIndex) {
            cached = stack.getProcessor(index);
            cachedIndex = index;
        }
        return cached;
    }

    @Override
    public float[] readRows(int frame, int firstRow, int rowCount, float[] dst) {
        ImageProcessor ip = plane(frame);
        int w = width();
        int base = firstRow * w;
        for (int i = 0; i < rowCount * w; i++) {
            dst[i] = ip.getf(base + i);
        }
        return dst;
    }

    @Override
    public float[] gather(int frame, int[] pixelIndices, float[] dst) {
        ImageProcessor ip = plane(frame);
        for (int i = 0; i < pixelIndices.length; i++) {
            dst[i] = ip.getf(pixelIndices[i]);
        }
        return dst;
    }
}
