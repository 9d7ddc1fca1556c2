package org.dendrokin.core.analysis;

import java.util.List;
import java.util.Optional;

import org.dendrokin.core.fit.FitResult;
import org.dendrokin.core.fit.KymographFits;
import org.dendrokin.core.kymo.Extraction;
import org.dendrokin.core.kymo.Kymograph;
import org.dendrokin.core.motion.MotionTrace;
import org.dendrokin.core.preprocess.Preprocessing;
import org.dendrokin.core.spread.SpreadAnalysis;

/**
 * Everything one analysis found, as typed values. Every output (results.json, the report, the pictures, the
 * ImageJ tables, the terminal summary, the batch table) is written from this one record, so that they cannot
 * disagree.
 *
 * @param movie          the analysed channel's size and the sizes used
 * @param extraction     the raw kymograph along the path and the sample centres
 * @param background     the background subtracted, frame by frame, and how it was found
 * @param referenceImage mean of up to 10 baseline frames, row-major, {@code width x height} values (shared)
 * @param preprocessing  background subtraction, stimulus, baseline, bleaching correction and dF/F0
 * @param calibrated     the signal after the calibration (dF/F0 when there is none)
 * @param spread         model-free spread measures, or null when no stimulus is known
 * @param fits           the model fits and their comparison, or null when none could run
 * @param skipped        default models that were not fitted because the data do not call for them
 * @param headline       the numbers shown first
 * @param motion         what was done about motion, and the measured shifts
 * @param normalisation  normalisation by a structural channel, if any
 * @param stimuli        each stimulus (trains merged) with the spread measured over its own window; the first is
 *                       the one of {@code spread}; empty when no stimulus is known
 * @param warnings       plain sentences, in the order they arose
 */
public record AnalysisResult(Movie movie, Extraction extraction, Background background, float[] referenceImage,
                             Preprocessing.Result preprocessing, CalibrationStage.Calibrated calibrated,
                             SpreadAnalysis.Result spread, KymographFits.Outcome fits, List<SkippedModel> skipped,
                             Headline headline, Motion motion, Normalisation normalisation,
                             List<StimulusOutcome> stimuli, List<Warning> warnings) {
    public AnalysisResult {
        skipped = List.copyOf(skipped);
        stimuli = List.copyOf(stimuli);
        warnings = List.copyOf(warnings);
    }

    /**
     * Motion of the specimen.
     *
     * @param mode  what the analysis was asked to do
     * @param trace the measured shift of every frame, or null when not measured
     */
    public record Motion(MotionMode mode, MotionTrace trace) {
        /** True when the kymographs were taken along the moving path. */
        public boolean corrected() {
            return mode == MotionMode.CORRECT && trace != null;
        }
    }

    /**
     * One stimulus and its spread.
     *
     * @param stimulus   where and when, with the spot's distance off the path and the pulses of a train
     * @param spread     the spread measured from this stimulus to the next, or null when it could not be
     * @param firstFrame first frame of the window measured (inclusive)
     * @param endFrame   end of the window (exclusive)
     */
    public record StimulusOutcome(ResolvedStimulus stimulus, SpreadAnalysis.Result spread, int firstFrame,
                                  int endFrame) {
    }

    /**
     * The analysed channel as the analysis saw it.
     *
     * @param widthPx        frame width, pixels
     * @param heightPx       frame height, pixels
     * @param frameCount     number of frames
     * @param pixelSizeUm    pixel size used, um
     * @param frameIntervalS frame interval used, s
     * @param pathLengthUm   length of the path, um
     * @param pathWidthUm    width of the band averaged across the path, um
     * @param linePeriodS    time between scan lines of a raster scan, s, or 0 when every pixel of a frame counts as
     *                       taken at the frame's time
     */
    public record Movie(int widthPx, int heightPx, int frameCount, double pixelSizeUm, double frameIntervalS,
                        double pathLengthUm, double pathWidthUm, double linePeriodS) {
        /** A movie whose frames count as taken at one instant each. */
        public Movie(int widthPx, int heightPx, int frameCount, double pixelSizeUm, double frameIntervalS,
                     double pathLengthUm, double pathWidthUm) {
            this(widthPx, heightPx, frameCount, pixelSizeUm, frameIntervalS, pathLengthUm, pathWidthUm, 0);
        }
    }

    /**
     * The background subtracted: {@code perFrame[f] + alongPath[p]} at frame f and position p.
     *
     * @param perFrame    grey value of each frame
     * @param alongPath   grey value added at each position along the path, or null when the background is the same
     *                    all along
     * @param value       a representative value (the given one, the estimate, or the median over frames)
     * @param uncertainty standard deviation of the background's error under the path, grey values, when it was
     *                    estimated from the data (the spread of the background across the field); NaN when the
     *                    value or region was given
     * @param description one or two sentences for the report
     */
    public record Background(double[] perFrame, double[] alongPath, double value, double uncertainty,
                             String description) {
        public Background {
            perFrame = perFrame.clone();
            alongPath = alongPath == null ? null : alongPath.clone();
        }

        /** One level for every position. */
        public Background(double[] perFrame, double value, String description) {
            this(perFrame, null, value, Double.NaN, description);
        }

        /** True when the background was estimated from the data and its uncertainty is known. */
        public boolean hasUncertainty() {
            return Double.isFinite(uncertainty) && uncertainty > 0;
        }

        @Override
        public double[] perFrame() {
            return perFrame.clone();
        }

        @Override
        public double[] alongPath() {
            return alongPath == null ? null : alongPath.clone();
        }
    }

    /** The analysed signal (dF/F0 or concentration). */
    public Kymograph signal() {
        return calibrated.signal();
    }

    /** The stimulus used. */
    public Preprocessing.Stimulus stimulus() {
        return preprocessing.stimulus();
    }

    /** The preferred model by the chosen criterion, or null. */
    public String bestModel() {
        return headline.bestModel();
    }

    /** The fits in the order asked, or an empty list when none ran. */
    public List<FitResult> fitResults() {
        return fits == null ? List.of() : fits.fits();
    }

    /** The preferred fit, if one converged. */
    public Optional<FitResult> bestFit() {
        return fits == null ? Optional.empty() : fits.best();
    }

    /** The warnings' sentences, in order. */
    public List<String> warningTexts() {
        return warnings.stream().map(Warning::text).toList();
    }
}
