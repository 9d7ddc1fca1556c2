package org.dendrokin.io.text;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;

import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Locale;
import java.util.Random;

import org.dendrokin.core.kymo.Kymograph;
import org.dendrokin.core.path.DendritePath;
import org.dendrokin.io.KymographCsv;
import org.dendrokin.io.calib.StandardsCsv;
import org.dendrokin.io.path.PathFiles;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/** Text files with a byte-order mark, HTML escaping and the two ways numbers are written. */
class TextToolkitTest {
    @TempDir
    Path dir;

    private Path withByteOrderMark(String name, String text) throws IOException {
        byte[] body = text.getBytes(StandardCharsets.UTF_8);
        byte[] bytes = new byte[body.length + 3];
        bytes[0] = (byte) 0xEF;
        bytes[1] = (byte) 0xBB;
        bytes[2] = (byte) 0xBF;
        System.arraycopy(body, 0, bytes, 3, body.length);
        return Files.write(dir.resolve(name), bytes);
    }

    @Test
    void csvFilesWithAByteOrderMarkReadAsWithout() throws IOException {
        // REF: RFC 8259 section 8.1 / Unicode FAQ on the BOM: a UTF-8 BOM is a signature, not content [published]
        String path = "x,y\n10,20\n40,60\n";
        DendritePath plain = PathFiles.read(Files.writeString(dir.resolve("plain.csv"), path), null);
        DendritePath marked = PathFiles.read(withByteOrderMark("marked.csv", path), null);
        assertEquals(plain.lengthPx(), marked.lengthPx(), 0.0, "path length, pixels");

        String kymograph = "time_s,0.0,0.5\n0.0,1.0,2.0\n1.0,3.0,4.0\n";
        Kymograph k = KymographCsv.read(withByteOrderMark("k.csv", kymograph), "dF/F0");
        assertArrayEquals(new double[] {0.0, 0.5}, k.distancesUm(), 0.0, "distances, um");

        StringBuilder table = new StringBuilder("concentration_uM,intensity\n");
        for (double c : new double[] {0, 0.1, 0.2, 0.4, 0.8, 1.6}) {
            table.append(c).append(',').append(100 + 900 * c / (c + 0.4)).append('\n');
        }
        assertEquals(6, StandardsCsv.read(withByteOrderMark("standards.csv", table.toString())).size());
        assertEquals("{}", TextFiles.read(withByteOrderMark("bom.json", "{}")));
    }

    @Test
    void escapingCoversTheCharactersWithAMeaningInHtml() {
        // REF: HTML Living Standard 13.1.2.6, characters to escape in text and attribute values [published standard]
        assertEquals("a &lt;b&gt; &amp; &quot;c&quot; &#39;d&#39; \u00b5m", Html.esc("a <b> & \"c\" 'd' \u00b5m"));
        assertEquals("", Html.esc(null));
        assertEquals("run(\"A\", \"b=&lt;1&gt;\") &amp;", Html.escText("run(\"A\", \"b=<1>\") &"));
    }

    @Test
    void numbersForPeopleHaveThreeSignificantDigits() {
        // Expected texts worked out by hand from the rule: 3 significant digits, %.3g outside [0.001, 1e5).
        assertEquals("0.5", Numbers.forPeople(0.5));
        assertEquals("1230", Numbers.forPeople(1234.5));
        assertEquals("0.00123", Numbers.forPeople(0.0012345));
        assertEquals("5.00e-05", Numbers.forPeople(0.00005));
        assertEquals("2.00e+06", Numbers.forPeople(2.0e6));
        assertEquals("-3.14", Numbers.forPeople(-Math.PI));
        assertEquals("0", Numbers.forPeople(0));
        assertEquals("n/a", Numbers.forPeople(Double.NaN));
        assertEquals("unbounded", Numbers.forPeople(Double.POSITIVE_INFINITY));
        Locale before = Locale.getDefault();
        try {
            Locale.setDefault(Locale.GERMANY);
            assertEquals("1.5", Numbers.forPeople(1.5), "no decimal comma whatever the machine's locale");
            assertEquals("1.0E-5", Numbers.forFile(1e-5));
        } finally {
            Locale.setDefault(before);
        }
    }

    @Test
    void numbersForFilesReadBackExactly() {
        // REF: Java SE Double.toString spec: the shortest decimal that uniquely distinguishes the double [published]
        Random random = new Random(20261203L);
        for (int i = 0; i < 10_000; i++) {
            double v = Double.longBitsToDouble(random.nextLong());
            if (!Double.isNaN(v)) {
                assertEquals(v, Double.parseDouble(Numbers.forFile(v)), 0.0, Numbers.forFile(v));
            }
            double scaled = random.nextGaussian() * Math.pow(10, random.nextInt(20) - 10);
            assertEquals(scaled, Double.parseDouble(Numbers.forFile(scaled)), 0.0, Numbers.forFile(scaled));
        }
        assertEquals("12.0", Numbers.forFile(12));
        assertEquals("NaN", Numbers.forFile(Double.NaN));
    }
}
