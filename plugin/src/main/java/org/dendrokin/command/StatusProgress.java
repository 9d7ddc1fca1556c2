package org.dendrokin.command;

import org.dendrokin.core.Progress;
import org.scijava.app.StatusService;

/**
 * Progress shown through SciJava's status service (the status bar of ImageJ2/Fiji, nothing when headless).
 * The work stops when the command's thread is interrupted, which is how SciJava cancels a running module.
 */
final class StatusProgress implements Progress {
    private final StatusService status;
    private final String command;

    StatusProgress(StatusService status, String command) {
        this.status = status;
        this.command = command;
    }

    @Override
    public void report(String stage, long done, long total) {
        if (status != null && total > 0) {
            status.showProgress((int) Math.min(Integer.MAX_VALUE, done), (int) Math.min(Integer.MAX_VALUE, total));
            status.showStatus(command + ": " + stage);
        }
    }

    @Override
    public boolean isCancelled() {
        return Thread.currentThread().isInterrupted();
    }

    void finish() {
        if (status != null) {
            status.clearStatus();
        }
    }
}
