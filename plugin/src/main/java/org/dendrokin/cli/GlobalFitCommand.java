package org.dendrokin.cli;

import java.nio.file.Path;
import java.util.concurrent.Callable;

import org.dendrokin.core.Progress;
import org.dendrokin.io.batch.BatchRunner;
import org.dendrokin.io.batch.GlobalFitStudy;

import picocli.CommandLine.Command;
import picocli.CommandLine.Option;
import picocli.CommandLine.Parameters;
import picocli.CommandLine.Spec;
import picocli.CommandLine.Model.CommandSpec;

/** {@code global-fit RESULTS_DIR --model MODEL --out OUT}: the joint fit of a batch's finished sessions. */
@Command(name = "global-fit", mixinStandardHelpOptions = true, sortOptions = false,
        description = {"Fit one D and one k per group (the group key of session.json) to all sessions of the group at "
                + "once, each session keeping its own amplitude, width, baseline and noise level, and compare the "
                + "groups. RESULTS_DIR is the output folder of batch (or of its merged SLURM shards); it is only read.",
            "Writes global-fit.json, global-fit.html and its pictures into OUT."})
final class GlobalFitCommand implements Callable<Integer> {
    @Parameters(index = "0", paramLabel = "RESULTS_DIR", description = "A batch's output folder (it holds sessions/).")
    Path results;

    @Option(names = "--model", required = true, paramLabel = "MODEL", description = "The model: diffusion-decay.")
    String model;

    @Option(names = "--out", required = true, paramLabel = "OUT",
            description = "Output folder, created if missing; nothing is written outside it.")
    Path out;

    @Option(names = "--bootstrap", paramLabel = "N",
            description = "Resamples of the sessions for the bootstrap intervals (default 200; 0: none).")
    int bootstrap = 200;

    @Option(names = "--seed", paramLabel = "S", description = "Seed of those resamples (default 1).")
    long seed = 1;

    @Spec
    CommandSpec spec;

    @Override
    public Integer call() {
        GlobalFitStudy.checkModel(model);
        if (bootstrap < 0) {
            throw new org.dendrokin.io.InputException(null, "--bootstrap must be 0 or more");
        }
        Path r = results.toAbsolutePath().normalize();
        GlobalFitStudy.Outcome o = GlobalFitStudy.runToFolder(r, BatchRunner.sessionIds(r, results),
                new GlobalFitStudy.Request(model, bootstrap, seed), out, Progress.NONE);
        spec.commandLine().getOut().println(GlobalFitStudy.summary(o));
        return Main.OK;
    }
}
