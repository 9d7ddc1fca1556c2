package org.dendrokin.command;

import java.io.UncheckedIOException;

import org.dendrokin.core.Progress;
import org.dendrokin.io.InputException;

/** What our SciJava commands share: one plain sentence for a failure, as the command line prints it. */
final class Commands {
    private Commands() {
    }

    /**
     * The sentence a command cancels with. Bad input keeps its message (naming the file); anything else is an
     * internal error, re-thrown so that SciJava logs its stack trace for a bug report.
     */
    static String sentence(RuntimeException e) {
        if (e instanceof InputException || e instanceof UncheckedIOException || e instanceof IllegalArgumentException) {
            return e.getMessage();
        }
        if (e instanceof Progress.CancelledException) {
            return "Stopped; nothing was written.";
        }
        throw e;
    }
}
