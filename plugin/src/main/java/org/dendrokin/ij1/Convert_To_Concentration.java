package org.dendrokin.ij1;

import java.util.List;

import ij.IJ;
import ij.ImagePlus;
import ij.WindowManager;
import ij.measure.Calibration;
import ij.plugin.PlugIn;

import org.dendrokin.core.calib.CalibrationSummary;
import org.dendrokin.core.calib.Calibrator;
import org.dendrokin.core.calib.DynamicRange;
import org.dendrokin.core.calib.Hill;
import org.dendrokin.core.calib.Ratio;
import org.dendrokin.core.calib.SaturationLimits;
import org.dendrokin.core.calib.SignalKind;
import org.dendrokin.core.calib.SingleWavelength;
import org.dendrokin.core.kymo.Kymograph;
import org.dendrokin.io.calib.CalibrationFile;

/**
 * Plugins > Dendrokin > Convert to Concentration: turns the current kymograph or movie into a 32-bit image
 * in uM. A kymograph image is converted at once; a movie becomes a virtual stack calibrated plane by plane
 * (the movie is not copied). Samples outside the calibration's trusted range become NaN and are counted in
 * the Log, with the limits used.
 */
public class Convert_To_Concentration implements PlugIn {
    static final String COMMAND = "Convert to Concentration";
    static final String[] METHODS = {"single-wavelength", "hill", "ratio", "dynamic-range", "calibration file"};

    @Override
    public void run(String arg) {
        ImagePlus image = WindowManager.getCurrentImage();
        if (image == null) {
            IJ.noImage();
            return;
        }
        IjProgress progress = new IjProgress(COMMAND);
        try {
            boolean kymograph = image.getStackSize() == 1;
            OptionsDialog first = new OptionsDialog(COMMAND, "concentration");
            first.choice("Method", METHODS, METHODS[0]);
            first.number("Background (intensity, subtracted first)", 0, 3);
            first.number("Flag samples above (fraction of the range)", SaturationLimits.DEFAULT.flagAbove(), 2);
            first.number("Reject samples above (fraction of the range)", SaturationLimits.DEFAULT.rejectAbove(), 2);
            if (!first.show()) {
                return;
            }
            String method = first.nextChoice();
            double background = first.nextNumber();
            SaturationLimits limits = new SaturationLimits(first.nextNumber(), first.nextNumber());
            Setup setup = askConstants(method, image, kymograph);
            if (setup == null) {
                return;
            }
            ImagePlus result;
            if (kymograph) {
                result = convertKymograph(image, setup.calibration, limits, background);
            } else {
                result = convertMovie(image, setup, limits, background, progress);
            }
            if (kymograph) {
                Display.showKymograph(result, image);
            } else {
                result.show();
                Display.place(result.getWindow(), image.getWindow());
            }
            progress.finish(COMMAND + ": " + result.getTitle() + " made.");
        } catch (RuntimeException e) {
            Failures.show(COMMAND, e);
        }
    }

    /** A calibration with the channels the ratio method reads. */
    record Setup(org.dendrokin.core.calib.Calibration calibration, int channel, int denominator,
            double denominatorBackground) {
    }

    /** The second dialog: the chosen method's constants, with units. */
    static Setup askConstants(String method, ImagePlus image, boolean kymograph) {
        OptionsDialog d = new OptionsDialog(COMMAND + " (" + method + ")", "concentration." + method);
        boolean channels = !kymograph && image.getNChannels() > 1;
        switch (method) {
            case "single-wavelength" -> {
                d.number("Kd (uM)", 0.2, 4);
                d.number("Fmin (intensity at zero concentration)", 0, 3);
                d.number("Fmax (intensity at saturation)", 1000, 3);
            }
            case "hill" -> {
                d.number("K (uM, half-saturation)", 1, 4);
                d.number("n (Hill coefficient)", 1, 3);
                d.number("Fmin (intensity at zero concentration)", 0, 3);
                d.number("Fmax (intensity at saturation)", 1000, 3);
            }
            case "ratio" -> {
                d.number("Kd (uM)", 0.2, 4);
                d.number("Rmin (ratio at zero concentration)", 0.3, 4);
                d.number("Rmax (ratio at saturation)", 3, 4);
                d.number("Beta (denominator at zero / at saturation)", 1, 4);
                if (channels) {
                    d.number("Numerator channel", 1, 0);
                    d.number("Denominator channel", 2, 0);
                    d.number("Offset subtracted from the denominator (intensity)", 0, 3);
                }
            }
            case "calibration file" -> d.file("Calibration (JSON written by Calibration from Standards)", "");
            case "dynamic-range" -> {
                d.number("Kd (uM)", 0.2, 4);
                d.number("Rf (Fmax / Fmin)", 5, 3);
                d.number("Resting concentration (uM)", 0.05, 4);
                d.number("n (Hill coefficient)", 1, 3);
            }
            default -> throw new IllegalArgumentException("method=" + method + " is not one of "
                    + String.join(", ", METHODS));
        }
        if (!channels || !method.equals("ratio")) {
            if (!kymograph && image.getNChannels() > 1) {
                d.number("Channel", image.getChannel(), 0);
            }
        }
        if (!d.show()) {
            return null;
        }
        int channel = image.getChannel();
        int denominator = 0;
        double denBackground = 0;
        org.dendrokin.core.calib.Calibration cal;
        switch (method) {
            case "single-wavelength" -> cal = new SingleWavelength(d.nextNumber(), d.nextNumber(), d.nextNumber());
            case "hill" -> cal = new Hill(d.nextNumber(), d.nextNumber(), d.nextNumber(), d.nextNumber());
            case "ratio" -> {
                cal = new Ratio(d.nextNumber(), d.nextNumber(), d.nextNumber(), d.nextNumber());
                if (channels) {
                    channel = (int) d.nextNumber();
                    denominator = (int) d.nextNumber();
                    denBackground = d.nextNumber();
                } else if (!kymograph) {
                    throw new IllegalArgumentException("the ratio method needs two channels, but "
                            + image.getTitle() + " has one; convert a ratio kymograph instead, or open both channels"
                            + " as one hyperstack");
                }
            }
            case "calibration file" -> {
                String file = d.nextText();
                if (file.isEmpty()) {
                    throw new IllegalArgumentException("choose the calibration file (JSON) to apply");
                }
                cal = CalibrationFile.read(java.nio.file.Path.of(file));
            }
            default -> cal = new DynamicRange(d.nextNumber(), d.nextNumber(), d.nextNumber(), d.nextNumber());
        }
        if (!method.equals("ratio") && !kymograph && image.getNChannels() > 1) {
            channel = (int) d.nextNumber();
        }
        if (!kymograph) {
            checkChannel(image, channel);
            if (denominator > 0) {
                checkChannel(image, denominator);
            }
            if (cal.input() == SignalKind.DF_F0) {
                throw new IllegalArgumentException("the dynamic-range method converts dF/F0, which a raw movie is not;"
                        + " convert a dF/F0 kymograph instead");
            }
        }
        return new Setup(cal, channel, denominator, denBackground);
    }

    private static void checkChannel(ImagePlus image, int channel) {
        if (channel < 1 || channel > image.getNChannels()) {
            throw new IllegalArgumentException("channel " + channel + " does not exist; " + image.getTitle() + " has "
                    + image.getNChannels());
        }
    }

    /** Converts a kymograph image; its values are the calibration's input after the background. */
    static ImagePlus convertKymograph(ImagePlus image, org.dendrokin.core.calib.Calibration calibration,
            SaturationLimits limits, double background) {
        Kymograph k = KymographImage.fromImage(image);
        if (calibration.input() == SignalKind.DF_F0 && !k.signalUnit().equalsIgnoreCase("dF/F0")) {
            IJ.log(COMMAND + ": the dynamic-range method expects dF/F0, but the values of " + image.getTitle()
                    + " are in '" + k.signalUnit() + "'.");
        }
        double[] v = k.values();
        if (calibration.input() != SignalKind.DF_F0) {
            for (int i = 0; i < v.length; i++) {
                v[i] -= background;
            }
        }
        Calibrator.CalibratedKymograph c = Calibrator.apply(calibration, limits, k.withValues(v, k.signalUnit()));
        log(c.summary(), calibration, image.getTitle());
        ImagePlus out = KymographImage.toImage(c.values(), Titles.stem(image));
        out.setProp("dendrokin.calibration", calibration.description());
        return out;
    }

    /** Wraps a movie as a calibrated virtual stack and counts the flagged samples frame by frame. */
    static ImagePlus convertMovie(ImagePlus movie, Setup setup, SaturationLimits limits, double background,
            IjProgress progress) {
        ConcentrationStack stack = new ConcentrationStack(movie, setup.calibration(), limits, setup.channel(),
                background, setup.denominator(), setup.denominatorBackground());
        CalibrationSummary summary = null;
        for (int t = 1; t <= stack.getSize(); t++) {
            progress.checkCancelled();
            CalibrationSummary s = stack.calibrated(t).summary();
            summary = summary == null ? s : summary.plus(s);
            progress.report("checking the calibrated range", t, stack.getSize());
        }
        log(summary, setup.calibration(), movie.getTitle());
        ImagePlus out = new ImagePlus(Titles.derived(movie, "", "uM"), stack);
        Calibration cal = movie.getCalibration().copy();
        cal.disableDensityCalibration();
        cal.setValueUnit("uM");
        out.setCalibration(cal);
        out.setDimensions(1, 1, stack.getSize());
        out.setOpenAsHyperStack(false);
        out.setProp("dendrokin.calibration", setup.calibration().description());
        org.dendrokin.core.calib.Calibration c = setup.calibration();
        double top = c.concentrationMicromolar(c.rangeStart() + limits.flagAbove() * (c.rangeEnd() - c.rangeStart()));
        out.setDisplayRange(0, Double.isFinite(top) && top > 0 ? top : 1);
        return out;
    }

    private static void log(CalibrationSummary summary, org.dendrokin.core.calib.Calibration calibration,
            String title) {
        if (summary == null) {
            return;
        }
        List<String> warnings = summary.warnings(calibration);
        for (String w : warnings) {
            IJ.log(COMMAND + " (" + title + "): " + w);
        }
    }
}
