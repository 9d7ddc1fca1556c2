package org.dendrokin.command;

import java.io.File;

import org.dendrokin.io.batch.BatchOptions;
import org.dendrokin.io.batch.BatchOutcome;
import org.dendrokin.io.batch.BatchRunner;
import org.scijava.ItemIO;
import org.scijava.app.StatusService;
import org.scijava.command.Command;
import org.scijava.command.ContextCommand;
import org.scijava.plugin.Parameter;
import org.scijava.plugin.Plugin;
import org.scijava.widget.FileWidget;

/** Every session folder under a root analysed as the command line's {@code batch} does. */
@Plugin(type = Command.class, headless = true, menuPath = "Plugins>Dendrokin>Scripting>Analyze Session Tree")
public class AnalyzeSessionsCommand extends ContextCommand {
    @Parameter(label = "Root folder", style = FileWidget.DIRECTORY_STYLE)
    private File root;

    @Parameter(label = "Output folder", style = FileWidget.DIRECTORY_STYLE)
    private File outDir;

    @Parameter(label = "Threads", min = "1")
    private int threads = 1;

    @Parameter(label = "Redo sessions analysed before")
    private boolean force;

    @Parameter(required = false)
    private StatusService status;

    @Parameter(type = ItemIO.OUTPUT, label = "Sessions")
    private int total;

    @Parameter(type = ItemIO.OUTPUT, label = "Analysed")
    private int analysed;

    @Parameter(type = ItemIO.OUTPUT, label = "Skipped (up to date)")
    private int skipped;

    @Parameter(type = ItemIO.OUTPUT, label = "Failed")
    private int failed;

    @Parameter(type = ItemIO.OUTPUT, label = "Summary table")
    private File summary;

    @Override
    public void run() {
        StatusProgress progress = new StatusProgress(status, "Analyze Session Tree");
        try {
            BatchOutcome o = BatchRunner.run(BatchOptions.of(root.toPath(), outDir.toPath(), threads).withForce(force),
                    progress);
            total = o.total();
            analysed = o.analysed();
            skipped = o.skipped();
            failed = o.failed();
            summary = o.summary() == null ? null : o.summary().toFile();
        } catch (RuntimeException e) {
            cancel(Commands.sentence(e));
        } finally {
            progress.finish();
        }
    }
}
