package org.dendrokin.io.compare;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Locale;

import org.dendrokin.core.Checks;
import org.dendrokin.core.Progress;
import org.dendrokin.core.fit.NoiseEstimate;
import org.dendrokin.core.kymo.Kymograph;
import org.dendrokin.core.model.Boundary;
import org.dendrokin.core.model.Domain;
import org.dendrokin.core.model.ModelCatalogue;
import org.dendrokin.core.model.ModelParameter;
import org.dendrokin.core.model.ScalarRun;
import org.dendrokin.core.model.SolverSettings;
import org.dendrokin.core.model.Stimulus;
import org.dendrokin.core.preprocess.Robust;
import org.dendrokin.core.preprocess.StimulusDetector;
import org.dendrokin.core.spread.SpreadAnalysis;

/**
 * A built-in model with the user's own parameters (no fitting) run on the grid of a measured kymograph and
 * set beside it: the simulated kymograph, the residual, its norm and root mean square, and the same model-free
 * spread measures on both. The one place this is computed: the ImageJ commands, the SciJava commands and the
 * command line's {@code compare} (through {@code io.fit.ModelComparisonRun}) all call it, so they cannot differ.
 */
public final class ModelComparison {
    private ModelComparison() {
    }

    /**
     * A model, its parameters and one stimulus pulse: the fields of the ImageJ and SciJava dialogs, which give
     * every one-species model its parameters by role: the diffusion coefficient, the rate, the threshold.
     *
     * @param model         a one-species model of the {@link ModelCatalogue}: "diffusion-decay", "nagumo" or
     *                      "fisher-kpp"
     * @param dUm2PerS      diffusion coefficient D, um^2/s (every parameter in um^2/s)
     * @param ratePerS      k (diffusion-decay, nagumo) or r (fisher-kpp), 1/s (every parameter in 1/s)
     * @param threshold     nagumo's a, dimensionless, 0..0.5 (every dimensionless parameter; ignored by the
     *                      models without one)
     * @param stimulusTimeS time of the pulse on the imaging clock, s
     * @param stimulusUm    position of the pulse along the path, um from the first vertex
     * @param widthUm       standard deviation of the pulse's Gaussian profile, um
     * @param amount        peak rise the pulse adds, signal unit
     * @param boundary      what happens at both ends of the path
     * @param gridUm        spacing of the simulation grid, um
     */
    public record Settings(String model, double dUm2PerS, double ratePerS, double threshold, double stimulusTimeS,
            double stimulusUm, double widthUm, double amount, Boundary boundary, double gridUm) {
        public Settings {
            requireScalar(model);
            Checks.positiveFinite(gridUm, "grid spacing (um)");
        }

        /** The parameter values in the order the model takes them, each from the field of its unit. */
        public double[] parameters() {
            List<ModelParameter> list = ModelCatalogue.scalar(model).parameters();
            double[] values = new double[list.size()];
            for (int i = 0; i < values.length; i++) {
                values[i] = switch (list.get(i).unit()) {
                    case DIFFUSION -> dUm2PerS;
                    case RATE -> ratePerS;
                    case DIMENSIONLESS -> threshold;
                    default -> throw new IllegalStateException("the dialogs have no field for parameter "
                            + list.get(i).name() + " of " + model);
                };
            }
            return values;
        }

        /** Parameter names and units, in the order of {@link #parameters()}. */
        public String[][] parameterLabels() {
            return ModelCatalogue.scalar(model).parameters().stream()
                    .map(p -> new String[] {p.name(), p.unit().symbol()}).toArray(String[][]::new);
        }
    }

    /**
     * A model with given parameters, in the kymograph's own coordinates: what both the ImageJ commands and the
     * command line's {@code compare} set beside a measured kymograph. The predicted signal is
     * {@code baseline + amplitude * u}.
     *
     * @param model      a one-species model of the {@link ModelCatalogue}: "diffusion-decay", "nagumo" or
     *                   "fisher-kpp"
     * @param parameters the model's parameters in the order of its catalogue entry
     * @param stimuli    the protocol; positions in um along the path (the kymograph's distances)
     * @param amplitude  signal per unit of u
     * @param baseline   signal at rest, signal unit
     * @param boundary   what happens at both ends of the path
     * @param gridUm     spacing of the simulation grid, um, or NaN for the kymograph's own spacing
     */
    public record GivenModel(String model, double[] parameters, List<Stimulus> stimuli, double amplitude,
            double baseline, Boundary boundary, double gridUm) {
        public GivenModel {
            requireScalar(model);
            Checks.require(!stimuli.isEmpty(), "give at least one stimulus");
            Checks.finite(amplitude, "amplitude");
            Checks.finite(baseline, "baseline");
            Checks.require(Double.isNaN(gridUm) || gridUm > 0 && Double.isFinite(gridUm),
                    "the grid spacing must be a positive number of um");
            parameters = parameters.clone();
            stimuli = List.copyOf(stimuli);
        }

        @Override
        public double[] parameters() {
            return parameters.clone();
        }
    }

    /**
     * When and where the data's own stimulus was, and how that was learnt: the measured spread is timed from
     * it, whatever model is set beside the data.
     *
     * @param timeS      stimulus time on the kymograph's clock, s
     * @param positionUm stimulus position, um along the path (the kymograph's distances)
     * @param source     how it was learnt, a phrase for the report ("results.json beside the kymograph", ...)
     */
    public record DataStimulus(double timeS, double positionUm, String source) {
        public DataStimulus {
            Checks.finite(timeS, "stimulus time (s)");
            Checks.finite(positionUm, "stimulus position (um)");
        }
    }

    /**
     * What a comparison produced. The measured spread depends on the data alone (timed from {@code data}, with
     * the data's own baseline); the simulated spread is timed from the model's first stimulus. {@code noiseSd}
     * is the data's baseline noise, used to read both; {@code mismatches} says, one sentence each, where the
     * model's stimulus or extent does not match the data's.
     */
    public record Comparison(Kymograph measured, Kymograph simulated, Kymograph residual, double rmse,
            double residualNorm, SpreadAnalysis.Result measuredSpread, SpreadAnalysis.Result simulatedSpread,
            double noiseSd, DataStimulus data, List<String> mismatches) {
        public Comparison {
            mismatches = List.copyOf(mismatches);
        }
    }

    /** As {@link #simulateOn(Kymograph, GivenModel, Progress)} for the commands' one-pulse settings. */
    public static Kymograph simulateOn(Kymograph grid, Settings s, Progress progress) {
        return simulateOn(grid, given(s), progress);
    }

    /**
     * Simulates the model on the grid of {@code grid}: the cable runs from the first to the last distance
     * (no-flux or fixed ends as set), sampled at each of the grid's distances and frame times.
     *
     * @return the simulated kymograph, in the grid's signal unit
     * @throws IllegalArgumentException for parameters or stimuli the engine cannot run (the message says which)
     */
    public static Kymograph simulateOn(Kymograph grid, GivenModel g, Progress progress) {
        double[] d = grid.distancesUm();
        double[] t = grid.timesS();
        double x0 = d[0];
        double length = d[d.length - 1] - x0;
        Checks.require(length > 0, "the kymograph must have at least two distinct distances");
        for (int i = 0; i < d.length; i++) {
            d[i] -= x0;
        }
        for (int i = 0; i < t.length; i++) {
            t[i] = Math.max(0, t[i]);
        }
        double dx = Double.isNaN(g.gridUm()) ? Math.min(grid.distanceStepUm(), length / 4) : g.gridUm();
        Domain domain = new Domain(length, Math.min(dx, length / 2), g.boundary());
        List<Stimulus> shifted = new ArrayList<>();
        for (Stimulus s : g.stimuli()) {
            shifted.add(s.shiftedBy(-x0));
        }
        progress.report("simulating " + g.model(), 0, 1);
        ScalarRun run = ScalarRun.prepare(ModelCatalogue.scalar(g.model()), domain, t, d, shifted,
                SolverSettings.DEFAULT);
        double[] out = new double[d.length * t.length];
        run.solve(g.parameters(), out);
        for (int i = 0; i < out.length; i++) {
            out[i] = g.baseline() + g.amplitude() * out[i];
        }
        progress.report("simulating " + g.model(), 1, 1);
        return new Kymograph(grid.distancesUm(), grid.timesS(), out, grid.signalUnit());
    }

    /** As {@link #compare(Kymograph, GivenModel, Progress)} for the commands' one-pulse settings. */
    public static Comparison compare(Kymograph measured, Settings s, Progress progress) {
        return compare(measured, given(s), progress);
    }

    /** As {@link #compare(Kymograph, GivenModel, DataStimulus, Progress)}, the data's stimulus found in the data. */
    public static Comparison compare(Kymograph measured, GivenModel g, Progress progress) {
        return compare(measured, g, detectStimulus(measured), progress);
    }

    /**
     * Simulates on the measured grid, takes the residual (measured - simulated) and reads the same model-free
     * spread measures off both. The measured ones are made once from the data alone: timed from the data's own
     * stimulus, relative to each position's median over the frames before it, with the data's baseline noise;
     * so two models set beside the same kymograph leave them unchanged. The simulated ones are timed from the
     * model's first stimulus, relative to the model's baseline.
     *
     * @param data the data's stimulus, e.g. from the results.json of the analysis that wrote the kymograph,
     *             or {@link #detectStimulus(Kymograph)}
     */
    public static Comparison compare(Kymograph measured, GivenModel g, DataStimulus data, Progress progress) {
        Kymograph simulated = simulateOn(measured, g, progress);
        double[] m = measured.values();
        double[] sim = simulated.values();
        double[] r = new double[m.length];
        double sum = 0;
        int n = 0;
        for (int i = 0; i < m.length; i++) {
            r[i] = m[i] - sim[i];
            if (Double.isFinite(r[i])) {
                sum += r[i] * r[i];
                n++;
            }
        }
        Kymograph residual = measured.withValues(r, measured.signalUnit());
        double noise = baselineNoise(measured, data.timeS());
        SpreadAnalysis.Result ms = measure(fromRest(measured, data.timeS()), data.timeS(), data.positionUm(), noise);
        Stimulus first = g.stimuli().get(0);
        SpreadAnalysis.Result ss = measure(shift(simulated, -g.baseline()), first.timeS(), first.positionUm(), noise);
        return new Comparison(measured, simulated, residual, n > 0 ? Math.sqrt(sum / n) : Double.NaN,
                Math.sqrt(sum), ms, ss, noise, data, mismatches(measured, first, data));
    }

    /**
     * The data's stimulus found in the kymograph itself ({@link StimulusDetector#detectInChange}: the strongest
     * step up, in noise standard deviations).
     *
     * @throws IllegalArgumentException when no clear rise is found (the message says so and what to give instead)
     */
    public static DataStimulus detectStimulus(Kymograph measured) {
        StimulusDetector.Detection d = StimulusDetector.detectInChange(measured);
        Checks.require(d.found(), String.format(Locale.ROOT, "no clear rise was found in the kymograph (the "
                + "strongest step is %.1f noise standard deviations, %.0f needed), so the data's stimulus time and "
                + "position must be given", d.strength(), StimulusDetector.MIN_STRENGTH));
        return new DataStimulus(d.timeS(), d.positionUm(), String.format(Locale.ROOT,
                "found in the kymograph (a rise of %.0f noise standard deviations)", d.strength()));
    }

    /**
     * One sentence for each way the model's first stimulus does not match the data's: more than one frame
     * interval apart in time, farther apart along the path than both two distance steps and the pulse's width,
     * or outside the kymograph's extent.
     */
    static List<String> mismatches(Kymograph measured, Stimulus model, DataStimulus data) {
        List<String> out = new ArrayList<>();
        double dt = measured.timeStepS();
        double first = measured.distanceUm(0);
        double last = measured.distanceUm(measured.positionCount() - 1);
        double end = measured.timeS(measured.frameCount() - 1);
        if (model.positionUm() < first || model.positionUm() > last) {
            out.add(String.format(Locale.ROOT, "The model's stimulus at %.3g um lies outside the kymograph (%.3g to "
                    + "%.3g um along the path).", model.positionUm(), first, last));
        } else if (Math.abs(model.positionUm() - data.positionUm())
                > Math.max(2 * measured.distanceStepUm(), model.widthUm())) {
            out.add(String.format(Locale.ROOT, "The model's stimulus at %.3g um is %.3g um from the data's (%.3g um, "
                    + "%s): the simulated spread starts elsewhere than the measured one.", model.positionUm(),
                    Math.abs(model.positionUm() - data.positionUm()), data.positionUm(), data.source()));
        }
        if (model.timeS() > end) {
            out.add(String.format(Locale.ROOT, "The model's stimulus at t = %.3g s comes after the kymograph's last "
                    + "frame (t = %.3g s).", model.timeS(), end));
        } else if (Math.abs(model.timeS() - data.timeS()) > dt) {
            out.add(String.format(Locale.ROOT, "The model's stimulus at t = %.3g s is %.3g s from the data's (t = "
                    + "%.3g s, %s), more than one frame interval (%.3g s): the model's time course is shifted against "
                    + "the data, which inflates the residual.", model.timeS(), Math.abs(model.timeS() - data.timeS()),
                    data.timeS(), data.source(), dt));
        }
        return out;
    }

    /** The parameter names of a built-in scalar model, in the order its parameters are given. */
    public static List<String> parameterNames(String model) {
        return ModelCatalogue.scalar(model).parameterNames();
    }

    private static void requireScalar(String model) {
        Checks.require(ModelCatalogue.findScalar(model).isPresent(),
                "model " + model + " is not one of " + ModelCatalogue.scalarNames());
    }

    /** The commands' settings as a given model: one pulse, amplitude 1, baseline 0. */
    static GivenModel given(Settings s) {
        return new GivenModel(s.model(), s.parameters(),
                List.of(Stimulus.pulse(s.stimulusTimeS(), s.stimulusUm(), s.widthUm(), s.amount())), 1, 0,
                s.boundary(), s.gridUm());
    }

    /** The spread measures, or an empty result whose warning says why they could not be made. */
    static SpreadAnalysis.Result measure(Kymograph k, double stimulusTimeS, double stimulusUm, double noise) {
        try {
            return SpreadAnalysis.measure(k, stimulusTimeS, stimulusUm, noise);
        } catch (IllegalArgumentException e) {
            double[] none = new double[0];
            return new SpreadAnalysis.Result(null, null, null, null, none, none, none, none, none, none, none, none,
                    null, none, SpreadAnalysis.Front.absent(SpreadAnalysis.FrontVerdict.TOO_FEW_POSITIONS, e.getMessage()),
                    List.of("The spread could not be measured: " + e.getMessage() + "."));
        }
    }

    /**
     * The kymograph relative to rest: each position minus its median over the frames before the stimulus (left
     * as it is when fewer than three frames precede the stimulus, as for a kymograph that starts at it).
     */
    static Kymograph fromRest(Kymograph k, double stimulusTimeS) {
        int before = 0;
        while (before < k.frameCount() && k.timeS(before) < stimulusTimeS) {
            before++;
        }
        if (before < 3) {
            return k;
        }
        double[] v = k.values();
        int nx = k.positionCount();
        for (int p = 0; p < nx; p++) {
            double[] col = k.column(p);
            double rest = Robust.median(Arrays.copyOf(col, before));
            if (Double.isFinite(rest)) {
                for (int f = 0; f < k.frameCount(); f++) {
                    v[f * nx + p] -= rest;
                }
            }
        }
        return k.withValues(v, k.signalUnit());
    }

    /**
     * The measured kymograph's noise level: the median over positions of each position's robust SD in the frames
     * before the stimulus (NaN when there are none).
     */
    public static double baselineNoise(Kymograph k, double stimulusTimeS) {
        int last = -1;
        while (last + 1 < k.frameCount() && k.timeS(last + 1) < stimulusTimeS) {
            last++;
        }
        if (last < 1) {
            return Double.NaN;
        }
        return Robust.median(NoiseEstimate.perPosition(k, 0, last, new ArrayList<>()));
    }

    private static Kymograph shift(Kymograph k, double by) {
        double[] v = k.values();
        for (int i = 0; i < v.length; i++) {
            v[i] += by;
        }
        return k.withValues(v, k.signalUnit());
    }
}
