package org.dendrokin.cli;

import java.util.concurrent.Callable;

import org.dendrokin.io.InputException;

import picocli.CommandLine.Command;

/** The {@code simulate} command; filled in by its own issue. */
@Command(name = "simulate", mixinStandardHelpOptions = true, description = "Not yet available.")
final class SimulateCommand implements Callable<Integer> {
    @Override
    public Integer call() {
        throw new InputException(null, "the simulate command is not available in this build yet");
    }
}
