package org.dendrokin.ij1;

import java.awt.Color;
import java.awt.Window;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;

import ij.IJ;
import ij.ImagePlus;
import ij.WindowManager;
import ij.gui.Plot;
import ij.gui.Roi;
import ij.measure.Measurements;
import ij.measure.ResultsTable;
import ij.plugin.PlugIn;
import ij.plugin.frame.RoiManager;
import ij.process.ImageProcessor;
import ij.process.ImageStatistics;

import org.dendrokin.core.calib.Calibration;
import org.dendrokin.core.calib.FittedHill;
import org.dendrokin.core.calib.Standards;
import org.dendrokin.core.calib.StandardsFit;
import org.dendrokin.io.calib.CalibrationBuilder;
import org.dendrokin.io.calib.CalibrationFile;
import org.dendrokin.io.calib.CalibrationPlot;
import org.dendrokin.io.calib.StandardsCsv;

/**
 * Plugins > Dendrokin > Calibration from Standards: fits the Hill form (or a monotone interpolant) to
 * standards of known concentration, read from a CSV table or measured by ImageJ as the mean intensity of
 * ROI Manager ROIs drawn on images of the standards; shows the curve with its 95% band and its residuals as
 * ImageJ plots and the constants with their intervals in a table, and saves the calibration file that
 * session.json and Convert to Concentration can use.
 */
public class Calibration_From_Standards implements PlugIn {
    static final String COMMAND = "Calibration from Standards";
    static final String[] SOURCES = {"table", "ROI Manager"};

    @Override
    public void run(String arg) {
        try {
            OptionsDialog d = new OptionsDialog(COMMAND, "standards");
            d.choice("Standards from", SOURCES, SOURCES[0]);
            d.file("Table (CSV with concentration_uM,intensity)", "");
            d.text("Concentrations (uM, one per ROI, in ROI Manager order)", "", 30);
            d.number("Background (intensity, subtracted from ROI means)", 0, 3);
            d.check("Monotone interpolation instead of the Hill fit", false);
            d.file("Save calibration as (JSON; empty: do not save)", "");
            if (!d.show()) {
                return;
            }
            String source = d.nextChoice();
            String tableText = d.nextText();
            String concentrations = d.nextText();
            double background = d.nextNumber();
            boolean monotone = d.nextCheck();
            String saveAs = d.nextText();

            Standards standards;
            Path table = null;
            if (source.equals(SOURCES[0])) {
                if (tableText.isEmpty()) {
                    throw new IllegalArgumentException("choose the table of standards (a CSV with the header"
                            + " concentration_uM,intensity)");
                }
                table = Path.of(tableText);
                standards = StandardsCsv.read(table);
            } else {
                standards = fromRois(WindowManager.getCurrentImage(), concentrations, background);
            }
            String sourceName = table == null ? "ROI Manager" : table.getFileName().toString();
            CalibrationBuilder.Built built = CalibrationBuilder.fromStandards(standards, monotone, table, sourceName,
                    "the monotone check box");
            built.warnings().forEach(w -> IJ.log(COMMAND + ": " + w));
            if (!saveAs.isEmpty()) {
                Path target = Path.of(saveAs.endsWith(".json") ? saveAs : saveAs + ".json");
                CalibrationFile.write(built.json(), target);
                String png = target.getFileName().toString().replaceFirst("\\.json$", ".png");
                CalibrationPlot.save(standards, built.calibration(), built.fit(), "Calibration from " + sourceName,
                        target.resolveSibling(png));
                IJ.showStatus(COMMAND + ": saved " + target);
            }
            Window curve = null;
            if (!OptionsDialog.headless()) {
                curve = Display.showPlot(curvePlot(standards, built, sourceName), Display.anchor());
                if (built.fit() != null) {
                    Display.showPlot(residualPlot(standards, built.calibration()), curve);
                }
            }
            Tables.show(table(built), "Dendrokin calibration", curve);
        } catch (RuntimeException e) {
            Failures.show(COMMAND, e);
        }
    }

    /**
     * Standards measured by ImageJ: the mean of each ROI Manager ROI on its own slice (or the current one),
     * minus the background, paired in order with the typed concentrations.
     */
    static Standards fromRois(ImagePlus image, String concentrations, double background) {
        if (image == null) {
            throw new IllegalArgumentException("open the images of the standards and add one ROI per standard to the"
                    + " ROI Manager");
        }
        RoiManager manager = RoiManager.getInstance();
        Roi[] rois = manager == null ? new Roi[0] : manager.getRoisAsArray();
        double[] c = parseList(concentrations);
        if (rois.length == 0 || rois.length != c.length) {
            throw new IllegalArgumentException("the ROI Manager holds " + rois.length + " ROIs but " + c.length
                    + " concentrations were given; give one concentration (uM) per ROI, in the same order");
        }
        double[] f = new double[rois.length];
        for (int i = 0; i < rois.length; i++) {
            int slice = rois[i].getPosition() > 0 ? rois[i].getPosition() : image.getCurrentSlice();
            ImageProcessor ip = image.getStack().getProcessor(slice);
            ip.setRoi(rois[i]);
            f[i] = ImageStatistics.getStatistics(ip, Measurements.MEAN, null).mean - background;
        }
        return new Standards(c, f);
    }

    static double[] parseList(String text) {
        List<Double> values = new ArrayList<>();
        for (String part : text.split("[,;\\s]+")) {
            if (!part.isEmpty()) {
                try {
                    values.add(Double.parseDouble(part));
                } catch (NumberFormatException e) {
                    throw new IllegalArgumentException("'" + part + "' in the list of concentrations is not a number");
                }
            }
        }
        return values.stream().mapToDouble(Double::doubleValue).toArray();
    }

    /** The fitted constants with their intervals (or the monotone table's size). */
    static ResultsTable table(CalibrationBuilder.Built built) {
        ResultsTable t = Tables.quantities();
        if (built.fit() == null) {
            Tables.add(t, "monotone", "standards", Double.NaN, "", Double.NaN, Double.NaN,
                    "monotone interpolation through the mean intensity of each concentration; no intervals");
            return t;
        }
        for (StandardsFit.Estimate e : built.fit().estimates()) {
            Tables.add(t, "hill fit", e.name(), e.value(), e.unit(), e.ci95Low(), e.ci95High(),
                    "95% interval, Student t with " + built.fit().dof() + " degrees of freedom");
        }
        Tables.add(t, "hill fit", "residual SD", built.fit().residualSd(), "intensity", Double.NaN, Double.NaN,
                "sqrt(RSS / (m - 4))");
        return t;
    }

    /** Standards as points, the curve and its 95% band, concentration on a log axis. */
    static Plot curvePlot(Standards standards, CalibrationBuilder.Built built, String sourceName) {
        double lo = Double.POSITIVE_INFINITY;
        double hi = 0;
        for (double c : standards.concentrationsMicromolar()) {
            if (c > 0) {
                lo = Math.min(lo, c);
                hi = Math.max(hi, c);
            }
        }
        Plot plot = new Plot("Calibration from " + sourceName, "concentration (uM, log scale)",
                "intensity (background subtracted)");
        int n = 200;
        double[] x = new double[n];
        double[] y = new double[n];
        double[] bandLo = new double[n];
        double[] bandHi = new double[n];
        double from = lo / 3;
        double to = hi * 3;
        Calibration cal = built.calibration();
        double t = built.fit() == null ? 0 : built.fit().tQuantile();
        for (int i = 0; i < n; i++) {
            x[i] = from * Math.pow(to / from, i / (n - 1.0));
            y[i] = cal.signal(x[i]);
            double sd = cal instanceof FittedHill h ? h.signalSd(x[i]) : 0;
            bandLo[i] = y[i] - t * sd;
            bandHi[i] = y[i] + t * sd;
        }
        plot.setLogScaleX();
        if (built.fit() != null) {
            // both edges of the band as one series, broken by NaN, so that the legend names it once
            double[] bx = new double[2 * n + 1];
            double[] by = new double[2 * n + 1];
            for (int i = 0; i < n; i++) {
                bx[i] = x[i];
                by[i] = bandLo[i];
                bx[n + 1 + i] = x[i];
                by[n + 1 + i] = bandHi[i];
            }
            bx[n] = Double.NaN;
            by[n] = Double.NaN;
            plot.setColor(new Color(150, 180, 230));
            plot.add("line", bx, by);
        }
        plot.setColor(new Color(210, 90, 30));
        plot.setLineWidth(2);
        plot.add("line", x, y);
        plot.setLineWidth(1);
        plot.setColor(new Color(30, 90, 170));
        List<Double> px = new ArrayList<>();
        List<Double> py = new ArrayList<>();
        for (int i = 0; i < standards.size(); i++) {
            if (standards.concentrationMicromolar(i) > 0) {
                px.add(standards.concentrationMicromolar(i));
                py.add(standards.intensity(i));
            }
        }
        plot.add("circle", px.stream().mapToDouble(Double::doubleValue).toArray(),
                py.stream().mapToDouble(Double::doubleValue).toArray());
        plot.setColor(Color.BLACK);
        plot.addLegend(built.fit() == null ? "curve\nstandards" : "95% band of the curve\nfitted Hill curve\nstandards");
        plot.setFrameSize(520, 320);
        return plot;
    }

    /** Measured minus fitted intensity of each standard. */
    static Plot residualPlot(Standards standards, Calibration cal) {
        double[] c = standards.concentrationsMicromolar();
        double[] r = new double[c.length];
        for (int i = 0; i < c.length; i++) {
            r[i] = standards.intensity(i) - cal.signal(c[i]);
        }
        Plot plot = new Plot("Residuals of the calibration", "concentration (uM)", "measured - fitted intensity");
        plot.setColor(new Color(30, 90, 170));
        plot.add("circle", c, r);
        plot.setColor(Color.GRAY);
        plot.add("line", new double[] {0, max(c)}, new double[] {0, 0});
        // a margin, so that no standard sits on the frame where it is half hidden
        double rMax = 0;
        for (double v : r) {
            rMax = Math.max(rMax, Math.abs(v));
        }
        double xPad = 0.05 * Math.max(max(c), 1e-9);
        double yPad = 1.15 * Math.max(rMax, 1e-9);
        plot.setLimits(-xPad, max(c) + xPad, -yPad, yPad);
        plot.setFrameSize(520, 200);
        return plot;
    }

    private static double max(double[] v) {
        double m = 0;
        for (double x : v) {
            m = Math.max(m, x);
        }
        return m;
    }
}
