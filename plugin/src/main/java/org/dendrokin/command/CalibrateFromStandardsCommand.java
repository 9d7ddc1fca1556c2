package org.dendrokin.command;

import java.io.File;
import java.nio.file.Path;

import org.dendrokin.core.calib.StandardsFit;
import org.dendrokin.io.calib.CalibrationBuilder;
import org.dendrokin.io.calib.CalibrationFile;
import org.dendrokin.io.calib.CalibrationPlot;
import org.dendrokin.io.calib.StandardsCsv;
import org.scijava.ItemIO;
import org.scijava.command.Command;
import org.scijava.command.ContextCommand;
import org.scijava.log.LogService;
import org.scijava.plugin.Parameter;
import org.scijava.plugin.Plugin;
import org.scijava.widget.FileWidget;

/**
 * A calibration file (JSON, plus a PNG of the curve beside it) from a table of standards, as Plugins >
 * Dendrokin > Calibration from Standards makes it.
 */
@Plugin(type = Command.class, headless = true, menuPath = "Plugins>Dendrokin>Scripting>Calibration File from Table")
public class CalibrateFromStandardsCommand extends ContextCommand {
    @Parameter(label = "Standards table (CSV: concentration_uM,intensity)")
    private File table;

    @Parameter(label = "Monotone interpolation instead of the Hill fit")
    private boolean monotone;

    @Parameter(label = "Calibration file to write (JSON)", style = FileWidget.SAVE_STYLE)
    private File output;

    @Parameter(required = false)
    private LogService log;

    @Parameter(type = ItemIO.OUTPUT, label = "K (uM)")
    private double kHalfMicromolar = Double.NaN;

    @Parameter(type = ItemIO.OUTPUT, label = "n")
    private double hillN = Double.NaN;

    @Override
    public void run() {
        try {
            Path t = table.toPath();
            var standards = StandardsCsv.read(t);
            CalibrationBuilder.Built b = CalibrationBuilder.fromStandards(standards, monotone, t,
                    t.getFileName().toString(), "monotone=true");
            CalibrationFile.write(b.json(), output.toPath());
            String png = output.getName().replaceFirst("\\.json$", "") + ".png";
            CalibrationPlot.save(standards, b.calibration(), b.fit(), "Calibration from " + t.getFileName(),
                    output.toPath().resolveSibling(png));
            if (log != null) {
                b.warnings().forEach(log::warn);
            }
            if (b.fit() != null) {
                for (StandardsFit.Estimate e : b.fit().estimates()) {
                    if (e.name().equals("k_half_uM")) {
                        kHalfMicromolar = e.value();
                    } else if (e.name().equals("n")) {
                        hillN = e.value();
                    }
                }
            }
        } catch (RuntimeException e) {
            cancel(Commands.sentence(e));
        }
    }
}
