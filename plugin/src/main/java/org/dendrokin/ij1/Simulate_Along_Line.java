package org.dendrokin.ij1;

import ij.IJ;
import ij.ImagePlus;
import ij.WindowManager;
import ij.plugin.PlugIn;

import org.dendrokin.core.kymo.Kymograph;
import org.dendrokin.core.path.DendritePath;
import org.dendrokin.io.compare.ModelComparison;

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
            ImagePlus image = KymographImage.toImage(simulated, current.getShortTitle() + " simulated " + model.model());
            image.setProp("dendrokin.model", model.toString());
            if (!folder.isEmpty()) {
                Compare_With_Simulation.saveKymograph(image, simulated, java.nio.file.Path.of(folder));
            }
            Display.showKymograph(image);
            progress.finish(COMMAND + ": " + model.model() + " simulated on " + grid.positionCount() + " positions x "
                    + grid.frameCount() + " frames.");
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

    /** A sensible default stimulus time: a tenth of the way through the recording. */
    private static double firstAfterStart(Kymograph grid) {
        return grid.timeS(Math.min(grid.frameCount() - 1, grid.frameCount() / 10));
    }
}
