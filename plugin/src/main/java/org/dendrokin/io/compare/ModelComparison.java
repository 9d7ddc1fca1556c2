package org.dendrokin.io.compare;

import java.util.ArrayList;
import java.util.List;

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

    /** What a comparison produced; {@code noiseSd} is the baseline noise used to read the spread measures. */
    public record Comparison(Kymograph measured, Kymograph simulated, Kymograph residual, double rmse,
            double residualNorm, SpreadAnalysis.Result measuredSpread, SpreadAnalysis.Result simulatedSpread,
            double noiseSd) {
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

    /**
     * Simulates on the measured grid, takes the residual (measured - simulated) and reads the same model-free
     * spread measures off both, relative to the model's baseline and timed from its first stimulus.
     */
    public static Comparison compare(Kymograph measured, GivenModel g, Progress progress) {
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
        Stimulus first = g.stimuli().get(0);
        double noise = baselineNoise(measured, first.timeS());
        SpreadAnalysis.Result ms = measure(shift(measured, -g.baseline()), first, noise);
        SpreadAnalysis.Result ss = measure(shift(simulated, -g.baseline()), first, noise);
        return new Comparison(measured, simulated, residual, n > 0 ? Math.sqrt(sum / n) : Double.NaN,
                Math.sqrt(sum), ms, ss, noise);
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
    static SpreadAnalysis.Result measure(Kymograph k, Stimulus first, double noise) {
        try {
            return SpreadAnalysis.measure(k, first.timeS(), first.positionUm(), noise);
        } catch (IllegalArgumentException e) {
            double[] none = new double[0];
            return new SpreadAnalysis.Result(null, null, null, null, none, none, none, none, none, none, none, none,
                    null, none, SpreadAnalysis.Front.absent(SpreadAnalysis.FrontVerdict.TOO_FEW_POSITIONS, e.getMessage()),
                    List.of("The spread could not be measured: " + e.getMessage() + "."));
        }
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
