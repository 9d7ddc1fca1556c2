package org.dendrokin.io.path;

import java.nio.file.Path;

import org.dendrokin.core.path.DendritePath;

/** Reads dendrite paths from ImageJ ROI files, ROI sets and CSV files. */
public final class PathFiles {
    private PathFiles() {
    }

    /**
     * Reads a dendrite path: an ImageJ {@code .roi} (straight line, polyline/segmented line, freehand line), a
     * {@code RoiSet.zip} (the first line ROI, or the one named {@code roiName}), or a CSV with header
     * {@code x,y} in ImageJ pixel coordinates.
     *
     * @param file    the path file
     * @param roiName name of the ROI to take from a .zip set; null = the first line ROI
     * @throws org.dendrokin.io.InputException naming the file for anything else
     */
    public static DendritePath read(Path file, String roiName) {
        throw new UnsupportedOperationException("not yet implemented");
    }
}
