package org.dendrokin.ij1;

import java.util.List;

import org.dendrokin.core.Progress;
import org.dendrokin.core.kymo.Kymograph;
import org.dendrokin.core.model.Boundary;
import org.dendrokin.core.model.Domain;
import org.dendrokin.core.model.ScalarRun;
import org.dendrokin.core.model.Stimulus;

/**
 * A built-in model with its parameters and one stimulus pulse, as the Simulate and Compare dialogs ask for
 * them, run on the grid of a kymograph (its distances along the path and its frame times).
 *
 * @param model          "diffusion-decay", "nagumo" or "fisher-kpp"
 * @param dUm2PerS       diffusion coefficient D, um^2/s
 * @param ratePerS       k (diffusion-decay, nagumo) or r (fisher-kpp), 1/s
 * @param threshold      nagumo's a, dimensionless, 0..0.5 (ignored by the other models)
 * @param stimulusTimeS  time of the pulse on the imaging clock, s
 * @param stimulusUm     position of the pulse along the path, um from the first vertex
 * @param widthUm        standard deviation of the pulse's Gaussian profile, um
 * @param amount         peak rise the pulse adds, signal unit
 * @param boundary       what happens at both ends of the path
 * @param gridUm         spacing of the simulation grid, um
 */
public record ModelSettings(String model, double dUm2PerS, double ratePerS, double threshold, double stimulusTimeS,
        double stimulusUm, double widthUm, double amount, Boundary boundary, double gridUm) {

    static final String[] ENDS = {"no-flux", "fixed"};

    /** Adds the model's fields to a dialog; labels carry units, first words are the option keys. */
    static void addFields(OptionsDialog d, double pathLengthUm, double firstTimeS) {
        d.choice("Model", ScalarRun.MODELS.toArray(new String[0]), ScalarRun.MODELS.get(0));
        d.number("D (um^2/s, diffusion coefficient)", 1.0, 3);
        d.number("Rate k or r (1/s)", 0.5, 3);
        d.number("Threshold a (nagumo only, 0-0.5)", 0.2, 3);
        d.number("Time of the stimulus (s)", firstTimeS, 3);
        d.number("Position of the stimulus (um along the path)", round(pathLengthUm / 2), 2);
        d.number("Width of the stimulus (um, Gaussian SD)", 1.0, 2);
        d.number("Amount (peak rise, signal unit)", 1.0, 3);
        d.choice("Ends of the path", ENDS, ENDS[0]);
        d.number("Grid spacing (um)", 0.25, 3);
    }

    /** Reads the fields added by {@link #addFields}, in the same order. */
    static ModelSettings read(OptionsDialog d) {
        String model = d.nextChoice();
        double dCoef = d.nextNumber();
        double rate = d.nextNumber();
        double a = d.nextNumber();
        double t0 = d.nextNumber();
        double x0 = d.nextNumber();
        double w = d.nextNumber();
        double amount = d.nextNumber();
        String ends = d.nextChoice();
        double grid = d.nextNumber();
        Boundary boundary = ends.equals("fixed") ? Boundary.FIXED : Boundary.NO_FLUX;
        return new ModelSettings(model, dCoef, rate, a, t0, x0, w, amount, boundary, grid);
    }

    /** The parameter values in the order the model takes them. */
    double[] parameters() {
        return model.equals("nagumo") ? new double[] {dUm2PerS, ratePerS, threshold} : new double[] {dUm2PerS, ratePerS};
    }

    /** Parameter names and units for tables, in the order of {@link #parameters()}. */
    String[][] parameterLabels() {
        String rate = model.equals("fisher-kpp") ? "r" : "k";
        return model.equals("nagumo")
                ? new String[][] {{"D", "um^2/s"}, {"k", "1/s"}, {"a", ""}}
                : new String[][] {{"D", "um^2/s"}, {rate, "1/s"}};
    }

    /**
     * Simulates the model on the grid of {@code grid}: the cable runs from 0 to the last distance, output at
     * each of the grid's distances and frame times.
     *
     * @return the simulated kymograph, in the grid's signal unit
     */
    Kymograph simulateOn(Kymograph grid, Progress progress) {
        double[] d = grid.distancesUm();
        double[] t = grid.timesS();
        double length = d[d.length - 1];
        if (!(d[0] >= 0) || !(length > 0)) {
            throw new IllegalArgumentException("the kymograph's distances must run from 0 or more to a positive length");
        }
        double dx = Math.min(gridUm, length / 2);
        Domain domain = new Domain(length, dx, boundary);
        for (int i = 0; i < t.length; i++) {
            t[i] = Math.max(0, t[i]);
        }
        progress.report("simulating " + model, 0, 1);
        ScalarRun run = ScalarRun.prepare(model, domain, t, d,
                List.of(Stimulus.pulse(stimulusTimeS, stimulusUm, widthUm, amount)));
        double[] out = new double[d.length * t.length];
        run.solve(parameters(), out);
        progress.report("simulating " + model, 1, 1);
        return new Kymograph(grid.distancesUm(), grid.timesS(), out, grid.signalUnit());
    }

    private static double round(double v) {
        return Math.round(v * 100) / 100.0;
    }
}
