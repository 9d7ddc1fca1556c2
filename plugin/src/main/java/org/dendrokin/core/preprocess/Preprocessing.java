package org.dendrokin.core.preprocess;

import java.util.ArrayList;
import java.util.List;
import java.util.Locale;

import org.dendrokin.core.Checks;
import org.dendrokin.core.kymo.Kymograph;

/**
 * From a raw intensity kymograph to dF/F0, in this order: subtract the background of each frame; find the
 * stimulus (given, or detected by {@link StimulusDetector} on the background-subtracted signal); choose the
 * baseline frames (given, or every frame before the stimulus); correct photobleaching
 * ({@link BleachCorrection}, optional); F0 and dF/F0 ({@link DeltaF}).
 */
public final class Preprocessing {
    private Preprocessing() {
    }

    /**
     * What the user fixed in session.json; null means "work it out from the data".
     *
     * @param stimulusTimeS      stimulus time, s, or null
     * @param stimulusPositionUm stimulus position along the path, um, or null
     * @param baselineFrames     {first, last} 0-based inclusive, or null
     * @param bleachCorrection   false to switch the bleaching correction off
     */
    public record Options(Double stimulusTimeS, Double stimulusPositionUm, int[] baselineFrames,
            boolean bleachCorrection) {
        public Options {
            baselineFrames = baselineFrames == null ? null : baselineFrames.clone();
        }

        @Override
        public int[] baselineFrames() {
            return baselineFrames == null ? null : baselineFrames.clone();
        }
    }

    /**
     * The stimulus used for the analysis.
     *
     * @param timeS      s, or NaN when none was given or found
     * @param positionUm um along the path, or NaN
     * @param source     "session.json", "detected" or "none"
     * @param detection  the detector's result (also when the user gave the values), or null if not run
     */
    public record Stimulus(double timeS, double positionUm, String source, StimulusDetector.Detection detection) {
        public boolean known() {
            return Double.isFinite(timeS) && Double.isFinite(positionUm);
        }
    }

    /**
     * @param backgroundSubtracted intensity minus background
     * @param bleach               the bleaching correction's result
     * @param deltaF               dF/F0 and its baseline noise
     * @param stimulus             the stimulus used
     * @param baselineFirst        first baseline frame, inclusive
     * @param baselineLast         last baseline frame, inclusive
     * @param warnings             plain sentences
     */
    public record Result(Kymograph backgroundSubtracted, BleachCorrection.Result bleach, DeltaF.Result deltaF,
            Stimulus stimulus, int baselineFirst, int baselineLast, List<String> warnings) {
    }

    /**
     * @param raw        raw intensity kymograph. Not modified.
     * @param background background of each frame, in the movie's grey values, length {@code raw.frameCount()}.
     *                   Not modified.
     * @param options    what session.json fixed
     */
    public static Result run(Kymograph raw, double[] background, Options options) {
        return run(raw, background, null, options);
    }

    /**
     * As {@link #run(Kymograph, double[], Options)}, with a background that also varies along the path: the
     * sample at frame f and position p has background {@code background[f] + alongPath[p]}.
     *
     * @param alongPath background added at each position, grey values, or null for none. Not modified.
     */
    public static Result run(Kymograph raw, double[] background, double[] alongPath, Options options) {
        int nt = raw.frameCount();
        int nx = raw.positionCount();
        Checks.require(background.length == nt, "one background value per frame is needed");
        Checks.require(alongPath == null || alongPath.length == nx, "one background value per position is needed");
        List<String> warnings = new ArrayList<>();
        double[] v = raw.values();
        for (int f = 0; f < nt; f++) {
            for (int p = 0; p < nx; p++) {
                v[f * nx + p] -= background[f] + (alongPath == null ? 0 : alongPath[p]);
            }
        }
        Kymograph subtracted = raw.withValues(v, raw.signalUnit());

        StimulusDetector.Detection detection = null;
        double t0 = options.stimulusTimeS() == null ? Double.NaN : options.stimulusTimeS();
        double x0 = options.stimulusPositionUm() == null ? Double.NaN : options.stimulusPositionUm();
        String source = "session.json";
        if (options.stimulusTimeS() == null || options.stimulusPositionUm() == null) {
            detection = StimulusDetector.detect(subtracted);
            if (detection.found()) {
                source = options.stimulusTimeS() == null && options.stimulusPositionUm() == null ? "detected"
                        : "session.json and detected";
                t0 = Double.isNaN(t0) ? detection.timeS() : t0;
                x0 = Double.isNaN(x0) ? detection.positionUm() : x0;
            } else {
                source = "none";
                warnings.add(detection.describe() + " The spread measures need a stimulus; give it in session.json "
                        + "as \"stimulus\": {\"time_s\": ..., \"position_um\": ...}.");
                t0 = Double.NaN;
                x0 = Double.NaN;
            }
        }
        if (Double.isFinite(t0) && (t0 < raw.timeS(0) || t0 > raw.timeS(nt - 1))) {
            warnings.add(String.format(Locale.ROOT, "The stimulus time %.3g s lies outside the movie (%.3g to %.3g s).",
                    t0, raw.timeS(0), raw.timeS(nt - 1)));
        }
        Stimulus stimulus = new Stimulus(t0, x0, source, detection);

        int firstResponse = nt;
        if (Double.isFinite(t0)) {
            firstResponse = raw.firstFrameAtOrAfter(t0);
        }
        int b0;
        int b1;
        int[] given = options.baselineFrames();
        if (given != null) {
            Checks.require(given[0] >= 0 && given[0] <= given[1] && given[1] < nt,
                    "baseline_frames [" + given[0] + ", " + given[1] + "] must lie within frames 0 to " + (nt - 1));
            b0 = given[0];
            b1 = given[1];
        } else if (firstResponse >= 1 && firstResponse < nt) {
            b0 = 0;
            b1 = firstResponse - 1;
        } else {
            b0 = 0;
            b1 = nt - 1;
            warnings.add("No frame before the stimulus is available, so F0 is the median of every frame; dF/F0 is then "
                    + "relative to the movie's typical level rather than a true baseline.");
        }
        if (b1 - b0 + 1 < 5) {
            warnings.add(String.format(Locale.ROOT, "Only %d baseline frames were available for F0; the baseline and "
                    + "its noise level are uncertain.", b1 - b0 + 1));
        }

        BleachCorrection.Result bleach;
        if (options.bleachCorrection()) {
            bleach = BleachCorrection.correct(subtracted, b0, b1, firstResponse);
            warnings.addAll(bleach.warnings());
        } else {
            double[] nan = new double[nt];
            java.util.Arrays.fill(nan, Double.NaN);
            bleach = new BleachCorrection.Result(subtracted, false, null, raw.timesS(), nan, nan, 0, List.of());
        }
        DeltaF.Result deltaF = DeltaF.compute(bleach.corrected(), b0, b1);
        if (deltaF.unusable() > 0) {
            warnings.add(String.format(Locale.ROOT, "At %d of %d positions the baseline intensity after background "
                    + "subtraction was zero or negative, so dF/F0 is undefined there (left empty); the background may "
                    + "be set too high.", deltaF.unusable(), nx));
        }
        return new Result(subtracted, bleach, deltaF, stimulus, b0, b1, warnings);
    }
}
