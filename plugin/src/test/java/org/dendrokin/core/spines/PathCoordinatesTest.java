package org.dendrokin.core.spines;

import static org.junit.jupiter.api.Assertions.assertEquals;

import org.dendrokin.core.path.DendritePath;
import org.junit.jupiter.api.Test;

/** Places of points relative to a path: arc length of the nearest point and signed distance. */
class PathCoordinatesTest {
    @Test
    void aPointAboveAPathDrawnLeftToRightIsOnItsLeft() {
        // REF: plane geometry; image y points down, so "above" on the screen is the left of a rightward path
        // [common practice]
        PathCoordinates pc = new PathCoordinates(DendritePath.of(new double[] {10, 30, 30},
                new double[] {20, 20, 40}, false));
        double[] above = pc.locate(14, 17);
        assertEquals(4, above[0], 1e-12, "arc length (px)");
        assertEquals(-3, above[1], 1e-12, "signed distance (px): negative is left");
        double[] below = pc.locate(14, 25);
        assertEquals(5, below[1], 1e-12, "below the path is its right");
        // On the second segment, going down the screen, +x is the path's left.
        double[] east = pc.locate(33, 30);
        assertEquals(30, east[0], 1e-12, "arc length along the corner (px)");
        assertEquals(-3, east[1], 1e-12, "east of a downward path is its left");
        assertEquals(1, pc.locate(5, 20)[2], 0, "beyond the first vertex the nearest point is an end");
    }
}
