package org.dendrokin.cli;

import java.nio.file.Path;
import java.util.concurrent.Callable;

import org.dendrokin.io.fit.ModelComparisonRun;

import picocli.CommandLine.Command;
import picocli.CommandLine.Option;
import picocli.CommandLine.Parameters;
import picocli.CommandLine.Spec;

/** The {@code compare} command: a measured kymograph beside a model with the user's own parameters. */
@Command(name = "compare", mixinStandardHelpOptions = true,
        description = "Put a model with your own parameters (no fitting) beside a measured kymograph: residuals, "
                + "front speed and peak decay length of each, and pictures. The measured numbers depend on the data "
                + "alone, timed from the data's own stimulus (--stimulus, else the results.json beside the "
                + "kymograph, else found in it); a warning says where the model's stimulus or extent does not match.")
final class CompareCommand implements Callable<Integer> {
    @Parameters(index = "0", paramLabel = "KYMOGRAPH_CSV", description = "kymograph.csv as written by analyze")
    Path kymograph;

    @Parameters(index = "1", paramLabel = "MODEL_JSON",
            description = "model, parameters and stimuli, e.g. {\"model\": \"nagumo\", \"parameters\": {\"D\": 1, "
                    + "\"k\": 0.5, \"a\": 0.2}, \"stimuli\": [{\"time_s\": 5, \"position_um\": 5, \"width_um\": 2, "
                    + "\"amount\": 1}], \"amplitude\": 1.5, \"baseline\": 0}")
    Path model;

    @Option(names = "--out", required = true, paramLabel = "OUT_DIR", description = "folder for comparison.json and pictures")
    Path out;

    @Option(names = "--signal-unit", defaultValue = "dF/F0", description = "unit of the kymograph's values (default ${DEFAULT-VALUE})")
    String signalUnit;

    @Option(names = "--stimulus", split = ",", paramLabel = "TIME_S,POSITION_UM",
            description = "the data's stimulus: time (s) and position along the path (um); default: from the "
                    + "results.json beside the kymograph, else found in the kymograph")
    double[] stimulus;

    @Spec
    picocli.CommandLine.Model.CommandSpec spec;

    @Override
    public Integer call() {
        if (stimulus != null && (stimulus.length != 2 || !Double.isFinite(stimulus[0])
                || !Double.isFinite(stimulus[1]))) {
            throw new picocli.CommandLine.ParameterException(spec.commandLine(),
                    "--stimulus takes two finite numbers, the time in s and the position in um, e.g. 9.75,14.9");
        }
        ModelComparisonRun.Result r = ModelComparisonRun.run(kymograph, model, signalUnit, stimulus, out);
        spec.commandLine().getOut().println(ModelComparisonRun.summary(r, signalUnit));
        r.warnings().forEach(w -> spec.commandLine().getOut().println("warning: " + w));
        return Main.OK;
    }
}
