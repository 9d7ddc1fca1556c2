package org.dendrokin.ij1;

import java.awt.Canvas;
import java.awt.Color;
import java.awt.Dimension;
import java.awt.Font;
import java.awt.FontMetrics;
import java.awt.Graphics;
import java.awt.Graphics2D;
import java.awt.Rectangle;
import java.awt.RenderingHints;
import java.awt.event.ComponentAdapter;
import java.awt.event.ComponentEvent;
import java.awt.event.KeyAdapter;
import java.awt.event.KeyEvent;
import java.awt.event.MouseAdapter;
import java.awt.event.MouseEvent;
import java.awt.event.MouseWheelEvent;
import java.awt.image.BufferedImage;
import java.awt.image.IndexColorModel;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;

import ij.ImageListener;
import ij.ImagePlus;
import ij.Prefs;
import ij.gui.ImageCanvas;
import ij.gui.ImageWindow;
import ij.measure.Calibration;
import ij.process.ImageProcessor;

/**
 * The axes and colour scale of a kymograph window, drawn in a strip of the window below the image, so that
 * nothing is drawn over the data: the distance axis lined up with the image's columns (it follows zoom and
 * scrolling), the colour bar of the current display range with its unit, and a line on the time axis (time
 * runs down; its ticks are on the image's left edge, see {@link Display#timeTicks}). When the data of the
 * shown slice reach beyond the colour bar, a line says so: those samples take the bar's end colours.
 * Everything is read from the image when painted, so a change in Image > Adjust > Brightness/Contrast or the
 * colour table shows at once.
 */
final class KymographLegend extends Canvas implements ImageListener {
    private static final long serialVersionUID = 1L;
    private static final int MIN_WIDTH = 260;
    /** Room in a title bar beside the title: icon and the three buttons (about 90 pixels in common themes). */
    private static final int TITLE_BAR_EXTRA = 100;
    /** Widest the strip grows to show the whole window title. */
    private static final int MAX_TITLE_WIDTH = 640;
    private static final int TICK = 4;
    private static final int BAR = 12;

    private final transient ImagePlus image;
    private final transient ImageCanvas imageCanvas;
    private final Font font;
    private final int line;

    private KymographLegend(ImagePlus image, ImageCanvas imageCanvas) {
        this.image = image;
        this.imageCanvas = imageCanvas;
        double scale = Math.max(1, Prefs.getGuiScale());
        this.font = new Font(Font.SANS_SERIF, Font.PLAIN, (int) Math.round(11 * scale));
        this.line = (int) Math.round(15 * scale);
    }

    /** Adds the strip to the image's window, below the image (and the slice slider), and fits the window to it. */
    static void attach(ImagePlus image) {
        ImageWindow window = image.getWindow();
        if (window == null || window.getCanvas() == null) {
            return;
        }
        KymographLegend legend = new KymographLegend(image, window.getCanvas());
        window.add(legend);
        ImagePlus.addImageListener(legend);
        // the axis follows the image when it is zoomed or scrolled
        ImageCanvas ic = window.getCanvas();
        ic.addComponentListener(new ComponentAdapter() {
            @Override
            public void componentResized(ComponentEvent e) {
                legend.invalidate();
                legend.repaint();
            }
        });
        MouseAdapter mouse = new MouseAdapter() {
            @Override
            public void mouseReleased(MouseEvent e) {
                legend.repaint();
            }

            @Override
            public void mouseDragged(MouseEvent e) {
                legend.repaint();
            }

            @Override
            public void mouseWheelMoved(MouseWheelEvent e) {
                legend.repaint();
            }
        };
        ic.addMouseListener(mouse);
        ic.addMouseMotionListener(mouse);
        ic.addMouseWheelListener(mouse);
        ic.addKeyListener(new KeyAdapter() {
            @Override
            public void keyReleased(KeyEvent e) {
                legend.repaint();
            }
        });
        window.pack();
    }

    @Override
    public Dimension getPreferredSize() {
        int width = Math.max(imageCanvas.getWidth() > 0 ? imageCanvas.getWidth()
                : imageCanvas.getPreferredSize().width, Math.max(MIN_WIDTH, titleWidth()));
        FontMetrics fm = getFontMetrics(font);
        // sized for the longer wording, so the strip keeps its height when the display range changes
        int notes = wrap(notes(true), fm, width - 4).size();
        // axis: ticks, numbers, title; colour bar: bar, ticks, numbers, title; then the notes
        return new Dimension(width, TICK + 2 * line + 4 + BAR + TICK + 2 * line + notes * line + 4);
    }

    /**
     * Width at which the window's title fits its title bar, so that a narrow kymograph's title (which names the
     * line and the unit) is not cut short by the window system; estimated with a bold face of the strip's size.
     */
    private int titleWidth() {
        java.awt.Window w = image.getWindow();
        String title = w instanceof java.awt.Frame f ? f.getTitle() : image.getTitle();
        FontMetrics bold = getFontMetrics(font.deriveFont(Font.BOLD));
        return Math.min(MAX_TITLE_WIDTH, bold.stringWidth(title) + TITLE_BAR_EXTRA);
    }

    @Override
    public void update(Graphics g) {
        paint(g);
    }

    @Override
    public void paint(Graphics g) {
        Dimension size = getSize();
        if (size.width <= 0 || size.height <= 0) {
            return;
        }
        BufferedImage off = new BufferedImage(size.width, size.height, BufferedImage.TYPE_INT_RGB);
        Graphics2D g2 = off.createGraphics();
        g2.setRenderingHint(RenderingHints.KEY_TEXT_ANTIALIASING, RenderingHints.VALUE_TEXT_ANTIALIAS_ON);
        g2.setColor(getParent() != null ? getParent().getBackground() : Color.WHITE);
        g2.fillRect(0, 0, size.width, size.height);
        g2.setColor(Color.BLACK);
        g2.setFont(font);
        int y = drawDistanceAxis(g2);
        y = drawColourBar(g2, y + 4);
        FontMetrics fm = g2.getFontMetrics();
        for (String s : wrap(notes(false), fm, size.width - 4)) {
            y += line;
            g2.drawString(s, 2, y - fm.getDescent());
        }
        g2.dispose();
        g.drawImage(off, 0, 0, null);
    }

    /** Ticks and numbers under the image's columns, then the axis title; returns the y below it. */
    private int drawDistanceAxis(Graphics2D g) {
        Calibration cal = image.getCalibration();
        Rectangle src = imageCanvas.getSrcRect();
        double mag = imageCanvas.getMagnification();
        int x0 = imageCanvas.getX() - getX();
        int width = (int) Math.round(src.width * mag);
        g.drawLine(x0, 0, x0 + width - 1, 0);
        FontMetrics fm = g.getFontMetrics();
        double lo = cal.getX(src.x);
        double hi = cal.getX(src.x + src.width - 1);
        AxisTicks ticks = AxisTicks.of(Math.min(lo, hi), Math.max(lo, hi), Math.max(2, width / 70));
        for (double v : ticks.values()) {
            // a sample's position is the centre of its column
            double column = v / cal.pixelWidth + cal.xOrigin;
            int sx = x0 + (int) Math.round((column + 0.5 - src.x) * mag);
            g.drawLine(sx, 0, sx, TICK);
            String label = ticks.label(v);
            int w = fm.stringWidth(label);
            g.drawString(label, Math.max(0, Math.min(getWidth() - w, sx - w / 2)), TICK + line - fm.getDescent());
        }
        String title = "distance along the path (" + cal.getXUnit() + ")";
        g.drawString(title, Math.max(0, x0 + (width - fm.stringWidth(title)) / 2), TICK + 2 * line - fm.getDescent());
        return TICK + 2 * line;
    }

    /** The colour bar over the display range, its numbers and its title; returns the y below it. */
    private int drawColourBar(Graphics2D g, int top) {
        ImageProcessor ip = image.getProcessor();
        double min = ip.getMin();
        double max = ip.getMax();
        int x0 = Math.max(2, imageCanvas.getX() - getX());
        int shown = (int) Math.round(imageCanvas.getSrcRect().width * imageCanvas.getMagnification());
        int width = Math.max(40, Math.min(getWidth() - x0 - 2, shown));
        IndexColorModel cm = ip.getLut() != null ? ip.getLut().getColorModel() : null;
        for (int i = 0; i < width; i++) {
            int index = (int) Math.round(255.0 * i / Math.max(1, width - 1));
            g.setColor(cm == null ? new Color(index, index, index) : new Color(cm.getRGB(index)));
            g.drawLine(x0 + i, top, x0 + i, top + BAR);
        }
        g.setColor(Color.BLACK);
        g.drawRect(x0, top, width - 1, BAR);
        FontMetrics fm = g.getFontMetrics();
        AxisTicks ticks = AxisTicks.of(min, max, Math.max(3, width / 60));
        for (double v : ticks.values()) {
            int sx = x0 + (int) Math.round((v - min) / (max - min) * (width - 1));
            g.drawLine(sx, top + BAR, sx, top + BAR + TICK);
            String label = ticks.label(v);
            int w = fm.stringWidth(label);
            // below the tick, as on the distance axis, so that the tick does not run into the number
            g.drawString(label, Math.max(0, Math.min(getWidth() - w, sx - w / 2)),
                    top + BAR + TICK + line - fm.getDescent());
        }
        String unit = image.getCalibration().getValueUnit();
        String title = "colour: " + (unit == null || unit.isEmpty() || unit.equals("Gray Value") ? "value" : unit)
                + ", bar from " + number(min) + " to " + number(max);
        g.drawString(title, 2, top + BAR + TICK + 2 * line - fm.getDescent());
        return top + BAR + TICK + 2 * line;
    }

    /**
     * The time axis, and the data range of the shown slice with a warning when it reaches beyond the colour bar
     * ({@code longest}: as if it did, to size the strip).
     */
    private List<String> notes(boolean longest) {
        List<String> notes = new ArrayList<>();
        Calibration cal = image.getCalibration();
        double first = cal.getY(0);
        double last = cal.getY(image.getHeight() - 1);
        AxisTicks ticks = Display.timeTickValues(image);
        notes.add("time: " + number(first) + " " + cal.getYUnit() + " at the top to " + number(last) + " "
                + cal.getYUnit() + " at the bottom" + (Double.isFinite(ticks.step()) ? ", ticks every "
                + ticks.label(ticks.step()) + " " + cal.getYUnit() : ""));
        double[] range = dataRange(image.getProcessor());
        double min = image.getProcessor().getMin();
        double max = image.getProcessor().getMax();
        double tolerance = 1e-6 * Math.max(1e-30, max - min);
        if (range == null) {
            notes.add("data: none finite in this slice");
        } else {
            boolean beyond = longest || range[0] < min - tolerance || range[1] > max + tolerance;
            notes.add("data: " + number(range[0]) + " to " + number(range[1])
                    + (beyond ? ", beyond the bar in its end colours" : ", all within the bar"));
        }
        return notes;
    }

    /** Smallest and largest finite value of a plane, or null when it has none. */
    static double[] dataRange(ImageProcessor ip) {
        double lo = Double.POSITIVE_INFINITY;
        double hi = Double.NEGATIVE_INFINITY;
        int n = ip.getPixelCount();
        for (int i = 0; i < n; i++) {
            double v = ip.getf(i);
            if (Double.isFinite(v)) {
                lo = Math.min(lo, v);
                hi = Math.max(hi, v);
            }
        }
        return lo <= hi ? new double[] {lo, hi} : null;
    }

    /** Three significant digits without an exponent for everyday magnitudes, trailing zeros dropped. */
    static String number(double v) {
        double a = Math.abs(v);
        if (v == 0 || !Double.isFinite(v)) {
            return v == 0 ? "0" : Double.toString(v);
        }
        if (a < 1e-3 || a >= 1e6) {
            return String.format(Locale.ROOT, "%.2e", v);
        }
        int decimals = Math.max(0, 2 - (int) Math.floor(Math.log10(a)));
        String s = new java.math.BigDecimal(v).setScale(decimals, java.math.RoundingMode.HALF_EVEN).stripTrailingZeros()
                .toPlainString();
        return s.equals("-0") ? "0" : s;
    }

    /** Splits text at spaces so that each line fits {@code width} pixels. */
    static List<String> wrap(List<String> paragraphs, FontMetrics fm, int width) {
        List<String> lines = new ArrayList<>();
        for (String p : paragraphs) {
            StringBuilder current = new StringBuilder();
            for (String word : p.split(" ")) {
                String candidate = current.isEmpty() ? word : current + " " + word;
                if (fm.stringWidth(candidate) > width && !current.isEmpty()) {
                    lines.add(current.toString());
                    current = new StringBuilder(word);
                } else {
                    current = new StringBuilder(candidate);
                }
            }
            lines.add(current.toString());
        }
        return lines;
    }

    @Override
    public void imageOpened(ImagePlus imp) {
    }

    @Override
    public void imageClosed(ImagePlus imp) {
        if (imp == image) {
            ImagePlus.removeImageListener(this);
        }
    }

    @Override
    public void imageUpdated(ImagePlus imp) {
        if (imp == image) {
            repaint();
        }
    }
}
