package org.dendrokin.core.analysis;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;

import org.dendrokin.core.model.TreeGeometry;
import org.dendrokin.core.path.DendritePath;
import org.junit.jupiter.api.Test;

class BranchedPathsTest {
    private static final double PX = 0.25;

    private static DendritePath line(double x0, double y0, double x1, double y1) {
        return DendritePath.of(new double[] {x0, x1}, new double[] {y0, y1}, false);
    }

    @Test
    void aSideLineTouchingTheMiddleCutsTheMainLineAndAForkJoinsAtItsEnd() {
        Map<String, DendritePath> lines = new LinkedHashMap<>();
        lines.put("trunk", line(8, 48, 120, 48));
        lines.put("side_a", line(72, 49, 112, 9));     // starts 1 px (0.25 um) beside the trunk
        lines.put("side_b", line(121, 48, 152, 84));   // starts 1 px beyond the trunk's end
        lines.put("side_c", line(120, 48, 154, 14));
        BranchedPaths b = BranchedPaths.join(lines, PX, 1.0);
        TreeGeometry tree = b.tree();
        assertEquals(List.of("trunk_1", "trunk_2", "side_a", "side_b", "side_c"), tree.branchNames());
        // REF: Euclidean length of straight segments [common practice]
        assertEquals(16.0, tree.branch("trunk_1").lengthUm(), 1e-9, "trunk up to the side branch (um)");
        assertEquals(12.0, tree.branch("trunk_2").lengthUm(), 1e-9, "trunk beyond it (um)");
        assertEquals(Math.hypot(40, 40) * PX, tree.branch("side_a").lengthUm(), 1e-9, "side_a (um)");
        assertEquals(2, b.branchPoints().size(), "two branch points");
        assertEquals(3, b.branchPoints().get(1).members().size(), "the fork joins three lines");
        assertEquals(0.25, b.branchPoints().get(0).gapUm(), 1e-9, "side_a's gap (um)");
        assertEquals(2, tree.junctions().size(), "two junctions in the tree");
        // REF: path distance on a tree is the sum of the edge lengths between the points [common practice]
        assertEquals(2 + 1, tree.distanceUm("trunk_1", 14, "side_a", 1), 1e-9, "through the branch point (um)");
        assertEquals("trunk_2", b.locate("trunk", 20).getKey(), "20 um along the trunk lies beyond the cut");
        assertEquals(4.0, b.locate("trunk", 20).getValue(), 1e-9, "and 4 um into that branch");
    }

    @Test
    void linesThatDoNotMeetAreRefusedNamingTheLine() {
        Map<String, DendritePath> lines = new LinkedHashMap<>();
        lines.put("trunk", line(8, 48, 120, 48));
        lines.put("stray", line(60, 60, 100, 90));   // 12 px = 3 um below the trunk at its nearest end
        AnalysisInputException e = assertThrows(AnalysisInputException.class,
                () -> BranchedPaths.join(lines, PX, 1.0));
        assertEquals(AnalysisInputException.Subject.PATH, e.subject());
        assertTrue(e.getMessage().contains("stray") && e.getMessage().contains("does not meet"), e.getMessage());
    }

    @Test
    void linesThatCloseALoopAreRefused() {
        Map<String, DendritePath> lines = new LinkedHashMap<>();
        lines.put("a", line(10, 10, 90, 10));
        lines.put("b", line(90, 10, 50, 70));
        lines.put("c", line(50, 70, 10, 10));
        AnalysisInputException e = assertThrows(AnalysisInputException.class,
                () -> BranchedPaths.join(lines, PX, 1.0));
        assertTrue(e.getMessage().contains("loop"), e.getMessage());
        // a side line whose two ends both touch the main line also closes a loop
        Map<String, DendritePath> bridge = new LinkedHashMap<>();
        bridge.put("trunk", line(0, 40, 160, 40));
        bridge.put("arch", DendritePath.of(new double[] {40, 80, 120}, new double[] {40, 10, 40}, false));
        AnalysisInputException e2 = assertThrows(AnalysisInputException.class,
                () -> BranchedPaths.join(bridge, PX, 1.0));
        assertTrue(e2.getMessage().contains("loop"), e2.getMessage());
    }
}
