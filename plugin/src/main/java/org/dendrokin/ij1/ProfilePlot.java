package org.dendrokin.ij1;

import java.awt.Color;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;

import ij.gui.Plot;

import org.dendrokin.core.kymo.Kymograph;

/**
 * Profiles along the path at a few times after the stimulus, data as points and a model as lines of the same
 * colour: the first frame after the stimulus (where the spread says most), then frames whose time since the
 * stimulus grows geometrically up to half of what the recording has left. The legend gives the time since the
 * stimulus and names the lines only, so that it stays small.
 */
final class ProfilePlot {
    /** How many profiles are drawn at most. */
    static final int COUNT = 4;
    private static final Color[] COLOURS = {new Color(30, 90, 170), new Color(210, 90, 30), new Color(40, 150, 80),
        new Color(150, 50, 150)};

    private ProfilePlot() {
    }

    /**
     * @param title          the plot window's title
     * @param data           the measured kymograph (points)
     * @param model          the model on the same grid (lines)
     * @param stimulusTimeS  time of the stimulus, s, on the kymographs' clock
     */
    static Plot of(String title, Kymograph data, Kymograph model, double stimulusTimeS) {
        Plot plot = new Plot(title, "distance along the path (um)", "signal (" + data.signalUnit() + ")");
        List<String> legend = new ArrayList<>();
        double[] x = data.distancesUm();
        int[] frames = frames(data.timesS(), stimulusTimeS);
        for (int i = 0; i < frames.length; i++) {
            int f = frames[i];
            plot.setColor(COLOURS[i % COLOURS.length]);
            plot.add("circle", x, data.row(f));
            plot.add("line", x, model.row(f));
            // with ImageJ's Plot.addLegend, only labels with "<rank>__" are shown: one entry per time, in order
            legend.add("points " + i);
            legend.add(i + "__" + String.format(Locale.ROOT, "%.3g s after the stimulus", data.timeS(f) - stimulusTimeS));
        }
        plot.setColor(Color.BLACK);
        plot.addLegend(String.join("\n", legend), "auto");
        plot.setFrameSize(520, 300);
        return plot;
    }

    /**
     * The frames drawn: the first frame after the stimulus, then up to {@link #COUNT} - 1 more whose times since
     * the stimulus grow geometrically to half of the time from that first frame to the last (distinct, ascending).
     * When no frame follows the stimulus, the last frame.
     *
     * @param timesS        frame times, s, ascending
     * @param stimulusTimeS time of the stimulus, s
     */
    static int[] frames(double[] timesS, double stimulusTimeS) {
        int first = 0;
        while (first < timesS.length && !(timesS[first] > stimulusTimeS)) {
            first++;
        }
        if (first >= timesS.length) {
            return new int[] {timesS.length - 1};
        }
        double early = timesS[first] - stimulusTimeS;
        double late = Math.max(early, (timesS[timesS.length - 1] - stimulusTimeS) / 2);
        List<Integer> picked = new ArrayList<>();
        picked.add(first);
        for (int i = 1; i < COUNT; i++) {
            double target = stimulusTimeS + early * Math.pow(late / early, i / (COUNT - 1.0));
            int f = nearest(timesS, target);
            if (f > picked.get(picked.size() - 1)) {
                picked.add(f);
            }
        }
        return picked.stream().mapToInt(Integer::intValue).toArray();
    }

    private static int nearest(double[] t, double target) {
        int best = 0;
        for (int i = 1; i < t.length; i++) {
            if (Math.abs(t[i] - target) < Math.abs(t[best] - target)) {
                best = i;
            }
        }
        return best;
    }
}
