package org.dendrokin.io.plot;

import java.awt.Color;
import java.awt.Graphics2D;
import java.awt.Polygon;
import java.awt.image.BufferedImage;
import java.util.Arrays;
import java.util.Locale;

import org.dendrokin.core.kymo.Kymograph;

/**
 * Draws a kymograph as a picture: distance (um) across, time (s) downwards, the signal as colour, and a
 * colour scale bar labelled with the signal's unit. NaN (path outside the image, or no concentration) shows as
 * grey; samples at or above a saturation level, when one is given, as magenta. Where values lie beyond the
 * colour range, the bar has an arrow at that end and {@link #scaleSentence} says how many.
 */
public final class Heatmap {
    /** Colour of saturated samples: outside both colour maps. */
    static final Color SATURATED = new Color(230, 0, 200);

    private final String title;
    private final ColourScale scale;
    private final double lo;
    private final double hi;
    private final double saturation;

    private Heatmap(String title, ColourScale scale, double lo, double hi, double saturation) {
        this.title = title;
        this.scale = scale;
        this.lo = lo;
        this.hi = hi;
        this.saturation = saturation;
    }

    /** A heat map whose colour range covers the kymograph's values ({@link #displayRange}). */
    public static Heatmap of(Kymograph k, String title) {
        double[] range = displayRange(k);
        return new Heatmap(title, ColourScale.SEQUENTIAL, range[0], range[1], Double.NaN);
    }

    /** A heat map with a fixed colour range, for pictures that must share one scale. */
    public static Heatmap withRange(String title, ColourScale scale, double lo, double hi) {
        return new Heatmap(title, scale, lo, hi, Double.NaN);
    }

    /** The same picture with samples at or above {@code level} drawn as saturated. */
    public Heatmap withSaturation(double level) {
        return new Heatmap(title, scale, lo, hi, level);
    }

    /** Lower end of the colour range. */
    public double lo() {
        return lo;
    }

    /** Upper end of the colour range. */
    public double hi() {
        return hi;
    }

    /**
     * The colour range of a kymograph: the 0.5th and 99.5th percentiles of its finite values. A focal response
     * is brief and small, so a range up to the very largest value would leave the spread itself in the darkest
     * colours; the few values beyond take the end colours, the bar shows an arrow at that end, and
     * {@link #scaleSentence} says how far the data reach. ({0, 1} without finite values.)
     */
    public static double[] displayRange(Kymograph k) {
        return robustRange(k.values());
    }

    /** The 0.5th and 99.5th percentiles of the finite values ({0, 1} if there are none). */
    public static double[] robustRange(double[] values) {
        double[] finite = Arrays.stream(values).filter(Double::isFinite).sorted().toArray();
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

    /**
     * How the picture maps values to colours.
     *
     * @param lo        lower end of the colour range
     * @param hi        upper end
     * @param min       smallest finite value
     * @param max       largest finite value
     * @param below     samples below lo (drawn in the bottom colour)
     * @param above     samples above hi and below the saturation level (drawn in the top colour)
     * @param saturated samples at or above the saturation level (drawn magenta)
     * @param missing   NaN samples (drawn grey)
     * @param total     all samples
     */
    public record Clipping(double lo, double hi, double min, double max, long below, long above, long saturated,
                           long missing, long total) {
    }

    /** Counts what lies beyond the colour range. */
    public Clipping clipping(Kymograph k) {
        double min = Double.NaN;
        double max = Double.NaN;
        long below = 0;
        long above = 0;
        long saturated = 0;
        long missing = 0;
        double[] values = k.values();
        for (double v : values) {
            if (!Double.isFinite(v)) {
                missing++;
                continue;
            }
            min = Double.isNaN(min) ? v : Math.min(min, v);
            max = Double.isNaN(max) ? v : Math.max(max, v);
            if (v >= saturation) {
                saturated++;
            } else if (v > hi) {
                above++;
            } else if (v < lo) {
                below++;
            }
        }
        return new Clipping(lo, hi, min, max, below, above, saturated, missing, values.length);
    }

    /**
     * One or two sentences for a caption: the colour range, whether it covers the data, and what is drawn
     * specially.
     */
    public String scaleSentence(Kymograph k) {
        Clipping c = clipping(k);
        String unit = k.signalUnit().isEmpty() ? "" : " " + k.signalUnit();
        StringBuilder s = new StringBuilder(String.format(Locale.ROOT, "Colours run from %s to %s%s",
                Axes.format(lo), Axes.format(hi), unit));
        long beyond = c.below() + c.above();
        if (beyond == 0) {
            s.append(", which covers every value.");
        } else {
            s.append(String.format(Locale.ROOT, "; the data reach %s to %s, and the %d sample%s (%s) beyond that "
                    + "range take the end colour (arrow on the bar), so the brightest part of the response is drawn "
                    + "flat: the profile picture shows its true height.", Axes.format(c.min()), Axes.format(c.max()),
                    beyond, beyond == 1 ? "" : "s", percent(beyond, c.total())));
        }
        if (c.saturated() > 0) {
            s.append(String.format(Locale.ROOT, " Magenta marks %d saturated sample%s (at or above %s%s).",
                    c.saturated(), c.saturated() == 1 ? "" : "s", Axes.format(saturation), unit));
        }
        if (c.missing() > 0) {
            s.append(String.format(Locale.ROOT, " Grey marks %d sample%s without a value.", c.missing(),
                    c.missing() == 1 ? "" : "s"));
        }
        return s.toString();
    }

    private static String percent(long n, long total) {
        double p = 100.0 * n / Math.max(1, total);
        return p < 0.1 ? "under 0.1%" : String.format(Locale.ROOT, "%.1f%%", p);
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
        int saturatedRgb = SATURATED.getRGB() & 0xFFFFFF;
        for (int py = 0; py < plotH; py++) {
            int f = Math.min(nt - 1, (int) ((py + 0.5) / plotH * nt));
            for (int px = 0; px < plotW; px++) {
                int p = Math.min(nx - 1, (int) ((px + 0.5) / plotW * nx));
                double v = k.value(f, p);
                image.setRGB(left + px, top + py, v >= saturation ? saturatedRgb : scale.rgb((v - lo) / (hi - lo)));
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
        Clipping c = clipping(k);
        colourBar(g, left + plotW + 25, top + 10, 18, plotH - 20, k.signalUnit(), c.above() > 0, c.below() > 0);
        g.dispose();
        return image;
    }

    private void colourBar(Graphics2D g, int x, int y, int w, int h, String unit, boolean over, boolean under) {
        for (int i = 0; i < h; i++) {
            g.setColor(scale.colour(1 - (i + 0.5) / h));
            g.fillRect(x, y + i, w, 1);
        }
        if (over) {
            g.setColor(scale.colour(1));
            Polygon arrow = new Polygon(new int[] {x, x + w, x + w / 2}, new int[] {y, y, y - 9}, 3);
            g.fill(arrow);
            g.setColor(Color.BLACK);
            g.draw(arrow);
        }
        if (under) {
            g.setColor(scale.colour(0));
            Polygon arrow = new Polygon(new int[] {x, x + w, x + w / 2}, new int[] {y + h, y + h, y + h + 9}, 3);
            g.fill(arrow);
            g.setColor(Color.BLACK);
            g.draw(arrow);
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
        Axes.centred(g, unit, x + w / 2.0, y + h + 28);
    }
}
