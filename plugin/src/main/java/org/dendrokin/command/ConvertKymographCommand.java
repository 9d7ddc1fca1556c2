package org.dendrokin.command;

import java.io.File;

import org.dendrokin.core.calib.Calibration;
import org.dendrokin.core.calib.Calibrator;
import org.dendrokin.core.calib.SaturationLimits;
import org.dendrokin.core.kymo.Kymograph;
import org.dendrokin.io.KymographCsv;
import org.dendrokin.io.calib.CalibrationFile;
import org.scijava.ItemIO;
import org.scijava.command.Command;
import org.scijava.command.ContextCommand;
import org.scijava.log.LogService;
import org.scijava.plugin.Parameter;
import org.scijava.plugin.Plugin;
import org.scijava.widget.FileWidget;

/**
 * A kymograph CSV of background-subtracted intensities converted to uM with a calibration file, as Plugins >
 * Dendrokin > Convert to Concentration does with its "calibration file" method. Samples outside the trusted
 * range become NaN; the warnings say how many and why.
 */
@Plugin(type = Command.class, headless = true, menuPath = "Plugins>Dendrokin>Scripting>Kymograph to Concentration")
public class ConvertKymographCommand extends ContextCommand {
    @Parameter(label = "Kymograph CSV (intensity)")
    private File kymograph;

    @Parameter(label = "Calibration file (JSON)")
    private File calibration;

    @Parameter(label = "Background (intensity, subtracted first)")
    private double background;

    @Parameter(label = "Kymograph CSV to write (uM)", style = FileWidget.SAVE_STYLE)
    private File output;

    @Parameter(required = false)
    private LogService log;

    @Parameter(type = ItemIO.OUTPUT, label = "Fraction of samples set to NaN")
    private double fractionNan;

    @Override
    public void run() {
        try {
            Calibration cal = CalibrationFile.read(calibration.toPath());
            Kymograph k = KymographCsv.read(kymograph.toPath(), "intensity");
            double[] v = k.values();
            for (int i = 0; i < v.length; i++) {
                v[i] -= background;
            }
            Calibrator.CalibratedKymograph c = Calibrator.apply(cal, SaturationLimits.DEFAULT, k.withValues(v,
                    k.signalUnit()));
            KymographCsv.write(c.values(), output.toPath());
            fractionNan = c.summary().fractionNan();
            if (log != null) {
                c.summary().warnings(cal).forEach(log::warn);
            }
        } catch (RuntimeException e) {
            cancel(Commands.sentence(e));
        }
    }
}
