package org.dendrokin.core.spines;

import java.util.List;

import org.dendrokin.core.Checks;
import org.dendrokin.core.kymo.FrameSource;
import org.dendrokin.core.kymo.Kymograph;
import org.dendrokin.core.path.DendritePath;

/**
 * What a spine analysis needs from the session's own analysis, already computed: the movie, the path, the shaft's
 * dF/F0 kymograph and how it was made (background, bleaching, baseline, stimulus), so that the heads are treated
 * exactly as the shaft was.
 *
 * @param referenceImage      row-major image the heads are found in ({@code frames.width() x frames.height()}):
 *                            the mean of the baseline frames of the signal channel, or a structural channel's mean.
 *                            Shared, not modified.
 * @param frames              the analysed (signal) channel, the same movie the kymograph was taken from
 * @param path                the dendrite's path, ImageJ pixel coordinates
 * @param pixelSizeUm         pixel size, um
 * @param pathWidthUm         width of the shaft's band, um
 * @param shaft               the shaft's dF/F0 kymograph (one row a frame of {@code frames}); positions in um from the
 *                            path's first vertex
 * @param backgroundPerFrame  the background subtracted from each frame, grey values. Not modified.
 * @param bleachPerFrame      the bleaching curve b(t_f) the shaft's frames were divided by (dimensionless, 1 at the
 *                            first frame), or null when no correction was applied. Not modified.
 * @param baselineFirst       first baseline frame (F0), 0-based inclusive
 * @param baselineLast        last baseline frame, inclusive
 * @param stimulusTimeS       stimulus time, s, or NaN when not known
 * @param stimulusPositionUm  stimulus position along the path, um, or NaN
 * @param given               heads the user gave (points or ovals), in pixel coordinates; may be empty
 * @param shaftModel          the shaft's dF/F0 as a fitted model describes it, on the grid of {@code shaft}, or null:
 *                            when given, the neck fits are driven by it instead of the measured kymograph (whose
 *                            noise and smoothing along the path bias them; see {@link SpineAnalysis})
 * @param shaftModelName      the model's name, for the record (empty without a model)
 */
public record SpineInputs(float[] referenceImage, FrameSource frames, DendritePath path, double pixelSizeUm,
        double pathWidthUm, Kymograph shaft, double[] backgroundPerFrame, double[] bleachPerFrame,
        int baselineFirst, int baselineLast, double stimulusTimeS, double stimulusPositionUm,
        List<SpineSite> given, Kymograph shaftModel, String shaftModelName) {
    /** Inputs whose neck fits are driven by the measured kymograph. */
    public SpineInputs(float[] referenceImage, FrameSource frames, DendritePath path, double pixelSizeUm,
            double pathWidthUm, Kymograph shaft, double[] backgroundPerFrame, double[] bleachPerFrame,
            int baselineFirst, int baselineLast, double stimulusTimeS, double stimulusPositionUm,
            List<SpineSite> given) {
        this(referenceImage, frames, path, pixelSizeUm, pathWidthUm, shaft, backgroundPerFrame, bleachPerFrame,
                baselineFirst, baselineLast, stimulusTimeS, stimulusPositionUm, given, null, "");
    }

    public SpineInputs {
        Checks.require(referenceImage != null && frames != null && path != null && shaft != null
                && backgroundPerFrame != null, "a spine analysis needs the reference image, the frames, the path, "
                + "the shaft's kymograph and the background");
        Checks.require(referenceImage.length == frames.width() * frames.height(), "the reference image has "
                + referenceImage.length + " pixels, the movie's frames " + frames.width() + " x " + frames.height());
        Checks.require(shaft.frameCount() == frames.frameCount(), "the kymograph has " + shaft.frameCount()
                + " frames, the movie " + frames.frameCount());
        Checks.require(backgroundPerFrame.length == frames.frameCount(), "one background value per frame is needed");
        Checks.positiveFinite(pixelSizeUm, "pixel size (um)");
        Checks.nonNegativeFinite(pathWidthUm, "path width (um)");
        Checks.require(baselineFirst >= 0 && baselineFirst <= baselineLast && baselineLast < frames.frameCount(),
                "baseline frames [" + baselineFirst + ", " + baselineLast + "] must lie within the movie");
        Checks.require(Double.isFinite(stimulusTimeS) == Double.isFinite(stimulusPositionUm),
                "the stimulus needs both its time and its position, or neither");
        Checks.require(bleachPerFrame == null || bleachPerFrame.length == frames.frameCount(),
                "one bleaching factor per frame is needed");
        backgroundPerFrame = backgroundPerFrame.clone();
        bleachPerFrame = bleachPerFrame == null ? null : bleachPerFrame.clone();
        given = given == null ? List.of() : List.copyOf(given);
        Checks.require(shaftModel == null || shaftModel.frameCount() == shaft.frameCount()
                && shaftModel.positionCount() == shaft.positionCount(), "the shaft's model must be on the grid of "
                + "its kymograph");
        shaftModelName = shaftModel == null || shaftModelName == null ? "" : shaftModelName;
    }

    /** The kymograph that drives the neck fits: the shaft's model when there is one, else its measured dF/F0. */
    public Kymograph driver() {
        return shaftModel != null ? shaftModel : shaft;
    }

    @Override
    public double[] backgroundPerFrame() {
        return backgroundPerFrame.clone();
    }

    @Override
    public double[] bleachPerFrame() {
        return bleachPerFrame == null ? null : bleachPerFrame.clone();
    }

    /** True when the stimulus time and position are known. */
    public boolean stimulusKnown() {
        return Double.isFinite(stimulusTimeS);
    }
}
