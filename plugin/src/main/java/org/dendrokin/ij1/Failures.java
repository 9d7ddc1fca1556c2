package org.dendrokin.ij1;

import java.io.PrintWriter;
import java.io.StringWriter;
import java.io.UncheckedIOException;

import ij.IJ;

import org.dendrokin.core.Progress;
import org.dendrokin.io.InputException;

/**
 * Turns a failed command into what an ImageJ user expects: an error dialog with one plain sentence (the
 * same sentence the command line prints), the status line after a cancel, and a stack trace only in the
 * Log and only when ImageJ's debug mode is on (Edit > Options > Misc).
 */
public final class Failures {
    private Failures() {
    }

    /** Shows {@code failure} for the command named {@code command}. */
    public static void show(String command, Throwable failure) {
        if (failure instanceof Progress.CancelledException) {
            IJ.showProgress(1.0);
            IJ.showStatus(command + ": stopped; nothing was written.");
            return;
        }
        IJ.showProgress(1.0);
        IJ.showStatus("");
        IJ.error(command, sentence(failure));
        if (IJ.debugMode) {
            StringWriter trace = new StringWriter();
            failure.printStackTrace(new PrintWriter(trace));
            IJ.log(trace.toString());
        }
    }

    /** The plain sentence for a failure: user errors keep their message, anything else is called internal. */
    public static String sentence(Throwable failure) {
        if (failure instanceof InputException || failure instanceof UncheckedIOException
                || failure instanceof IllegalArgumentException) {
            return capitalise(failure.getMessage());
        }
        return "Internal error: " + failure + ". Turn on debug mode (Edit > Options > Misc) to see the details"
                + " in the Log, and please report them.";
    }

    private static String capitalise(String s) {
        if (s == null || s.isEmpty()) {
            return "The input could not be used.";
        }
        String t = Character.toUpperCase(s.charAt(0)) + s.substring(1);
        return t.endsWith(".") ? t : t + ".";
    }
}
