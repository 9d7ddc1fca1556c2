package org.dendrokin.ij1;

import java.awt.Dimension;
import java.awt.Rectangle;
import java.util.Locale;

import ij.IJ;
import ij.ImagePlus;
import ij.WindowManager;
import ij.gui.ImageWindow;
import ij.plugin.Zoom;

/**
 * How our images appear: kymographs zoomed to a readable size with a calibration bar, and new windows
 * placed beside the window they came from rather than piled on it. Without a display an image is only
 * made current, so the next macro line can use it.
 */
final class Display {
    private static final int TARGET_PX = 420;

    private Display() {
    }

    /** Shows a kymograph image: zoomed so that its longer side is about 420 screen pixels, with a colour bar. */
    static void showKymograph(ImagePlus image) {
        showKymograph(image, WindowManager.getCurrentImage());
    }

    /** As {@link #showKymograph(ImagePlus)}, placed beside {@code source} (e.g. the previous kymograph). */
    static void showKymograph(ImagePlus image, ImagePlus source) {
        image.show();
        if (OptionsDialog.headless() || image.getWindow() == null) {
            return;
        }
        int longest = Math.max(image.getWidth(), image.getHeight());
        double zoom = Math.max(1, Math.min(8, Math.floor((double) TARGET_PX / longest)));
        if (zoom > 1) {
            Zoom.set(image, zoom);
        }
        calibrationBar(image, zoom);
        placeBeside(image.getWindow(), source == null ? null : source.getWindow());
    }

    /**
     * Adds ImageJ's calibration bar as an overlay at the upper right (early frames far from the stimulus, the
     * least telling corner), small enough to leave the data visible; its text is sized for the zoom so it reads
     * at about 12 screen pixels. The unit is in the window title.
     */
    static void calibrationBar(ImagePlus image, double zoom) {
        // the bar's size follows the image's smaller side, so a narrow kymograph keeps most of its width
        double barZoom = Math.max(0.3, Math.min(1.0, Math.min(0.55 * image.getHeight() / 128.0,
                0.3 * image.getWidth() / 64.0)));
        int screenFont = image.getWidth() < 120 ? 10 : 12;
        double range = image.getDisplayRangeMax() - image.getDisplayRangeMin();
        int decimals = range >= 100 ? 0 : range >= 10 ? 1 : range >= 1 ? 2 : 3;
        IJ.run(image, "Calibration Bar...", String.format(Locale.ROOT,
                "location=[Upper Right] fill=White label=Black number=3 decimal=%d font=%d zoom=%.2f overlay",
                decimals, Math.max(5, (int) Math.round(screenFont / zoom)), barZoom));
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

    /** Moves {@code window} to the right of {@code anchor} if it fits on the screen, else below it. */
    static void placeBeside(ImageWindow window, ImageWindow anchor) {
        if (window == null || anchor == null || window == anchor) {
            return;
        }
        Rectangle a = anchor.getBounds();
        Dimension screen = IJ.getScreenSize();
        Rectangle w = window.getBounds();
        if (a.x + a.width + w.width <= screen.width) {
            window.setLocation(a.x + a.width + 4, a.y);
        } else if (a.y + a.height + w.height <= screen.height) {
            window.setLocation(a.x, a.y + a.height + 4);
        }
    }
}
