package org.dendrokin.ij1;

import java.awt.Color;
import java.awt.Point;
import java.awt.Rectangle;
import java.awt.Window;
import java.util.ArrayList;
import java.util.List;

import javax.swing.Timer;

import ij.IJ;
import ij.ImagePlus;
import ij.WindowManager;
import ij.gui.GUI;
import ij.gui.ImageCanvas;
import ij.gui.ImageWindow;
import ij.gui.Line;
import ij.gui.Overlay;
import ij.gui.Plot;
import ij.gui.PlotWindow;
import ij.measure.Calibration;

/**
 * How our windows appear. A kymograph is zoomed to a readable size, gets its axes and colour scale in a strip
 * below the image ({@link KymographLegend}) and short time ticks on its left edge, nothing drawn over the
 * data; every new window (image, table, plot) is placed beside the window it came from and clear of the
 * windows already open ({@link WindowPlacement}). Without a display an image is only made current, so the next
 * macro line can use it, and a table becomes the Results table.
 */
final class Display {
    private static final int TARGET_PX = 420;
    /** Screen length of a time tick, pixels. */
    private static final int TICK_PX = 8;
    /** Name of the overlay elements that mark time, so that a user can find and remove them. */
    static final String TIME_TICK = "time tick";

    private Display() {
    }

    /** Shows a kymograph image beside the current image. */
    static void showKymograph(ImagePlus image) {
        showKymograph(image, WindowManager.getCurrentImage());
    }

    /**
     * Shows a kymograph image (or a stack of kymographs on one grid): zoomed so that its longer side is about
     * 420 screen pixels, with its axes and colour scale, placed beside {@code source} (e.g. the movie it came
     * from, or the previous kymograph).
     */
    static void showKymograph(ImagePlus image, ImagePlus source) {
        Window anchor = source == null ? null : source.getWindow();
        image.show();
        if (OptionsDialog.headless() || image.getWindow() == null) {
            return;
        }
        int longest = Math.max(image.getWidth(), image.getHeight());
        double zoom = Math.max(1, Math.min(8, Math.floor((double) TARGET_PX / longest)));
        image.setOverlay(timeTicks(image, zoom));
        KymographLegend.attach(image);
        double shown = fit(image, zoom);
        place(image.getWindow(), anchor);
        // the window system may still apply the size ImageJ asked for when it opened the window, which would
        // crop the image to make room for the legend: fit it once more when that has happened
        later(() -> {
            Rectangle src = image.getCanvas() == null ? null : image.getCanvas().getSrcRect();
            if (src != null && image.getCanvas().getMagnification() == shown
                    && (src.width < image.getWidth() || src.height < image.getHeight())) {
                fit(image, shown);
            }
        });
    }

    /**
     * Shows the whole image at {@code zoom}, or at the largest of ImageJ's lower zoom levels at which the window
     * (with its slider and legend) fits on the screen, and sizes the window to it; returns the zoom used.
     */
    private static double fit(ImagePlus image, double zoom) {
        ImageWindow w = image.getWindow();
        ImageCanvas ic = w.getCanvas();
        Rectangle screen = GUI.getMaxWindowBounds(w);
        double z = zoom;
        while (true) {
            ic.setMagnification(z);
            ic.setSize((int) Math.round(image.getWidth() * z), (int) Math.round(image.getHeight() * z));
            ic.setSourceRect(new Rectangle(0, 0, image.getWidth(), image.getHeight()));
            w.pack();
            double lower = ImageCanvas.getLowerZoomLevel(z);
            if ((w.getHeight() <= screen.height && w.getWidth() <= screen.width) || lower >= z) {
                return z;
            }
            z = lower;
        }
    }

    /**
     * The time axis's ticks: round times, about one per 30 rows of the image (2 to 10 of them). They depend on
     * the image alone, so the ticks drawn and the spacing the legend states always agree.
     */
    static AxisTicks timeTickValues(ImagePlus image) {
        Calibration cal = image.getCalibration();
        double first = cal.getY(0);
        double last = cal.getY(image.getHeight() - 1);
        return AxisTicks.of(Math.min(first, last), Math.max(first, last),
                Math.max(2, Math.min(10, image.getHeight() / 30)));
    }

    /**
     * Short white ticks on the image's left edge at round times, at the centre of the row of that time; they
     * cover the outermost columns only, and are named {@value #TIME_TICK} in the overlay.
     *
     * @param magnification the window's zoom, so that a tick is about 8 screen pixels long
     */
    static Overlay timeTicks(ImagePlus image, double magnification) {
        Overlay overlay = image.getOverlay() == null ? new Overlay() : image.getOverlay();
        Calibration cal = image.getCalibration();
        double length = Math.max(1, TICK_PX / magnification);
        for (double t : timeTickValues(image).values()) {
            double row = t / cal.pixelHeight + cal.yOrigin + 0.5;
            Line tick = new Line(0, row, length, row);
            tick.setStrokeColor(Color.WHITE);
            // a new Line takes ImageJ's current line width (a band around a path, often several pixels)
            tick.setStrokeWidth(1);
            tick.setName(TIME_TICK);
            overlay.add(tick);
        }
        return overlay;
    }

    /** Shows a plot beside {@code anchor}; returns its window (null without a display). */
    static PlotWindow showPlot(Plot plot, Window anchor) {
        PlotWindow window = plot.show();
        place(window, anchor);
        return window;
    }

    /** The window of the current image, else ImageJ's main window (or null): where results go beside. */
    static Window anchor() {
        ImagePlus current = WindowManager.getCurrentImage();
        if (current != null && current.getWindow() != null) {
            return current.getWindow();
        }
        return IJ.getInstance();
    }

    /** Opens a dialog to the right of the image's window, so that a preview drawn on the image stays visible. */
    static void besideImage(ij.gui.GenericDialog dialog, ImagePlus image) {
        ImageWindow w = image.getWindow();
        if (w == null) {
            return;
        }
        Rectangle b = w.getBounds();
        if (b.x + b.width + 660 <= IJ.getScreenSize().width) {
            dialog.centerDialog(false);
            dialog.setLocation(b.x + b.width + 8, b.y);
        }
    }

    /**
     * Moves {@code window} beside {@code anchor} (ImageJ's main window when null), clear of ImageJ's other open
     * windows where the screen has room; see {@link WindowPlacement}.
     */
    static void place(Window window, Window anchor) {
        if (window == null || OptionsDialog.headless()) {
            return;
        }
        List<Window> known = others(window);
        Point p = spot(window, anchor);
        window.setLocation(p);
        // a window that has only just opened may still be moved by the window manager's own placement, and its
        // neighbours may still grow (a plot adds its buttons): look again once things have settled. Windows
        // opened since (the Log, the next result) are theirs to avoid; this one does not jump for them.
        later(() -> {
            boolean overlaps = known.stream().anyMatch(w -> w.isShowing() && w.getBounds().intersects(
                    window.getBounds()));
            if (window.isShowing() && (!window.getLocation().equals(p) || overlaps)) {
                window.setLocation(spot(window, anchor));
            }
        });
    }

    /** Where {@code window} goes beside {@code anchor} (ImageJ's main window when null or not shown). */
    private static Point spot(Window window, Window anchor) {
        Window a = anchor != null && anchor != window && anchor.isShowing() ? anchor : IJ.getInstance();
        Rectangle screen = GUI.getMaxWindowBounds(a != null ? a : window);
        Rectangle anchorBounds = a != null ? a.getBounds() : new Rectangle(screen.x, screen.y, 0, 0);
        List<Rectangle> open = others(window).stream().map(Window::getBounds).toList();
        return WindowPlacement.next(anchorBounds, window.getSize(), open, screen);
    }

    /** Every other window of this program on the screen: ImageJ's, images, tables, plots, dialogs, the Log. */
    private static List<Window> others(Window window) {
        List<Window> open = new ArrayList<>();
        for (Window w : Window.getWindows()) {
            if (w != window && w.isShowing() && w.getWidth() > 0 && w.getHeight() > 0) {
                open.add(w);
            }
        }
        return open;
    }

    /** Runs {@code check} on the event thread after 0.3 s and again after 1 s. */
    private static void later(Runnable check) {
        for (int delay : new int[] {300, 1000}) {
            Timer timer = new Timer(delay, e -> check.run());
            timer.setRepeats(false);
            timer.start();
        }
    }
}
