package org.dendrokin.cli;

import java.util.concurrent.Callable;

import org.dendrokin.io.InputException;

import picocli.CommandLine.Command;

/** The {@code demo} command; filled in by its own issue. */
@Command(name = "demo", mixinStandardHelpOptions = true, description = "Not yet available.")
final class DemoCommand implements Callable<Integer> {
    @Override
    public Integer call() {
        throw new InputException(null, "the demo command is not available in this build yet");
    }
}
