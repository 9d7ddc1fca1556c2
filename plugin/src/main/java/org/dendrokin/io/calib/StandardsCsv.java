package org.dendrokin.io.calib;

import java.io.IOException;
import java.io.Reader;
import java.io.UncheckedIOException;
import java.nio.file.NoSuchFileException;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;

import org.apache.commons.csv.CSVFormat;
import org.apache.commons.csv.CSVParser;
import org.apache.commons.csv.CSVRecord;
import org.dendrokin.core.calib.Standards;
import org.dendrokin.io.InputException;
import org.dendrokin.io.text.TextFiles;

/**
 * Reads a table of standards: a CSV with the header {@code concentration_uM,intensity} (columns in either
 * order, extra columns ignored), one standard a line, replicates as repeated concentrations. Lines that
 * start with {@code #} are comments. Intensities are background subtracted, in the movie's units.
 */
public final class StandardsCsv {
    public static final String CONCENTRATION = "concentration_uM";
    public static final String INTENSITY = "intensity";

    private StandardsCsv() {
    }

    public static Standards read(Path file) {
        try (Reader r = TextFiles.open(file)) {
            CSVFormat format = CSVFormat.DEFAULT.builder().setCommentMarker('#').setIgnoreSurroundingSpaces(true)
                    .setIgnoreEmptyLines(true).get();
            List<CSVRecord> records = new ArrayList<>();
            List<Long> lines = new ArrayList<>();
            CSVParser parser = format.parse(r);
            for (CSVRecord rec : parser) {
                records.add(rec);
                lines.add(parser.getCurrentLineNumber());
            }
            if (records.isEmpty()) {
                throw new InputException(file, "is empty; a standards table needs the header " + CONCENTRATION + ","
                        + INTENSITY + " and one line per standard");
            }
            CSVRecord header = records.get(0);
            int ci = -1;
            int fi = -1;
            for (int i = 0; i < header.size(); i++) {
                String name = header.get(i).replace("\uFEFF", "").trim();
                if (name.equals(CONCENTRATION)) {
                    ci = i;
                } else if (name.equals(INTENSITY)) {
                    fi = i;
                }
            }
            if (ci < 0 || fi < 0) {
                throw new InputException(file, "line " + lines.get(0) + " must be the header " + CONCENTRATION
                        + "," + INTENSITY + " (concentration in uM), got \""
                        + String.join(",", header.toList()) + "\"");
            }
            List<double[]> rows = new ArrayList<>();
            for (int k = 1; k < records.size(); k++) {
                CSVRecord rec = records.get(k);
                long line = lines.get(k);
                if (rec.size() <= Math.max(ci, fi)) {
                    throw new InputException(file, "line " + line + " has " + rec.size() + " fields; it needs a "
                            + CONCENTRATION + " and an " + INTENSITY);
                }
                double c = number(file, rec.get(ci), line, CONCENTRATION);
                double f = number(file, rec.get(fi), line, INTENSITY);
                if (c < 0) {
                    throw new InputException(file, "line " + line + ": " + CONCENTRATION + " must be zero or positive, "
                            + "got " + rec.get(ci));
                }
                rows.add(new double[] {c, f});
            }
            if (rows.isEmpty()) {
                throw new InputException(file, "has a header but no standards");
            }
            double[] c = new double[rows.size()];
            double[] f = new double[rows.size()];
            for (int i = 0; i < c.length; i++) {
                c[i] = rows.get(i)[0];
                f[i] = rows.get(i)[1];
            }
            return new Standards(c, f);
        } catch (NoSuchFileException e) {
            throw new InputException(file, "does not exist", e);
        } catch (IOException | IllegalStateException | UncheckedIOException e) {
            throw new InputException(file, "cannot be read as CSV (" + e.getMessage() + ")", e);
        }
    }

    private static double number(Path file, String text, long line, String column) {
        try {
            double v = Double.parseDouble(text.trim());
            if (Double.isFinite(v)) {
                return v;
            }
        } catch (NumberFormatException e) {
            // reported below
        }
        throw new InputException(file, "line " + line + ": " + column + " must be a number, got \"" + text + "\"");
    }
}
