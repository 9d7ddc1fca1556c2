package org.dendrokin.ij1;

import java.awt.Color;

import ij.ImagePlus;
import ij.gui.Overlay;
import ij.gui.PolygonRoi;
import ij.gui.Roi;

import org.dendrokin.core.path.DendritePath;
import org.dendrokin.core.path.ResampledPath;
import org.dendrokin.io.path.PathFiles;

/**
 * Shows on the image the band that a kymograph averages: the path and the two edges of the band, half the
 * band width to each side along the path's normals, exactly as the extraction resamples it. The image's
 * own overlay is put back by {@link #remove}.
 */
final class BandOutline {
    private static final String NAME = "Dendrokin band";
    private static final Color EDGE = new Color(255, 220, 0);

    private final ImagePlus image;
    private final Overlay original;

    BandOutline(ImagePlus image) {
        this.image = image;
        this.original = image.getOverlay() == null ? null : image.getOverlay().duplicate();
    }

    /** Replaces the outline with one for the given path and widths; bad values just clear it. */
    void show(Iterable<LineSelection> lines, double pixelSizeUm, double bandWidthUm, double stepUm) {
        Overlay overlay = original == null ? new Overlay() : original.duplicate();
        if (pixelSizeUm > 0 && bandWidthUm >= 0 && stepUm > 0) {
            for (LineSelection line : lines) {
                try {
                    for (Roi edge : edges(line.path(), bandWidthUm / pixelSizeUm, stepUm / pixelSizeUm)) {
                        overlay.add(edge);
                    }
                } catch (RuntimeException e) {
                    // a path the core cannot resample gets no outline; the command itself reports why
                }
            }
        }
        image.setOverlay(overlay);
    }

    /** Puts the image's own overlay back. */
    void remove() {
        image.setOverlay(original);
    }

    /** The two edges of the band as open polylines, ImageJ pixel coordinates. */
    static Roi[] edges(DendritePath path, double bandWidthPx, double stepPx) {
        ResampledPath r = path.resample(Math.min(stepPx, Math.max(0.25, path.lengthPx() / 400)));
        double[] x = r.xPx();
        double[] y = r.yPx();
        double[] nx = r.normalX();
        double[] ny = r.normalY();
        float[][] left = new float[2][x.length];
        float[][] right = new float[2][x.length];
        double half = Math.max(bandWidthPx, 1) / 2;
        double s = PathFiles.LINE_ROI_SHIFT;  // back to ImageJ's line coordinates
        for (int i = 0; i < x.length; i++) {
            left[0][i] = (float) (x[i] + half * nx[i] - s);
            left[1][i] = (float) (y[i] + half * ny[i] - s);
            right[0][i] = (float) (x[i] - half * nx[i] - s);
            right[1][i] = (float) (y[i] - half * ny[i] - s);
        }
        Roi[] rois = {
            new PolygonRoi(left[0], left[1], Roi.POLYLINE), new PolygonRoi(right[0], right[1], Roi.POLYLINE)};
        for (Roi roi : rois) {
            roi.setStrokeColor(EDGE);
            roi.setName(NAME);
        }
        return rois;
    }
}
