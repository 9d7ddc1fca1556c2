package org.dendrokin.core.spines;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.Comparator;
import java.util.List;
import java.util.Locale;

import org.dendrokin.core.Progress;
import org.dendrokin.core.fit.FitResult;
import org.dendrokin.core.fit.ParameterEstimate;
import org.dendrokin.core.kymo.Kymograph;
import org.dendrokin.core.preprocess.Robust;

/**
 * Spines beside the shaft, from a session's movie and its analysed kymograph: heads found in the reference image
 * ({@link SpineDetector}) or given; each head's dF/F0 in every frame (the mean of a disc of the head radius, minus
 * the frame's background, divided by the same bleaching curve as the shaft, over its median in the same baseline
 * frames); the shaft's dF/F0 along the path near it (the kymograph's columns, averaged with Gaussian weights;
 * {@link ShaftDriver}); model-free measures of the head's response (peak, time to peak, decay time, defined as
 * for the shaft); and a fit of the neck exchange between head and shaft ({@link NeckExchangeModel}, driven by the
 * shaft's measured signal at the neck's base, whose place along the path is fitted too), whose time constant is
 * reported with a 95% interval.
 *
 * <p>The stimulated spine. A spine within {@code stimulatedWithinUm} of the stimulus whose head rises above the
 * shaft at its base (its peak more than 3 noise standard deviations of the 3-frame average above the shaft's) may
 * have been stimulated itself: the fit then adds a jump of the head's own signal at the stimulus time that leaves
 * through the neck, and the spine counts as stimulated when the jump's 95% interval lies above zero. Its neck time
 * constant then comes mostly from how fast that jump decays.
 *
 * <p>The shaft's signal that drives the fit. The measured kymograph carries its own noise, and its columns are
 * averages along the path (the band, the optics, the driver's weights) that flatten a narrow pulse near the stimulus;
 * a noisy or flattened input biases tau_neck (errors in variables) and makes its interval too narrow. When the
 * session's fitted model describes the shaft's kymograph ({@link SpineInputs#shaftModel}), its prediction drives
 * the fits instead (its columns only interpolated, not averaged); the measured kymograph still gives the shaft's
 * time course in the outputs and the checks of whether the shaft responded.
 *
 * <p>What can be measured: the head follows the shaft with a lag of about tau_neck, so a tau_neck well below the
 * frame interval cannot be told from zero, and one at a spine whose shaft signal changes slowly (far from the
 * stimulus) is poorly determined; the interval says so. The model assumes the head's disc sees the head alone;
 * light from the shaft falling into it makes the head look faster.
 */
public final class SpineAnalysis {
    /** Noise standard deviations (of the 3-frame average) a response must reach to be fitted. */
    static final double RESPONSE_SD = 5;
    /** Noise standard deviations (of the 3-frame average) by which a stimulated head's peak exceeds the shaft's. */
    static final double ABOVE_SHAFT_SD = 3;
    /**
     * The prior sd of the neck base's offset along the path from the head's projection, as a fraction of the head's
     * distance from the path: tan(25 degrees), a neck leaving the shaft about 25 degrees from the perpendicular
     * [assumption: necks leave roughly perpendicular; stated in the guide].
     */
    static final double NECK_SLOPE_SD = 0.47;

    private SpineAnalysis() {
    }

    /**
     * Everything the spine analysis found.
     *
     * @param timesS           frame times, s
     * @param spines           the spines in order along the path
     * @param shaftDistanceUm  signed distance from the stimulus of each kymograph column, um (empty when the
     *                         stimulus is not known)
     * @param shaftPeakDeltaF  the shaft's peak dF/F0 at each column (3-frame average after the stimulus)
     * @param detection        how the heads were detected, or null when detection was off
     * @param pixelSizeUm      the movie's pixel size, um (the heads' places are in its pixels)
     * @param shaftDriver      what drove the neck fits: the fitted model's name, or empty for the measured kymograph
     * @param warnings         plain sentences
     */
    public record Result(double[] timesS, List<Spine> spines, double[] shaftDistanceUm, double[] shaftPeakDeltaF,
            SpineDetector.Detection detection, double pixelSizeUm, String shaftDriver, List<String> warnings) {
        public Result {
            timesS = timesS.clone();
            spines = List.copyOf(spines);
            shaftDistanceUm = shaftDistanceUm.clone();
            shaftPeakDeltaF = shaftPeakDeltaF.clone();
            warnings = List.copyOf(warnings);
        }

        @Override
        public double[] timesS() {
            return timesS.clone();
        }

        @Override
        public double[] shaftDistanceUm() {
            return shaftDistanceUm.clone();
        }

        @Override
        public double[] shaftPeakDeltaF() {
            return shaftPeakDeltaF.clone();
        }
    }

    /**
     * Runs the spine analysis.
     *
     * @param in       the session's movie, path, kymograph and how it was made
     * @param settings detection and fit settings
     * @param progress progress and cancellation
     * @throws Progress.CancelledException if the user cancelled
     */
    public static Result run(SpineInputs in, SpineSettings settings, Progress progress) {
        List<String> warnings = new ArrayList<>();
        int width = in.frames().width();
        int height = in.frames().height();
        double px = in.pixelSizeUm();
        Kymograph shaft = in.shaft();
        double[] times = shaft.timesS();

        SpineDetector.Detection detection = null;
        List<SpineSite> sites = new ArrayList<>(in.given());
        if (settings.detect()) {
            detection = SpineDetector.detect(in.referenceImage(), width, height, in.path(), px, in.pathWidthUm(),
                    settings);
            warnings.addAll(detection.warnings());
            for (SpineSite found : detection.sites()) {
                boolean near = in.given().stream().anyMatch(g -> Math.hypot(g.xPx() - found.xPx(),
                        g.yPx() - found.yPx()) * px < 2 * settings.headRadiusUm());
                if (!near) {
                    sites.add(found);
                }
            }
        }

        PathCoordinates coordinates = new PathCoordinates(in.path());
        List<Placed> placed = new ArrayList<>();
        for (SpineSite s : sites) {
            placed.add(new Placed(s, coordinates.locate(s.xPx(), s.yPx())));
        }
        placed.sort(Comparator.comparingDouble((Placed p) -> p.place[0]).thenComparingDouble(p -> p.place[1]));
        List<int[]> discs = new ArrayList<>();
        for (Placed p : placed) {
            discs.add(HeadTraces.disc(p.site.xPx(), p.site.yPx(), radiusPx(p.site, settings, px), width, height));
        }
        double[][] means = HeadTraces.means(in.frames(), discs, progress);

        double[] bleach = in.bleachPerFrame();
        if (bleach == null) {
            bleach = new double[times.length];
            Arrays.fill(bleach, 1);
        }
        double[] background = in.backgroundPerFrame();
        List<Spine> spines = new ArrayList<>();
        int unusable = 0;
        for (int i = 0; i < placed.size(); i++) {
            progress.checkCancelled();
            Placed p = placed.get(i);
            double[] head = deltaF(means[i], background, bleach, in.baselineFirst(), in.baselineLast());
            if (head == null) {
                unusable++;
                head = new double[times.length];
                Arrays.fill(head, Double.NaN);
            }
            double positionUm = p.place[0] * px;
            spines.add(measure(i + 1, p, radiusPx(p.site, settings, px) * px, positionUm, head, in, settings, times,
                    progress));
            progress.report("fitting spine necks", i + 1, placed.size());
        }
        if (unusable > 0) {
            warnings.add(String.format(Locale.ROOT, "%d spine head(s) were no brighter than the background in the "
                    + "baseline frames, so their dF/F0 is undefined (left empty).", unusable));
        }
        if (!in.stimulusKnown() && !spines.isEmpty()) {
            warnings.add("The stimulus is not known, so the spines have no distance from it, no peak, and no neck "
                    + "exchange fit; give \"stimulus\" in session.json.");
        }
        summarise(spines, times, warnings);

        double[] shaftD = new double[0];
        double[] shaftPeak = new double[0];
        if (in.stimulusKnown()) {
            int nx = shaft.positionCount();
            shaftD = new double[nx];
            shaftPeak = new double[nx];
            for (int p = 0; p < nx; p++) {
                shaftD[p] = shaft.distanceUm(p) - in.stimulusPositionUm();
                shaftPeak[p] = ResponseMeasures.of(times, shaft.column(p), in.stimulusTimeS()).peak();
            }
        }
        return new Result(times, spines, shaftD, shaftPeak, detection, px, in.shaftModelName(), warnings);
    }

    /** A site and its place relative to the path: arc length (pixels), signed distance (pixels), at an end. */
    private record Placed(SpineSite site, double[] place) {
    }

    private static double radiusPx(SpineSite site, SpineSettings settings, double px) {
        return Double.isNaN(site.radiusPx()) ? settings.headRadiusUm() / px : site.radiusPx();
    }

    /**
     * dF/F0 of one head: v_f = (mean_f - background_f) / bleach_f, F0 the median of v over the baseline frames,
     * dF/F0 = (v - F0) / F0; null when F0 is not positive.
     */
    static double[] deltaF(double[] mean, double[] background, double[] bleach, int first, int last) {
        int n = mean.length;
        double[] v = new double[n];
        for (int f = 0; f < n; f++) {
            v[f] = (mean[f] - background[f]) / bleach[f];
        }
        double f0 = Robust.median(Arrays.copyOfRange(v, first, last + 1));
        if (!(f0 > 0)) {
            return null;
        }
        for (int f = 0; f < n; f++) {
            v[f] = (v[f] - f0) / f0;
        }
        return v;
    }

    private static Spine measure(int id, Placed p, double radiusUm, double positionUm, double[] head, SpineInputs in,
            SpineSettings settings, double[] times, Progress progress) {
        double px = in.pixelSizeUm();
        Spine.Side side = p.place[1] < 0 ? Spine.Side.LEFT : Spine.Side.RIGHT;
        double offPathUm = Math.abs(p.place[1]) * px;
        double offsetSdUm = Math.max(offPathUm * NECK_SLOPE_SD, px);
        ShaftDriver driver = new ShaftDriver(in.shaft(), positionUm - 4 * offsetSdUm, positionUm + 4 * offsetSdUm,
                settings.shaftSmoothingUm());
        // A model carries no noise to average: its columns are only interpolated (weights of one column spacing).
        ShaftDriver fitDriver = in.shaftModel() == null ? driver : new ShaftDriver(in.shaftModel(),
                positionUm - 4 * offsetSdUm, positionUm + 4 * offsetSdUm,
                in.shaft().distanceStepUm() > 0 ? Math.min(settings.shaftSmoothingUm(), in.shaft().distanceStepUm())
                        : settings.shaftSmoothingUm());
        double[] base = new double[times.length];
        Arrays.fill(base, Double.NaN);
        if (driver.usable()) {
            driver.at(positionUm, base, null);
        }
        double noise = Robust.madSd(Arrays.copyOfRange(head, in.baselineFirst(), in.baselineLast() + 1));
        if (!in.stimulusKnown()) {
            return new Spine(id, p.site, radiusUm, positionUm, side, offPathUm, positionUm, Double.NaN, false, head,
                    base, noise, Double.NaN, Double.NaN, Double.NaN, null, "the stimulus is not known");
        }
        double distance = positionUm - in.stimulusPositionUm();
        ResponseMeasures response = ResponseMeasures.of(times, head, in.stimulusTimeS());
        ResponseMeasures shaftResponse = ResponseMeasures.of(times, base, in.stimulusTimeS());
        double baseNoise = Robust.madSd(Arrays.copyOfRange(base, in.baselineFirst(), in.baselineLast() + 1));
        double smoothedNoise = noise / Math.sqrt(3);
        boolean headResponds = response.peak() > RESPONSE_SD * smoothedNoise;
        boolean baseResponds = shaftResponse.peak() > RESPONSE_SD * baseNoise / Math.sqrt(3);
        boolean jumpPossible = Math.abs(distance) <= settings.stimulatedWithinUm()
                && response.peak() > shaftResponse.peak() + ABOVE_SHAFT_SD * smoothedNoise;
        String notFitted = "";
        FitResult fit = null;
        boolean stimulated = false;
        if (!(noise > 0)) {
            notFitted = "the head's dF/F0 is undefined or has no noise to weigh it by";
        } else if (!driver.usable()) {
            notFitted = "the kymograph has no values near the spine's base";
        } else if (!headResponds || !(baseResponds || jumpPossible)) {
            notFitted = "the head or the shaft at its base did not respond clearly above the noise";
        } else {
            if (jumpPossible) {
                FitResult withJump = NeckExchangeFit.fit(times, head, noise, fitDriver, positionUm, offsetSdUm,
                        in.stimulusTimeS(), settings.headDecayPerS(), true, settings.profiles(), progress);
                stimulated = withJump.converged() && withJump.estimate(NeckExchangeModel.JUMP)
                        .map(j -> j.ci95() != null && j.ci95().lower() > 0).orElse(false);
                fit = stimulated ? withJump : null;
            }
            if (fit == null) {
                fit = NeckExchangeFit.fit(times, head, noise, fitDriver, positionUm, offsetSdUm, in.stimulusTimeS(),
                        settings.headDecayPerS(), false, settings.profiles(), progress);
            }
        }
        double basePositionUm = positionUm;
        if (fit != null && fit.converged()) {
            basePositionUm = positionUm + fit.estimate(NeckExchangeModel.OFFSET).orElseThrow().value();
            driver.at(basePositionUm, base, null);
        }
        return new Spine(id, p.site, radiusUm, positionUm, side, offPathUm, basePositionUm, distance, stimulated, head,
                base, noise, response.peak(), headResponds ? response.timeToPeakS() : Double.NaN,
                headResponds ? response.decayTimeS() : Double.NaN, fit, notFitted);
    }

    /** Warnings that speak of the spines as a whole. */
    private static void summarise(List<Spine> spines, double[] times, List<String> warnings) {
        double dt = times.length > 1 ? (times[times.length - 1] - times[0]) / (times.length - 1) : Double.NaN;
        List<String> vague = new ArrayList<>();
        List<String> fast = new ArrayList<>();
        for (Spine s : spines) {
            if (s.exchange() == null) {
                continue;
            }
            ParameterEstimate tau = s.tauNeck().orElse(null);
            if (tau == null || !tau.identifiable()) {
                vague.add(Integer.toString(s.id()));
            } else if (tau.value() < dt) {
                fast.add(Integer.toString(s.id()));
            }
        }
        if (!vague.isEmpty()) {
            warnings.add(String.format(Locale.ROOT, "The neck time constant is not determined for spine%s %s: the "
                    + "shaft's signal at their base changes too little or too slowly for the head's lag to show, or "
                    + "the fit did not converge.", vague.size() > 1 ? "s" : "", String.join(", ", vague)));
        }
        if (!fast.isEmpty()) {
            warnings.add(String.format(Locale.ROOT, "The neck time constant of spine%s %s is shorter than the frame "
                    + "interval (%.3g s): exchange that fast is measurable only down to about the frame interval, so "
                    + "read it as an upper limit.", fast.size() > 1 ? "s" : "", String.join(", ", fast), dt));
        }
    }
}
