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
        ImagePlus source = WindowManager.getCurrentImage();
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

    /** Adds ImageJ's calibration bar as an overlay at the upper right, scaled back for the zoom. */
    static void calibrationBar(ImagePlus image, double zoom) {
        double barZoom = Math.max(0.5, Math.min(1.0, image.getHeight() / 260.0));
        IJ.run(image, "Calibration Bar...", String.format(Locale.ROOT,
                "location=[Upper Right] fill=White label=Black number=5 decimal=2 font=%d zoom=%.2f overlay show",
                Math.max(7, (int) Math.round(12 / zoom)), barZoom));
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
