package org.dendrokin.io.plot;

import java.awt.BasicStroke;
import java.awt.Color;
import java.awt.FontMetrics;
import java.awt.Graphics2D;
import java.awt.Polygon;
import java.awt.image.BufferedImage;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;

import org.dendrokin.core.model.TreeGeometry;

/**
 * A branched dendrite drawn as a tree laid out by distance from the stimulus: the horizontal axis is the distance
 * along the tree (um), each stretch of branch is a thick horizontal bar at its own height, hanging by a thin vertical
 * line from the stretch it leaves at a junction, and coloured by a value along it (for example each position's peak
 * over time); each bar carries its branch's name. The stimulated branch gives two stretches from the stimulus, one
 * towards each of its ends. Positions without a value (branches without data) are drawn grey. On a logarithmic
 * colour scale (for peaks that fall by orders of magnitude along the tree) the colours span two decades below the
 * largest value, and smaller or non-positive values take the bottom colour.
 */
public final class TreePlot {
    private static final int ROW_PX = 46;
    private static final int BAR_PX = 12;

    private TreePlot() {
    }

    /**
     * @param tree        the tree
     * @param originBranch the stimulated branch
     * @param originUm    the stimulus's position along it, um
     * @param positionsUm per branch with values, its positions along the branch, um, increasing
     * @param values      per branch with values, the value at each position
     * @param title       picture title
     * @param unit        unit of the values, for the colour bar
     * @param logarithmic colours by log10 of the value over two decades below the largest, else linear from the
     *                    smallest to the largest value
     */
    public static BufferedImage render(TreeGeometry tree, String originBranch, double originUm,
            Map<String, double[]> positionsUm, Map<String, double[]> values, String title, String unit,
            boolean logarithmic) {
        List<TreeGeometry.Segment> segments = tree.layoutFrom(originBranch, originUm);
        int count = segments.size();
        List<List<Integer>> children = new ArrayList<>();
        for (int s = 0; s < count; s++) {
            children.add(new ArrayList<>());
        }
        for (int s = 0; s < count; s++) {
            int p = segments.get(s).parent();
            if (p >= 0) {
                children.get(p).add(s);
            }
        }
        double[] row = new double[count];
        int[] next = {0};
        for (int s = 0; s < count; s++) {
            if (segments.get(s).parent() < 0) {
                place(s, children, row, next);
            }
        }
        int rows = Math.max(1, next[0]);
        double farthest = 0;
        double lo = Double.POSITIVE_INFINITY;
        double hi = Double.NEGATIVE_INFINITY;
        for (TreeGeometry.Segment seg : segments) {
            farthest = Math.max(farthest, seg.nearDistanceUm() + seg.lengthUm());
        }
        for (double[] v : values.values()) {
            for (double x : v) {
                if (Double.isFinite(x)) {
                    lo = Math.min(lo, x);
                    hi = Math.max(hi, x);
                }
            }
        }
        if (logarithmic) {
            hi = hi > 0 ? Math.log10(hi) : 0;
            lo = hi - 2;
        } else if (!(hi > lo)) {
            lo = Double.isFinite(lo) ? lo : 0;
            hi = lo + 1;
        }
        int left = 40;
        int top = 50;
        int plotW = 720;
        int labelRoom = 150;
        int right = 110;
        int plotH = rows * ROW_PX;
        int bottom = 60;
        BufferedImage image = Axes.canvas(left + plotW + labelRoom + right, top + plotH + bottom);
        Graphics2D g = Axes.graphics(image);
        double scale = plotW / Math.max(farthest, 1e-9);
        ColourScale colours = ColourScale.SEQUENTIAL;
        g.setStroke(new BasicStroke(1.5f));
        for (int s = 0; s < count; s++) {
            TreeGeometry.Segment seg = segments.get(s);
            int y = top + (int) Math.round((row[s] + 0.5) * ROW_PX);
            int x0 = left + (int) Math.round(seg.nearDistanceUm() * scale);
            int yParent = seg.parent() >= 0 ? top + (int) Math.round((row[seg.parent()] + 0.5) * ROW_PX) : y;
            if (seg.parent() < 0) {
                // the two stretches from the stimulus meet at distance 0
                int yOther = y;
                for (int t = 0; t < count; t++) {
                    if (t != s && segments.get(t).parent() < 0) {
                        yOther = top + (int) Math.round((row[t] + 0.5) * ROW_PX);
                    }
                }
                yParent = yOther;
            }
            g.setColor(Color.DARK_GRAY);
            g.drawLine(x0, yParent, x0, y);
            double[] x = positionsUm.get(seg.branch());
            double[] v = values.get(seg.branch());
            int pixels = Math.max(1, (int) Math.round(seg.lengthUm() * scale));
            for (int px = 0; px < pixels; px++) {
                double d = (px + 0.5) / scale;
                double along = seg.nearUm() + Math.signum(seg.farUm() - seg.nearUm()) * d;
                double value = x == null || v == null ? Double.NaN : interpolate(x, v, along);
                if (logarithmic && !Double.isNaN(value)) {
                    value = value > 0 ? Math.log10(value) : Double.NEGATIVE_INFINITY;
                }
                g.setColor(colours.colour((value - lo) / (hi - lo)));
                g.fillRect(x0 + px, y - BAR_PX / 2, 1, BAR_PX);
            }
            g.setColor(Color.BLACK);
            g.drawRect(x0, y - BAR_PX / 2, pixels, BAR_PX);
            g.setFont(Axes.TICK);
            String label = seg.branch();
            if (seg.parent() < 0 && seg.nearUm() > 0 && seg.nearUm() < tree.branch(seg.branch()).lengthUm()) {
                label += seg.farUm() < seg.nearUm() ? " (towards its start)" : " (towards its end)";
            }
            g.drawString(label, x0 + pixels + 6, y + 4);
        }
        // the stimulus: a marker at distance 0
        int ys = top + (int) Math.round(meanRootRow(segments, row) * ROW_PX + 0.5 * ROW_PX);
        Polygon marker = new Polygon(new int[] {left - 10, left - 10, left - 1}, new int[] {ys - 6, ys + 6, ys}, 3);
        g.setColor(new Color(200, 40, 40));
        g.fill(marker);
        g.setColor(Color.BLACK);
        g.setFont(Axes.TICK);
        for (double t : Axes.ticks(0, farthest, 6)) {
            int xx = left + (int) Math.round(t * scale);
            g.drawLine(xx, top + plotH, xx, top + plotH + 5);
            Axes.centred(g, Axes.format(t), xx, top + plotH + 19);
        }
        g.drawLine(left, top + plotH, left + plotW, top + plotH);
        g.setFont(Axes.LABEL);
        Axes.centred(g, "distance from the stimulus along the tree (um)", left + plotW / 2.0, top + plotH + 42);
        g.setFont(Axes.TITLE);
        g.drawString(title, left, top - 20);
        colourBar(g, left + plotW + labelRoom + 25, top + 5, 18, Math.max(60, plotH - 10), lo, hi, unit, logarithmic);
        g.dispose();
        return image;
    }

    /** Leaves get consecutive rows in depth-first order; a stretch with branches after it sits at their mean. */
    private static void place(int s, List<List<Integer>> children, double[] row, int[] next) {
        List<Integer> kids = children.get(s);
        if (kids.isEmpty()) {
            row[s] = next[0]++;
            return;
        }
        double sum = 0;
        for (int c : kids) {
            place(c, children, row, next);
            sum += row[c];
        }
        row[s] = sum / kids.size();
    }

    private static double meanRootRow(List<TreeGeometry.Segment> segments, double[] row) {
        double sum = 0;
        int n = 0;
        for (int s = 0; s < segments.size(); s++) {
            if (segments.get(s).parent() < 0) {
                sum += row[s];
                n++;
            }
        }
        return n == 0 ? 0 : sum / n;
    }

    /** Linear interpolation in increasing positions, NaN outside them. */
    private static double interpolate(double[] x, double[] v, double at) {
        int n = x.length;
        if (n == 0 || at < x[0] - 1e-9 || at > x[n - 1] + 1e-9) {
            return Double.NaN;
        }
        if (n == 1) {
            return v[0];
        }
        int i = java.util.Arrays.binarySearch(x, at);
        if (i >= 0) {
            return v[i];
        }
        int hiIndex = Math.min(n - 1, Math.max(1, -i - 1));
        int loIndex = hiIndex - 1;
        double w = (at - x[loIndex]) / (x[hiIndex] - x[loIndex]);
        return v[loIndex] + Math.max(0, Math.min(1, w)) * (v[hiIndex] - v[loIndex]);
    }

    private static void colourBar(Graphics2D g, int x, int y, int w, int h, double lo, double hi, String unit,
            boolean logarithmic) {
        for (int i = 0; i < h; i++) {
            g.setColor(ColourScale.SEQUENTIAL.colour(1 - (i + 0.5) / h));
            g.fillRect(x, y + i, w, 1);
        }
        g.setColor(Color.BLACK);
        g.drawRect(x, y, w, h);
        g.setFont(Axes.TICK);
        FontMetrics fm = g.getFontMetrics();
        for (double v : logarithmic ? List.of(lo, lo + 1, hi) : Axes.ticks(lo, hi, 4)) {
            int yy = (int) (y + (1 - (v - lo) / (hi - lo)) * h);
            g.drawLine(x + w, yy, x + w + 4, yy);
            String text = Axes.format(logarithmic ? Double.parseDouble(String.format(java.util.Locale.ROOT, "%.3g",
                    Math.pow(10, v))) : v);
            g.drawString(text, x + w + 7, yy + fm.getAscent() / 2 - 1);
        }
        g.setFont(Axes.LABEL);
        Axes.centred(g, logarithmic ? unit + " (log)" : unit, x + w / 2.0, y + h + 24);
    }
}
