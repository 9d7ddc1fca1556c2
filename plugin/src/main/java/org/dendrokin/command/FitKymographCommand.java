package org.dendrokin.command;

import java.io.File;
import java.util.ArrayList;
import java.util.List;

import org.dendrokin.core.fit.FitResult;
import org.dendrokin.core.fit.KymographFits;
import org.dendrokin.core.fit.ParameterEstimate;
import org.dendrokin.core.kymo.Kymograph;
import org.dendrokin.io.KymographCsv;
import org.scijava.ItemIO;
import org.scijava.app.StatusService;
import org.scijava.command.Command;
import org.scijava.command.ContextCommand;
import org.scijava.log.LogService;
import org.scijava.plugin.Parameter;
import org.scijava.plugin.Plugin;

/**
 * Models fitted to a kymograph CSV, as Plugins > Dendrokin > Fit Spread Models does: returns the best model and
 * its D and k (where it has them) with their 95% intervals.
 */
@Plugin(type = Command.class, headless = true, menuPath = "Plugins>Dendrokin>Scripting>Fit Models to Kymograph")
public class FitKymographCommand extends ContextCommand {
    @Parameter(label = "Kymograph CSV")
    private File kymograph;

    @Parameter(label = "Signal unit")
    private String signalUnit = "dF/F0";

    @Parameter(label = "Models (comma separated)")
    private String models = "diffusion-decay, nagumo";

    @Parameter(label = "Time of the stimulus (s)")
    private double stimulusTimeS;

    @Parameter(label = "Position of the stimulus (um along the path)")
    private double stimulusUm;

    @Parameter(label = "Criterion", choices = {"aicc", "aic", "bic"})
    private String criterion = "aicc";

    @Parameter(required = false)
    private StatusService status;

    @Parameter(required = false)
    private LogService log;

    @Parameter(type = ItemIO.OUTPUT, label = "Best model")
    private String bestModel;

    @Parameter(type = ItemIO.OUTPUT, label = "D (um^2/s)")
    private double dUm2PerS = Double.NaN;

    @Parameter(type = ItemIO.OUTPUT, label = "D 95% interval, low (um^2/s)")
    private double dLowUm2PerS = Double.NaN;

    @Parameter(type = ItemIO.OUTPUT, label = "D 95% interval, high (um^2/s)")
    private double dHighUm2PerS = Double.NaN;

    @Parameter(type = ItemIO.OUTPUT, label = "k (1/s)")
    private double kPerS = Double.NaN;

    @Override
    public void run() {
        StatusProgress progress = new StatusProgress(status, "Fit Models to Kymograph");
        try {
            Kymograph k = KymographCsv.read(kymograph.toPath(), signalUnit);
            List<String> names = new ArrayList<>();
            for (String m : models.split("[,;\\s]+")) {
                if (!m.isEmpty()) {
                    names.add(m);
                }
            }
            KymographFits.Outcome o = KymographFits.fit(k, KymographFits.Setup.of(stimulusTimeS, stimulusUm)
                    .withModels(names).withCriterion(criterion), progress);
            if (log != null) {
                o.warnings().forEach(log::warn);
            }
            bestModel = o.bestModel();
            FitResult best = o.best().orElse(null);
            if (best != null) {
                ParameterEstimate d = best.estimate("D").orElse(null);
                if (d != null) {
                    dUm2PerS = d.value();
                    if (d.ci95() != null) {
                        dLowUm2PerS = d.ci95().lower();
                        dHighUm2PerS = d.ci95().upper();
                    }
                }
                best.estimate("k").ifPresent(e -> kPerS = e.value());
            }
        } catch (RuntimeException e) {
            cancel(Commands.sentence(e));
        } finally {
            progress.finish();
        }
    }
}
