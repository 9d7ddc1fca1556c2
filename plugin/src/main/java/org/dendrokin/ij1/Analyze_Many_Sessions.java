package org.dendrokin.ij1;

import java.io.IOException;
import java.nio.file.Path;

import ij.IJ;
import ij.measure.ResultsTable;
import ij.plugin.BrowserLauncher;
import ij.plugin.PlugIn;

import org.dendrokin.io.batch.BatchOptions;
import org.dendrokin.io.batch.BatchOutcome;
import org.dendrokin.io.batch.BatchRunner;

/**
 * Plugins > Dendrokin > Analyze Many Sessions: the command line's {@code batch} with ImageJ's progress bar.
 * Every folder under the root that holds a session.json is analysed on a bounded pool of threads; a session
 * whose inputs and settings match an earlier result is skipped unless asked otherwise; Esc stops the batch
 * and leaves only complete session results. Shows summary.csv as a table and can open the index report.
 */
public class Analyze_Many_Sessions implements PlugIn {
    static final String COMMAND = "Analyze Many Sessions";

    @Override
    public void run(String arg) {
        IjProgress progress = new IjProgress(COMMAND);
        try {
            OptionsDialog d = new OptionsDialog(COMMAND, "batch");
            d.folder("Root folder (searched for session.json)", "");
            d.folder("Output folder", "");
            d.number("Threads", Math.max(1, Runtime.getRuntime().availableProcessors()), 0);
            d.check("Redo sessions analysed before", false);
            d.check("Open the index report when done", !OptionsDialog.headless());
            if (!d.show()) {
                return;
            }
            String root = d.nextText();
            String out = d.nextText();
            int threads = (int) Math.round(d.nextNumber());
            boolean force = d.nextCheck();
            boolean open = d.nextCheck();
            if (root.isEmpty() || out.isEmpty()) {
                throw new IllegalArgumentException("choose both the root folder of the sessions and an output folder");
            }
            if (threads < 1) {
                throw new IllegalArgumentException("Threads must be 1 or more");
            }
            BatchOutcome outcome = BatchRunner.run(BatchOptions.of(Path.of(root), Path.of(out), threads)
                    .withForce(force), progress);
            String line = COMMAND + ": " + outcome.total() + " sessions, " + outcome.analysed() + " analysed, "
                    + outcome.skipped() + " skipped as up to date, " + outcome.failed() + " failed.";
            IJ.log(line);
            if (outcome.summary() != null) {
                ResultsTable summary = ResultsTable.open2(outcome.summary().toString());
                if (summary != null) {
                    logFailures(summary);
                    Tables.show(summary, "Dendrokin summary", Display.anchor());
                }
            }
            if (open && outcome.index() != null && !OptionsDialog.headless()) {
                openReport(outcome.index());
            }
            progress.finish(line);
        } catch (RuntimeException e) {
            Failures.show(COMMAND, e);
        }
    }

    /** One Log line for each session that failed, with the sentence summary.csv gives. */
    static void logFailures(ResultsTable summary) {
        if (summary.getColumnIndex("status") == ResultsTable.COLUMN_NOT_FOUND) {
            return;
        }
        for (int row = 0; row < summary.size(); row++) {
            if ("failed".equals(summary.getStringValue("status", row))) {
                IJ.log(COMMAND + ": " + summary.getStringValue("session", row) + " failed: "
                        + summary.getStringValue("error", row));
            }
        }
    }

    static void openReport(Path index) {
        try {
            BrowserLauncher.openURL(index.toUri().toString());
        } catch (IOException e) {
            IJ.log(COMMAND + ": the report is at " + index + " (no web browser could be started: " + e.getMessage()
                    + ").");
        }
    }
}
