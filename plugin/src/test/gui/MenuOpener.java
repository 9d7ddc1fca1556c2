import java.awt.Font;
import java.awt.FontMetrics;
import java.awt.Frame;
import java.awt.Insets;
import java.awt.Point;
import java.awt.Robot;
import java.awt.event.InputEvent;
import java.awt.event.KeyEvent;
import java.awt.image.BufferedImage;

import ij.IJ;
import ij.ImageJ;

/**
 * For the window tests only: opens ImageJ's Plugins menu and points at its Dendrokin submenu with the mouse,
 * a moment after the macro that calls it has ended, so that the screenshot shows the menu open. Macro use:
 * {@code call("MenuOpener.openLater", "Plugins", "Dendrokin");}
 */
public class MenuOpener {
    private MenuOpener() {
    }

    public static String openLater(String menu, String lastItem) {
        Thread t = new Thread(() -> {
            try {
                Thread.sleep(700);
                open(menu);
            } catch (Exception e) {
                IJ.log("MenuOpener: " + e);
            }
        }, "menu-opener");
        t.setDaemon(true);
        t.start();
        return "";
    }

    private static void open(String menu) throws Exception {
        ImageJ ij = IJ.getInstance();
        Frame frame = ij;
        Point origin = frame.getLocationOnScreen();
        Insets insets = frame.getInsets();
        Font font = frame.getMenuBar().getFont() != null ? frame.getMenuBar().getFont() : new Font("Dialog", Font.PLAIN, 12);
        FontMetrics fm = new BufferedImage(1, 1, BufferedImage.TYPE_INT_RGB).getGraphics().getFontMetrics(font);
        int x = origin.x + insets.left + 6;
        for (int i = 0; i < frame.getMenuBar().getMenuCount(); i++) {
            String label = frame.getMenuBar().getMenu(i).getLabel();
            int w = fm.stringWidth(label) + 16;
            if (label.equals(menu)) {
                x += w / 2;
                break;
            }
            x += w;
        }
        int y = origin.y + insets.top - 10;
        Robot robot = new Robot();
        robot.mouseMove(x, y);
        robot.mousePress(InputEvent.BUTTON1_DOWN_MASK);
        robot.mouseRelease(InputEvent.BUTTON1_DOWN_MASK);
        Thread.sleep(600);
        // the item is the menu's last one: Up wraps to it, Right opens its submenu
        robot.keyPress(KeyEvent.VK_UP);
        robot.keyRelease(KeyEvent.VK_UP);
        Thread.sleep(200);
        robot.keyPress(KeyEvent.VK_RIGHT);
        robot.keyRelease(KeyEvent.VK_RIGHT);
        Thread.sleep(300);
    }
}
