package org.dendrokin.ij1;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;

import java.nio.file.Path;

import ij.gui.Line;
import ij.gui.PolygonRoi;
import ij.gui.Roi;
import ij.io.RoiEncoder;

import org.dendrokin.core.path.DendritePath;
import org.dendrokin.io.path.PathFiles;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/** A line drawn in ImageJ gives the plug-in the same path as the same line saved to a .roi file gives the CLI. */
class LineSelectionConventionTest {
    @TempDir
    Path dir;

    @Test
    void selectionAndRoiFileGiveTheSamePath() {
        Roi[] rois = {
            new Line(10, 20, 40, 60),
            new PolygonRoi(new float[] {3.25f, 30.5f, 44f}, new float[] {7f, 12.75f, 40f}, 3, Roi.POLYLINE),
            new PolygonRoi(new int[] {5, 6, 6, 7, 8}, new int[] {5, 5, 6, 6, 7}, 5, Roi.FREELINE)};
        for (int i = 0; i < rois.length; i++) {
            Path file = dir.resolve("line" + i + ".roi");
            RoiEncoder.save(rois[i], file.toString());
            DendritePath fromFile = PathFiles.read(file, null);
            DendritePath fromSelection = LineSelection.of(rois[i], "selection").path();
            // REF: PathFiles reading the same ROI through ImageJ's RoiDecoder [common practice]
            assertArrayEquals(fromFile.xPx(), fromSelection.xPx(), 1e-6, "x of ROI " + i);
            assertArrayEquals(fromFile.yPx(), fromSelection.yPx(), 1e-6, "y of ROI " + i);
        }
    }
}
