package org.dendrokin.command;

import java.io.File;

import org.dendrokin.core.kymo.Kymograph;
import org.dendrokin.io.KymographCsv;
import org.dendrokin.io.compare.ModelComparison;
import org.scijava.ItemIO;
import org.scijava.app.StatusService;
import org.scijava.command.Command;
import org.scijava.plugin.Parameter;
import org.scijava.plugin.Plugin;
import org.scijava.widget.FileWidget;

/**
 * A measured kymograph (CSV) beside a built-in model with given parameters: the residual kymograph is written
 * and the residual's root mean square, and the front speed and length constant of both, are returned.
 */
@Plugin(type = Command.class, headless = true, menuPath = "Plugins>Dendrokin>Scripting>Compare Kymograph with Model")
public class CompareWithModelCommand extends ModelParameters {
    @Parameter(label = "Measured kymograph CSV")
    private File measured;

    @Parameter(label = "Signal unit of the measured kymograph")
    private String signalUnit = "dF/F0";

    @Parameter(label = "Residual kymograph CSV to write (measured - simulated)", style = FileWidget.SAVE_STYLE)
    private File residual;

    @Parameter(required = false)
    private StatusService status;

    @Parameter(type = ItemIO.OUTPUT, label = "RMSE (signal unit)")
    private double rmse;

    @Parameter(type = ItemIO.OUTPUT, label = "Measured front speed (um/s)")
    private double measuredFrontSpeedUmPerS = Double.NaN;

    @Parameter(type = ItemIO.OUTPUT, label = "Simulated front speed (um/s)")
    private double simulatedFrontSpeedUmPerS = Double.NaN;

    @Parameter(type = ItemIO.OUTPUT, label = "Measured peak decay length (um)")
    private double measuredPeakDecayLengthUm = Double.NaN;

    @Parameter(type = ItemIO.OUTPUT, label = "Simulated peak decay length (um)")
    private double simulatedPeakDecayLengthUm = Double.NaN;

    @Override
    public void run() {
        StatusProgress progress = new StatusProgress(status, "Compare Kymograph with Model");
        try {
            Kymograph k = KymographCsv.read(measured.toPath(), signalUnit);
            ModelComparison.Comparison c = ModelComparison.compare(k, settings(), progress);
            KymographCsv.write(c.residual(), residual.toPath());
            rmse = c.rmse();
            if (c.measuredSpread().frontSpeed() != null) {
                measuredFrontSpeedUmPerS = c.measuredSpread().frontSpeed().value();
            }
            if (c.simulatedSpread().frontSpeed() != null) {
                simulatedFrontSpeedUmPerS = c.simulatedSpread().frontSpeed().value();
            }
            if (c.measuredSpread().peakDecayLength() != null) {
                measuredPeakDecayLengthUm = c.measuredSpread().peakDecayLength().value();
            }
            if (c.simulatedSpread().peakDecayLength() != null) {
                simulatedPeakDecayLengthUm = c.simulatedSpread().peakDecayLength().value();
            }
        } catch (RuntimeException e) {
            cancel(Commands.sentence(e));
        } finally {
            progress.finish();
        }
    }
}
