package org.dendrokin.ij1;

import java.util.List;

import org.dendrokin.core.model.Boundary;
import org.dendrokin.core.model.ModelCatalogue;
import org.dendrokin.io.compare.ModelComparison;

/** The model fields of the Simulate and Compare dialogs: labels with units; first words are option keys. */
final class ModelSettings {
    static final String[] ENDS = {"no-flux", "fixed"};

    private ModelSettings() {
    }

    static void addFields(OptionsDialog d, double pathLengthUm, double firstTimeS) {
        List<String> models = ModelCatalogue.scalarNames();
        d.choice("Model", models.toArray(new String[0]), models.get(0));
        d.number("D (um^2/s, diffusion coefficient)", 1.0, 3);
        d.number("Rate k or r (1/s)", 0.5, 3);
        d.number("Threshold a (nagumo only, 0-0.5)", 0.2, 3);
        d.number("Time of the stimulus (s)", firstTimeS, 3);
        d.number("Position of the stimulus (um along the path)", Math.round(pathLengthUm * 50) / 100.0, 2);
        d.number("Width of the stimulus (um, Gaussian SD)", 1.0, 2);
        d.number("Amount (peak rise, signal unit)", 1.0, 3);
        d.choice("Ends of the path", ENDS, ENDS[0]);
        d.number("Grid spacing (um)", 0.25, 3);
    }

    /** Reads the fields added by {@link #addFields}, in the same order. */
    static ModelComparison.Settings read(OptionsDialog d) {
        String model = d.nextChoice();
        double dCoef = d.nextNumber();
        double rate = d.nextNumber();
        double a = d.nextNumber();
        double t0 = d.nextNumber();
        double x0 = d.nextNumber();
        double w = d.nextNumber();
        double amount = d.nextNumber();
        Boundary boundary = d.nextChoice().equals("fixed") ? Boundary.FIXED : Boundary.NO_FLUX;
        double grid = d.nextNumber();
        return new ModelComparison.Settings(model, dCoef, rate, a, t0, x0, w, amount, boundary, grid);
    }
}
