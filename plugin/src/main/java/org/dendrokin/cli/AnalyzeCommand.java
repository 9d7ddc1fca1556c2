package org.dendrokin.cli;

import java.io.File;
import java.util.concurrent.Callable;

import org.dendrokin.io.SessionRunner;

import picocli.CommandLine.Command;
import picocli.CommandLine.Option;
import picocli.CommandLine.Parameters;
import picocli.CommandLine.Spec;
import picocli.CommandLine.Model.CommandSpec;

/** {@code analyze SESSION_DIR --out OUT_DIR}: one session folder to kymograph, pictures, results and report. */
@Command(name = "analyze", mixinStandardHelpOptions = true,
        description = "Analyse one session folder (a folder holding session.json, a movie and a path).")
final class AnalyzeCommand implements Callable<Integer> {
    @Parameters(index = "0", paramLabel = "SESSION_DIR", description = "The session folder; it is never written.")
    File sessionDir;

    @Option(names = "--out", required = true, paramLabel = "OUT_DIR",
            description = "Output folder, created if missing; nothing is written outside it.")
    File outDir;

    @Spec
    CommandSpec spec;

    @Override
    public Integer call() {
        SessionRunner.Result result = DemoCommand.run(sessionDir.toPath(), outDir.toPath(),
                spec.commandLine().getErr());
        spec.commandLine().getOut().println(DemoCommand.summary(result));
        return Main.OK;
    }
}
