package org.dendrokin.ij1;

import java.awt.TextField;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.Vector;

import ij.IJ;
import ij.ImagePlus;
import ij.ImageStack;
import ij.VirtualStack;
import ij.WindowManager;
import ij.gui.GenericDialog;
import ij.io.FileInfo;
import ij.io.FileSaver;
import ij.io.TiffEncoder;
import ij.plugin.PlugIn;

import org.dendrokin.core.Progress;
import org.dendrokin.core.kymo.Extraction;
import org.dendrokin.core.kymo.KymographExtractor;
import org.dendrokin.io.AtomicFiles;
import org.dendrokin.io.KymographCsv;
import org.dendrokin.io.movie.ImagePlusFrames;

/**
 * Plugins > Dendrokin > Kymograph Along Line: samples the current movie along the line selection (or along
 * each line in the ROI Manager) and opens the raw intensity kymograph as a calibrated 32-bit image. Reads
 * one plane at a time, so it works on virtual stacks without loading the movie.
 */
public class Kymograph_Along_Line implements PlugIn {
    static final String COMMAND = "Kymograph Along Line";

    /**
     * What the dialog asks for.
     *
     * @param pixelSizeUm    pixel size, um
     * @param frameIntervalS time between frames, s
     * @param bandWidthUm    width of the band averaged across the path, um
     * @param stepUm         spacing of samples along the path, um
     * @param channel        1-based channel of a multi-channel image
     * @param source         where the lines come from
     * @param saveFolder     folder to save CSV and TIFF in; empty: do not save
     */
    record Settings(double pixelSizeUm, double frameIntervalS, double bandWidthUm, double stepUm, int channel,
            LineSelection.Source source, String saveFolder) {
        Settings {
            positive(pixelSizeUm, "Pixel size must be a positive number of um (the image is not calibrated: enter it"
                    + " here or in Image > Properties)");
            positive(frameIntervalS, "Frame interval must be a positive number of seconds (the image has none: enter"
                    + " it here or in Image > Properties)");
            if (!(bandWidthUm >= 0) || !Double.isFinite(bandWidthUm)) {
                throw new IllegalArgumentException("Band width must be zero or a positive number of um");
            }
            positive(stepUm, "Step along the path must be a positive number of um");
        }

        private static void positive(double v, String message) {
            if (!(v > 0) || !Double.isFinite(v)) {
                throw new IllegalArgumentException(message);
            }
        }
    }

    @Override
    public void run(String arg) {
        ImagePlus movie = WindowManager.getCurrentImage();
        if (movie == null) {
            IJ.noImage();
            return;
        }
        IjProgress progress = new IjProgress(COMMAND);
        try {
            Settings settings = ask(movie);
            if (settings == null) {
                return;
            }
            List<LineSelection> lines = LineSelection.collect(movie, settings.source());
            ImagePlus previous = movie;
            for (LineSelection line : lines) {
                Extraction extraction = extract(movie, line, settings, progress);
                String title = title(movie, line, lines.size());
                ImagePlus image = KymographImage.toImage(extraction.kymograph(), title);
                if (extraction.samplesOutside() > 0) {
                    IJ.log(COMMAND + ": " + String.format(Locale.ROOT, "%.0f%%", 100 * extraction.fractionOutside())
                            + " of the path '" + line.name() + "' lies outside the image; those columns are NaN.");
                }
                if (!settings.saveFolder().isEmpty()) {
                    save(title, image, extraction, Path.of(settings.saveFolder()));
                }
                // several kymographs go side by side rather than on top of each other
                Display.showKymograph(image, previous);
                previous = image;
            }
            progress.finish(COMMAND + ": " + lines.size() + (lines.size() == 1 ? " kymograph" : " kymographs") + " made.");
        } catch (RuntimeException e) {
            Failures.show(COMMAND, e);
        }
    }

    /** Samples one line of the movie; the core does the work. */
    static Extraction extract(ImagePlus movie, LineSelection line, Settings s, Progress progress) {
        return KymographExtractor.extract(new ImagePlusFrames(movie, s.channel() - 1), line.path(), s.pixelSizeUm(),
                s.frameIntervalS(), s.bandWidthUm(), s.stepUm(), progress);
    }

    /** Shows the dialog, pre-filled from the image and its line; null if cancelled. */
    Settings ask(ImagePlus movie) {
        ImageSettings cal = ImageSettings.of(movie);
        double pixel = Double.isNaN(cal.pixelSizeUm()) ? 0 : cal.pixelSizeUm();
        double interval = Double.isNaN(cal.frameIntervalS()) ? 0 : cal.frameIntervalS();
        LineSelection.Source suggested = LineSelection.suggestedSource(movie);
        double lineWidthPx = 1;
        if (movie.getRoi() != null && LineSelection.isPath(movie.getRoi())) {
            lineWidthPx = LineSelection.of(movie.getRoi(), "selection").widthPx();
        }
        double band = pixel > 0 ? lineWidthPx * pixel : 1.0;
        OptionsDialog d = new OptionsDialog(COMMAND, "kymograph");
        d.choice("Lines", LineSelection.Source.labels(), suggested.label);
        d.number("Pixel size (um)", pixel, 4, false);
        d.number("Frame interval (s)", interval, 4, false);
        d.number("Band width (um)", round(band), 3, false);
        d.number("Step along the path (um)", round(pixel > 0 ? pixel : 1.0), 4, false);
        if (movie.getNChannels() > 1) {
            d.number("Channel (1-" + movie.getNChannels() + ")", movie.getChannel(), 0, false);
        }
        d.folder("Save CSV and TIFF to folder (empty: do not save)", "");
        d.message("The band width starts at the line width (double-click the line tool to change it).");
        BandOutline outline = new BandOutline(movie);
        if (d.generic() != null && !d.fromMacro()) {
            d.onChange((gd, e) -> {
                previewBand(gd, movie, outline);
                return true;
            });
            previewBand(d.generic(), movie, outline);
            Display.besideImage(d.generic(), movie);
        }
        boolean ok;
        try {
            ok = d.show();
        } finally {
            outline.remove();
        }
        if (!ok) {
            return null;
        }
        LineSelection.Source source = LineSelection.Source.of(d.nextChoice());
        double p = d.nextNumber();
        double f = d.nextNumber();
        double b = d.nextNumber();
        double st = d.nextNumber();
        int channel = movie.getNChannels() > 1 ? (int) Math.round(d.nextNumber()) : 1;
        if (channel < 1 || channel > movie.getNChannels()) {
            throw new IllegalArgumentException("Channel must be between 1 and " + movie.getNChannels());
        }
        return new Settings(p, f, b, st, channel, source, d.nextText());
    }

    /** Reads the current numbers straight from the open dialog (fields 0: pixel size, 2: band, 3: step). */
    private static void previewBand(GenericDialog gd, ImagePlus movie, BandOutline outline) {
        @SuppressWarnings("unchecked")
        Vector<TextField> fields = gd.getNumericFields();
        try {
            double pixel = Double.parseDouble(fields.get(0).getText().trim());
            double band = Double.parseDouble(fields.get(2).getText().trim());
            double step = Double.parseDouble(fields.get(3).getText().trim());
            List<LineSelection> lines = new ArrayList<>();
            String source = gd.getChoices().isEmpty() ? LineSelection.Source.SELECTION.label
                    : ((java.awt.Choice) gd.getChoices().get(0)).getSelectedItem();
            lines.addAll(LineSelection.collect(movie, LineSelection.Source.of(source)));
            outline.show(lines, pixel, band, step);
        } catch (RuntimeException e) {
            outline.show(List.of(), 0, 0, 0);
        }
    }

    private static double round(double v) {
        return Math.round(v * 1e4) / 1e4;
    }

    static String title(ImagePlus movie, LineSelection line, int count) {
        String stem = Titles.stem(movie);
        return count == 1 ? stem + " kymograph" : stem + " " + line.name() + " kymograph";
    }

    /** Writes the kymograph as the contract's CSV and as a calibrated TIFF, each through a temporary name. */
    static void save(String title, ImagePlus image, Extraction extraction, Path folder) {
        String stem = title.replaceAll("[^A-Za-z0-9._()-]", "_");
        KymographCsv.write(extraction.kymograph(), folder.resolve(stem + ".csv"));
        saveTiff(image, folder.resolve(stem + ".tif"));
    }

    /**
     * Saves an image (a virtual stack too, plane by plane) as an ImageJ TIFF with its calibration, through a
     * temporary name; unlike File > Save As, the image keeps its title and file.
     */
    static void saveTiff(ImagePlus image, Path target) {
        FileInfo fi = image.getFileInfo();
        ImageStack stack = image.getStack();
        if (stack.isVirtual()) {
            fi.virtualStack = (VirtualStack) stack;
            fi.pixels = null;
        }
        fi.description = new FileSaver(image).getDescriptionString();
        fi.info = image.getInfoProperty();
        if (stack.getSize() > 1 && stack.getSliceLabel(1) != null) {
            String[] labels = new String[stack.getSize()];
            for (int i = 1; i <= labels.length; i++) {
                labels[i - 1] = stack.getSliceLabel(i);
            }
            fi.sliceLabels = labels;
        }
        AtomicFiles.write(target, out -> new TiffEncoder(fi).write(out));
    }
}
