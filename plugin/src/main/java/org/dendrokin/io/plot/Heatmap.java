package org.dendrokin.io.plot;

import java.awt.Color;
import java.awt.Graphics2D;
import java.awt.image.BufferedImage;

import org.dendrokin.core.kymo.Kymograph;

/**
 * Draws a kymograph as a picture: distance (um) across, time (s) downwards, the signal as colour, and a
 * colour scale bar labelled with the signal's unit. NaN (path outside the image) shows as grey.
 */
public final class Heatmap {
    private final String title;
    private final ColourScale scale;
    private final double lo;
    private final double hi;

    private Heatmap(String title, ColourScale scale, double lo, double hi) {
        this.title = title;
        this.scale = scale;
        this.lo = lo;
        this.hi = hi;
    }

    /** A heat map whose colour range runs from the 0.5th to the 99.5th percentile of the finite values. */
    public static Heatmap of(Kymograph k, String title) {
        double[] range = robustRange(k.values());
        return new Heatmap(title, ColourScale.SEQUENTIAL, range[0], range[1]);
    }

    /** A heat map with a fixed colour range, for pictures that must share one scale. */
    public static Heatmap withRange(String title, ColourScale scale, double lo, double hi) {
        return new Heatmap(title, scale, lo, hi);
    }

    /**
     * The 0.5th and 99.5th percentiles of the finite values ({0, 1} if there are none). A focal response is
     * brief and small, so a scale up to the maximum would leave the spread itself in the darkest colours; the
     * few brighter values are drawn at the top colour, and the picture prints the true maximum beside the bar.
     */
    public static double[] robustRange(double[] values) {
        double[] finite = java.util.Arrays.stream(values).filter(Double::isFinite).sorted().toArray();
        if (finite.length == 0) {
            return new double[] {0, 1};
        }
        double lo = finite[(int) Math.floor(0.005 * (finite.length - 1))];
        double hi = finite[(int) Math.ceil(0.995 * (finite.length - 1))];
        if (!(hi > lo)) {
            hi = lo + 1;
        }
        return new double[] {lo, hi};
    }

    /** The smallest and largest finite value (NaN, NaN if there are none). */
    private static double[] extremes(double[] values) {
        double min = Double.NaN;
        double max = Double.NaN;
        for (double v : values) {
            if (Double.isFinite(v)) {
                min = Double.isNaN(min) ? v : Math.min(min, v);
                max = Double.isNaN(max) ? v : Math.max(max, v);
            }
        }
        return new double[] {min, max};
    }

    public BufferedImage render(Kymograph k) {
        int plotW = Math.max(360, Math.min(900, k.positionCount() * 3));
        int plotH = Math.max(300, Math.min(700, k.frameCount() * 2));
        int left = 80;
        int top = 40;
        int right = 110;
        int bottom = 60;
        BufferedImage image = Axes.canvas(left + plotW + right, top + plotH + bottom);
        Graphics2D g = Axes.graphics(image);

        int nx = k.positionCount();
        int nt = k.frameCount();
        for (int py = 0; py < plotH; py++) {
            int f = Math.min(nt - 1, (int) ((py + 0.5) / plotH * nt));
            for (int px = 0; px < plotW; px++) {
                int p = Math.min(nx - 1, (int) ((px + 0.5) / plotW * nx));
                double v = k.value(f, p);
                image.setRGB(left + px, top + py, scale.rgb((v - lo) / (hi - lo)));
            }
        }
        double dx = k.distanceStepUm();
        double dt = k.timeStepS();
        double x0 = k.distanceUm(0) - dx / 2;
        double x1 = k.distanceUm(nx - 1) + dx / 2;
        double t0 = k.timeS(0) - dt / 2;
        double t1 = k.timeS(nt - 1) + dt / 2;
        if (!(x1 > x0)) {
            x1 = x0 + 1;
        }
        if (!(t1 > t0)) {
            t1 = t0 + 1;
        }
        Axes.frame(g, left, top, plotW, plotH, x0, x1, t0, t1, "distance along the path (um)", "time (s)");
        g.setFont(Axes.TITLE);
        g.drawString(title, left, top - 14);
        colourBar(g, left + plotW + 25, top, 18, plotH, k.signalUnit());
        double[] extremes = extremes(k.values());
        g.setFont(Axes.TICK);
        g.setColor(Color.BLACK);
        if (extremes[1] > hi + 1e-9 * Math.abs(hi)) {
            g.drawString("max " + Axes.format(extremes[1]), left + plotW + 20, top - 6);
        }
        if (extremes[0] < lo - 1e-9 * Math.abs(lo)) {
            g.drawString("min " + Axes.format(extremes[0]), left + plotW + 20, top + plotH + 40);
        }
        g.dispose();
        return image;
    }

    private void colourBar(Graphics2D g, int x, int y, int w, int h, String unit) {
        for (int i = 0; i < h; i++) {
            g.setColor(scale.colour(1 - (i + 0.5) / h));
            g.fillRect(x, y + i, w, 1);
        }
        g.setColor(Color.BLACK);
        g.drawRect(x, y, w, h);
        g.setFont(Axes.TICK);
        for (double v : Axes.ticks(lo, hi, 5)) {
            int yy = (int) (y + (1 - (v - lo) / (hi - lo)) * h);
            g.drawLine(x + w, yy, x + w + 4, yy);
            g.drawString(Axes.format(v), x + w + 7, yy + 4);
        }
        g.setFont(Axes.LABEL);
        Axes.centred(g, unit, x + w / 2.0, y + h + 22);
    }
}
