package org.dendrokin.ij1;

import java.util.Arrays;

import ij.IJ;
import ij.ImagePlus;
import ij.WindowManager;
import ij.plugin.PlugIn;

import org.dendrokin.core.kymo.Extraction;
import org.dendrokin.core.kymo.Kymograph;
import org.dendrokin.core.kymo.KymographExtractor;
import org.dendrokin.core.path.DendritePath;
import org.dendrokin.core.preprocess.BackgroundEstimator;
import org.dendrokin.core.preprocess.Preprocessing;
import org.dendrokin.io.compare.ModelComparison;
import org.dendrokin.io.movie.ImagePlusFrames;

/**
 * Plugins > Dendrokin > Simulate Along Line: runs a built-in reaction-diffusion model along the dendrite and
 * opens the simulated kymograph beside the measured one. The grid comes from the current image: a kymograph
 * image gives its own distances and frame times; a movie with a line selection gives the line's length
 * (sampled at the step) and the movie's frames.
 */
public class Simulate_Along_Line implements PlugIn {
    static final String COMMAND = "Simulate Along Line";

    @Override
    public void run(String arg) {
        ImagePlus current = WindowManager.getCurrentImage();
        if (current == null) {
            IJ.noImage();
            return;
        }
        IjProgress progress = new IjProgress(COMMAND);
        try {
            Kymograph grid = grid(current);
            OptionsDialog d = new OptionsDialog(COMMAND, "simulate");
            ModelSettings.addFields(d, grid.distanceUm(grid.positionCount() - 1), firstAfterStart(grid));
            d.folder("Save CSV and TIFF to folder (empty: do not save)", "");
            if (!d.show()) {
                return;
            }
            ModelComparison.Settings model = ModelSettings.read(d);
            String folder = d.nextText();
            Kymograph simulated = ModelComparison.simulateOn(grid, model, progress);
            ImagePlus image = KymographImage.toImage(simulated, Titles.stem(current) + " simulated " + model.model());
            image.setProp("dendrokin.model", model.toString());
            if (!folder.isEmpty()) {
                Compare_With_Simulation.saveKymograph(image, simulated, java.nio.file.Path.of(folder));
            }
            ImagePlus measured = current.getStackSize() > 1 ? measured(current, model.stimulusTimeS(), model.stimulusUm(), progress) : null;
            if (measured != null) {
                // the measured dF/F0 beside the model, both on the model's display range for a fair look
                measured.setDisplayRange(image.getDisplayRangeMin(), image.getDisplayRangeMax());
                Display.showKymograph(measured, current);
                Display.showKymograph(image, measured);
            } else {
                Display.showKymograph(image, current);
            }
            progress.finish(COMMAND + ": " + model.model() + " simulated on " + grid.positionCount() + " positions x "
                    + grid.frameCount() + " frames" + (measured != null ? ", beside the measured dF/F0." : "."));
        } catch (RuntimeException e) {
            Failures.show(COMMAND, e);
        }
    }

    /** The simulation grid, taken from a kymograph image or from a movie and its line selection. */
    static Kymograph grid(ImagePlus current) {
        if (current.getStackSize() == 1) {
            return KymographImage.fromImage(current);
        }
        ImageSettings cal = ImageSettings.of(current);
        if (!(cal.pixelSizeUm() > 0) || !(cal.frameIntervalS() > 0)) {
            throw new IllegalArgumentException("the movie " + current.getTitle() + " needs a pixel size in um and a"
                    + " frame interval in s (Image > Properties) to set the simulation's grid");
        }
        LineSelection line = LineSelection.of(current.getRoi(), "selection");
        DendritePath path = line.path();
        double length = path.lengthPx() * cal.pixelSizeUm();
        double step = cal.pixelSizeUm();
        int n = (int) Math.floor(length / step + 1e-9) + 1;
        double[] d = new double[n];
        for (int i = 0; i < n; i++) {
            d[i] = i * step;
        }
        int frames = current.getNFrames() > 1 ? current.getNFrames() : current.getNSlices();
        double[] t = new double[frames];
        for (int i = 0; i < frames; i++) {
            t[i] = i * cal.frameIntervalS();
        }
        return new Kymograph(d, t, new double[n * frames], "dF/F0");
    }

    /**
     * The measured kymograph along the movie's line, on the simulation's grid (one sample per pixel along the
     * line, a band as wide as the line), as dF/F0 corrected as {@code analyze} corrects it: background from
     * pixels away from the line subtracted, bleaching fitted on the frames before the stimulus and removed, F0
     * from those frames. Null, with a line in the Log, when no frame precedes the stimulus
     * (then there is no F0 to compare with).
     */
    static ImagePlus measured(ImagePlus movie, double stimulusTimeS, double stimulusUm, IjProgress progress) {
        ImageSettings cal = ImageSettings.of(movie);
        double px = cal.pixelSizeUm();
        int before = (int) Math.ceil(stimulusTimeS / cal.frameIntervalS()) - 1;
        if (before < 0) {
            IJ.log(COMMAND + ": the stimulus is at the first frame, so there is no baseline for F0; only the model"
                    + " is shown.");
            return null;
        }
        LineSelection line = LineSelection.of(movie.getRoi(), "selection");
        ImagePlusFrames frames = new ImagePlusFrames(movie, movie.getChannel() - 1);
        double bandUm = Math.max(1, line.widthPx()) * px;
        Extraction e = KymographExtractor.extract(frames, line.path(), px, cal.frameIntervalS(), bandUm, px,
                progress);
        int count = Math.min(16, before + 1);
        int[] picks = new int[count];
        for (int i = 0; i < count; i++) {
            picks[i] = (int) Math.round(i * (double) before / Math.max(1, count - 1));
        }
        BackgroundEstimator.Estimate bg = BackgroundEstimator.fromFarPixels(frames, e.xPx(), e.yPx(),
                (bandUm / 2 + 3.0) / px, picks, progress);
        double background = Double.isFinite(bg.value()) ? bg.value() : 0;
        double[] perFrame = new double[e.kymograph().frameCount()];
        Arrays.fill(perFrame, background);
        // The same correction as analyze: background, bleaching fitted on the baseline and removed, then dF/F0.
        Preprocessing.Result corrected = Preprocessing.run(e.kymograph(), perFrame,
                new Preprocessing.Options(stimulusTimeS, stimulusUm, null, true));
        Kymograph dff = corrected.deltaF().kymograph();
        IJ.log(COMMAND + ": measured dF/F0 along the line, background " + String.format(java.util.Locale.ROOT,
                "%.4g", background) + " (" + bg.description() + "), F0 from frames " + corrected.baselineFirst() + "-"
                + corrected.baselineLast() + (corrected.bleach().applied() && corrected.bleach().timeConstant() != null
                ? String.format(java.util.Locale.ROOT, ", bleaching corrected (time constant %.3g s)",
                        corrected.bleach().timeConstant().value()) : ", no bleaching correction") + ".");
        corrected.warnings().forEach(w -> IJ.log(COMMAND + ": " + w));
        return KymographImage.toImage(dff, Titles.stem(movie) + " measured");
    }

    /** A sensible default stimulus time: a tenth of the way through the recording. */
    private static double firstAfterStart(Kymograph grid) {
        return grid.timeS(Math.min(grid.frameCount() - 1, grid.frameCount() / 10));
    }
}
