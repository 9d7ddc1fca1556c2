package org.dendrokin.command;

import org.dendrokin.core.model.Boundary;
import org.dendrokin.core.model.ModelCatalogue;
import org.dendrokin.io.compare.ModelComparison;
import org.scijava.command.ContextCommand;
import org.scijava.plugin.Parameter;

/**
 * The model inputs shared by the simulate and compare commands; names carry units. The model's choices are the
 * one-species models of the {@link ModelCatalogue}, written out because an annotation holds only constants (a
 * {@code DynamicCommand} could fill them in at run time, but {@code CommandService.run} then returns no module to
 * scripts); {@code CommandServiceTest} fails when the two lists differ.
 */
abstract class ModelParameters extends ContextCommand {
    @Parameter(label = "Model", choices = {"diffusion-decay", "nagumo", "fisher-kpp"})
    String model = "diffusion-decay";

    @Parameter(label = "D (um^2/s)")
    double dUm2PerS = 1.0;

    @Parameter(label = "Rate k or r (1/s)")
    double ratePerS = 0.5;

    @Parameter(label = "Threshold a (nagumo only)")
    double threshold = 0.2;

    @Parameter(label = "Time of the stimulus (s)")
    double stimulusTimeS;

    @Parameter(label = "Position of the stimulus (um along the path)")
    double stimulusUm;

    @Parameter(label = "Width of the stimulus (um, Gaussian SD)")
    double widthUm = 1.0;

    @Parameter(label = "Amount (peak rise, signal unit)")
    double amount = 1.0;

    @Parameter(label = "Ends", choices = {"no-flux", "fixed"})
    String ends = "no-flux";

    @Parameter(label = "Grid spacing (um)")
    double gridUm = 0.25;

    ModelComparison.Settings settings() {
        return new ModelComparison.Settings(model, dUm2PerS, ratePerS, threshold, stimulusTimeS, stimulusUm, widthUm,
                amount, ends.equals("fixed") ? Boundary.FIXED : Boundary.NO_FLUX, gridUm);
    }
}
