package org.dendrokin.ij1;

import java.awt.Window;
import java.io.OutputStreamWriter;
import java.nio.charset.StandardCharsets;
import java.nio.file.Path;

import ij.IJ;
import ij.WindowManager;
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
    /** Width of a new quantity table's window, pixels: wide enough for the value, unit and interval. */
    private static final int WIDE_TABLE_PX = 900;

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

    /** Adds one quantity; NaN numbers show as empty cells. */
    static void add(ResultsTable table, String source, String quantity, double value, String unit, double lo95,
            double hi95, String note) {
        table.incrementCounter();
        table.addValue("source", source);
        table.addValue("quantity", quantity);
        number(table, "value", value);
        table.addValue("unit", unit);
        number(table, "ci95_low", lo95);
        number(table, "ci95_high", hi95);
        table.addValue("note", note == null ? "" : note);
    }

    /** A number, or for NaN an empty cell: the number stays NaN for getResult(), the window shows nothing. */
    private static void number(ResultsTable table, String column, double value) {
        if (Double.isNaN(value)) {
            table.addValue(column, "");
        } else {
            table.addValue(column, value);
        }
    }

    /** Adds a measured estimate, or an empty row saying why there is none. */
    static void add(ResultsTable table, String source, String quantity, String unit, Estimate e, String whyMissing) {
        if (e == null) {
            add(table, source, quantity, Double.NaN, unit, Double.NaN, Double.NaN, whyMissing);
        } else {
            add(table, source, quantity, e.value(), e.unit(), e.lo95(), e.hi95(), e.method());
        }
    }

    /**
     * Shows the table under {@code title}, a new window beside {@code anchor} and clear of the other windows (a
     * table window already open keeps its place and gets the new rows); without a display the table becomes the
     * Results table a macro reads.
     */
    static void show(ResultsTable table, String title, Window anchor) {
        if (OptionsDialog.headless()) {
            ij.plugin.filter.Analyzer.setResultsTable(table);
            return;
        }
        boolean existed = WindowManager.getWindow(title) != null;
        table.show(title);
        Window window = WindowManager.getWindow(title);
        if (!existed && window != null) {
            // ImageJ opens a table at most 700 pixels wide, which hides the intervals of our quantity tables
            if (table.getColumnIndex("ci95_high") != ResultsTable.COLUMN_NOT_FOUND) {
                window.setSize(Math.max(window.getWidth(), Math.min(WIDE_TABLE_PX, IJ.getScreenSize().width / 2)),
                        window.getHeight());
            }
            Display.place(window, anchor);
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
