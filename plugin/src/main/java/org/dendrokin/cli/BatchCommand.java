package org.dendrokin.cli;

import java.util.concurrent.Callable;

import org.dendrokin.io.InputException;

import picocli.CommandLine.Command;

/** The {@code batch} command; filled in by its own issue. */
@Command(name = "batch", mixinStandardHelpOptions = true, description = "Not yet available.")
final class BatchCommand implements Callable<Integer> {
    @Override
    public Integer call() {
        throw new InputException(null, "the batch command is not available in this build yet");
    }
}
