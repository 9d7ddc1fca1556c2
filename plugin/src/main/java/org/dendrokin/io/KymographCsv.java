package org.dendrokin.io;

import java.io.IOException;
import java.io.OutputStreamWriter;
import java.io.Reader;
import java.io.Writer;
import java.nio.charset.StandardCharsets;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;

import org.apache.commons.csv.CSVFormat;
import org.apache.commons.csv.CSVPrinter;
import org.apache.commons.csv.CSVRecord;
import org.dendrokin.core.kymo.Kymograph;
import org.dendrokin.io.text.Numbers;
import org.dendrokin.io.text.TextFiles;

/**
 * The kymograph CSV of the contract: first line {@code time_s,} then the distance (um) of each column;
 * then one line a frame with its time (s) and the signal at each distance. NaN is written as {@code NaN}.
 */
public final class KymographCsv {
    private KymographCsv() {
    }

    public static void write(Kymograph kymograph, Path target) {
        AtomicFiles.write(target, out -> {
            Writer w = new OutputStreamWriter(out, StandardCharsets.UTF_8);
            try (CSVPrinter csv = new CSVPrinter(w, CSVFormat.DEFAULT.builder().setRecordSeparator('\n').get())) {
                List<String> header = new ArrayList<>();
                header.add("time_s");
                for (double d : kymograph.distancesUm()) {
                    header.add(Numbers.forFile(d));
                }
                csv.printRecord(header);
                int n = kymograph.positionCount();
                String[] line = new String[n + 1];
                for (int f = 0; f < kymograph.frameCount(); f++) {
                    line[0] = Numbers.forFile(kymograph.timeS(f));
                    for (int p = 0; p < n; p++) {
                        line[p + 1] = Numbers.forFile(kymograph.value(f, p));
                    }
                    csv.printRecord((Object[]) line);
                }
            }
        });
    }

    /** Reads a kymograph CSV written by {@link #write}; the unit is not stored in the file and is given. */
    public static Kymograph read(Path file, String signalUnit) {
        try (Reader r = TextFiles.open(file)) {
            List<CSVRecord> records = CSVFormat.DEFAULT.parse(r).getRecords();
            if (records.size() < 2) {
                throw new InputException(file, "a kymograph CSV needs a header line and at least one frame");
            }
            CSVRecord header = records.get(0);
            if (!"time_s".equals(header.get(0).trim())) {
                throw new InputException(file, "the first column of a kymograph CSV must be time_s");
            }
            int n = header.size() - 1;
            double[] distances = new double[n];
            for (int i = 0; i < n; i++) {
                distances[i] = parse(file, header.get(i + 1), 1, i + 2);
            }
            double[] times = new double[records.size() - 1];
            double[] values = new double[times.length * n];
            for (int f = 0; f < times.length; f++) {
                CSVRecord rec = records.get(f + 1);
                if (rec.size() != n + 1) {
                    throw new InputException(file, "line " + (f + 2) + " has " + rec.size() + " fields, expected " + (n + 1));
                }
                times[f] = parse(file, rec.get(0), f + 2, 1);
                for (int p = 0; p < n; p++) {
                    values[f * n + p] = parse(file, rec.get(p + 1), f + 2, p + 2);
                }
            }
            return new Kymograph(distances, times, values, signalUnit);
        } catch (IOException e) {
            throw new InputException(file, "cannot be read (" + e.getMessage() + ")", e);
        }
    }

    private static double parse(Path file, String text, int line, int column) {
        try {
            return Double.parseDouble(text.trim());
        } catch (NumberFormatException e) {
            throw new InputException(file, "line " + line + ", column " + column + " is not a number: '" + text + "'");
        }
    }
}
