package org.dendrokin.core.analysis;

import org.dendrokin.core.Checks;
import org.dendrokin.core.kymo.FrameSource;
import org.dendrokin.core.path.DendritePath;
import org.dendrokin.core.preprocess.Preprocessing;

/**
 * Everything one analysis needs, already read and validated by the caller: the movie's analysed channel (and
 * the denominator channel of the ratio method), the path, the sizes, and what the user fixed.
 *
 * @param signal          the analysed channel; only the band along the path and the background pixels are read
 * @param denominator     the ratio method's denominator channel, or null
 * @param path            the path in ImageJ pixel coordinates
 * @param pixelSizeUm     pixel size, um
 * @param frameIntervalS  time between frames, s
 * @param pathWidthUm     width of the band averaged across the path, um
 * @param background      how the background is found
 * @param calibration     the calibration to apply
 * @param preprocessing   stimulus, baseline frames and bleaching correction as the user fixed them
 * @param fits            the models to fit
 */
public record AnalysisRequest(FrameSource signal, FrameSource denominator, DendritePath path, double pixelSizeUm,
                              double frameIntervalS, double pathWidthUm, BackgroundRequest background,
                              CalibrationRequest calibration, Preprocessing.Options preprocessing,
                              FitRequest fits) {
    public AnalysisRequest {
        Checks.require(signal != null, "an analysis needs the movie's signal channel");
        Checks.require(path != null, "an analysis needs a path");
        Checks.positiveFinite(pixelSizeUm, "pixel size (um)");
        Checks.positiveFinite(frameIntervalS, "frame interval (s)");
        Checks.nonNegativeFinite(pathWidthUm, "path width (um)");
        Checks.require(background != null && calibration != null && preprocessing != null && fits != null,
                "background, calibration, preprocessing and fit settings must all be given");
    }
}
