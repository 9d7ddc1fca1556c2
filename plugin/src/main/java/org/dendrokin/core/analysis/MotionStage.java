package org.dendrokin.core.analysis;

import java.util.List;
import java.util.Locale;

import org.dendrokin.core.Progress;
import org.dendrokin.core.kymo.Extraction;
import org.dendrokin.core.kymo.FrameSource;
import org.dendrokin.core.kymo.KymographExtractor;
import org.dendrokin.core.motion.MotionCorrection;
import org.dendrokin.core.motion.MotionSettings;
import org.dendrokin.core.motion.MotionTrace;
import org.dendrokin.core.motion.PixelBox;
import org.dendrokin.core.motion.StimulusRegion;
import org.dendrokin.core.path.DendritePath;
import org.dendrokin.core.preprocess.StimulusDetector;

/**
 * Rigid motion in a session: measured on the structural channel when there is one (it does not change with the
 * signal), else on the analysed channel with the stimulated site weighted out, against the mean of the frames
 * before the stimulus; then every kymograph of the session is taken along the path moved with each frame's shift
 * ({@link MotionMode#CORRECT}), or along the path as drawn ({@link MotionMode#MEASURE}). When the stimulus time
 * is to be detected, it is detected first on the kymograph along the path as drawn, to know which frames are
 * baseline.
 */
final class MotionStage {
    /** Radius around the stimulated site that the measurement weights out, um. */
    static final double STIMULUS_RADIUS_UM = 3.0;
    /** Share of the movie taken as baseline for the reference when no stimulus time is known or found. */
    static final double FALLBACK_BASELINE_SHARE = 0.1;

    private final AnalysisRequest request;
    private final MotionTrace trace;
    private final Extraction plain;
    /** The signal channel along the moving path, made with the measurement, or null. */
    private final Extraction corrected;

    private MotionStage(AnalysisRequest request, MotionTrace trace, Extraction plain) {
        this(request, trace, plain, null);
    }

    private MotionStage(AnalysisRequest request, MotionTrace trace, Extraction plain, Extraction corrected) {
        this.request = request;
        this.trace = trace;
        this.plain = plain;
        this.corrected = corrected;
    }

    /**
     * Measures the motion if the request asks for it.
     *
     * @param request  the analysis' inputs
     * @param primary  the first stimulus, placed on the path (its time or place may be NaN)
     * @param warnings receives the measurement's warnings. Modified.
     * @param progress progress and cancellation
     */
    static MotionStage measure(AnalysisRequest request, ResolvedStimulus primary, List<Warning> warnings,
                               Progress progress) {
        if (request.motion() == MotionMode.OFF) {
            return new MotionStage(request, null, null);
        }
        FrameSource frames = request.signal();
        DendritePath path = request.path();
        double px = request.pixelSizeUm();
        int nt = frames.frameCount();
        Extraction plain = null;
        int baselineLast;
        double stimulusTime = primary.timeS();
        double stimulusPosition = primary.positionUm();
        if (Double.isFinite(stimulusTime)) {
            baselineLast = firstFrameAtOrAfter(stimulusTime, request.frameIntervalS(), nt) - 1;
        } else {
            plain = KymographExtractor.extract(frames, path, px, request.frameIntervalS(), request.pathWidthUm(), px,
                    progress);
            StimulusDetector.Detection d = StimulusDetector.detect(plain.kymograph());
            baselineLast = d.found() ? d.onsetFrame() - 1 : -1;
            if (d.found() && !Double.isFinite(stimulusPosition)) {
                stimulusPosition = d.positionUm();
            }
        }
        if (baselineLast < 0) {
            baselineLast = Math.max(0, (int) Math.round(FALLBACK_BASELINE_SHARE * nt) - 1);
            warnings.add(new Warning(Warning.Topic.MOVIE, String.format(Locale.ROOT, "No frames before a stimulus "
                    + "were known for the motion reference, so the first %d frames were used.", baselineLast + 1)));
        }
        if (request.baselineFrames() != null) {
            baselineLast = Math.min(nt - 1, request.baselineFrames()[1]);
        }
        int baselineFirst = request.baselineFrames() != null ? Math.max(0, request.baselineFrames()[0]) : 0;
        baselineLast = Math.max(baselineFirst, Math.min(nt - 1, baselineLast));
        FrameSource reference = request.structural() != null ? request.structural() : frames;
        StimulusRegion region = request.structural() == null && Double.isFinite(stimulusPosition)
                ? StimulusRegion.alongPath(path, Math.max(0, Math.min(stimulusPosition, path.lengthPx() * px)), px,
                        STIMULUS_RADIUS_UM) : null;
        MotionTrace trace;
        Extraction corrected = null;
        PixelBox box = PixelBox.around(path, request.pathWidthUm() / px);
        MotionSettings settings = MotionSettings.of(px, request.pathWidthUm());
        try {
            if (request.motion() == MotionMode.CORRECT) {
                // the signal's kymograph is sampled while the motion is measured
                MotionCorrection.Corrected both = MotionCorrection.measureAndExtract(reference, box, baselineFirst,
                        baselineLast, region, settings, frames, path, request.frameIntervalS(),
                        request.pathWidthUm(), px, progress);
                trace = both.trace();
                corrected = both.extraction();
            } else {
                trace = MotionCorrection.measure(reference, box, baselineFirst, baselineLast, region, settings,
                        progress);
            }
        } catch (IllegalArgumentException e) {
            warnings.add(new Warning(Warning.Topic.MOVIE, "Motion was not measured: " + e.getMessage() + "."));
            return new MotionStage(request, null, plain);
        }
        trace.warnings().forEach(w -> warnings.add(new Warning(Warning.Topic.MOVIE, w)));
        return new MotionStage(request, trace, plain, corrected);
    }

    /** The measured motion, or null when not measured. */
    MotionTrace trace() {
        return trace;
    }

    /** The kymograph of one channel: along the moving path when correcting, else along the path as drawn. */
    Extraction extract(FrameSource channel, Progress progress) {
        double px = request.pixelSizeUm();
        if (corrected != null && channel == request.signal()) {
            return corrected;
        }
        if (trace != null && request.motion() == MotionMode.CORRECT) {
            return MotionCorrection.extract(channel, request.path(), trace, px, request.frameIntervalS(),
                    request.pathWidthUm(), px, progress);
        }
        if (plain != null && channel == request.signal()) {
            return plain;
        }
        return KymographExtractor.extract(channel, request.path(), px, request.frameIntervalS(),
                request.pathWidthUm(), px, progress);
    }

    private static int firstFrameAtOrAfter(double timeS, double frameIntervalS, int frames) {
        int f = (int) Math.ceil(timeS / frameIntervalS - 1e-9);
        return Math.max(0, Math.min(frames, f));
    }
}
