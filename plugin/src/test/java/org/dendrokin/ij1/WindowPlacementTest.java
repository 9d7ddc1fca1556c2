package org.dendrokin.ij1;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.awt.Dimension;
import java.awt.Point;
import java.awt.Rectangle;
import java.util.ArrayList;
import java.util.List;
import java.util.Random;

import org.junit.jupiter.api.Test;

/** Where new windows go, checked against the placement rules on made-up screens (pixels). */
class WindowPlacementTest {
    private static final Rectangle SCREEN = new Rectangle(0, 0, 1920, 1080);
    private static final int GAP = WindowPlacement.GAP;

    private static Rectangle at(Point p, Dimension size) {
        return new Rectangle(p, size);
    }

    @Test
    void aResultGoesRightOfItsSourceWhenThereIsRoom() {
        Rectangle movie = new Rectangle(10, 120, 590, 260);
        Point p = WindowPlacement.next(movie, new Dimension(370, 565), List.of(movie), SCREEN);
        assertEquals(new Point(movie.x + movie.width + GAP, movie.y), p, "top-aligned, just right of the movie");
    }

    @Test
    void belowTheSourceWhenTheRightSideIsOffTheScreen() {
        Rectangle source = new Rectangle(1500, 100, 400, 300);
        Point p = WindowPlacement.next(source, new Dimension(370, 500), List.of(source), SCREEN);
        assertEquals(new Point(source.x, source.y + source.height + GAP), p, "left-aligned, just below");
    }

    @Test
    void severalResultsLineUpSideBySideInsteadOfOnTopOfEachOther() {
        Rectangle movie = new Rectangle(10, 120, 590, 260);
        Dimension size = new Dimension(272, 595);
        List<Rectangle> open = new ArrayList<>(List.of(movie));
        Rectangle first = at(WindowPlacement.next(movie, size, open, SCREEN), size);
        open.add(first);
        Rectangle second = at(WindowPlacement.next(first, size, open, SCREEN), size);
        assertEquals(new Point(first.x + first.width + GAP, first.y), second.getLocation());
        assertFalse(second.intersects(first) || second.intersects(movie));
    }

    @Test
    void aSecondTableWithoutAnImageDoesNotHideUnderTheFirst() {
        // the reported case: two tables opened beside ImageJ's main window, one after the other
        Rectangle main = new Rectangle(1040, 0, 611, 97);
        Dimension table = new Dimension(700, 400);
        List<Rectangle> open = new ArrayList<>(List.of(main));
        Rectangle first = at(WindowPlacement.next(main, table, open, SCREEN), table);
        open.add(first);
        Rectangle second = at(WindowPlacement.next(main, table, open, SCREEN), table);
        assertFalse(second.intersects(first), first + " and " + second);
        assertFalse(second.intersects(main) || first.intersects(main), "ImageJ's toolbar stays in view");
        assertTrue(SCREEN.contains(first) && SCREEN.contains(second));
    }

    @Test
    void aWindowInTheWayIsWalkedAround() {
        Rectangle source = new Rectangle(10, 120, 590, 260);
        Rectangle log = new Rectangle(610, 100, 400, 250);
        Dimension size = new Dimension(370, 565);
        Rectangle placed = at(WindowPlacement.next(source, size, List.of(source, log), SCREEN), size);
        assertFalse(placed.intersects(log) || placed.intersects(source));
        assertTrue(SCREEN.contains(placed));
    }

    @Test
    void onAFullScreenTheWindowCascadesAndNeverSitsExactlyOnAnother() {
        Rectangle screen = new Rectangle(0, 0, 800, 600);
        Rectangle wall = new Rectangle(0, 0, 800, 600);
        Rectangle source = new Rectangle(100, 100, 300, 300);
        List<Rectangle> open = new ArrayList<>(List.of(wall, source));
        Dimension size = new Dimension(300, 300);
        for (int i = 0; i < 12; i++) {
            Point p = WindowPlacement.next(source, size, open, screen);
            for (Rectangle r : open) {
                assertTrue(Math.abs(r.x - p.x) >= WindowPlacement.CASCADE || Math.abs(r.y - p.y)
                        >= WindowPlacement.CASCADE, "corner " + p + " clear of " + r);
            }
            assertTrue(screen.contains(at(p, size)), "on the screen: " + p);
            open.add(at(p, size));
        }
    }

    @Test
    void randomScreensGiveAPlaceOnTheScreenThatOverlapsNothingWheneverOneOfTheTriedSpotsIsFree() {
        Random random = new Random(7);
        for (int trial = 0; trial < 2000; trial++) {
            List<Rectangle> open = new ArrayList<>();
            int n = 1 + random.nextInt(6);
            for (int i = 0; i < n; i++) {
                open.add(new Rectangle(random.nextInt(1600), random.nextInt(900), 100 + random.nextInt(600),
                        80 + random.nextInt(500)));
            }
            Rectangle anchor = open.get(random.nextInt(n));
            Dimension size = new Dimension(100 + random.nextInt(600), 80 + random.nextInt(500));
            Rectangle placed = at(WindowPlacement.next(anchor, size, open, SCREEN), size);
            boolean free = open.stream().noneMatch(placed::intersects) && SCREEN.contains(placed);
            boolean freeRightOrBelow = isFree(new Rectangle(anchor.x + anchor.width + GAP, anchor.y, size.width,
                    size.height), open) || isFree(new Rectangle(anchor.x, anchor.y + anchor.height + GAP, size.width,
                    size.height), open);
            if (freeRightOrBelow) {
                assertTrue(free, "trial " + trial + ": a free spot beside the anchor existed, got " + placed);
                assertTrue(WindowPlacement.distance(placed, anchor) <= GAP + 1e-9, "trial " + trial + ": next to it");
            }
            for (Rectangle r : open) {
                assertFalse(r.getLocation().equals(placed.getLocation()), "trial " + trial + ": exactly on " + r);
            }
        }
    }

    private static boolean isFree(Rectangle r, List<Rectangle> open) {
        return SCREEN.contains(r) && open.stream().noneMatch(r::intersects);
    }
}
