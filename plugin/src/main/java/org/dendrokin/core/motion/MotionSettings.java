package org.dendrokin.core.motion;

import org.dendrokin.core.Checks;

/**
 * How motion is measured and reported.
 *
 * @param pixelSizeUm     pixel size, um, positive; shifts are reported in um with it
 * @param bandWidthUm     width of the band averaged across the path, um, zero or positive; a shift above a quarter
 *                        of it (or of the pixel size, if the band is narrower) is reported with a warning
 * @param windowPx        largest side of the measurement window, pixels: a power of two from 16 to 1024. The cost
 *                        of a frame grows as its square; 64 is enough for a dendrite with spines
 * @param maxShiftPx      largest shift looked for along x and along y, pixels, 1 to {@code windowPx / 4}; as the
 *                        window follows the content, this limits a sudden jump, not the total drift
 * @param smoothingFrames width of the running median applied to the measured trace, frames: 1 (none) or an odd
 *                        number; it removes isolated wrong frames and keeps sudden steps
 */
public record MotionSettings(double pixelSizeUm, double bandWidthUm, int windowPx, int maxShiftPx,
        int smoothingFrames) {
    /** Default side of the measurement window, pixels. */
    public static final int DEFAULT_WINDOW_PX = 64;
    /** Default largest shift, pixels. */
    public static final int DEFAULT_MAX_SHIFT_PX = 16;

    public MotionSettings {
        Checks.positiveFinite(pixelSizeUm, "pixelSizeUm");
        Checks.nonNegativeFinite(bandWidthUm, "bandWidthUm");
        Checks.require(RealFft2d.isPowerOfTwo(windowPx) && windowPx >= 16 && windowPx <= 1024,
                "the motion window must be a power of two from 16 to 1024 pixels, got " + windowPx);
        Checks.require(maxShiftPx >= 1 && maxShiftPx <= windowPx / 4,
                "the largest motion shift must be 1 to " + windowPx / 4 + " pixels, got " + maxShiftPx);
        Checks.require(smoothingFrames >= 1 && smoothingFrames % 2 == 1,
                "the motion smoothing must be an odd number of frames, got " + smoothingFrames);
    }

    /** The defaults: a 64 pixel window, shifts up to 16 pixels, no smoothing. */
    public static MotionSettings of(double pixelSizeUm, double bandWidthUm) {
        return new MotionSettings(pixelSizeUm, bandWidthUm, DEFAULT_WINDOW_PX, DEFAULT_MAX_SHIFT_PX, 1);
    }

    public MotionSettings withWindowPx(int newWindowPx) {
        return new MotionSettings(pixelSizeUm, bandWidthUm, newWindowPx, Math.min(maxShiftPx, newWindowPx / 4),
                smoothingFrames);
    }

    public MotionSettings withMaxShiftPx(int newMaxShiftPx) {
        return new MotionSettings(pixelSizeUm, bandWidthUm, windowPx, newMaxShiftPx, smoothingFrames);
    }

    public MotionSettings withSmoothingFrames(int frames) {
        return new MotionSettings(pixelSizeUm, bandWidthUm, windowPx, maxShiftPx, frames);
    }

    /** The shift above which a warning is given, um: a quarter of the band width, or of a pixel if more. */
    public double warningThresholdUm() {
        return Math.max(bandWidthUm, pixelSizeUm) / 4;
    }
}
