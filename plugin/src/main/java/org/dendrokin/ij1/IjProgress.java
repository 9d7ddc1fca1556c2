package org.dendrokin.ij1;

import ij.IJ;

import org.dendrokin.core.Progress;

/**
 * Progress shown on ImageJ's progress bar and status line; pressing Esc asks the work to stop. The status
 * line is refreshed at most every 100 ms so that a fast loop does not spend its time repainting.
 */
public final class IjProgress implements Progress {
    private final String command;
    private long lastStatusNanos;

    /** @param command the menu command's name, shown at the start of the status line */
    public IjProgress(String command) {
        this.command = command;
        IJ.resetEscape();
    }

    @Override
    public void report(String stage, long done, long total) {
        if (total > 0) {
            IJ.showProgress((double) done / total);
        }
        long now = System.nanoTime();
        if (now - lastStatusNanos > 100_000_000L || done >= total) {
            lastStatusNanos = now;
            IJ.showStatus(command + ": " + stage + (total > 0 ? " " + done + "/" + total : "") + " (Esc stops)");
        }
    }

    @Override
    public boolean isCancelled() {
        return IJ.escapePressed();
    }

    /** Clears the progress bar; call when the work ends, however it ends. */
    public void finish(String status) {
        IJ.showProgress(1.0);
        IJ.showStatus(status);
    }
}
