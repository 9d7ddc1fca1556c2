package org.dendrokin.core.analysis;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.function.UnaryOperator;

import org.dendrokin.core.Progress;
import org.dendrokin.core.fit.FitData;
import org.dendrokin.core.fit.FitModel;
import org.dendrokin.core.fit.FitResult;
import org.dendrokin.core.fit.InputUncertainty;
import org.dendrokin.core.fit.ModelFit;
import org.dendrokin.core.fit.ParameterEstimate;
import org.dendrokin.core.fit.ResidualBleaching;
import org.dendrokin.core.fit.TreeFitModel;
import org.dendrokin.core.kymo.Extraction;
import org.dendrokin.core.kymo.FrameSource;
import org.dendrokin.core.kymo.Kymograph;
import org.dendrokin.core.kymo.KymographExtractor;
import org.dendrokin.core.model.SolverSettings;
import org.dendrokin.core.model.Stimulus;
import org.dendrokin.core.model.TreeDomain;
import org.dendrokin.core.model.TreeGeometry;
import org.dendrokin.core.model.TreeStimulus;
import org.dendrokin.core.path.DendritePath;
import org.dendrokin.core.preprocess.BleachCorrection;
import org.dendrokin.core.preprocess.DeltaF;
import org.dendrokin.core.preprocess.Preprocessing;
import org.dendrokin.core.units.Unit;

/**
 * The branched part of a session with several lines (after {@link SessionAnalysis} has analysed the main line):
 * one dF/F0 kymograph a line, read along the line as drawn with the main analysis' background, baseline frames and
 * bleaching time constant; one fit of the diffusion-decay model to all branches at once on the tree the lines form
 * ({@link TreeFitModel}: shared D and k, an amplitude and a baseline a branch, the stimulus held where the main line's
 * closed-form fit put it); and, for each line other than the main one, the signal that entered it against the
 * model's prediction.
 * <p>
 * The signal that entered a line is its dF/F0 above the fitted baseline summed along the line (dF/F0 um), over time.
 * The model's value is the same sum of the engine's prediction scaled by the amplitude of the branch that holds the
 * stimulus; their ratio is the least-squares scale of the one time course to the other. A dye that fills the cell
 * evenly has one amplitude everywhere in dF/F0, so a ratio far from 1 says that more or less entered the side branch
 * than diffusion through the tree carries there.
 */
public final class TreeSessionAnalysis {
    /** The model fitted on the tree. */
    public static final String MODEL = "diffusion-decay";

    private TreeSessionAnalysis() {
    }

    /**
     * The signal that entered one line.
     *
     * @param line        the line
     * @param distanceUm  distance along the tree from the stimulus to the nearest point of the line, um
     * @param dataPeak    the data's baseline-corrected sum along the line (dF/F0 um), averaged over the five frames
     *                    around the model's peak
     * @param modelPeak   the peak of the same sum for the model with the stimulated branch's amplitude, dF/F0 um
     * @param ratio       data over model: the least-squares scale of the model's sum to the data's over all frames,
     *                    sum_f d_f m_f / sum_f m_f^2
     * @param peakTimeS   time of the model's peak, s
     */
    public record Entered(String line, double distanceUm, double dataPeak, double modelPeak, double ratio,
            double peakTimeS) {
    }

    /**
     * @param layout      how the lines form a tree
     * @param kymographs  dF/F0 kymograph of each line, by line name, main line first
     * @param noiseSd     typical baseline noise SD of each line's dF/F0
     * @param fit         the joint fit, or null when it could not be made (see warnings)
     * @param model       the fitted model's prediction per line (dF/F0, with each branch's own amplitude and
     *                    baseline), or empty
     * @param entered     per line other than the main one
     * @param stimulus    the stimulus on the tree: branch and position along it, um
     * @param warnings    plain sentences
     */
    public record Result(BranchedPaths layout, Map<String, Kymograph> kymographs, Map<String, Double> noiseSd,
            FitResult fit, Map<String, Kymograph> model, List<Entered> entered, TreeStimulus stimulus,
            List<String> warnings) {
        public Result {
            kymographs = java.util.Collections.unmodifiableMap(new LinkedHashMap<>(kymographs));
            noiseSd = java.util.Collections.unmodifiableMap(new LinkedHashMap<>(noiseSd));
            model = java.util.Collections.unmodifiableMap(new LinkedHashMap<>(model));
            entered = List.copyOf(entered);
            warnings = List.copyOf(warnings);
        }
    }

    /**
     * Runs the branched part.
     *
     * @param frames      the analysed movie channel
     * @param paths       the lines, main first (the main one is the path of {@code main})
     * @param layout      their tree ({@link BranchedPaths#join})
     * @param pixelSizeUm pixel size, um
     * @param frameIntervalS frame interval, s
     * @param widthUm     width of the band averaged across each line, um
     * @param bleach      whether to correct bleaching, as for the main line
     * @param main        the main line's analysis
     * @param progress    progress and cancellation
     */
    public static Result run(FrameSource frames, Map<String, DendritePath> paths, BranchedPaths layout,
            double pixelSizeUm, double frameIntervalS, double widthUm, boolean bleach, AnalysisResult main,
            Progress progress) {
        List<String> warnings = new ArrayList<>();
        Preprocessing.Stimulus stim = main.stimulus();
        String mainLine = layout.lines().get(0);
        if (main.motion().corrected()) {
            warnings.add("The branches were read along the lines as drawn; motion correction applies to the main "
                    + "line's own analysis only.");
        }
        TreeGeometry tree = layout.tree();
        Map.Entry<String, Double> origin = stim.known() ? layout.locate(mainLine, stim.positionUm()) : null;
        AnalysisResult.Background bg = main.background();
        double[] perFrame = bg.alongPath() == null ? bg.perFrame()
                : SessionAnalysis.constant(bg.value(), frames.frameCount());
        if (bg.alongPath() != null) {
            warnings.add(String.format(Locale.ROOT, "The branches' background is the main line's median background "
                    + "beside the path, %.1f grey values, at every position.", bg.value()));
        }
        // Bleaching is a property of the dye and the light, the same on every line: each line is corrected with the
        // main line's fitted bleaching (a side line's own fit would rest on its baseline frames alone).
        BleachCorrection.Result mainBleach = main.preprocessing().bleach();
        BleachCorrection.Result used = bleach && mainBleach.applied() ? mainBleach : null;
        int b0 = main.preprocessing().baselineFirst();
        int b1 = main.preprocessing().baselineLast();
        Map<String, Kymograph> kymos = new LinkedHashMap<>();
        Map<String, Double> noise = new LinkedHashMap<>();
        // each line's dF/F0 with the background raised by its uncertainty, for the fit's intervals
        Map<String, Kymograph> raised = new LinkedHashMap<>();
        double bgSd = bg.hasUncertainty() ? bg.uncertainty() : Double.NaN;
        for (String line : layout.lines()) {
            progress.checkCancelled();
            Extraction e = KymographExtractor.extract(frames, paths.get(line), pixelSizeUm, frameIntervalS, widthUm,
                    pixelSizeUm, progress);
            DeltaF.Result pre = DeltaF.compute(bleachCorrected(e.kymograph(), perFrame, used), b0, b1);
            kymos.put(line, pre.kymograph());
            noise.put(line, pre.typicalNoiseSd());
            if (Double.isFinite(bgSd)) {
                double[] higher = perFrame.clone();
                for (int f = 0; f < higher.length; f++) {
                    higher[f] += bgSd;
                }
                try {
                    raised.put(line, DeltaF.compute(bleachCorrected(e.kymograph(), higher, used), b0, b1)
                            .kymograph());
                } catch (IllegalArgumentException ex) {
                    // a background raised this far leaves no signal on this line: its uncertainty is not carried
                    raised.clear();
                    bgSd = Double.NaN;
                }
            }
        }
        if (origin == null) {
            warnings.add("The tree was not fitted: the stimulus time and position are not known.");
            return new Result(layout, kymos, noise, null, Map.of(), List.of(), null, warnings);
        }
        FitResult closed = main.fitResults().stream().filter(f -> f.model().equals(MODEL) && f.converged())
                .findFirst().orElse(null);
        if (closed == null) {
            warnings.add("The tree was not fitted: it starts from the main line's " + MODEL + " fit, which did not "
                    + "converge or was not made.");
            return new Result(layout, kymos, noise, null, Map.of(), List.of(), null, warnings);
        }
        double d = value(closed, "D");
        double k = value(closed, "k");
        double width = value(closed, "width");
        double t0 = closed.estimate("stimulus_time").map(ParameterEstimate::value).orElse(stim.timeS());
        double x0 = closed.estimate("position").map(ParameterEstimate::value).orElse(stim.positionUm());
        Kymograph first = kymos.get(mainLine);
        x0 = Math.max(0, Math.min(x0, layout.cutsUm(mainLine)[layout.cutsUm(mainLine).length - 1]));
        Map.Entry<String, Double> at = layout.locate(mainLine, x0);
        TreeStimulus stimulus = new TreeStimulus(at.getKey(), Stimulus.pulse(Math.max(0, t0), at.getValue(),
                width, 1.0));

        // data per branch: each line's columns split at its cuts
        Map<String, double[]> positions = new LinkedHashMap<>();
        Map<String, Kymograph> data = byBranch(layout, kymos, positions);
        Map<String, Double> sigmas = new LinkedHashMap<>();
        for (String line : layout.lines()) {
            for (String piece : layout.branchesOf(line)) {
                if (data.containsKey(piece)) {
                    sigmas.put(piece, noise.get(line) > 0 ? noise.get(line) : 1.0);
                }
            }
        }
        double h = Math.min(first.distanceStepUm(), width / 3);
        double frame = Math.max(first.timeStepS(), 1e-6);
        double dt = SolverSettings.DEFAULT.maxStep(2 * k, h, 2 * d, Math.max(width, h));
        dt = Math.max(Math.min(dt, frame / 2), frame / 10);
        FitResult fit;
        TreeFitModel model;
        double[] pointTimes;
        boolean residual = used != null;
        double baselineMidS = 0.5 * (first.timeS(b0) + first.timeS(b1));
        try {
            model = new TreeFitModel(MODEL, new TreeDomain(tree, h), first.timesS(), positions, List.of(stimulus), dt,
                    Unit.DF_F0);
            FitData fitData = model.data(data, sigmas);
            if (!raised.isEmpty()) {
                fitData = fitData.withInputUncertainty(backgroundShifts(layout, kymos, raised, model, sigmas,
                        first.distanceStepUm()));
            }
            double[] start = model.completeStart(new double[] {d, k}, fitData);
            pointTimes = pointTimes(first.timesS(), positions);
            // As for the main line: the bleaching correction's own error would otherwise end up in k; on a tree it
            // weighs more, since the far branches' small signal sits on that slow trend.
            FitModel fitted = residual ? new ResidualBleaching(model, pointTimes, 1, baselineMidS) : model;
            fit = ModelFit.fit(fitted, fitData, List.of(residual ? ResidualBleaching.start(start) : start),
                    ModelFit.Options.defaults().withProfiles(false), progress);
            double[] times = pointTimes;
            // The stimulus is held where the main line's fit put it, and that fit's uncertainty in it is carried into
            // the intervals as the background's is: the change of the prediction when each held value moves by its
            // standard error, at the fitted constants; the fit is then finished again with it (from its optimum).
            List<double[]> stimulusShifts = fit.converged() ? stimulusShifts(closed, layout, mainLine, tree, h,
                    first.timesS(), positions, dt, residual ? m -> new ResidualBleaching(m, times, 1, baselineMidS)
                    : m -> m, fitted, fit.values(), x0, t0, width) : List.of();
            if (!stimulusShifts.isEmpty()) {
                InputUncertainty before = fitData.inputUncertainty();
                List<double[]> all = new ArrayList<>(before == null ? List.of() : before.shifts());
                all.addAll(stimulusShifts);
                FitData withStimulus = fitData.withInputUncertainty(new InputUncertainty(
                        before == null ? "stimulus" : before.source() + "+stimulus", all));
                fit = ModelFit.fit(fitted, withStimulus, List.of(fit.values()),
                        ModelFit.Options.defaults().withProfiles(false), progress);
            }
        } catch (IllegalArgumentException e) {
            warnings.add("The tree could not be fitted: " + e.getMessage() + ".");
            return new Result(layout, kymos, noise, null, Map.of(), List.of(), stimulus, warnings);
        }
        if (!fit.converged()) {
            warnings.add("The fit of " + MODEL + " to all branches did not converge (" + fit.reason() + ").");
            return new Result(layout, kymos, noise, fit, Map.of(), List.of(), stimulus, warnings);
        }
        // the prediction without the residual bleaching, and the data with it removed
        double[] theta = Arrays.copyOf(fit.values(), model.parameters().size());
        double[] clean = new double[model.size()];
        model.evaluate(theta, clean, null);
        Map<String, Kymograph> predicted = model.kymographs(clean, Unit.DF_F0.symbol());
        if (residual) {
            double eps = value(fit, ResidualBleaching.PARAMETER);
            FitData raw = model.data(data, sigmas);
            double[] v = new double[model.size()];
            for (int i = 0; i < v.length; i++) {
                v[i] = (1 + raw.value(i)) * Math.exp(eps * (pointTimes[i] - baselineMidS)) - 1;
            }
            data = model.kymographs(v, Unit.DF_F0.symbol());
        }
        double stimAmp = value(fit, TreeFitModel.amplitudeName(stimulus.branch()));
        List<Entered> entered = new ArrayList<>();
        for (String line : layout.lines().subList(1, layout.lines().size())) {
            entered.add(entered(line, layout, data, predicted, fit, stimAmp, origin));
        }
        return new Result(layout, kymos, noise, fit, byLine(layout, predicted, kymos), entered, stimulus, warnings);
    }

    /**
     * The change of the fitted model's prediction (at the fitted constants {@code values}) when each stimulus value
     * held from the main line's fit (width, and time and place when that fit estimated them) moves by its standard
     * error: one shift each, on the tree fit's grid. Values without a finite standard error are left out.
     */
    private static List<double[]> stimulusShifts(FitResult closed, BranchedPaths layout, String mainLine,
            TreeGeometry tree, double h, double[] timesS, Map<String, double[]> positions, double dt,
            UnaryOperator<FitModel> wrap, FitModel fitted, double[] values, double x0, double t0,
            double width) {
        double[] base = new double[fitted.size()];
        fitted.evaluate(values, base, null);
        List<double[]> shifts = new ArrayList<>();
        double lastUm = layout.cutsUm(mainLine)[layout.cutsUm(mainLine).length - 1];
        for (String held : List.of("width", "stimulus_time", "position")) {
            double se = closed.estimate(held).map(ParameterEstimate::standardError).orElse(Double.NaN);
            if (!(se > 0 && Double.isFinite(se))) {
                continue;
            }
            double w = held.equals("width") ? width + se : width;
            double t = held.equals("stimulus_time") ? t0 + se : t0;
            double x = held.equals("position") ? Math.max(0, Math.min(x0 + se, lastUm)) : x0;
            Map.Entry<String, Double> at = layout.locate(mainLine, x);
            TreeFitModel moved = new TreeFitModel(MODEL, new TreeDomain(tree, h), timesS, positions,
                    List.of(new TreeStimulus(at.getKey(), Stimulus.pulse(Math.max(0, t), at.getValue(), w, 1.0))), dt,
                    Unit.DF_F0);
            double[] again = new double[fitted.size()];
            wrap.apply(moved).evaluate(values, again, null);
            double[] shift = new double[again.length];
            for (int i = 0; i < shift.length; i++) {
                double dv = again[i] - base[i];
                shift[i] = Double.isFinite(dv) ? dv : 0;
            }
            shifts.add(shift);
        }
        return shifts;
    }

    /**
     * Each line's kymograph split at its cuts into one kymograph per branch (branches with fewer than 2 columns are
     * left out); the branches' positions from their own start go into {@code positions} when it is not null.
     */
    private static Map<String, Kymograph> byBranch(BranchedPaths layout, Map<String, Kymograph> lines,
            Map<String, double[]> positions) {
        TreeGeometry tree = layout.tree();
        Map<String, Kymograph> out = new LinkedHashMap<>();
        for (String line : layout.lines()) {
            Kymograph kymo = lines.get(line);
            double[] cuts = layout.cutsUm(line);
            List<String> pieces = layout.branchesOf(line);
            for (int q = 0; q < pieces.size(); q++) {
                List<Integer> cols = new ArrayList<>();
                for (int p = 0; p < kymo.positionCount(); p++) {
                    double x = kymo.distanceUm(p);
                    boolean last = q == pieces.size() - 1;
                    if (x >= cuts[q] && (x < cuts[q + 1] || last && x <= cuts[q + 1] + 1e-9)) {
                        cols.add(p);
                    }
                }
                if (cols.size() < 2) {
                    continue;
                }
                double[] local = new double[cols.size()];
                double len = tree.branch(pieces.get(q)).lengthUm();
                for (int c = 0; c < local.length; c++) {
                    local[c] = Math.min(len, kymo.distanceUm(cols.get(c)) - cuts[q]);
                }
                double[] v = new double[kymo.frameCount() * local.length];
                for (int f = 0; f < kymo.frameCount(); f++) {
                    for (int c = 0; c < local.length; c++) {
                        v[f * local.length + c] = kymo.value(f, cols.get(c));
                    }
                }
                if (positions != null) {
                    positions.put(pieces.get(q), local);
                }
                out.put(pieces.get(q), new Kymograph(local, kymo.timesS(), v, kymo.signalUnit()));
            }
        }
        return out;
    }

    /**
     * The background's uncertainty on the tree fit's grid, as for a single path ({@code
     * SessionAnalysis.backgroundUncertainty}): the background's error is taken as independent from one stretch of
     * {@value SessionAnalysis#BACKGROUND_BLOCK_UM} um of a line to the next, and each stretch's shift is the change
     * of the dF/F0 there when the background is raised by its uncertainty (bleaching curve and baseline frames
     * held).
     *
     * @param lines  each line's dF/F0
     * @param raised each line's dF/F0 with the background raised by its uncertainty
     */
    private static InputUncertainty backgroundShifts(BranchedPaths layout, Map<String, Kymograph> lines,
            Map<String, Kymograph> raised, TreeFitModel model, Map<String, Double> sigmas, double stepUm) {
        int block = Math.max(1, (int) Math.round(SessionAnalysis.BACKGROUND_BLOCK_UM / stepUm));
        List<double[]> shifts = new ArrayList<>();
        for (String line : layout.lines()) {
            Kymograph base = lines.get(line);
            Kymograph up = raised.get(line);
            int nx = base.positionCount();
            int nt = base.frameCount();
            for (int from = 0; from < nx; from += block) {
                Map<String, Kymograph> moved = new LinkedHashMap<>();
                for (String other : layout.lines()) {
                    Kymograph k = lines.get(other);
                    double[] v = new double[k.frameCount() * k.positionCount()];
                    if (other.equals(line)) {
                        for (int f = 0; f < nt; f++) {
                            for (int p = from; p < Math.min(nx, from + block); p++) {
                                double d = up.value(f, p) - base.value(f, p);
                                v[f * nx + p] = Double.isFinite(d) ? d : 0;
                            }
                        }
                    }
                    moved.put(other, new Kymograph(k.distancesUm(), k.timesS(), v, k.signalUnit()));
                }
                Map<String, Kymograph> pieces = byBranch(layout, moved, null);
                pieces.keySet().retainAll(sigmas.keySet());
                double[] shift = model.data(pieces, sigmas).values();
                boolean any = false;
                for (double d : shift) {
                    any |= d != 0;
                }
                if (any) {
                    shifts.add(shift);
                }
            }
        }
        return new InputUncertainty("background", shifts);
    }

    /** The frame time of every point of a tree fit's grid (per branch, frame by frame, its positions). */
    private static double[] pointTimes(double[] timesS, Map<String, double[]> positions) {
        int total = 0;
        for (double[] x : positions.values()) {
            total += x.length * timesS.length;
        }
        double[] out = new double[total];
        int i = 0;
        for (double[] x : positions.values()) {
            for (double t : timesS) {
                for (int q = 0; q < x.length; q++) {
                    out[i++] = t;
                }
            }
        }
        return out;
    }

    /**
     * Intensity minus the background of each frame, divided by the main line's bleaching b(t): exp(-(t - t_first) /
     * tau), or f exp(-(t - t_first) / tau1) + (1 - f) exp(-(t - t_first) / tau2) when it was corrected in two phases;
     * none when {@code bleach} is null.
     */
    private static Kymograph bleachCorrected(Kymograph raw, double[] background, BleachCorrection.Result bleach) {
        int nx = raw.positionCount();
        double[] v = raw.values();
        for (int f = 0; f < raw.frameCount(); f++) {
            double u = raw.timeS(f) - raw.timeS(0);
            double b = bleach == null ? 1 : bleach.fastPhase() == null
                    ? Math.exp(-u / bleach.timeConstant().value())
                    : bleach.fastPhase().fraction() * Math.exp(-u / bleach.fastPhase().timeConstant().value())
                            + (1 - bleach.fastPhase().fraction()) * Math.exp(-u / bleach.timeConstant().value());
            for (int p = 0; p < nx; p++) {
                v[f * nx + p] = (v[f * nx + p] - background[f]) / b;
            }
        }
        return raw.withValues(v, raw.signalUnit());
    }

    /** The model's prediction per line, put back together from its branches (NaN where no branch had data). */
    private static Map<String, Kymograph> byLine(BranchedPaths layout, Map<String, Kymograph> predicted,
            Map<String, Kymograph> kymos) {
        Map<String, Kymograph> out = new LinkedHashMap<>();
        for (String line : layout.lines()) {
            Kymograph kymo = kymos.get(line);
            double[] cuts = layout.cutsUm(line);
            List<String> pieces = layout.branchesOf(line);
            int nx = kymo.positionCount();
            double[] v = new double[kymo.frameCount() * nx];
            Arrays.fill(v, Double.NaN);
            for (int q = 0; q < pieces.size(); q++) {
                Kymograph m = predicted.get(pieces.get(q));
                if (m == null) {
                    continue;
                }
                int firstCol = 0;
                while (firstCol < nx && kymo.distanceUm(firstCol) < cuts[q]) {
                    firstCol++;
                }
                for (int f = 0; f < kymo.frameCount(); f++) {
                    for (int c = 0; c < m.positionCount() && firstCol + c < nx; c++) {
                        v[f * nx + firstCol + c] = m.value(f, c);
                    }
                }
            }
            out.put(line, kymo.withValues(v, kymo.signalUnit()));
        }
        return out;
    }

    private static Entered entered(String line, BranchedPaths layout, Map<String, Kymograph> data,
            Map<String, Kymograph> predicted, FitResult fit, double stimAmp, Map.Entry<String, Double> origin) {
        TreeGeometry tree = layout.tree();
        int frames = -1;
        double[] dataSum = null;
        double[] modelSum = null;
        double distance = Double.POSITIVE_INFINITY;
        for (String b : layout.branchesOf(line)) {
            Kymograph y = data.get(b);
            Kymograph m = predicted.get(b);
            if (y == null || m == null) {
                continue;
            }
            double amp = value(fit, TreeFitModel.amplitudeName(b));
            double base = value(fit, TreeFitModel.baselineName(b));
            if (dataSum == null) {
                frames = y.frameCount();
                dataSum = new double[frames];
                modelSum = new double[frames];
            }
            double step = y.distanceStepUm();
            for (int f = 0; f < frames; f++) {
                for (int q = 0; q < y.positionCount(); q++) {
                    double v = y.value(f, q);
                    if (Double.isFinite(v)) {
                        dataSum[f] += (v - base) * step;
                    }
                    // the engine's u is (prediction - baseline) / amplitude
                    modelSum[f] += (m.value(f, q) - base) / amp * stimAmp * step;
                }
            }
            for (double end : new double[] {0, tree.branch(b).lengthUm()}) {
                distance = Math.min(distance, tree.distanceUm(origin.getKey(), origin.getValue(), b, end));
            }
        }
        if (dataSum == null) {
            return new Entered(line, distance, Double.NaN, Double.NaN, Double.NaN, Double.NaN);
        }
        // at the model's peak (a maximum over noisy frames would be biased upwards), averaged over five frames
        int peak = 0;
        for (int f = 1; f < frames; f++) {
            if (modelSum[f] > modelSum[peak]) {
                peak = f;
            }
        }
        double sum = 0;
        int used = 0;
        for (int f = Math.max(0, peak - 2); f <= Math.min(frames - 1, peak + 2); f++) {
            sum += dataSum[f];
            used++;
        }
        double dm = 0;
        double mm = 0;
        for (int f = 0; f < frames; f++) {
            dm += dataSum[f] * modelSum[f];
            mm += modelSum[f] * modelSum[f];
        }
        return new Entered(line, distance, sum / used, modelSum[peak], mm > 0 ? dm / mm : Double.NaN,
                firstPresent(layout, line, data).timeS(peak));
    }

    private static Kymograph firstPresent(BranchedPaths layout, String line, Map<String, Kymograph> data) {
        for (String b : layout.branchesOf(line)) {
            if (data.get(b) != null) {
                return data.get(b);
            }
        }
        throw new IllegalStateException("no data on " + line);
    }

    private static double value(FitResult f, String name) {
        return f.estimate(name).map(ParameterEstimate::value).orElse(Double.NaN);
    }
}
