package org.dendrokin.ij1;

import java.io.OutputStreamWriter;
import java.nio.charset.StandardCharsets;
import java.nio.file.Path;

import ij.measure.ResultsTable;

import org.apache.commons.csv.CSVFormat;
import org.apache.commons.csv.CSVPrinter;
import org.dendrokin.io.AtomicFiles;

import org.dendrokin.core.spread.Estimate;

/**
 * Results tables in our style: one row a quantity, its value, unit and 95% interval in separate columns, so
 * that a user can copy them into a spreadsheet and sort or plot them.
 */
final class Tables {
    private Tables() {
    }

    /** A new table with the columns our rows use. */
    static ResultsTable quantities() {
        ResultsTable table = new ResultsTable();
        table.setPrecision(4);
        table.showRowNumbers(false);
        table.setNaNEmptyCells(true);
        return table;
    }

    /** Adds one quantity; NaN bounds show as empty cells. */
    static void add(ResultsTable table, String source, String quantity, double value, String unit, double lo95,
            double hi95, String note) {
        table.incrementCounter();
        table.addValue("source", source);
        table.addValue("quantity", quantity);
        table.addValue("value", value);
        table.addValue("unit", unit);
        table.addValue("ci95_low", lo95);
        table.addValue("ci95_high", hi95);
        table.addValue("note", note == null ? "" : note);
    }

    /** Adds a measured estimate, or an empty row saying why there is none. */
    static void add(ResultsTable table, String source, String quantity, String unit, Estimate e, String whyMissing) {
        if (e == null) {
            add(table, source, quantity, Double.NaN, unit, Double.NaN, Double.NaN, whyMissing);
        } else {
            add(table, source, quantity, e.value(), e.unit(), e.lo95(), e.hi95(), e.method());
        }
    }

    /** Shows the table under {@code title}; without a display it becomes the Results table a macro reads. */
    static void show(ResultsTable table, String title) {
        if (OptionsDialog.headless()) {
            ij.plugin.filter.Analyzer.setResultsTable(table);
        } else {
            table.show(title);
        }
    }

    /** Saves the table as CSV (all columns, numbers in Locale.ROOT form, NaN as an empty cell) through a temporary name. */
    static void saveCsv(ResultsTable table, Path target) {
        String[] headings = table.getHeadings();
        AtomicFiles.write(target, out -> {
            OutputStreamWriter w = new OutputStreamWriter(out, StandardCharsets.UTF_8);
            try (CSVPrinter csv = new CSVPrinter(w, CSVFormat.DEFAULT.builder().setRecordSeparator('\n').get())) {
                csv.printRecord((Object[]) headings);
                for (int row = 0; row < table.size(); row++) {
                    Object[] cells = new Object[headings.length];
                    for (int c = 0; c < headings.length; c++) {
                        double v = table.getValue(headings[c], row);
                        String text = table.getStringValue(headings[c], row);
                        boolean emptyNumber = text == null || text.isEmpty() || text.equals("NaN");
                        cells[c] = !Double.isNaN(v) ? Double.toString(v) : emptyNumber ? "" : text;
                    }
                    csv.printRecord(cells);
                }
            }
        });
    }
}
