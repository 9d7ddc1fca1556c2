package org.dendrokin.cli;

import java.util.concurrent.Callable;

import org.dendrokin.io.InputException;

import picocli.CommandLine.Command;

/** The {@code analyze} command; filled in by its own issue. */
@Command(name = "analyze", mixinStandardHelpOptions = true, description = "Not yet available.")
final class AnalyzeCommand implements Callable<Integer> {
    @Override
    public Integer call() {
        throw new InputException(null, "the analyze command is not available in this build yet");
    }
}
