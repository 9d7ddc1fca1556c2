package org.dendrokin.ij1;

import java.awt.Dimension;
import java.awt.Point;
import java.awt.Rectangle;
import java.util.ArrayList;
import java.util.Comparator;
import java.util.List;

/**
 * Where a new window goes: next to the window it came from (its anchor) and clear of every window already on
 * the screen, so that a command's results never hide each other or the image they were made from. Pure
 * geometry in screen pixels; {@link Display} feeds it the bounds of ImageJ's open windows.
 *
 * <p>The places tried are the spots next to the anchor and to every open window (right of it, below it, left of it
 * and above it, edges aligned, {@link #GAP} pixels apart) and the same rows and columns at the screen's left and
 * top edges. Of those that lie on the screen and overlap no open window, the one nearest the anchor wins; ties go
 * to right, then below, then left, then above, then the screen's edges, so that a result sits to the right of its
 * source when there is room, else below it. When the screen is full, the window cascades from the anchor in
 * steps of {@link #CASCADE} pixels to the first spot whose corner is at least that far from every open window's
 * corner: it may overlap, but never sits exactly on another window and its title bar stays in view.
 */
final class WindowPlacement {
    /** Space between windows placed side by side, pixels. */
    static final int GAP = 8;
    /** Step of the cascade used when no free place is left, pixels. */
    static final int CASCADE = 24;
    private static final int MAX_CASCADE = 64;

    private WindowPlacement() {
    }

    /**
     * @param anchor the window the new one belongs beside (e.g. the source image), screen pixels
     * @param size   the new window's size, pixels
     * @param open   bounds of the windows already on the screen (the anchor may be among them; the new window
     *               must not be)
     * @param screen the usable screen area, pixels
     * @return the new window's top-left corner
     */
    static Point next(Rectangle anchor, Dimension size, List<Rectangle> open, Rectangle screen) {
        List<Rectangle> taken = new ArrayList<>(open);
        if (!taken.contains(anchor)) {
            taken.add(anchor);
        }
        List<Candidate> candidates = new ArrayList<>();
        for (Rectangle r : taken) {
            candidates.add(new Candidate(r.x + r.width + GAP, r.y, 0));
            candidates.add(new Candidate(r.x, r.y + r.height + GAP, 1));
            candidates.add(new Candidate(r.x - size.width - GAP, r.y, 2));
            candidates.add(new Candidate(r.x, r.y - size.height - GAP, 3));
            candidates.add(new Candidate(screen.x, r.y, 4));
            candidates.add(new Candidate(screen.x, r.y + r.height + GAP, 4));
            candidates.add(new Candidate(r.x, screen.y, 4));
            candidates.add(new Candidate(r.x + r.width + GAP, screen.y, 4));
        }
        candidates.add(new Candidate(screen.x, screen.y, 4));
        return candidates.stream()
                .filter(c -> free(c.bounds(size), taken, screen))
                .min(Comparator.<Candidate>comparingDouble(c -> distance(c.bounds(size), anchor))
                        .thenComparingInt(Candidate::rank).thenComparingInt(Candidate::y).thenComparingInt(Candidate::x))
                .map(c -> new Point(c.x, c.y))
                .orElseGet(() -> cascade(anchor, size, taken, screen));
    }

    /** A place to try, ranked by direction from the window it was derived from (0: right ... 4: screen edge). */
    private record Candidate(int x, int y, int rank) {
        Rectangle bounds(Dimension size) {
            return new Rectangle(x, y, size.width, size.height);
        }
    }

    private static boolean free(Rectangle r, List<Rectangle> taken, Rectangle screen) {
        return screen.contains(r) && taken.stream().noneMatch(t -> t.intersects(r));
    }

    /** The first cascade step from the anchor whose corner keeps clear of every open window's corner. */
    private static Point cascade(Rectangle anchor, Dimension size, List<Rectangle> taken, Rectangle screen) {
        Point p = anchor.getLocation();
        for (int k = 1; k <= MAX_CASCADE; k++) {
            int x = anchor.x + k * CASCADE;
            int y = anchor.y + k * CASCADE;
            // wrap back to the screen's top-left corner rather than leave it; a step keeps the corners apart
            int spanX = Math.max(1, screen.width - size.width);
            int spanY = Math.max(1, screen.height - size.height);
            p = new Point(screen.x + Math.floorMod(x - screen.x, spanX), screen.y + Math.floorMod(y - screen.y, spanY));
            Point q = p;
            if (taken.stream().allMatch(r -> Math.abs(r.x - q.x) >= CASCADE || Math.abs(r.y - q.y) >= CASCADE)) {
                return p;
            }
        }
        return p;
    }

    /** Shortest distance between two rectangles, 0 when they touch or overlap. */
    static double distance(Rectangle a, Rectangle b) {
        int dx = Math.max(0, Math.max(a.x - (b.x + b.width), b.x - (a.x + a.width)));
        int dy = Math.max(0, Math.max(a.y - (b.y + b.height), b.y - (a.y + a.height)));
        return Math.hypot(dx, dy);
    }
}
