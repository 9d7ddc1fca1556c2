package org.dendrokin.io.compare;

import java.util.List;

import org.dendrokin.core.Checks;
import org.dendrokin.core.Progress;
import org.dendrokin.core.kymo.Kymograph;
import org.dendrokin.core.model.Boundary;
import org.dendrokin.core.model.Domain;
import org.dendrokin.core.model.ScalarRun;
import org.dendrokin.core.model.Stimulus;
import org.dendrokin.core.spread.SpreadAnalysis;

/**
 * A built-in model with the user's own parameters (no fitting) run on the grid of a measured kymograph and
 * set beside it: the simulated kymograph, the residual, its root mean square, and the same model-free spread
 * measures on both. Shared by the ImageJ commands and the SciJava commands so that they cannot differ.
 */
public final class ModelComparison {
    private ModelComparison() {
    }

    /**
     * A model, its parameters and one stimulus pulse.
     *
     * @param model         "diffusion-decay", "nagumo" or "fisher-kpp"
     * @param dUm2PerS      diffusion coefficient D, um^2/s
     * @param ratePerS      k (diffusion-decay, nagumo) or r (fisher-kpp), 1/s
     * @param threshold     nagumo's a, dimensionless, 0..0.5 (ignored by the other models)
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
            Checks.require(ScalarRun.MODELS.contains(model), "model " + model + " is not one of " + ScalarRun.MODELS);
            Checks.positiveFinite(gridUm, "grid spacing (um)");
        }

        /** The parameter values in the order the model takes them. */
        public double[] parameters() {
            return model.equals("nagumo") ? new double[] {dUm2PerS, ratePerS, threshold}
                    : new double[] {dUm2PerS, ratePerS};
        }

        /** Parameter names and units, in the order of {@link #parameters()}. */
        public String[][] parameterLabels() {
            String rate = model.equals("fisher-kpp") ? "r" : "k";
            return model.equals("nagumo")
                    ? new String[][] {{"D", "um^2/s"}, {"k", "1/s"}, {"a", ""}}
                    : new String[][] {{"D", "um^2/s"}, {rate, "1/s"}};
        }
    }

    /** What a comparison produced. */
    public record Comparison(Kymograph measured, Kymograph simulated, Kymograph residual, double rmse,
            SpreadAnalysis.Result measuredSpread, SpreadAnalysis.Result simulatedSpread) {
    }

    /**
     * Simulates the model on the grid of {@code grid}: the cable runs from 0 to the last distance (no-flux or
     * fixed ends as set), sampled at each of the grid's distances and frame times.
     *
     * @return the simulated kymograph, in the grid's signal unit
     */
    public static Kymograph simulateOn(Kymograph grid, Settings s, Progress progress) {
        double[] d = grid.distancesUm();
        double[] t = grid.timesS();
        double length = d[d.length - 1];
        Checks.require(d[0] >= 0 && length > 0, "the kymograph's distances must run from 0 or more to a positive"
                + " length");
        Domain domain = new Domain(length, Math.min(s.gridUm(), length / 2), s.boundary());
        for (int i = 0; i < t.length; i++) {
            t[i] = Math.max(0, t[i]);
        }
        progress.report("simulating " + s.model(), 0, 1);
        ScalarRun run = ScalarRun.prepare(s.model(), domain, t, d,
                List.of(Stimulus.pulse(s.stimulusTimeS(), s.stimulusUm(), s.widthUm(), s.amount())));
        double[] out = new double[d.length * t.length];
        run.solve(s.parameters(), out);
        progress.report("simulating " + s.model(), 1, 1);
        return new Kymograph(grid.distancesUm(), grid.timesS(), out, grid.signalUnit());
    }

    /** Simulates on the measured grid, takes the residual and measures both the same way. */
    public static Comparison compare(Kymograph measured, Settings s, Progress progress) {
        Kymograph simulated = simulateOn(measured, s, progress);
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
        double noise = baselineSd(measured, s.stimulusTimeS());
        SpreadAnalysis.Result ms = measure(measured, s, noise);
        SpreadAnalysis.Result ss = measure(simulated, s, noise);
        return new Comparison(measured, simulated, residual, n > 0 ? Math.sqrt(sum / n) : Double.NaN, ms, ss);
    }

    /** The spread measures, or an empty result whose warning says why they could not be made. */
    static SpreadAnalysis.Result measure(Kymograph k, Settings s, double noise) {
        try {
            return SpreadAnalysis.measure(k, s.stimulusTimeS(), s.stimulusUm(), noise);
        } catch (IllegalArgumentException e) {
            double[] none = new double[0];
            return new SpreadAnalysis.Result(null, null, null, null, none, none, none, none, none, none, none, none,
                    null, none, List.of("The spread could not be measured: " + e.getMessage() + "."));
        }
    }

    /** Sample standard deviation of the finite values before the stimulus (NaN if fewer than two). */
    public static double baselineSd(Kymograph k, double stimulusTimeS) {
        double sum = 0;
        double sum2 = 0;
        int n = 0;
        for (int f = 0; f < k.frameCount() && k.timeS(f) < stimulusTimeS; f++) {
            for (double v : k.row(f)) {
                if (Double.isFinite(v)) {
                    sum += v;
                    sum2 += v * v;
                    n++;
                }
            }
        }
        return n > 1 ? Math.sqrt(Math.max(0, (sum2 - sum * sum / n) / (n - 1))) : Double.NaN;
    }
}
