package org.dendrokin.ij1;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Locale;

import ij.IJ;
import ij.ImagePlus;
import ij.gui.PointRoi;
import ij.gui.Roi;
import ij.io.RoiDecoder;
import ij.process.FloatPolygon;

import org.dendrokin.io.demo.DemoSessionGenerator;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

import com.google.gson.JsonObject;
import com.google.gson.JsonParser;

/**
 * Analyze Session Folder's settings for one run (channel, structural channel, motion, stimulus spot), driven by
 * the option keys a recorded macro holds: the same results as session.json edited to say the same.
 */
class AnalyzeSessionDialogTest {
    private static final DemoSessionGenerator.Scenario TINY = new DemoSessionGenerator.Scenario(64, 32, 40, 0.25, 1.0,
            9.5, 6.0, 0.5, 0.05, 1.0, 1.5, 600, 100, 200, 3, 7L);

    @TempDir
    static Path dir;
    static Path session;
    static double spotX;
    static double spotY;

    @BeforeAll
    static void makeSession() {
        HeadlessImageJ.start();
        session = dir.resolve("cell");
        DemoSessionGenerator.write(session, TINY);
        Roi roi = RoiDecoder.open(session.resolve("dendrite.roi").toString());
        FloatPolygon p = roi.getFloatPolygon();
        spotX = p.xpoints[p.npoints / 3] + 0.5;
        spotY = p.ypoints[p.npoints / 3];
    }

    private static JsonObject results(Path out) throws IOException {
        return JsonParser.parseString(Files.readString(out.resolve("results.json"))).getAsJsonObject();
    }

    @Test
    void recordedOptionsActAsTheSameKeysInSessionJson() throws IOException {
        Path edited = dir.resolve("edited");
        Files.createDirectories(edited);
        for (String f : new String[] {"dendrite.tif", "dendrite.roi"}) {
            Files.copy(session.resolve(f), edited.resolve(f));
        }
        Files.writeString(edited.resolve("session.json"), Files.readString(session.resolve("session.json"))
                .replaceFirst("\\{", String.format(Locale.ROOT, "{\"channel\": 1, \"motion\": \"measure\", "
                        + "\"stimulus\": {\"x_px\": %s, \"y_px\": %s}, ", spotX, spotY)));
        IJ.run("Analyze Session Folder...", "session=[" + edited + "] output=[" + dir.resolve("edited-out") + "]");
        IJ.run("Analyze Session Folder...", "session=[" + session + "] output=[" + dir.resolve("dialog-out") + "]"
                + " channel=1 structural=[as in session.json] motion=measure stimulus=[" + spotX + "," + spotY + "]");
        JsonObject byFile = results(dir.resolve("edited-out"));
        JsonObject byDialog = results(dir.resolve("dialog-out"));
        JsonObject overrides = byDialog.remove("overrides").getAsJsonObject();
        assertEquals("the dialog", overrides.get("given_in").getAsString());
        assertEquals(1, overrides.get("channel").getAsInt());
        assertEquals("measure", overrides.get("motion").getAsString());
        assertFalse(overrides.has("structural_channel"), "kept as in session.json");
        byFile.remove("session");
        byDialog.remove("session");
        // REF: a setting given for one run must act as the same key written in session.json [common practice]
        assertTrue(byFile.equals(byDialog), "results.json differs:\n" + byFile + "\n" + byDialog);
    }

    @Test
    void aMacroWithoutTheNewKeysKeepsSessionJson() throws IOException {
        Path out = dir.resolve("plain-out");
        IJ.run("Analyze Session Folder...", "session=[" + session + "] output=[" + out + "]");
        assertFalse(results(out).has("overrides"), "no overrides");
    }

    @Test
    void aPointSelectionFillsTheSpotAtThePixelCentre() {
        ImagePlus image = IJ.createImage("movie", "16-bit black", 40, 30, 1);
        assertNull(Analyze_Session_Folder.pointSelection(image), "no selection, no spot");
        image.setRoi(new PointRoi(12, 7));
        // REF: ImageJ puts a clicked point at whole-number coordinates drawn at the pixel's centre, which our
        // convention (pixel i covers [i, i+1)) calls i + 0.5 [common practice]
        assertEquals("12.5,7.5", Analyze_Session_Folder.pointSelection(image));
    }
}
