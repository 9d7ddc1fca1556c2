package org.dendrokin.cli;

import java.io.PrintWriter;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.concurrent.Callable;

import org.dendrokin.core.Progress;
import org.dendrokin.core.model.BuiltInModel;
import org.dendrokin.core.model.ModelCatalogue;
import org.dendrokin.core.model.ModelParameter;
import org.dendrokin.io.InputException;
import org.dendrokin.io.OutputFolder;
import org.dendrokin.io.model.SimulationOutputs;

import picocli.CommandLine.Command;
import picocli.CommandLine.IModelTransformer;
import picocli.CommandLine.Model.CommandSpec;
import picocli.CommandLine.Option;
import picocli.CommandLine.Parameters;
import picocli.CommandLine.Spec;

/**
 * The {@code simulate} command: runs a model file and writes a kymograph, its picture and a summary. Its help ends
 * with the built-in models and their parameters, read from the {@link ModelCatalogue}.
 */
@Command(name = "simulate", mixinStandardHelpOptions = true, modelTransformer = SimulateCommand.ModelList.class,
        description = "Simulate a reaction-diffusion model along a dendrite and write kymograph.csv, kymograph.png"
                + " and summary.json (and a synthetic movie if the model file asks for one); on a branched tree"
                + " (\"tree\" in the model file), one kymograph-BRANCH.csv and .png per branch and tree.png.")
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
        OutputFolder.check(outDir);
        SimulationOutputs.Written written = SimulationOutputs.simulate(modelFile, outDir, Version.get(), Progress.NONE);
        PrintWriter out = spec.commandLine().getOut();
        for (String w : written.warnings()) {
            out.println("Warning: " + w);
        }
        out.println("Wrote " + written.files().size() + " files to " + outDir);
        return Main.OK;
    }

    /** Adds the list of built-in models and their parameters to the help. */
    static final class ModelList implements IModelTransformer {
        /** Longest footer line; picocli would wrap longer ones at 80 columns without indenting them. */
        private static final int WIDTH = 78;

        @Override
        public CommandSpec transform(CommandSpec spec) {
            List<String> lines = new ArrayList<>();
            lines.add("");
            lines.add("Built-in models (\"model\" in MODEL_JSON; \"network\" for your own reaction network)");
            lines.add("and their parameters (\"parameters\"):");
            for (BuiltInModel m : ModelCatalogue.all()) {
                StringBuilder line = new StringBuilder("  " + m.name() + ":");
                List<ModelParameter> parameters = m.parameters();
                for (int i = 0; i < parameters.size(); i++) {
                    ModelParameter p = parameters.get(i);
                    String unit = p.unit().symbol();
                    String item = " " + p.name() + (unit.isEmpty() ? "" : " (" + unit + ")")
                            + (i < parameters.size() - 1 ? "," : "");
                    if (line.length() + item.length() > WIDTH) {
                        lines.add(line.toString());
                        line = new StringBuilder("     ");
                    }
                    line.append(item);
                }
                lines.add(line.toString());
            }
            spec.usageMessage().footer(lines.toArray(new String[0]));
            return spec;
        }
    }
}
