package org.dendrokin.io.fit;

import java.awt.Color;
import java.awt.Graphics2D;
import java.awt.image.BufferedImage;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;

import org.dendrokin.core.fit.FitResult;
import org.dendrokin.core.kymo.Kymograph;
import org.dendrokin.core.spread.SpreadAnalysis;
import org.dendrokin.io.plot.ColourScale;
import org.dendrokin.io.plot.Heatmap;
import org.dendrokin.io.plot.LinePlot;
import org.dendrokin.io.plot.Picture;
import org.dendrokin.io.plot.Pictures;

/**
 * The pictures that put a fitted (or user-given) model beside the measurement: measured, simulated and residual
 * kymographs side by side, profiles along the dendrite at a few times, and front position against time for both.
 */
public final class FitPictures {
    private static final int W = 640;
    private static final int H = 420;

    private FitPictures() {
    }

    /** The model's prediction on the measured grid as a kymograph. */
    public static Kymograph simulated(Kymograph measured, FitResult fit) {
        return measured.withValues(fit.fitted(), measured.signalUnit());
    }

    /**
     * Writes the comparison pictures for one model.
     *
     * @param outDir       output folder (must exist)
     * @param prefix       file-name prefix, e.g. {@code "fit-nagumo"}
     * @param label        how the model is named in titles, e.g. {@code "nagumo (fitted)"}
     * @param measured     the measured kymograph
     * @param model        the model's prediction on the same grid
     * @param stimulusTimeS  stimulus time, s (for the front position)
     * @param stimulusPosUm  stimulus position, um
     * @param noiseSd      typical noise SD (for the front detection)
     */
    public static List<Picture> write(Path outDir, String prefix, String label, Kymograph measured, Kymograph model,
                                      double stimulusTimeS, double stimulusPosUm, double noiseSd) {
        List<Picture> out = new ArrayList<>();
        String unit = measured.signalUnit();
        double[] range = Heatmap.robustRange(measured.values());
        double[] res = measured.values();
        double[] sim = model.values();
        for (int i = 0; i < res.length; i++) {
            res[i] -= sim[i];
        }
        Kymograph residual = measured.withValues(res, unit);
        double half = (range[1] - range[0]) / 2;
        BufferedImage a = Heatmap.withRange("Measured (" + unit + ")", ColourScale.SEQUENTIAL, range[0], range[1])
                .render(measured);
        BufferedImage b = Heatmap.withRange(label + " (" + unit + ")", ColourScale.SEQUENTIAL, range[0], range[1])
                .render(model);
        BufferedImage c = Heatmap.withRange("Residual, measured - model (" + unit + ")", ColourScale.DIVERGING, -half,
                half).render(residual);
        String file = prefix + "-kymographs.png";
        Pictures.savePng(sideBySide(a, b, c), outDir.resolve(file));
        out.add(new Picture(file, "Measured, " + label + " and residual",
                String.format(Locale.ROOT, "Left and middle share one colour scale (%.3g to %.3g %s). The residual "
                        + "(right) uses a blue-white-red scale of the same span centred on zero: a good fit leaves "
                        + "only speckle there, while bands or blobs show where the model misses the data.", range[0],
                        range[1], unit)));

        int nt = measured.frameCount();
        int first = Math.min(nt - 1, measured.firstFrameAtOrAfter(stimulusTimeS));
        LinePlot profiles = new LinePlot("Profiles along the dendrite", "distance (um)", "signal (" + unit + ")");
        int shown = 0;
        for (int q = 1; q <= 4 && first < nt; q++) {
            int f = first + (int) Math.round((nt - 1 - first) * (q * q) / 16.0 * 0.9);
            f = Math.min(nt - 1, Math.max(first, f));
            String t = String.format(Locale.ROOT, "%.3g s", measured.timeS(f));
            profiles.points("measured " + t, measured.distancesUm(), measured.row(f));
            profiles.lineMatchingPrevious("model " + t, model.distancesUm(), model.row(f));
            shown++;
        }
        if (shown > 0) {
            String pf = prefix + "-profiles.png";
            Pictures.savePng(profiles.render(W, H), outDir.resolve(pf));
            out.add(new Picture(pf, "Profiles: measured and " + label,
                    "The signal along the dendrite at a few times after the stimulus: measured (markers) and model "
                            + "(lines) of the same time."));
        }

        SpreadAnalysis.Result sm = SpreadAnalysis.measure(measured, stimulusTimeS, stimulusPosUm, noiseSd);
        SpreadAnalysis.Result ss = SpreadAnalysis.measure(model, stimulusTimeS, stimulusPosUm, noiseSd);
        if (sm.arrivalTimeS().length > 0 || ss.arrivalTimeS().length > 0) {
            LinePlot front = new LinePlot("Front position against time", "time after the stimulus (s)",
                    "distance from the stimulus (um)");
            front.points("measured", sm.arrivalTimeS(), abs(sm.arrivalDistanceUm()));
            front.points(label, ss.arrivalTimeS(), abs(ss.arrivalDistanceUm()));
            String ff = prefix + "-front.png";
            Pictures.savePng(front.render(W, H), outDir.resolve(ff));
            out.add(new Picture(ff, "Front position: measured and " + label,
                    "Distance from the stimulus against the time at which the signal there first reached half of its "
                            + "own peak, for the measurement and for the model. A straight line means a front of "
                            + "constant speed; passive diffusion gives a curve (arrival time grows with distance "
                            + "squared)."));
        }
        return out;
    }

    private static double[] abs(double[] v) {
        double[] a = new double[v.length];
        for (int i = 0; i < v.length; i++) {
            a[i] = Math.abs(v[i]);
        }
        return a;
    }

    private static BufferedImage sideBySide(BufferedImage... images) {
        int w = 0;
        int h = 0;
        for (BufferedImage i : images) {
            w += i.getWidth();
            h = Math.max(h, i.getHeight());
        }
        BufferedImage out = new BufferedImage(w, h, BufferedImage.TYPE_INT_RGB);
        Graphics2D g = out.createGraphics();
        g.setColor(Color.WHITE);
        g.fillRect(0, 0, w, h);
        int x = 0;
        for (BufferedImage i : images) {
            g.drawImage(i, x, 0, null);
            x += i.getWidth();
        }
        g.dispose();
        return out;
    }
}
