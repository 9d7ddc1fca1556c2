package org.dendrokin.io.plot;

import java.awt.BasicStroke;
import java.awt.Color;
import java.awt.Graphics2D;
import java.awt.geom.Ellipse2D;
import java.awt.geom.Path2D;
import java.awt.image.BufferedImage;
import java.util.ArrayList;
import java.util.List;

/**
 * A simple x-y chart for reports: lines, markers and shaded bands, with a legend. Built step by step,
 * then rendered once; NaN points break a line.
 */
public final class LinePlot {
    private static final Color[] PALETTE = {
        new Color(30, 90, 170), new Color(210, 90, 30), new Color(40, 150, 80),
        new Color(150, 50, 150), new Color(120, 120, 120), new Color(190, 40, 60)};

    private final String title;
    private final String xLabel;
    private final String yLabel;
    private final List<Series> series = new ArrayList<>();
    private final List<Band> bands = new ArrayList<>();
    private double[] xRange;
    private double[] yRange;

    public LinePlot(String title, String xLabel, String yLabel) {
        this.title = title;
        this.xLabel = xLabel;
        this.yLabel = yLabel;
    }

    /** Adds a line through the points; NaN breaks it. */
    public LinePlot line(String label, double[] x, double[] y) {
        series.add(new Series(label, x.clone(), y.clone(), false, nextColour()));
        return this;
    }

    /** Adds unconnected markers. */
    public LinePlot points(String label, double[] x, double[] y) {
        series.add(new Series(label, x.clone(), y.clone(), true, nextColour()));
        return this;
    }

    /**
     * Adds a line in the colour of the series added just before it, so that data and the model drawn over
     * them (e.g. a profile at one time) read as a pair.
     */
    public LinePlot lineMatchingPrevious(String label, double[] x, double[] y) {
        Color colour = series.isEmpty() ? nextColour() : series.get(series.size() - 1).colour;
        series.add(new Series(label, x.clone(), y.clone(), false, colour));
        return this;
    }

    /** Adds a shaded band between lower and upper, e.g. a confidence band. */
    public LinePlot band(String label, double[] x, double[] lower, double[] upper) {
        bands.add(new Band(label, x.clone(), lower.clone(), upper.clone()));
        return this;
    }

    public LinePlot xRange(double lo, double hi) {
        xRange = new double[] {lo, hi};
        return this;
    }

    public LinePlot yRange(double lo, double hi) {
        yRange = new double[] {lo, hi};
        return this;
    }

    /** The next palette colour not yet used, cycling when all are taken. */
    private Color nextColour() {
        long distinct = series.stream().map(Series::colour).distinct().count();
        return PALETTE[(int) (distinct % PALETTE.length)];
    }

    public BufferedImage render(int width, int height) {
        int left = 85;
        int top = 40;
        int right = 20;
        int bottom = 62;
        int plotW = width - left - right;
        int plotH = height - top - bottom;
        double[] xr = xRange != null ? xRange : range(true);
        double[] yr = yRange != null ? yRange : pad(range(false));
        BufferedImage image = Axes.canvas(width, height);
        Graphics2D g = Axes.graphics(image);
        java.awt.Shape clip = new java.awt.Rectangle(left, top, plotW, plotH);
        g.setClip(clip);
        for (Band b : bands) {
            Path2D.Double p = new Path2D.Double();
            boolean started = false;
            for (int i = 0; i < b.x.length; i++) {
                double px = left + (b.x[i] - xr[0]) / (xr[1] - xr[0]) * plotW;
                double py = top + (yr[1] - b.upper[i]) / (yr[1] - yr[0]) * plotH;
                if (!Double.isFinite(px) || !Double.isFinite(py)) {
                    continue;
                }
                if (started) {
                    p.lineTo(px, py);
                } else {
                    p.moveTo(px, py);
                    started = true;
                }
            }
            for (int i = b.x.length - 1; i >= 0; i--) {
                double px = left + (b.x[i] - xr[0]) / (xr[1] - xr[0]) * plotW;
                double py = top + (yr[1] - b.lower[i]) / (yr[1] - yr[0]) * plotH;
                if (Double.isFinite(px) && Double.isFinite(py)) {
                    p.lineTo(px, py);
                }
            }
            p.closePath();
            g.setColor(new Color(30, 90, 170, 50));
            g.fill(p);
        }
        g.setStroke(new BasicStroke(2f));
        for (Series s : series) {
            g.setColor(s.colour);
            Path2D.Double path = new Path2D.Double();
            boolean pen = false;
            for (int i = 0; i < s.x.length; i++) {
                double px = left + (s.x[i] - xr[0]) / (xr[1] - xr[0]) * plotW;
                double py = top + (yr[1] - s.y[i]) / (yr[1] - yr[0]) * plotH;
                if (!Double.isFinite(px) || !Double.isFinite(py)) {
                    pen = false;
                    continue;
                }
                if (s.markers) {
                    g.draw(new Ellipse2D.Double(px - 3, py - 3, 6, 6));
                } else if (pen) {
                    path.lineTo(px, py);
                } else {
                    path.moveTo(px, py);
                    pen = true;
                }
            }
            if (!s.markers) {
                g.draw(path);
            }
        }
        g.setClip(null);
        g.setStroke(new BasicStroke(1f));
        Axes.frame(g, left, top, plotW, plotH, xr[0], xr[1], yr[1], yr[0], xLabel, yLabel);
        g.setFont(Axes.TITLE);
        g.drawString(title, left, top - 14);
        legend(g, left + plotW - 10, top + 10);
        g.dispose();
        return image;
    }

    private void legend(Graphics2D g, int rightX, int y) {
        g.setFont(Axes.TICK);
        int width = 0;
        List<String> labels = new ArrayList<>();
        for (Series s : series) {
            labels.add(s.label);
        }
        for (Band b : bands) {
            labels.add(b.label);
        }
        for (String l : labels) {
            width = Math.max(width, g.getFontMetrics().stringWidth(l));
        }
        if (labels.isEmpty()) {
            return;
        }
        int x = rightX - width - 34;
        g.setColor(new Color(255, 255, 255, 220));
        g.fillRect(x - 6, y - 4, width + 40, labels.size() * 17 + 6);
        int row = 0;
        for (Series s : series) {
            g.setColor(s.colour);
            int yy = y + 10 + row * 17;
            if (s.markers) {
                g.drawOval(x + 8, yy - 7, 6, 6);
            } else {
                g.fillRect(x, yy - 5, 22, 3);
            }
            g.setColor(Color.BLACK);
            g.drawString(s.label, x + 28, yy);
            row++;
        }
        for (Band b : bands) {
            int yy = y + 10 + row * 17;
            g.setColor(new Color(30, 90, 170, 50));
            g.fillRect(x, yy - 9, 22, 10);
            g.setColor(Color.BLACK);
            g.drawString(b.label, x + 28, yy);
            row++;
        }
    }

    private double[] range(boolean xAxis) {
        double lo = Double.POSITIVE_INFINITY;
        double hi = Double.NEGATIVE_INFINITY;
        for (Series s : series) {
            for (double v : xAxis ? s.x : s.y) {
                if (Double.isFinite(v)) {
                    lo = Math.min(lo, v);
                    hi = Math.max(hi, v);
                }
            }
        }
        for (Band b : bands) {
            for (double[] arr : xAxis ? new double[][] {b.x} : new double[][] {b.lower, b.upper}) {
                for (double v : arr) {
                    if (Double.isFinite(v)) {
                        lo = Math.min(lo, v);
                        hi = Math.max(hi, v);
                    }
                }
            }
        }
        if (!Double.isFinite(lo)) {
            return new double[] {0, 1};
        }
        if (!(hi > lo)) {
            return new double[] {lo - 0.5, hi + 0.5};
        }
        return new double[] {lo, hi};
    }

    private static double[] pad(double[] r) {
        double m = 0.05 * (r[1] - r[0]);
        return new double[] {r[0] - m, r[1] + m};
    }

    private record Series(String label, double[] x, double[] y, boolean markers, Color colour) {
    }

    private record Band(String label, double[] x, double[] lower, double[] upper) {
    }
}
