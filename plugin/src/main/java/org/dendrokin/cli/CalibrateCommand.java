package org.dendrokin.cli;

import java.io.PrintWriter;
import java.nio.file.Path;
import java.util.Locale;
import java.util.concurrent.Callable;

import org.dendrokin.core.calib.Standards;
import org.dendrokin.core.calib.StandardsFit;
import org.dendrokin.io.OutputFolder;
import org.dendrokin.io.calib.CalibrationBuilder;
import org.dendrokin.io.calib.CalibrationFile;
import org.dendrokin.io.calib.CalibrationPlot;
import org.dendrokin.io.calib.StandardsCsv;

import picocli.CommandLine.Command;
import picocli.CommandLine.Option;
import picocli.CommandLine.Parameters;
import picocli.CommandLine.Spec;
import picocli.CommandLine.Model.CommandSpec;

/** The {@code calibrate} command: a calibration file and its picture from a table of standards. */
@Command(name = "calibrate", mixinStandardHelpOptions = true,
        description = {"Builds a calibration from a table of standards (CSV with the header concentration_uM,"
                + "intensity; replicate rows allowed) and writes calibration.json and calibration.png to the "
                + "output folder. Use it from session.json as {\"method\": \"standards\", \"file\": "
                + "\"calibration.json\"}."})
final class CalibrateCommand implements Callable<Integer> {
    static final String JSON = "calibration.json";
    static final String PNG = "calibration.png";

    @Parameters(index = "0", paramLabel = "TABLE.csv", description = "The table of standards.")
    Path table;

    @Option(names = "--out", required = true, paramLabel = "DIR", description = "Output folder (created if missing).")
    Path out;

    @Option(names = "--monotone", description = "Interpolate the standards monotonically (Fritsch-Carlson) instead "
            + "of fitting the Hill form; the mean intensities must rise (or fall) strictly with concentration.")
    boolean monotone;

    @Spec
    CommandSpec spec;

    @Override
    public Integer call() {
        // a calibration may be saved into the session folder that names it ("method": "file")
        OutputFolder.checkWritable(out);
        Standards standards = StandardsCsv.read(table);
        CalibrationBuilder.Built built = CalibrationBuilder.fromStandards(standards, monotone, table,
                String.valueOf(table.getFileName()), "--monotone");
        Path json = out.resolve(JSON);
        Path png = out.resolve(PNG);
        CalibrationFile.write(built.json(), json);
        String title = (monotone ? "Monotone calibration from " : "Hill fit to ") + table.getFileName();
        CalibrationPlot.save(standards, built.calibration(), built.fit(), title, png);
        PrintWriter w = spec.commandLine().getOut();
        w.println(built.calibration().description() + ".");
        StandardsFit.Result fit = built.fit();
        if (fit != null) {
            for (StandardsFit.Estimate e : fit.estimates()) {
                w.println(String.format(Locale.ROOT, "  %-10s %.6g %s (95%% CI %.6g to %.6g)", e.name(), e.value(),
                        e.unit(), e.ci95Low(), e.ci95High()));
            }
            int m = fit.dof() + StandardsFit.PARAMETERS;
            w.println(String.format(Locale.ROOT, "  %d standards, residual SD %.4g", m, fit.residualSd()));
        }
        built.warnings().forEach(s -> w.println("Warning: " + s));
        w.println("Wrote " + json + " and " + png);
        w.flush();
        return Main.OK;
    }
}
