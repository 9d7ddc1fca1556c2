package org.dendrokin.command;

import java.io.File;

import org.dendrokin.core.kymo.Kymograph;
import org.dendrokin.io.KymographCsv;
import org.dendrokin.io.compare.ModelComparison;
import org.scijava.app.StatusService;
import org.scijava.command.Command;
import org.scijava.plugin.Parameter;
import org.scijava.plugin.Plugin;
import org.scijava.widget.FileWidget;

/**
 * A built-in model simulated on the grid (distances and frame times) of a kymograph CSV, written as a
 * kymograph CSV: what Plugins > Dendrokin > Simulate Along Line does on a kymograph image.
 */
@Plugin(type = Command.class, headless = true, menuPath = "Plugins>Dendrokin>Scripting>Simulate on Kymograph Grid")
public class SimulateOnGridCommand extends ModelParameters {
    @Parameter(label = "Kymograph CSV giving the grid")
    private File grid;

    @Parameter(label = "Simulated kymograph CSV to write", style = FileWidget.SAVE_STYLE)
    private File output;

    @Parameter(required = false)
    private StatusService status;

    @Override
    public void run() {
        StatusProgress progress = new StatusProgress(status, "Simulate on Kymograph Grid");
        try {
            Kymograph g = KymographCsv.read(grid.toPath(), "");
            KymographCsv.write(ModelComparison.simulateOn(g, settings(), progress), output.toPath());
        } catch (RuntimeException e) {
            cancel(Commands.sentence(e));
        } finally {
            progress.finish();
        }
    }
}
