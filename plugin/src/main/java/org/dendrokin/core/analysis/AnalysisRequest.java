package org.dendrokin.core.analysis;

import java.util.List;

import org.dendrokin.core.Checks;
import org.dendrokin.core.kymo.FrameSource;
import org.dendrokin.core.path.DendritePath;

/**
 * Everything one analysis needs, already read and validated by the caller: the movie's analysed channel (and
 * the denominator channel of the ratio method, and a structural channel), the path, the sizes, and what the user
 * fixed.
 *
 * @param signal          the analysed channel; only the band along the path and the background pixels are read
 * @param denominator     the ratio method's denominator channel, or null
 * @param structural      a structural channel (a dye that does not respond), used for motion and normalisation,
 *                        or null
 * @param path            the path in ImageJ pixel coordinates
 * @param pixelSizeUm     pixel size, um
 * @param frameIntervalS  time between frames, s
 * @param pathWidthUm     width of the band averaged across the path, um
 * @param background      how the background is found
 * @param calibration     the calibration to apply
 * @param stimuli         the stimuli as given (at least one; {@link StimulusSpec#DETECT} to detect it)
 * @param trainGapS       largest time between pulses at one place that make one train, s
 * @param baselineFrames  {first, last} baseline frames, 0-based inclusive, or null for every frame before the
 *                        stimulus
 * @param bleachCorrection false to switch the bleaching correction off
 * @param motion          what to do about motion
 * @param normalisation   normalisation by the structural channel
 * @param fits            the models to fit
 * @param linePeriodS     time between the scan lines of a raster scan, s (a sample on image row y of frame f was
 *                        taken at t_f + y * linePeriodS), or 0 to take every pixel of a frame at the frame's time
 */
public record AnalysisRequest(FrameSource signal, FrameSource denominator, FrameSource structural,
                              DendritePath path, double pixelSizeUm, double frameIntervalS, double pathWidthUm,
                              BackgroundRequest background, CalibrationRequest calibration, List<StimulusSpec> stimuli,
                              double trainGapS, int[] baselineFrames, boolean bleachCorrection, MotionMode motion,
                              Normalisation normalisation, FitRequest fits, double linePeriodS) {
    /** Default largest gap between the pulses of one train, s. */
    public static final double DEFAULT_TRAIN_GAP_S = 2.0;

    /** A request whose frames count as taken at one instant each. */
    public AnalysisRequest(FrameSource signal, FrameSource denominator, FrameSource structural, DendritePath path,
                           double pixelSizeUm, double frameIntervalS, double pathWidthUm, BackgroundRequest background,
                           CalibrationRequest calibration, List<StimulusSpec> stimuli, double trainGapS,
                           int[] baselineFrames, boolean bleachCorrection, MotionMode motion,
                           Normalisation normalisation, FitRequest fits) {
        this(signal, denominator, structural, path, pixelSizeUm, frameIntervalS, pathWidthUm, background,
                calibration, stimuli, trainGapS, baselineFrames, bleachCorrection, motion, normalisation, fits, 0);
    }

    public AnalysisRequest {
        Checks.nonNegativeFinite(linePeriodS, "line period (s)");
        Checks.require(signal != null, "an analysis needs the movie's signal channel");
        Checks.require(path != null, "an analysis needs a path");
        Checks.positiveFinite(pixelSizeUm, "pixel size (um)");
        Checks.positiveFinite(frameIntervalS, "frame interval (s)");
        Checks.nonNegativeFinite(pathWidthUm, "path width (um)");
        Checks.require(background != null && calibration != null && fits != null && motion != null
                && normalisation != null, "background, calibration, motion, normalisation and fit settings must all "
                + "be given");
        Checks.require(stimuli != null && !stimuli.isEmpty(), "at least one stimulus (possibly to detect) is needed");
        Checks.require(normalisation == Normalisation.NONE || structural != null,
                "a normalisation by the structural channel needs that channel");
        Checks.nonNegativeFinite(trainGapS, "train gap (s)");
        stimuli = List.copyOf(stimuli);
        baselineFrames = baselineFrames == null ? null : baselineFrames.clone();
    }

    @Override
    public int[] baselineFrames() {
        return baselineFrames == null ? null : baselineFrames.clone();
    }
}
