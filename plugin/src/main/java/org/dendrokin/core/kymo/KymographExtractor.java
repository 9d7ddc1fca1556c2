package org.dendrokin.core.kymo;

import org.dendrokin.core.Progress;
import org.dendrokin.core.path.DendritePath;

/** Samples a movie along a dendrite path, frame by frame, into a raw intensity kymograph. */
public final class KymographExtractor {
    /** Signal unit of an extracted kymograph: raw intensities, in the movie's own grey values. */
    public static final String INTENSITY = "intensity";

    private KymographExtractor() {
    }

    /**
     * Resamples the path at uniform arc length ({@code stepUm}; the usual choice is the pixel size), and for
     * each sample averages each frame over a band {@code bandWidthUm} wide across the local tangent, with
     * bilinear interpolation between pixel centres. Samples whose band leaves the image are NaN.
     *
     * @param frames         the movie channel; only the rows the band touches are read
     * @param path           the path in ImageJ pixel coordinates
     * @param pixelSizeUm    pixel size, um
     * @param frameIntervalS time between frames, s; frame i is at i * frameIntervalS
     * @param bandWidthUm    width of the band averaged across the path, um (0 = on the line only)
     * @param stepUm         spacing of the samples along the path, um
     * @param progress       receives one report a frame; checked for cancellation
     * @return the kymograph (distances in um from the first vertex, times in s) and its sample geometry
     */
    public static Extraction extract(FrameSource frames, DendritePath path, double pixelSizeUm,
            double frameIntervalS, double bandWidthUm, double stepUm, Progress progress) {
        throw new UnsupportedOperationException("not yet implemented");
    }
}
