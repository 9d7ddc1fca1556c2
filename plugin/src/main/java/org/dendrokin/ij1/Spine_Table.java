package org.dendrokin.ij1;

import java.io.IOException;
import java.io.Reader;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;

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
 * its 95% interval. Recorded in macros like the other commands; run headless it becomes the Results table.
 */
public class Spine_Table implements PlugIn {
    static final String COMMAND = "Spine Table";

    @Override
    public void run(String arg) {
        try {
            OptionsDialog d = new OptionsDialog(COMMAND, "spines");
            d.folder("Results folder (holds " + SpineOutputs.SPINES_CSV + ")", "");
            if (!d.show()) {
                return;
            }
            String folder = d.nextText();
            if (folder.isEmpty()) {
                throw new IllegalArgumentException("choose the output folder of an analysed session, the one that "
                        + "holds " + SpineOutputs.SPINES_CSV);
            }
            Path dir = Path.of(folder);
            Tables.show(table(dir.resolve(SpineOutputs.SPINES_CSV)), "Dendrokin spines "
                    + dir.toAbsolutePath().normalize().getFileName(), Display.anchor());
        } catch (RuntimeException e) {
            Failures.show(COMMAND, e);
        }
    }

    /** The rows of spines.csv; numbers as numbers (an empty cell or NaN as an empty cell), the rest as text. */
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
        if (cell.isEmpty() || cell.equals("NaN")) {
            return Double.NaN;
        }
        try {
            return Double.parseDouble(cell);
        } catch (NumberFormatException e) {
            return null;
        }
    }
}
