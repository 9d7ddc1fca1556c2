package org.dendrokin.ij1;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.Reader;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;

import org.apache.commons.csv.CSVFormat;
import org.apache.commons.csv.CSVRecord;
import org.dendrokin.core.Progress;
import org.dendrokin.io.SessionRunner;
import org.dendrokin.io.session.SpineOutputs;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

import ij.IJ;
import ij.ImagePlus;
import ij.WindowManager;
import ij.gui.Overlay;
import ij.gui.Roi;
import ij.measure.ResultsTable;
import ij.plugin.filter.Analyzer;

/** Spine Table, run as a macro runs it, on the spine demo session's outputs. */
class SpineTableTest {
    @Test
    void showsEverySpineOfTheSessionWithItsNeckTimeConstant(@TempDir Path dir) throws Exception {
        HeadlessImageJ.start();
        Path out = dir.resolve("demo-spines-results");
        SessionRunner.analyze(Path.of("..", "test-images", "demo-spines"), out, Progress.NONE);
        List<CSVRecord> rows;
        try (Reader r = Files.newBufferedReader(out.resolve(SpineOutputs.SPINES_CSV))) {
            rows = CSVFormat.DEFAULT.builder().setHeader().setSkipHeaderRecord(true).get().parse(r).getRecords();
        }
        IJ.run("Spine Table...", "results=[" + out + "]");
        ResultsTable t = Analyzer.getResultsTable();
        assertEquals(rows.size(), t.size(), "one row a spine");
        int fitted = 0;
        for (int i = 0; i < rows.size(); i++) {
            assertEquals(rows.get(i).get("side"), t.getStringValue("side", i), "side of spine " + (i + 1));
            assertEquals(Double.parseDouble(rows.get(i).get("position_um")), t.getValue("position_um", i), 1e-9,
                    "position of spine " + (i + 1) + " (um)");
            String tau = rows.get(i).get("tau_neck_s");
            if (!tau.isEmpty()) {
                fitted++;
                assertEquals(Double.parseDouble(tau), t.getValue("tau_neck_s", i), 1e-9, "tau_neck (s)");
            }
        }
        assertTrue(fitted > 0, "some spines have a neck time constant");

        // With "mark" the heads are drawn on the active image: one disc a spine, where spines.csv puts it, red for
        // the stimulated one; a second run replaces the marks instead of adding to them.
        ImagePlus movie = IJ.openImage(Path.of("..", "test-images", "demo-spines", "dendrite.tif").toString());
        WindowManager.setTempCurrentImage(movie);
        try {
            IJ.run("Spine Table...", "results=[" + out + "] mark");
            IJ.run("Spine Table...", "results=[" + out + "] mark");
            Overlay overlay = movie.getOverlay();
            assertEquals(rows.size(), overlay.size(), "one mark a spine, after two runs");
            for (int i = 0; i < rows.size(); i++) {
                Roi head = overlay.get(i);
                double r = Double.parseDouble(rows.get(i).get("radius_px"));
                // REF: the default head_radius_um, 0.3 um (docs/spines.md), over the demo's 0.2 um pixels (its
                // README) [derived]; the disc's centre from ImageJ's own oval bounds
                assertEquals(1.5, r, 1e-9, "radius of spine " + (i + 1) + " (px)");
                assertEquals(Double.parseDouble(rows.get(i).get("x_px")),
                        head.getFloatBounds().x + head.getFloatBounds().width / 2, 1e-6, "x of spine " + (i + 1));
                assertEquals(Double.parseDouble(rows.get(i).get("y_px")),
                        head.getFloatBounds().y + head.getFloatBounds().height / 2, 1e-6, "y of spine " + (i + 1));
                boolean stimulated = Boolean.parseBoolean(rows.get(i).get("stimulated"));
                assertEquals(stimulated, Spine_Table.STIMULATED.equals(head.getStrokeColor()),
                        "colour of spine " + (i + 1));
            }
        } finally {
            WindowManager.setTempCurrentImage(null);
        }
    }
}
