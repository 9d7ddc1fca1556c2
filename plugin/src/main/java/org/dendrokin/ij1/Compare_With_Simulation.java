package org.dendrokin.ij1;

import java.nio.file.Path;
import java.util.Arrays;
import java.util.Locale;

import ij.IJ;
import ij.ImagePlus;
import ij.ImageStack;
import ij.WindowManager;
import ij.gui.Plot;
import ij.measure.ResultsTable;
import ij.plugin.PlugIn;
import ij.process.FloatProcessor;

import org.dendrokin.core.kymo.Kymograph;
import org.dendrokin.core.spread.SpreadAnalysis;
import org.dendrokin.io.KymographCsv;
import org.dendrokin.io.compare.ModelComparison;
import org.dendrokin.io.compare.ModelComparison.Comparison;
import org.dendrokin.io.plot.ColourScale;

/**
 * Plugins > Dendrokin > Compare with Simulation: puts a model with the user's own parameters (no fitting)
 * beside the measured kymograph. Opens one stack (measured, simulated, measured minus simulated) on one
 * colour scale, a table with the residual norm and the front speed and peak decay length of each, and a plot
 * of profiles at a few times.
 */
public class Compare_With_Simulation implements PlugIn {
    static final String COMMAND = "Compare with Simulation";

    @Override
    public void run(String arg) {
        ImagePlus current = WindowManager.getCurrentImage();
        if (current == null) {
            IJ.noImage();
            return;
        }
        IjProgress progress = new IjProgress(COMMAND);
        try {
            Kymograph measured = KymographImage.fromImage(current);
            OptionsDialog d = new OptionsDialog(COMMAND, "compare");
            ModelSettings.addFields(d, measured.distanceUm(measured.positionCount() - 1),
                    measured.timeS(measured.frameCount() / 10));
            d.folder("Save CSV and TIFF to folder (empty: do not save)", "");
            if (!d.show()) {
                return;
            }
            ModelComparison.Settings model = ModelSettings.read(d);
            String folder = d.nextText();
            Comparison c = ModelComparison.compare(measured, model, progress);
            c.mismatches().forEach(w -> IJ.log(COMMAND + ": " + w));
            ImagePlus stack = stack(c, Titles.derived(current, "vs " + model.model(), measured.signalUnit()));
            ResultsTable table = table(c, model);
            if (!folder.isEmpty()) {
                Path dir = Path.of(folder);
                KymographCsv.write(c.simulated(), dir.resolve(stem(stack) + "_simulated.csv"));
                KymographCsv.write(c.residual(), dir.resolve(stem(stack) + "_residual.csv"));
                Kymograph_Along_Line.saveTiff(stack, dir.resolve(stem(stack) + ".tif"));
                Tables.saveCsv(table, dir.resolve(stem(stack) + ".csv"));
            }
            Display.showKymograph(stack, current);
            Tables.show(table, "Dendrokin comparison", stack.getWindow());
            if (!OptionsDialog.headless()) {
                Display.showPlot(profilePlot(c, model), stack.getWindow());
            }
            progress.finish(COMMAND + String.format(Locale.ROOT, ": RMSE %.4g %s.", c.rmse(), measured.signalUnit()));
        } catch (RuntimeException e) {
            Failures.show(COMMAND, e);
        }
    }

    /** Measured, simulated and residual as one three-slice stack with one display range. */
    static ImagePlus stack(Comparison c, String title) {
        double[] all = concat(c.measured().values(), c.simulated().values(), c.residual().values());
        double[] range = KymographImage.displayRange(all);
        ImageStack stack = new ImageStack(c.measured().positionCount(), c.measured().frameCount());
        String[] labels = {"measured", "simulated", "measured - simulated"};
        Kymograph[] ks = {c.measured(), c.simulated(), c.residual()};
        for (int i = 0; i < 3; i++) {
            ImagePlus one = KymographImage.toImage(ks[i], labels[i]);
            stack.addSlice(labels[i], (FloatProcessor) one.getProcessor());
        }
        ImagePlus image = new ImagePlus(title, stack);
        image.setCalibration(KymographImage.calibration(c.measured()));
        image.getProcessor().setLut(KymographImage.lut(ColourScale.SEQUENTIAL));
        image.setDisplayRange(range[0], range[1]);
        image.setProp(KymographImage.PROPERTY, "slices: measured, simulated, measured - simulated; one colour scale");
        return image;
    }

    /** The numbers a user compares: residual norm, front speed and peak decay length of each. */
    static ResultsTable table(Comparison c, ModelComparison.Settings model) {
        ResultsTable t = Tables.quantities();
        String unit = c.measured().signalUnit();
        Tables.add(t, "measured - simulated", "RMSE", c.rmse(), unit, Double.NaN, Double.NaN, "root mean square of"
                + " the residual over all finite samples");
        SpreadAnalysis.Result[] results = {c.measuredSpread(), c.simulatedSpread()};
        String[] sources = {"measured", "simulated"};
        for (int i = 0; i < 2; i++) {
            String why = String.join(" ", results[i].warnings());
            Tables.add(t, sources[i], "front speed", "um/s", results[i].frontSpeed(), why);
            Tables.add(t, sources[i], "peak decay length", "um", results[i].peakDecayLength(), why);
            Tables.add(t, sources[i], "decay time", "s", results[i].decayTime(), why);
        }
        double[] p = model.parameters();
        String[][] labels = model.parameterLabels();
        for (int i = 0; i < p.length; i++) {
            Tables.add(t, model.model() + " (given)", labels[i][0], p[i], labels[i][1], Double.NaN, Double.NaN,
                    "set in the dialog, not fitted");
        }
        return t;
    }

    /** Profiles along the path at a few times after the stimulus: measured as points, simulated as lines. */
    static Plot profilePlot(Comparison c, ModelComparison.Settings model) {
        return ProfilePlot.of("Profiles: measured (points) and " + model.model() + " (lines)", c.measured(),
                c.simulated(), model.stimulusTimeS());
    }

    static void saveKymograph(ImagePlus image, Kymograph k, Path folder) {
        KymographCsv.write(k, folder.resolve(stem(image) + ".csv"));
        Kymograph_Along_Line.saveTiff(image, folder.resolve(stem(image) + ".tif"));
    }

    static String stem(ImagePlus image) {
        return image.getTitle().replaceAll("[^A-Za-z0-9._()-]", "_");
    }

    private static double[] concat(double[]... arrays) {
        return Arrays.stream(arrays).flatMapToDouble(Arrays::stream).toArray();
    }
}
