package org.dendrokin.io.path;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.io.OutputStream;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.zip.ZipEntry;
import java.util.zip.ZipOutputStream;

import ij.gui.Line;
import ij.gui.OvalRoi;
import ij.gui.PolygonRoi;
import ij.gui.Roi;
import ij.io.RoiEncoder;

import org.dendrokin.core.path.DendritePath;
import org.dendrokin.io.InputException;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

class PathFilesTest {
    @TempDir
    Path dir;

    private Path saveRoi(Roi roi, String name) {
        Path file = dir.resolve(name);
        RoiEncoder.save(roi, file.toString());
        return file;
    }

    @Test
    void readsAStraightLineRoiAtPixelCentres() {
        Path file = saveRoi(new Line(10, 20, 40, 60), "line.roi");
        DendritePath path = PathFiles.read(file, null);
        // REF: ImageJ samples line coordinates as array positions (pixel centres, i + 0.5 in our convention);
        // see BandAverageVersusImageJTest for the check against ij.gui.ProfilePlot [common practice]
        assertArrayEquals(new double[] {10.5, 40.5}, path.xPx(), 1e-12, "x (px)");
        assertArrayEquals(new double[] {20.5, 60.5}, path.yPx(), 1e-12, "y (px)");
        assertEquals(50.0, path.lengthPx(), 1e-12, "length (px)");
    }

    @Test
    void readsSubPixelPolylinesAsTheyAre() {
        PolygonRoi roi = new PolygonRoi(new float[] {1.25f, 4.25f, 4.25f}, new float[] {2.5f, 6.5f, 9.5f}, 3,
                Roi.POLYLINE);
        DendritePath path = PathFiles.read(saveRoi(roi, "poly.roi"), null);
        assertArrayEquals(new double[] {1.75, 4.75, 4.75}, path.xPx(), 1e-6, "x (px), shifted by 0.5");
        // REF: 3-4-5 triangle plus a 3 px leg [common practice]
        assertEquals(8.0, path.lengthPx(), 1e-6, "length (px)");
    }

    @Test
    void smoothsFreehandLines() {
        int[] x = new int[41];
        int[] y = new int[41];
        for (int i = 0; i < x.length; i++) {
            x[i] = 5 + (i + 1) / 2;
            y[i] = 5 + i / 2;
        }
        DendritePath path = PathFiles.read(saveRoi(new PolygonRoi(x, y, x.length, Roi.FREELINE), "free.roi"), null);
        // REF: the pixel staircase of 20 diagonal steps smooths to the diagonal, 20 sqrt 2 [common practice]
        assertEquals(20 * Math.sqrt(2), path.lengthPx(), 0.01 * 20 * Math.sqrt(2), "length (px)");
    }

    @Test
    void picksTheFirstLineOrTheNamedRoiFromASet() throws IOException {
        Roi oval = new OvalRoi(1, 1, 5, 5);
        oval.setName("soma");
        Roi first = new Line(0, 0, 3, 4);
        first.setName("proximal");
        Roi second = new Line(0, 0, 6, 8);
        second.setName("distal");
        Path zip = dir.resolve("RoiSet.zip");
        try (OutputStream out = Files.newOutputStream(zip); ZipOutputStream z = new ZipOutputStream(out)) {
            for (Roi roi : new Roi[] {oval, first, second}) {
                z.putNextEntry(new ZipEntry(roi.getName() + ".roi"));
                z.write(RoiEncoder.saveAsByteArray(roi));
                z.closeEntry();
            }
        }
        assertEquals(5.0, PathFiles.read(zip, null).lengthPx(), 1e-12, "first line ROI (px)");
        assertEquals(10.0, PathFiles.read(zip, "distal").lengthPx(), 1e-12, "ROI named distal (px)");
        InputException e = assertThrows(InputException.class, () -> PathFiles.read(zip, "apical"));
        assertTrue(e.getMessage().startsWith(zip.toString()) && e.getMessage().contains("\"apical\"")
                && e.getMessage().contains("distal"), e.getMessage());
    }

    @Test
    void readsCsvInPixelUnits() throws IOException {
        Path csv = Files.writeString(dir.resolve("path.csv"), "x,y\n0.5,0.5\n3.5,4.5\n\n3.5,10.5\n");
        DendritePath path = PathFiles.read(csv, null);
        assertEquals(3, path.vertexCount());
        assertEquals(11.0, path.lengthPx(), 1e-12, "length (px)");
    }

    @Test
    void namesTheFileForBadPaths() throws IOException {
        Path zero = Files.writeString(dir.resolve("zero.csv"), "x,y\n4,4\n4,4\n");
        InputException e = assertThrows(InputException.class, () -> PathFiles.read(zero, null));
        assertTrue(e.getMessage().startsWith(zero.toString()) && e.getMessage().contains("zero length"),
                e.getMessage());

        Path badNumber = Files.writeString(dir.resolve("bad.csv"), "x,y\n1,2\n3,four\n");
        e = assertThrows(InputException.class, () -> PathFiles.read(badNumber, null));
        assertTrue(e.getMessage().contains("line 3") && e.getMessage().contains("four"), e.getMessage());

        Path noHeader = Files.writeString(dir.resolve("nohead.csv"), "1,2\n3,4\n");
        e = assertThrows(InputException.class, () -> PathFiles.read(noHeader, null));
        assertTrue(e.getMessage().contains("x,y"), e.getMessage());

        Path area = saveRoi(new OvalRoi(2, 2, 10, 10), "oval.roi");
        e = assertThrows(InputException.class, () -> PathFiles.read(area, null));
        assertTrue(e.getMessage().startsWith(area.toString()) && e.getMessage().contains("not a line"),
                e.getMessage());

        Path notRoi = Files.writeString(dir.resolve("junk.roi"), "hello");
        e = assertThrows(InputException.class, () -> PathFiles.read(notRoi, null));
        assertTrue(e.getMessage().startsWith(notRoi.toString()), e.getMessage());

        Path other = Files.writeString(dir.resolve("path.txt"), "x,y\n");
        assertThrows(InputException.class, () -> PathFiles.read(other, null));
    }

    @Test
    void csvFilesTheCsvReaderRefusesAreNamedInOneSentence() throws IOException {
        String[] texts = {"x,y,\n1,2,3\n4,5,6\n", "x,y\n1,2\n\"4\"5,6\n"};
        for (int i = 0; i < texts.length; i++) {
            Path csv = Files.writeString(dir.resolve("odd" + i + ".csv"), texts[i]);
            InputException e = assertThrows(InputException.class, () -> PathFiles.read(csv, null), texts[i]);
            assertTrue(e.getMessage().startsWith(csv + ": the path CSV could not be read")
                    && !e.getMessage().contains("Exception"), e.getMessage());
        }
    }

    @Test
    void aRoiWhoseHeaderClaimsMoreThanTheFileHoldsIsRefusedBeforeDecoding() throws IOException {
        PolygonRoi line = new PolygonRoi(new float[] {2, 10, 20}, new float[] {3, 8, 5}, 3, Roi.POLYLINE);
        line.setName("dendrite");
        byte[] valid = RoiEncoder.saveAsByteArray(line);
        java.nio.ByteBuffer b = java.nio.ByteBuffer.wrap(valid.clone());
        int header2 = b.getInt(60);
        // The name's length (second header, offset 20) set so that its byte count overflows an int: ImageJ's own
        // bounds check (offset + 2 length > size) passes, and it would allocate 2^30 characters.
        b.putInt(header2 + 20, 1 << 30);
        Path bigName = Files.write(dir.resolve("big-name.roi"), b.array());
        InputException e = assertThrows(InputException.class, () -> PathFiles.read(bigName, null));
        assertTrue(e.getMessage().startsWith(bigName + ": ") && e.getMessage().contains("name of 1073741824"),
                e.getMessage());
        java.nio.ByteBuffer c = java.nio.ByteBuffer.wrap(valid.clone());
        c.putShort(16, (short) 0);  // no short count: the vertex count is then the int at offset 18
        c.putInt(18, 500_000_000);
        Path manyVertices = Files.write(dir.resolve("many.roi"), c.array());
        e = assertThrows(InputException.class, () -> PathFiles.read(manyVertices, null));
        assertTrue(e.getMessage().contains("500000000 vertices"), e.getMessage());
        assertEquals(3, PathFiles.read(Files.write(dir.resolve("valid.roi"), valid), null).vertexCount());
    }
}
