package org.dendrokin.cli;

import java.io.PrintWriter;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.concurrent.Callable;

import org.dendrokin.core.Progress;
import org.dendrokin.io.InputException;
import org.dendrokin.io.model.SimulationOutputs;

import picocli.CommandLine.Command;
import picocli.CommandLine.Model.CommandSpec;
import picocli.CommandLine.Option;
import picocli.CommandLine.Parameters;
import picocli.CommandLine.Spec;

/** The {@code simulate} command: runs a model file and writes a kymograph, its picture and a summary. */
@Command(name = "simulate", mixinStandardHelpOptions = true,
        description = "Simulate a reaction-diffusion model along a dendrite and write kymograph.csv, kymograph.png"
                + " and summary.json (and a synthetic movie if the model file asks for one).")
final class SimulateCommand implements Callable<Integer> {
    @Parameters(index = "0", paramLabel = "MODEL_JSON", description = "The model file (see docs/models.md).")
    Path modelFile;

    @Option(names = "--out", required = true, paramLabel = "OUT_DIR",
            description = "Output folder (created if missing).")
    Path outDir;

    @Spec
    CommandSpec spec;

    @Override
    public Integer call() {
        if (!Files.isRegularFile(modelFile)) {
            throw new InputException(modelFile, "does not exist or is not a file");
        }
        if (Files.exists(outDir) && !Files.isDirectory(outDir)) {
            throw new InputException(outDir, "exists and is not a folder");
        }
        SimulationOutputs.Written written = SimulationOutputs.simulate(modelFile, outDir, Version.get(), Progress.NONE);
        PrintWriter out = spec.commandLine().getOut();
        for (String w : written.warnings()) {
            out.println("Warning: " + w);
        }
        out.println("Wrote " + written.files().size() + " files to " + outDir);
        return Main.OK;
    }
}
