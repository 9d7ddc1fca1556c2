package org.dendrokin.ij1;

import java.awt.Color;
import java.io.IOException;
import java.io.Reader;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;

import ij.IJ;
import ij.ImagePlus;
import ij.WindowManager;
import ij.gui.OvalRoi;
import ij.gui.Overlay;
import ij.measure.ResultsTable;
import ij.plugin.PlugIn;

import org.apache.commons.csv.CSVFormat;
import org.apache.commons.csv.CSVParser;
import org.apache.commons.csv.CSVRecord;
import org.dendrokin.io.InputException;
import org.dendrokin.io.session.SpineOutputs;

/**
 * Plugins > Dendrokin > Spine Table: shows the spines of an analysed session (the {@code spines.csv} that Analyze
 * Session Folder writes when session.json has a {@code spines} key) as a results table, one row a spine: position
 * along the path, side, distance from the stimulus, peak, time to peak, decay time and the neck time constant with
 * its 95% interval. With "mark heads" it also draws each head's disc on the active image's overlay, labelled with
 * the spine's id: red for the stimulated spine, green where the neck time constant is determined, yellow for the
 * rest (the image's own overlay is kept; marks of an earlier run are replaced). Recorded in macros like the other
 * commands; run headless it becomes the Results table.
 */
public class Spine_Table implements PlugIn {
    static final String COMMAND = "Spine Table";
    /** Name of the overlay's head marks, so that a second run replaces them. */
    static final String MARK_PREFIX = "Dendrokin spine ";
    static final Color STIMULATED = new Color(255, 60, 60);
    static final Color DETERMINED = new Color(60, 220, 90);
    static final Color OTHER = new Color(255, 220, 0);

    @Override
    public void run(String arg) {
        try {
            OptionsDialog d = new OptionsDialog(COMMAND, "spines");
            d.folder("Results folder (holds " + SpineOutputs.SPINES_CSV + ")", "");
            d.check("Mark heads on the active image", true);
            if (!d.show()) {
                return;
            }
            String folder = d.nextText();
            boolean mark = d.nextCheck();
            if (folder.isEmpty()) {
                throw new IllegalArgumentException("choose the output folder of an analysed session, the one that "
                        + "holds " + SpineOutputs.SPINES_CSV);
            }
            Path dir = Path.of(folder);
            ResultsTable t = table(dir.resolve(SpineOutputs.SPINES_CSV));
            Tables.show(t, "Dendrokin spines " + dir.toAbsolutePath().normalize().getFileName(), Display.anchor());
            ImagePlus image = WindowManager.getCurrentImage();
            if (mark && image != null) {
                int drawn = mark(image, t);
                IJ.showStatus(COMMAND + ": " + drawn + " spine head(s) marked on " + image.getTitle());
            } else if (mark) {
                IJ.showStatus(COMMAND + ": no image is open, so the heads were not marked");
            }
        } catch (RuntimeException e) {
            Failures.show(COMMAND, e);
        }
    }

    /**
     * Draws each spine's head disc on the image's overlay (a circle of radius_px around x_px, y_px, ImageJ pixel
     * coordinates), named and labelled with its id; earlier marks of this command are removed first.
     *
     * @return the number of heads drawn
     */
    static int mark(ImagePlus image, ResultsTable t) {
        Overlay overlay = image.getOverlay() == null ? new Overlay() : image.getOverlay();
        for (int i = overlay.size() - 1; i >= 0; i--) {
            String name = overlay.get(i).getName();
            if (name != null && name.startsWith(MARK_PREFIX)) {
                overlay.remove(i);
            }
        }
        int drawn = 0;
        for (int row = 0; row < t.size(); row++) {
            double x = t.getValue("x_px", row);
            double y = t.getValue("y_px", row);
            double r = t.columnExists("radius_px") ? t.getValue("radius_px", row) : Double.NaN;
            if (!Double.isFinite(x) || !Double.isFinite(y)) {
                continue;
            }
            r = Double.isFinite(r) && r > 0 ? r : 1.5;
            OvalRoi head = new OvalRoi(x - r, y - r, 2 * r, 2 * r);
            String id = t.getStringValue("id", row);
            head.setName(MARK_PREFIX + id);
            boolean stimulated = "true".equals(t.getStringValue("stimulated", row));
            boolean determined = "true".equals(t.getStringValue("tau_neck_determined", row));
            head.setStrokeColor(stimulated ? STIMULATED : determined ? DETERMINED : OTHER);
            overlay.add(head);
            drawn++;
        }
        overlay.drawLabels(true);
        overlay.drawNames(false);
        overlay.setLabelColor(OTHER);
        image.setOverlay(overlay);
        return drawn;
    }

    /** The rows of spines.csv; numbers as numbers (NaN where the file says NaN), the rest, empty cells too, as text. */
    static ResultsTable table(Path csv) {
        if (!Files.isRegularFile(csv)) {
            throw new InputException(csv, "is not there: analyse the session with a \"spines\" key in session.json "
                    + "first");
        }
        ResultsTable t = Tables.quantities();
        try (Reader r = Files.newBufferedReader(csv, StandardCharsets.UTF_8);
                CSVParser p = CSVFormat.DEFAULT.builder().setHeader().setSkipHeaderRecord(true).get().parse(r)) {
            for (CSVRecord row : p) {
                t.incrementCounter();
                for (String column : p.getHeaderNames()) {
                    String cell = row.get(column);
                    Double number = number(cell);
                    if (number != null) {
                        t.addValue(column, number);
                    } else {
                        t.addValue(column, cell);
                    }
                }
            }
        } catch (IOException | IllegalArgumentException e) {
            throw new InputException(csv, "could not be read as a spine table (" + e.getMessage() + ")", e);
        }
        return t;
    }

    private static Double number(String cell) {
        if (cell.isEmpty()) {
            // shown empty, read as NaN by ResultsTable.getValue
            return null;
        }
        if (cell.equals("NaN")) {
            return Double.NaN;
        }
        try {
            return Double.parseDouble(cell);
        } catch (NumberFormatException e) {
            return null;
        }
    }
}
