package org.dendrokin.io.plot;

import java.awt.BasicStroke;
import java.awt.Color;
import java.awt.Font;
import java.awt.FontMetrics;
import java.awt.Graphics2D;
import java.awt.RenderingHints;
import java.awt.geom.AffineTransform;
import java.awt.image.BufferedImage;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;

/** Shared drawing for pictures: a white canvas, a plot rectangle, tick marks with round numbers, labels. */
final class Axes {
    static final Font LABEL = new Font(Font.SANS_SERIF, Font.PLAIN, 14);
    static final Font TICK = new Font(Font.SANS_SERIF, Font.PLAIN, 12);
    static final Font TITLE = new Font(Font.SANS_SERIF, Font.BOLD, 15);

    private Axes() {
    }

    static BufferedImage canvas(int width, int height) {
        BufferedImage image = new BufferedImage(width, height, BufferedImage.TYPE_INT_RGB);
        Graphics2D g = image.createGraphics();
        g.setColor(Color.WHITE);
        g.fillRect(0, 0, width, height);
        g.dispose();
        return image;
    }

    static Graphics2D graphics(BufferedImage image) {
        Graphics2D g = image.createGraphics();
        g.setRenderingHint(RenderingHints.KEY_ANTIALIASING, RenderingHints.VALUE_ANTIALIAS_ON);
        g.setRenderingHint(RenderingHints.KEY_TEXT_ANTIALIASING, RenderingHints.VALUE_TEXT_ANTIALIAS_ON);
        g.setColor(Color.BLACK);
        return g;
    }

    /** Round tick values covering [lo, hi], about {@code target} of them. */
    static List<Double> ticks(double lo, double hi, int target) {
        List<Double> out = new ArrayList<>();
        if (!(hi > lo) || !Double.isFinite(lo) || !Double.isFinite(hi)) {
            out.add(lo);
            return out;
        }
        double raw = (hi - lo) / Math.max(1, target);
        double mag = Math.pow(10, Math.floor(Math.log10(raw)));
        double step = mag;
        for (double m : new double[] {1, 2, 2.5, 5, 10}) {
            if (m * mag >= raw) {
                step = m * mag;
                break;
            }
        }
        double first = Math.ceil(lo / step - 1e-9) * step;
        for (double v = first; v <= hi + step * 1e-9; v += step) {
            out.add(Math.abs(v) < step * 1e-9 ? 0.0 : v);
        }
        return out;
    }

    static String format(double v) {
        double a = Math.abs(v);
        if (a != 0 && (a < 1e-3 || a >= 1e5)) {
            return String.format(Locale.ROOT, "%.2g", v);
        }
        String s = String.format(Locale.ROOT, "%.4f", v);
        s = s.replaceAll("0+$", "");
        return s.endsWith(".") ? s.substring(0, s.length() - 1) : s;
    }

    /** Draws a string centred at x with its baseline at y. */
    static void centred(Graphics2D g, String s, double x, double y) {
        FontMetrics fm = g.getFontMetrics();
        g.drawString(s, (float) (x - fm.stringWidth(s) / 2.0), (float) y);
    }

    /** Draws a string rotated a quarter turn anticlockwise, centred at (x, y). */
    static void vertical(Graphics2D g, String s, double x, double y) {
        AffineTransform old = g.getTransform();
        g.rotate(-Math.PI / 2, x, y);
        centred(g, s, x, y);
        g.setTransform(old);
    }

    /**
     * Draws a frame with ticks: x runs left to right from xLo to xHi; y runs from yTop (at the top) to
     * yBottom, so a kymograph can put time downwards and a line plot upwards.
     */
    static void frame(Graphics2D g, int left, int top, int width, int height, double xLo, double xHi,
                      double yTop, double yBottom, String xLabel, String yLabel) {
        g.setColor(Color.BLACK);
        g.setStroke(new BasicStroke(1f));
        g.drawRect(left, top, width, height);
        g.setFont(TICK);
        for (double v : ticks(Math.min(xLo, xHi), Math.max(xLo, xHi), 6)) {
            double x = left + (v - xLo) / (xHi - xLo) * width;
            g.drawLine((int) x, top + height, (int) x, top + height + 5);
            centred(g, format(v), x, top + height + 19);
        }
        FontMetrics fm = g.getFontMetrics();
        for (double v : ticks(Math.min(yTop, yBottom), Math.max(yTop, yBottom), 5)) {
            double y = top + (v - yTop) / (yBottom - yTop) * height;
            g.drawLine(left - 5, (int) y, left, (int) y);
            String s = format(v);
            g.drawString(s, left - 8 - fm.stringWidth(s), (float) (y + 4));
        }
        g.setFont(LABEL);
        centred(g, xLabel, left + width / 2.0, top + height + 40);
        vertical(g, yLabel, left - 52, top + height / 2.0);
    }

    /**
     * A value range padded for plotting: by {@code fraction} of its span at each end, by {@code max(|lo| / 10,
     * minPad)} when it is a single value, and [0, 1] when it is empty (lo not finite).
     *
     * @return {lo, hi}
     */
    static double[] padded(double lo, double hi, double fraction, double minPad) {
        if (!Double.isFinite(lo)) {
            return new double[] {0, 1};
        }
        double m = hi > lo ? fraction * (hi - lo) : Math.max(Math.abs(lo) * 0.1, minPad);
        return new double[] {lo - m, hi + m};
    }

    /** Draws a frame with ticks on its left side only (a plot of categories side by side): y from hi at the top. */
    static void yFrame(Graphics2D g, int left, int top, int width, int height, double lo, double hi) {
        g.setColor(Color.BLACK);
        g.drawRect(left, top, width, height);
        g.setFont(TICK);
        FontMetrics fm = g.getFontMetrics();
        for (double v : ticks(lo, hi, 5)) {
            double y = top + (hi - v) / (hi - lo) * height;
            g.drawLine(left - 5, (int) y, left, (int) y);
            String s = format(v);
            g.drawString(s, left - 8 - fm.stringWidth(s), (float) (y + 4));
        }
    }
}
