package org.dendrokin.io.plot;

import java.awt.BasicStroke;
import java.awt.Color;
import java.awt.Graphics2D;
import java.awt.Rectangle;
import java.awt.geom.Ellipse2D;
import java.awt.geom.Rectangle2D;
import java.awt.image.BufferedImage;
import java.util.ArrayList;
import java.util.List;

/**
 * A constant shared by the sessions of each group beside the sessions' own values: per group a column, each
 * session's own estimate a dot with its 95% interval as a thin vertical line (spread sideways by a fixed
 * low-discrepancy sequence, the same picture every time), and the group's shared estimate a black line across the
 * column over a shaded band, its 95% interval. The vertical range follows the dots and bands; session intervals
 * that reach beyond it are cut at the frame.
 */
public final class SharedEstimatePlot {
    private static final Color[] PALETTE = {
        new Color(30, 90, 170), new Color(210, 90, 30), new Color(40, 150, 80),
        new Color(150, 50, 150), new Color(120, 120, 120), new Color(190, 40, 60)};

    private final String title;
    private final String yLabel;
    private final List<Column> columns = new ArrayList<>();

    public SharedEstimatePlot(String title, String yLabel) {
        this.title = title;
        this.yLabel = yLabel;
    }

    /**
     * Adds a group's column.
     *
     * @param name        group name under the column
     * @param values      each session's own estimate (NaN left out); copied
     * @param lows        lower ends of their intervals (NaN: none); copied
     * @param highs       upper ends; copied
     * @param shared      the group's shared estimate, or NaN
     * @param sharedLow   lower end of its interval, or NaN
     * @param sharedHigh  upper end, or NaN
     */
    public SharedEstimatePlot group(String name, double[] values, double[] lows, double[] highs, double shared,
                                    double sharedLow, double sharedHigh) {
        columns.add(new Column(name, values.clone(), lows.clone(), highs.clone(), shared, sharedLow, sharedHigh));
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
                if (Double.isFinite(v)) {
                    lo = Math.min(lo, v);
                    hi = Math.max(hi, v);
                }
            }
            for (double v : new double[] {c.shared, c.sharedLow, c.sharedHigh}) {
                if (Double.isFinite(v)) {
                    lo = Math.min(lo, v);
                    hi = Math.max(hi, v);
                }
            }
        }
        double[] range = Axes.padded(lo, hi, 0.12, 1e-9);
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
            double spread = Math.min(slot * 0.32, 60);
            Color colour = PALETTE[i % PALETTE.length];
            if (Double.isFinite(c.sharedLow) && Double.isFinite(c.sharedHigh)) {
                double y1 = top + (hi - Math.min(hi, c.sharedHigh)) / (hi - lo) * plotH;
                double y2 = top + (hi - Math.max(lo, c.sharedLow)) / (hi - lo) * plotH;
                g.setColor(new Color(colour.getRed(), colour.getGreen(), colour.getBlue(), 60));
                g.fill(new Rectangle2D.Double(cx - spread - 12, y1, 2 * spread + 24, Math.max(1, y2 - y1)));
            }
            g.setClip(new Rectangle(left + 1, top + 1, plotW - 1, plotH - 1));
            for (int j = 0; j < c.values.length; j++) {
                if (!Double.isFinite(c.values[j])) {
                    continue;
                }
                double offset = 2 * vanDerCorput(j + 1) - 1;
                double x = cx + offset * spread;
                double y = top + (hi - c.values[j]) / (hi - lo) * plotH;
                g.setColor(new Color(colour.getRed(), colour.getGreen(), colour.getBlue(), 140));
                g.setStroke(new BasicStroke(1f));
                double yl = Double.isFinite(c.lows[j]) ? top + (hi - c.lows[j]) / (hi - lo) * plotH : y;
                double yh = Double.isFinite(c.highs[j]) ? top + (hi - c.highs[j]) / (hi - lo) * plotH : y;
                g.drawLine((int) x, (int) yh, (int) x, (int) yl);
                g.setColor(new Color(colour.getRed(), colour.getGreen(), colour.getBlue(), 200));
                g.fill(new Ellipse2D.Double(x - 4, y - 4, 8, 8));
            }
            if (Double.isFinite(c.shared)) {
                int y = (int) (top + (hi - c.shared) / (hi - lo) * plotH);
                g.setColor(Color.BLACK);
                g.setStroke(new BasicStroke(2.5f));
                g.drawLine((int) (cx - spread - 12), y, (int) (cx + spread + 12), y);
            }
            g.setClip(null);
            g.setColor(Color.BLACK);
            g.setStroke(new BasicStroke(1f));
            g.setFont(Axes.TICK);
            Axes.centred(g, c.name, cx, top + plotH + 19);
            long count = java.util.Arrays.stream(c.values).filter(Double::isFinite).count();
            Axes.centred(g, "n = " + count, cx, top + plotH + 35);
        }
        g.setFont(Axes.LABEL);
        Axes.vertical(g, yLabel, left - 62, top + plotH / 2.0);
        g.setFont(Axes.TITLE);
        g.drawString(title, left, top - 14);
        g.setFont(Axes.TICK);
        g.setColor(Color.DARK_GRAY);
        String key = "dots: sessions' own fits (lines: 95%); bar and band: the shared value (95%)";
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

    private record Column(String name, double[] values, double[] lows, double[] highs, double shared,
                          double sharedLow, double sharedHigh) {
    }
}
