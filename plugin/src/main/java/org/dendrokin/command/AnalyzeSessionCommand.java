package org.dendrokin.command;

import java.io.File;

import org.dendrokin.io.SessionRunner;
import org.scijava.ItemIO;
import org.scijava.app.StatusService;
import org.scijava.command.Command;
import org.scijava.command.ContextCommand;
import org.scijava.log.LogService;
import org.scijava.plugin.Parameter;
import org.scijava.plugin.Plugin;
import org.scijava.widget.FileWidget;

/** One session folder analysed as the command line's {@code analyze} does, for scripts and headless runs. */
@Plugin(type = Command.class, headless = true, menuPath = "Plugins>Dendrokin>Scripting>Analyze One Session")
public class AnalyzeSessionCommand extends ContextCommand {
    @Parameter(label = "Session folder", style = FileWidget.DIRECTORY_STYLE)
    private File sessionDir;

    @Parameter(label = "Output folder", style = FileWidget.DIRECTORY_STYLE)
    private File outDir;

    @Parameter(required = false)
    private StatusService status;

    @Parameter(required = false)
    private LogService log;

    @Parameter(type = ItemIO.OUTPUT, label = "Signal unit")
    private String signalUnit;

    @Parameter(type = ItemIO.OUTPUT, label = "Best model")
    private String bestModel;

    @Parameter(type = ItemIO.OUTPUT, label = "Front speed (um/s)")
    private double frontSpeedUmPerS = Double.NaN;

    @Parameter(type = ItemIO.OUTPUT, label = "Report")
    private File report;

    @Override
    public void run() {
        StatusProgress progress = new StatusProgress(status, "Analyze One Session");
        try {
            SessionRunner.Result r = SessionRunner.analyze(sessionDir.toPath(), outDir.toPath(), progress);
            if (log != null) {
                r.warnings().forEach(log::warn);
            }
            signalUnit = r.signalUnit();
            bestModel = r.bestModel();
            if (r.analysis().headline().frontSpeed() != null) {
                frontSpeedUmPerS = r.analysis().headline().frontSpeed().value();
            }
            report = r.report().toFile();
        } catch (RuntimeException e) {
            cancel(Commands.sentence(e));
        } finally {
            progress.finish();
        }
    }
}
