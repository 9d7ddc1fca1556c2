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
     * @param outDir         output folder (must exist)
     * @param prefix         file-name prefix, e.g. {@code "fit-nagumo"}
     * @param label          how the model is named in titles, e.g. {@code "nagumo (fitted)"}
     * @param measured       the measured kymograph
     * @param measuredSpread the measured kymograph's spread measures, or null to measure them here
     * @param model          the model's prediction on the same grid
     * @param stimulusTimeS  stimulus time, s (for the front position)
     * @param stimulusPosUm  stimulus position, um
     * @param noiseSd        typical noise SD (for the front detection)
     */
    public static List<Picture> write(Path outDir, String prefix, String label, Kymograph measured,
                                      SpreadAnalysis.Result measuredSpread, Kymograph model, double stimulusTimeS,
                                      double stimulusPosUm, double noiseSd) {
        List<Picture> out = new ArrayList<>();
        String unit = measured.signalUnit();
        double[] m = Heatmap.displayRange(measured);
        double[] s = Heatmap.displayRange(model);
        double lo = Math.min(m[0], s[0]);
        double hi = Math.max(m[1], s[1]);
        double[] res = measured.values();
        double[] sim = model.values();
        for (int i = 0; i < res.length; i++) {
            res[i] -= sim[i];
        }
        Kymograph residual = measured.withValues(res, unit);
        double[] r = Heatmap.displayRange(residual);
        double half = Math.max(Math.abs(r[0]), Math.abs(r[1]));
        Heatmap ma = Heatmap.withRange("Measured (" + unit + ")", ColourScale.SEQUENTIAL, lo, hi);
        Heatmap mb = Heatmap.withRange(label + " (" + unit + ")", ColourScale.SEQUENTIAL, lo, hi);
        Heatmap mc = Heatmap.withRange("Residual, measured - model (" + unit + ")", ColourScale.DIVERGING, -half,
                half);
        String file = prefix + "-kymographs.png";
        Pictures.savePng(stacked(ma.render(measured), mb.render(model), mc.render(residual)), outDir.resolve(file));
        out.add(new Picture(file, "Measured, " + label + " and residual",
                "Top and middle share one colour scale. " + ma.scaleSentence(measured)
                        + " The residual (bottom) uses a blue-white-red scale centred on zero. "
                        + mc.scaleSentence(residual) + " A good fit leaves only speckle there, while stripes, bands "
                        + "or blobs show where the model misses the data."));

        int nt = measured.frameCount();
        int first = measured.firstFrameAtOrAfter(stimulusTimeS);
        LinePlot profiles = new LinePlot("Profiles along the dendrite", "distance along the path (um)",
                "signal (" + unit + ")");
        int shown = 0;
        for (int f : profileFrames(first, nt)) {
            String t = String.format(Locale.ROOT, "%.3g s after", measured.timeS(f) - stimulusTimeS);
            profiles.points("measured " + t, measured.distancesUm(), measured.row(f));
            profiles.lineMatchingPrevious("model " + t, model.distancesUm(), model.row(f));
            shown++;
        }
        if (shown > 0) {
            String pf = prefix + "-profiles.png";
            Pictures.savePng(profiles.render(W, H), outDir.resolve(pf));
            out.add(new Picture(pf, "Profiles: measured and " + label,
                    "The signal along the dendrite in the first frame after the stimulus and at a few later times "
                            + "(spaced so that each is about three times as long after the stimulus as the one "
                            + "before): measured (markers) and model (lines) of the same time."));
        }

        SpreadAnalysis.Result sm = measuredSpread != null ? measuredSpread
                : SpreadAnalysis.measure(measured, stimulusTimeS, stimulusPosUm, noiseSd);
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

    /**
     * Up to four frames for the profile picture: the first frame at or after the stimulus, then frames whose
     * distance from it grows about threefold each time, the last near the end of the movie.
     *
     * @param first first frame at or after the stimulus
     * @param nt    number of frames
     */
    static int[] profileFrames(int first, int nt) {
        if (first >= nt) {
            return new int[0];
        }
        int span = nt - 1 - first;
        java.util.TreeSet<Integer> frames = new java.util.TreeSet<>();
        frames.add(first);
        for (int q = 2; q >= 0; q--) {
            frames.add(first + (int) Math.round(span * 0.9 / Math.pow(3, q)));
        }
        return frames.stream().mapToInt(Integer::intValue).toArray();
    }

    private static double[] abs(double[] v) {
        double[] a = new double[v.length];
        for (int i = 0; i < v.length; i++) {
            a[i] = Math.abs(v[i]);
        }
        return a;
    }

    /** The pictures one above the other, so that each keeps its size at the width of a report page. */
    private static BufferedImage stacked(BufferedImage... images) {
        int w = 0;
        int h = 0;
        for (BufferedImage i : images) {
            w = Math.max(w, i.getWidth());
            h += i.getHeight();
        }
        BufferedImage out = new BufferedImage(w, h, BufferedImage.TYPE_INT_RGB);
        Graphics2D g = out.createGraphics();
        g.setColor(Color.WHITE);
        g.fillRect(0, 0, w, h);
        int y = 0;
        for (BufferedImage i : images) {
            g.drawImage(i, 0, y, null);
            y += i.getHeight();
        }
        g.dispose();
        return out;
    }
}
