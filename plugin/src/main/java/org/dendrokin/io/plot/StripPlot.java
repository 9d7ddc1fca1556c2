package org.dendrokin.io.plot;

import java.awt.BasicStroke;
import java.awt.Color;
import java.awt.Graphics2D;
import java.awt.geom.Ellipse2D;
import java.awt.image.BufferedImage;
import java.util.ArrayList;
import java.util.List;

/**
 * One value per session, in columns by group: each session a dot (spread sideways by a fixed
 * low-discrepancy sequence so that equal values stay visible, the same picture every time), each group's
 * mean a black bar with its 95% interval as a vertical line, and {@code n} under each group's name.
 * NaN values are left out and not counted.
 */
public final class StripPlot {
    private static final Color[] PALETTE = {
        new Color(30, 90, 170), new Color(210, 90, 30), new Color(40, 150, 80),
        new Color(150, 50, 150), new Color(120, 120, 120), new Color(190, 40, 60)};

    private final String title;
    private final String yLabel;
    private final List<Column> columns = new ArrayList<>();

    public StripPlot(String title, String yLabel) {
        this.title = title;
        this.yLabel = yLabel;
    }

    /**
     * Adds a group's column.
     *
     * @param name   group name shown under the column
     * @param values one value per session; copied
     * @param mean   the line drawn across the column, or NaN for none
     * @param ciLow  lower end of the interval drawn through the mean, or NaN
     * @param ciHigh upper end, or NaN
     */
    public StripPlot group(String name, double[] values, double mean, double ciLow, double ciHigh) {
        columns.add(new Column(name, java.util.Arrays.stream(values).filter(Double::isFinite).toArray(), mean, ciLow,
                ciHigh));
        return this;
    }

    public BufferedImage render(int width, int height) {
        int left = 90;
        int top = 40;
        int right = 20;
        int bottom = 62;
        int plotW = width - left - right;
        int plotH = height - top - bottom;
        double lo = Double.POSITIVE_INFINITY;
        double hi = Double.NEGATIVE_INFINITY;
        for (Column c : columns) {
            for (double v : c.values) {
                lo = Math.min(lo, v);
                hi = Math.max(hi, v);
            }
            for (double v : new double[] {c.ciLow, c.ciHigh}) {
                if (Double.isFinite(v)) {
                    lo = Math.min(lo, v);
                    hi = Math.max(hi, v);
                }
            }
        }
        double[] range = Axes.padded(lo, hi, 0.06, 0.5);
        lo = range[0];
        hi = range[1];
        BufferedImage image = Axes.canvas(width, height);
        Graphics2D g = Axes.graphics(image);
        Axes.yFrame(g, left, top, plotW, plotH, lo, hi);
        int n = Math.max(1, columns.size());
        double slot = (double) plotW / n;
        for (int i = 0; i < columns.size(); i++) {
            Column c = columns.get(i);
            double cx = left + slot * (i + 0.5);
            double spread = Math.min(slot * 0.3, 40);
            Color colour = PALETTE[i % PALETTE.length];
            g.setColor(new Color(colour.getRed(), colour.getGreen(), colour.getBlue(), 170));
            for (int j = 0; j < c.values.length; j++) {
                // Van der Corput base 2: fixed, evenly filling offsets in [-1, 1)
                double offset = 2 * vanDerCorput(j + 1) - 1;
                double x = cx + offset * spread;
                double y = top + (hi - c.values[j]) / (hi - lo) * plotH;
                g.fill(new Ellipse2D.Double(x - 4, y - 4, 8, 8));
            }
            g.setColor(Color.BLACK);
            g.setStroke(new BasicStroke(1.5f));
            if (Double.isFinite(c.ciLow) && Double.isFinite(c.ciHigh)) {
                int y1 = (int) (top + (hi - c.ciHigh) / (hi - lo) * plotH);
                int y2 = (int) (top + (hi - c.ciLow) / (hi - lo) * plotH);
                g.drawLine((int) (cx + spread + 10), y1, (int) (cx + spread + 10), y2);
            }
            if (Double.isFinite(c.mean)) {
                int y = (int) (top + (hi - c.mean) / (hi - lo) * plotH);
                g.setStroke(new BasicStroke(2.5f));
                g.drawLine((int) (cx - spread - 6), y, (int) (cx + spread + 16), y);
            }
            g.setStroke(new BasicStroke(1f));
            g.setFont(Axes.TICK);
            Axes.centred(g, c.name, cx, top + plotH + 19);
            Axes.centred(g, "n = " + c.values.length, cx, top + plotH + 35);
        }
        g.setFont(Axes.LABEL);
        Axes.vertical(g, yLabel, left - 62, top + plotH / 2.0);
        g.setFont(Axes.TITLE);
        g.drawString(title, left, top - 14);
        g.setFont(Axes.TICK);
        g.setColor(Color.DARK_GRAY);
        String key = "dots: sessions; bar: mean; line: 95% interval of the mean";
        g.drawString(key, left + plotW - g.getFontMetrics().stringWidth(key), top + plotH + 52);
        g.dispose();
        return image;
    }

    private static double vanDerCorput(int k) {
        double v = 0;
        double base = 0.5;
        while (k > 0) {
            if ((k & 1) != 0) {
                v += base;
            }
            k >>= 1;
            base /= 2;
        }
        return v;
    }

    private record Column(String name, double[] values, double mean, double ciLow, double ciHigh) {
    }
}
