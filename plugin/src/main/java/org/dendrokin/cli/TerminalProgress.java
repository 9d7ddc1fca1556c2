package org.dendrokin.cli;

import java.io.PrintWriter;
import java.util.Locale;

import org.dendrokin.core.Progress;

/**
 * A one-line progress display on the terminal's error stream: the stage and its percentage, rewritten in place
 * (carriage return) at most a few times a second, and ended with a newline by {@link #finish()}. When the error
 * stream is not a terminal (a log file, a pipe, a cluster job), it stays silent, so that logs carry no
 * carriage returns and an error is the only line on the stream.
 */
final class TerminalProgress implements Progress {
    private static final long MIN_INTERVAL_NS = 200_000_000L;
    private final PrintWriter err;
    private long lastNs;
    private String lastStage = "";
    private boolean dirty;

    private final boolean interactive;

    TerminalProgress(PrintWriter err) {
        this(err, System.console() != null);
    }

    TerminalProgress(PrintWriter err, boolean interactive) {
        this.err = err;
        this.interactive = interactive;
    }

    @Override
    public void report(String stage, long done, long total) {
        if (!interactive) {
            return;
        }
        long now = System.nanoTime();
        boolean newStage = !stage.equals(lastStage);
        if (!newStage && done < total && now - lastNs < MIN_INTERVAL_NS) {
            return;
        }
        lastNs = now;
        lastStage = stage;
        int percent = total > 0 ? (int) Math.min(100, 100 * done / total) : 0;
        err.print(String.format(Locale.ROOT, "\r%-40s %3d%%", stage, percent));
        err.flush();
        dirty = true;
    }

    /** Ends the progress line. */
    void finish() {
        if (dirty) {
            err.print("\r" + " ".repeat(46) + "\r");
            err.flush();
            dirty = false;
        }
    }
}
