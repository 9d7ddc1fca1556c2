package org.dendrokin.ij1;

import java.util.ArrayList;
import java.util.List;

import ij.ImagePlus;
import ij.gui.Line;
import ij.gui.Roi;
import ij.plugin.frame.RoiManager;
import ij.process.FloatPolygon;

import org.dendrokin.core.path.DendritePath;
import org.dendrokin.io.path.PathFiles;

/**
 * A line drawn in ImageJ (straight, segmented or freehand) as a dendrite path, with its line width, which
 * is offered as the width of the band averaged across the path. Coordinates are converted to our path
 * convention (pixel i covers [i, i+1)) exactly as for ROI files ({@link PathFiles}).
 *
 * @param name    the ROI's name, or "selection" for an unnamed current selection
 * @param roi     the ImageJ ROI it came from
 * @param widthPx the line width, pixels (1 for a thin line)
 */
public record LineSelection(String name, Roi roi, double widthPx) {

    /** Where the lines of a command come from; the labels are the dialog's choices and macro values. */
    public enum Source {
        SELECTION("current selection"),
        MANAGER_SELECTED("selected in ROI Manager"),
        MANAGER_ALL("all lines in ROI Manager");

        final String label;

        Source(String label) {
            this.label = label;
        }

        static String[] labels() {
            Source[] all = values();
            String[] s = new String[all.length];
            for (int i = 0; i < all.length; i++) {
                s[i] = all[i].label;
            }
            return s;
        }

        static Source of(String label) {
            for (Source s : values()) {
                if (s.label.equals(label)) {
                    return s;
                }
            }
            throw new IllegalArgumentException("lines=" + label + " is not one of: " + String.join(", ", labels()));
        }
    }

    /** A line ROI as a selection; throws IllegalArgumentException for areas and points. */
    public static LineSelection of(Roi roi, String fallbackName) {
        if (roi == null || !isPath(roi)) {
            throw new IllegalArgumentException("a straight, segmented or freehand line selection along the dendrite is"
                    + " needed" + (roi == null ? "; draw one with the line tools" : ", not a " + roi.getTypeAsString()
                    + " selection"));
        }
        String name = roi.getName() != null ? roi.getName() : fallbackName;
        // a line's own width, else ImageJ's line width setting (Edit > Options > Line Width), as its profiles do
        double stroke = roi.getStrokeWidth();
        double width = Math.max(1.0, stroke > 1 ? stroke : Line.getWidth());
        return new LineSelection(name, roi, width);
    }

    static boolean isPath(Roi roi) {
        int t = roi.getType();
        return t == Roi.LINE || t == Roi.POLYLINE || t == Roi.FREELINE;
    }

    /**
     * The vertices in our path coordinates (pixel i covers [i, i+1)): {x[], y[]}. ImageJ samples line ROIs with
     * pixel centres at whole numbers, so {@link PathFiles#LINE_ROI_SHIFT} is added, as for ROI files.
     */
    public double[][] vertices() {
        double s = PathFiles.LINE_ROI_SHIFT;
        if (roi instanceof Line line) {
            return new double[][] {{line.x1d + s, line.x2d + s}, {line.y1d + s, line.y2d + s}};
        }
        FloatPolygon p = roi.getFloatPolygon();
        double[] x = new double[p.npoints];
        double[] y = new double[p.npoints];
        for (int i = 0; i < p.npoints; i++) {
            x[i] = p.xpoints[i] + s;
            y[i] = p.ypoints[i] + s;
        }
        return new double[][] {x, y};
    }

    /** True for a freehand line, which the path smooths lightly. */
    public boolean freehand() {
        return roi.getType() == Roi.FREELINE;
    }

    /** The dendrite path through the vertices. */
    public DendritePath path() {
        double[][] v = vertices();
        return DendritePath.of(v[0], v[1], freehand());
    }

    /**
     * The lines to work on, from the image's selection or from the ROI Manager.
     *
     * @throws IllegalArgumentException if there is no line where the user pointed
     */
    public static List<LineSelection> collect(ImagePlus image, Source source) {
        List<LineSelection> lines = new ArrayList<>();
        if (source == Source.SELECTION) {
            lines.add(of(image.getRoi(), "selection"));
            return lines;
        }
        RoiManager manager = RoiManager.getInstance();
        if (manager == null || manager.getCount() == 0) {
            throw new IllegalArgumentException("the ROI Manager is empty; add the dendrite lines to it (press t) or"
                    + " use the current selection");
        }
        Roi[] rois = source == Source.MANAGER_ALL ? manager.getRoisAsArray() : manager.getSelectedRoisAsArray();
        for (int i = 0; i < rois.length; i++) {
            if (rois[i] != null && isPath(rois[i])) {
                lines.add(of(rois[i], "line " + (i + 1)));
            }
        }
        if (lines.isEmpty()) {
            throw new IllegalArgumentException("none of the ROI Manager's " + (source == Source.MANAGER_ALL ? "" : "selected ")
                    + "ROIs is a straight, segmented or freehand line");
        }
        return lines;
    }

    /** The source to offer first: the selection if it is a line, else the ROI Manager if it holds one. */
    public static Source suggestedSource(ImagePlus image) {
        Roi roi = image.getRoi();
        if (roi != null && isPath(roi)) {
            return Source.SELECTION;
        }
        RoiManager manager = RoiManager.getInstance();
        if (manager != null && manager.getCount() > 0) {
            return manager.getSelectedIndexes().length > 0 ? Source.MANAGER_SELECTED : Source.MANAGER_ALL;
        }
        return Source.SELECTION;
    }
}
