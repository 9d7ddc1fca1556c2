package org.dendrokin.ij1;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;

import java.util.ArrayList;
import java.util.List;
import java.util.regex.Matcher;
import java.util.regex.Pattern;

import ij.ImagePlus;
import ij.ImageStack;
import ij.gui.Line;
import ij.measure.Calibration;
import ij.process.FloatProcessor;
import ij.process.ShortProcessor;

import org.dendrokin.core.kymo.Kymograph;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;

/** Window titles name the source, what was done and the unit once: no bracketed group is ever repeated. */
class TitlesTest {
    @BeforeAll
    static void imagej() {
        HeadlessImageJ.start();
    }

    /** The bracketed groups of a title, e.g. "(first half)" and "(dF/F0)". */
    private static List<String> groups(String title) {
        List<String> out = new ArrayList<>();
        Matcher m = Pattern.compile("\\([^()]*\\)").matcher(title);
        while (m.find()) {
            out.add(m.group());
        }
        return out;
    }

    private static void assertNoRepeat(String title) {
        List<String> g = groups(title);
        assertEquals(g.size(), g.stream().distinct().count(), "a bracketed group repeats in '" + title + "'");
        assertFalse(title.contains("  "), "double space in '" + title + "'");
    }

    private static ImagePlus kymographImage(String name, String unit) {
        double[] d = {0, 0.5, 1, 1.5};
        double[] t = {0, 0.5, 1};
        return KymographImage.toImage(new Kymograph(d, t, new double[12], unit), name);
    }

    @Test
    void theUnitIsAddedOnceEvenWhenTheNameAlreadyEndsWithIt() {
        assertEquals("cell measured (dF/F0)", Titles.withUnit("cell measured", "dF/F0"));
        assertEquals("cell measured (dF/F0)", Titles.withUnit("cell measured (dF/F0)", "dF/F0"));
        assertEquals("cell (no unit)", Titles.withUnit("cell", ""));
    }

    @Test
    void theStemDropsTheFileExtensionAndTheUnitButKeepsOtherBrackets() {
        assertEquals("dendrite", Titles.stem("dendrite.tif", "Gray Value"));
        assertEquals("cell 3", Titles.stem("cell 3.ome.tiff", "Gray Value"));
        assertEquals("demo-session", Titles.stem("demo-session (dF/F0)", "dF/F0"));
        assertEquals("dendrite first half kymograph (left)", Titles.stem("dendrite first half kymograph (left)"
                + " (intensity)", "intensity"));
        assertEquals("(dF/F0)", Titles.stem("(dF/F0)", "dF/F0"), "a title that is only the unit keeps it");
    }

    @Test
    void imagesMadeFromAnImageNameItOnceWithTheNewUnit() {
        ImagePlus session = kymographImage("demo-session", "dF/F0");
        assertEquals("demo-session (dF/F0)", session.getTitle());
        String[] titles = {
            Titles.derived(session, "fit diffusion-decay", "dF/F0"),
            Titles.derived(session, "vs nagumo", "dF/F0"),
            Titles.derived(session, "", "uM"),
            KymographImage.toImage(KymographImage.fromImage(session), Titles.stem(session) + " simulated nagumo")
                    .getTitle(),
        };
        assertEquals("demo-session fit diffusion-decay (dF/F0)", titles[0]);
        assertEquals("demo-session vs nagumo (dF/F0)", titles[1]);
        assertEquals("demo-session (uM)", titles[2]);
        assertEquals("demo-session simulated nagumo (dF/F0)", titles[3]);
        for (String t : titles) {
            assertNoRepeat(t);
        }
        // a derived image of a derived image still names the unit once
        ImagePlus fit = kymographImage(Titles.stem(Titles.derived(session, "fit nagumo", "dF/F0"), "dF/F0"), "dF/F0");
        assertNoRepeat(Titles.derived(fit, "vs nagumo", "dF/F0"));
    }

    @Test
    void theMeasuredKymographOfSimulateAlongLineNamesItsUnitOnce() {
        ImageStack stack = new ImageStack(40, 30);
        for (int f = 0; f < 8; f++) {
            short[] p = new short[40 * 30];
            java.util.Arrays.fill(p, (short) (f < 4 ? 100 : 150));
            stack.addSlice(new ShortProcessor(40, 30, p, null));
        }
        ImagePlus movie = new ImagePlus("dendrite.tif", stack);
        movie.setDimensions(1, 1, 8);
        Calibration cal = movie.getCalibration();
        cal.pixelWidth = 0.2;
        cal.pixelHeight = 0.2;
        cal.setUnit("micron");
        cal.frameInterval = 0.5;
        cal.setTimeUnit("s");
        movie.setRoi(new Line(5.5, 15.5, 30.5, 15.5));
        ImagePlus measured = Simulate_Along_Line.measured(movie, 1.75, 2.5, new IjProgress("test"));
        assertEquals("dendrite measured (dF/F0)", measured.getTitle());
        assertNoRepeat(measured.getTitle());
    }

    @Test
    void kymographsOfSeveralLinesAreNamedAfterTheMovieAndTheLine() {
        ImagePlus movie = new ImagePlus("cell 3.tif", new FloatProcessor(10, 10));
        LineSelection line = LineSelection.of(new Line(1, 1, 8, 8), "first half");
        String title = KymographImage.toImage(new Kymograph(new double[] {0, 1}, new double[] {0, 1}, new double[4],
                "intensity"), Kymograph_Along_Line.title(movie, line, 2)).getTitle();
        assertEquals("cell 3 first half kymograph (intensity)", title);
        assertNoRepeat(title);
    }
}
