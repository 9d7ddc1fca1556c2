package org.dendrokin.io.path;

import java.io.IOException;
import java.io.InputStream;
import java.io.Reader;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.zip.ZipEntry;
import java.util.zip.ZipInputStream;

import ij.gui.Line;
import ij.gui.Roi;
import ij.io.RoiDecoder;
import ij.process.FloatPolygon;

import org.apache.commons.csv.CSVFormat;
import org.apache.commons.csv.CSVParser;
import org.apache.commons.csv.CSVRecord;
import org.dendrokin.core.path.DendritePath;
import org.dendrokin.io.InputException;
import org.dendrokin.io.text.TextFiles;

/**
 * Reads dendrite paths from ImageJ ROI files, ROI sets and CSV files into our coordinate convention (pixel i
 * covers [i, i+1), centre i + 0.5).
 *
 * <p>ImageJ ROIs are decoded by ImageJ's own {@link RoiDecoder}. ImageJ 1.x samples line selections (its line
 * profiles, with or without sub-pixel resolution) at array positions equal to the stored coordinates: a line at
 * x = 10 runs through the centre of pixel column 10. In our convention that centre is 10.5, so
 * {@value #LINE_ROI_SHIFT} is added to every coordinate of a line ROI; a kymograph along a ROI then samples the
 * same points as ImageJ's line profile along it. CSV paths are in our convention already and are not shifted.
 * Freehand lines are smoothed lightly ({@link DendritePath}).
 */
public final class PathFiles {
    /** Added to ImageJ line ROI coordinates to put them in our pixel convention. */
    public static final double LINE_ROI_SHIFT = 0.5;
    /** Largest ROI read: a line of 65535 sub-pixel vertices takes under 1 MB. */
    private static final int MAX_ROI_BYTES = 16 << 20;

    private PathFiles() {
    }

    /**
     * Reads a dendrite path: an ImageJ {@code .roi} (straight line, polyline/segmented line, freehand line), a
     * {@code .zip} ROI set (the first line ROI, or the one named {@code roiName}), or a CSV with header
     * {@code x,y} in pixel units (our convention; more columns are ignored).
     *
     * @param file    the path file; never written
     * @param roiName name of the ROI to take from a .zip set; null = the first line ROI
     * @throws InputException naming the file for anything else
     */
    public static DendritePath read(Path file, String roiName) {
        if (!Files.isRegularFile(file) || !Files.isReadable(file)) {
            throw new InputException(file, "the path file does not exist or cannot be read");
        }
        String name = file.getFileName().toString().toLowerCase(Locale.ROOT);
        if (name.endsWith(".roi")) {
            return fromRoi(file, decode(file, readBytes(file), file.getFileName().toString()));
        }
        if (name.endsWith(".zip")) {
            return fromRoiSet(file, roiName);
        }
        if (name.endsWith(".csv")) {
            return fromCsv(file);
        }
        throw new InputException(file, "the path must be an ImageJ .roi file, a .zip ROI set or a .csv file with "
                + "columns x,y");
    }

    /**
     * Reads every line ROI of a {@code .zip} ROI set, for a branched session: by name (the ROI's own name, else its
     * entry name without {@code .roi}), in the set's order. Area and point ROIs are skipped.
     *
     * @param file the ROI set; never written
     * @throws InputException naming the file when it cannot be read, holds fewer than two lines or repeats a name
     */
    public static Map<String, DendritePath> readLines(Path file) {
        if (!Files.isRegularFile(file) || !Files.isReadable(file)) {
            throw new InputException(file, "the path file does not exist or cannot be read");
        }
        if (!file.getFileName().toString().toLowerCase(Locale.ROOT).endsWith(".zip")) {
            throw new InputException(file, "a branched session's lines must come as a .zip ROI set (or as a list of "
                    + "files in \"tree\": {\"paths\": [...]})");
        }
        Map<String, DendritePath> out = new LinkedHashMap<>();
        try (InputStream in = Files.newInputStream(file); ZipInputStream zip = new ZipInputStream(in)) {
            ZipEntry entry;
            while ((entry = zip.getNextEntry()) != null) {
                if (entry.isDirectory() || !entry.getName().toLowerCase(Locale.ROOT).endsWith(".roi")) {
                    continue;
                }
                Roi roi = decode(file, zip.readAllBytes(), entry.getName());
                if (!isLine(roi)) {
                    continue;
                }
                String base = entry.getName().substring(0, entry.getName().length() - 4);
                String label = roi.getName() != null ? roi.getName() : base;
                if (out.put(label, fromRoi(file, roi)) != null) {
                    throw new InputException(file, "the ROI set holds two line ROIs named \"" + label + "\"; give "
                            + "each branch its own name");
                }
            }
        } catch (IOException e) {
            throw new InputException(file, "the ROI set could not be read as a zip file (" + e.getMessage() + ")", e);
        }
        if (out.size() < 2) {
            throw new InputException(file, "a branched session needs at least two line ROIs, and the ROI set holds "
                    + out.size());
        }
        return out;
    }

    private static byte[] readBytes(Path file) {
        try {
            if (Files.size(file) > MAX_ROI_BYTES) {
                throw new InputException(file, "this is not an ImageJ ROI: it is " + Files.size(file) / (1 << 20)
                        + " MB, far more than a line selection takes");
            }
            return Files.readAllBytes(file);
        } catch (IOException e) {
            throw new InputException(file, "the path file could not be read (" + e.getMessage() + ")", e);
        }
    }

    /**
     * Decodes one ROI with ImageJ's decoder after checking the lengths its header claims ({@link RoiBytes}).
     *
     * @param entry the file's name, or the entry's name inside a ROI set
     */
    private static Roi decode(Path file, byte[] bytes, String entry) {
        String where = entry.equals(file.getFileName().toString()) ? "" : "entry " + entry + ": ";
        String overclaim = RoiBytes.overclaim(bytes);
        if (overclaim != null) {
            throw new InputException(file, where + "this is not an ImageJ ROI, or it is damaged: " + overclaim
                    + " in a file of " + bytes.length + " bytes");
        }
        Roi roi;
        try {
            roi = new RoiDecoder(RoiBytes.withoutGroup(bytes), entry).getRoi();
        } catch (IOException | RuntimeException e) {
            roi = null;
        }
        if (roi == null) {
            throw new InputException(file, where + "this is not an ImageJ ROI");
        }
        return roi;
    }

    /**
     * Reads any ImageJ {@code .roi} file (an area for the background, say) with the same checks as a path's.
     *
     * @throws InputException naming the file when it is not an ImageJ ROI or its header claims more than it holds
     */
    public static Roi readRoi(Path file) {
        return decode(file, readBytes(file), file.getFileName().toString());
    }

    private static boolean isLine(Roi roi) {
        int t = roi.getType();
        return t == Roi.LINE || t == Roi.POLYLINE || t == Roi.FREELINE;
    }

    private static DendritePath fromRoi(Path file, Roi roi) {
        if (!isLine(roi)) {
            throw new InputException(file, "the ROI is a " + roi.getTypeAsString().toLowerCase(Locale.ROOT)
                    + " selection, not a line; draw the dendrite with the straight, segmented or freehand line tool");
        }
        double shift = LINE_ROI_SHIFT;
        double[] x;
        double[] y;
        if (roi instanceof Line) {
            Line line = (Line) roi;
            x = new double[] {line.x1d + shift, line.x2d + shift};
            y = new double[] {line.y1d + shift, line.y2d + shift};
        } else {
            FloatPolygon p = roi.getFloatPolygon();
            x = new double[p.npoints];
            y = new double[p.npoints];
            for (int i = 0; i < p.npoints; i++) {
                x[i] = p.xpoints[i] + shift;
                y[i] = p.ypoints[i] + shift;
            }
        }
        return build(file, x, y, roi.getType() == Roi.FREELINE);
    }

    private static DendritePath fromRoiSet(Path file, String roiName) {
        List<String> names = new ArrayList<>();
        try (InputStream in = Files.newInputStream(file); ZipInputStream zip = new ZipInputStream(in)) {
            ZipEntry entry;
            while ((entry = zip.getNextEntry()) != null) {
                if (entry.isDirectory() || !entry.getName().toLowerCase(Locale.ROOT).endsWith(".roi")) {
                    continue;
                }
                byte[] bytes = zip.readNBytes(MAX_ROI_BYTES + 1);
                if (bytes.length > MAX_ROI_BYTES) {
                    throw new InputException(file, "entry " + entry.getName() + " is more than "
                            + MAX_ROI_BYTES / (1 << 20) + " MB, far more than a line selection takes");
                }
                Roi roi = decode(file, bytes, entry.getName());
                String base = entry.getName().substring(0, entry.getName().length() - 4);
                String label = roi.getName() != null ? roi.getName() : base;
                names.add(label);
                boolean wanted = roiName == null ? isLine(roi) : roiName.equals(label) || roiName.equals(base);
                if (wanted) {
                    return fromRoi(file, roi);
                }
            }
        } catch (IOException e) {
            throw new InputException(file, "the ROI set could not be read as a zip file (" + e.getMessage() + ")", e);
        }
        if (names.isEmpty()) {
            throw new InputException(file, "the ROI set holds no ImageJ ROI");
        }
        if (roiName == null) {
            throw new InputException(file, "the ROI set holds no line ROI (it holds " + String.join(", ", names)
                    + ")");
        }
        throw new InputException(file, "the ROI set holds no ROI named \"" + roiName + "\" (it holds "
                + String.join(", ", names) + ")");
    }

    private static DendritePath fromCsv(Path file) {
        CSVFormat format = CSVFormat.DEFAULT.builder().setHeader().setSkipHeaderRecord(true).setTrim(true)
                .setIgnoreEmptyLines(true).setIgnoreHeaderCase(true).get();
        List<Double> xs = new ArrayList<>();
        List<Double> ys = new ArrayList<>();
        try (Reader reader = TextFiles.open(file);
                CSVParser parser = CSVParser.parse(reader, format)) {
            if (!parser.getHeaderMap().containsKey("x") || !parser.getHeaderMap().containsKey("y")) {
                throw new InputException(file, "the path CSV needs a first line with the column names x,y");
            }
            for (CSVRecord record : parser) {
                long line = parser.getCurrentLineNumber();
                xs.add(number(file, record, "x", line));
                ys.add(number(file, record, "y", line));
            }
        } catch (IOException | java.io.UncheckedIOException | IllegalArgumentException | IllegalStateException e) {
            // commons-csv reports a header without a name, or a name given twice, as an IllegalArgumentException, and
            // a stray quote as its CSVException inside an UncheckedIOException: the innermost message is the reason.
            Throwable reason = e;
            while (reason.getCause() != null && reason.getCause().getMessage() != null) {
                reason = reason.getCause();
            }
            throw new InputException(file, "the path CSV could not be read (" + reason.getMessage() + ")", e);
        }
        double[] x = new double[xs.size()];
        double[] y = new double[ys.size()];
        for (int i = 0; i < x.length; i++) {
            x[i] = xs.get(i);
            y[i] = ys.get(i);
        }
        return build(file, x, y, false);
    }

    private static double number(Path file, CSVRecord record, String column, long line) {
        String text = record.isSet(column) ? record.get(column) : "";
        try {
            double v = Double.parseDouble(text);
            if (Double.isFinite(v)) {
                return v;
            }
        } catch (NumberFormatException e) {
            // reported below
        }
        throw new InputException(file, "line " + line + ": " + column + " is \"" + text + "\", not a number");
    }

    private static DendritePath build(Path file, double[] x, double[] y, boolean freehand) {
        try {
            return DendritePath.of(x, y, freehand);
        } catch (IllegalArgumentException e) {
            throw new InputException(file, e.getMessage(), e);
        }
    }
}
