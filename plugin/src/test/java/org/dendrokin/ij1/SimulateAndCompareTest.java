package org.dendrokin.ij1;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotSame;

import java.util.List;

import ij.IJ;
import ij.ImagePlus;
import ij.WindowManager;
import ij.measure.ResultsTable;
import ij.plugin.filter.Analyzer;

import org.dendrokin.core.kymo.Kymograph;
import org.dendrokin.core.model.Boundary;
import org.dendrokin.core.model.Domain;
import org.dendrokin.core.model.ScalarRun;
import org.dendrokin.core.model.Stimulus;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;

/** Simulate Along Line and Compare with Simulation, run by their menu labels and options as a macro would. */
class SimulateAndCompareTest {
    private static final String MODEL = "model=nagumo d=0.8 rate=2 threshold=0.2 time=0.5 position=6 width=1"
            + " amount=1 ends=no-flux grid=0.25";

    @BeforeAll
    static void imagej() {
        HeadlessImageJ.start();
    }

    /** A kymograph grid of 41 positions, 0..10 um, and 31 frames, 0..3 s. */
    private static Kymograph grid(double fill) {
        double[] d = new double[41];
        for (int i = 0; i < d.length; i++) {
            d[i] = 0.25 * i;
        }
        double[] t = new double[31];
        for (int i = 0; i < t.length; i++) {
            t[i] = 0.1 * i;
        }
        double[] v = new double[d.length * t.length];
        java.util.Arrays.fill(v, fill);
        return new Kymograph(d, t, v, "dF/F0");
    }

    /** The engine's own run of the same model on the same grid. */
    private static double[] engine(Kymograph g) {
        ScalarRun run = ScalarRun.prepare("nagumo", new Domain(10, 0.25, Boundary.NO_FLUX), g.timesS(), g.distancesUm(),
                List.of(Stimulus.pulse(0.5, 6, 1, 1)));
        double[] out = new double[g.positionCount() * g.frameCount()];
        run.solve(new double[] {0.8, 2, 0.2}, out);
        return out;
    }

    private static ImagePlus runOn(ImagePlus image, String command, String options) {
        WindowManager.setTempCurrentImage(image);
        IJ.run(command, options);
        return WindowManager.getCurrentImage();
    }

    @Test
    void simulationOnAKymographImageIsTheEnginesRunOnItsGrid() {
        Kymograph g = grid(0);
        ImagePlus result = runOn(KymographImage.toImage(g, "measured"), "Simulate Along Line...", MODEL);
        assertNotSame(null, result);
        assertEquals("measured simulated nagumo (dF/F0)", result.getTitle());
        Kymograph simulated = KymographImage.fromImage(result);
        assertArrayEquals(g.distancesUm(), simulated.distancesUm(), 1e-12, "distances, um");
        assertArrayEquals(g.timesS(), simulated.timesS(), 1e-12, "times, s");
        // the image stores 32-bit floats
        assertArrayEquals(engine(g), simulated.values(), 1e-6, "simulated signal");
    }

    @Test
    void comparisonWithTheModelItselfLeavesOnlyAnOffset() {
        Kymograph g = grid(0);
        double[] model = engine(g);
        double[] measured = model.clone();
        for (int i = 0; i < measured.length; i++) {
            measured[i] += 0.125;
        }
        ImagePlus result = runOn(KymographImage.toImage(g.withValues(measured, "dF/F0"), "cell"),
                "Compare with Simulation...", MODEL);
        assertEquals(3, result.getStackSize(), "measured, simulated, residual");
        assertEquals("measured - simulated", result.getStack().getSliceLabel(3));
        float[] residual = (float[]) result.getStack().getPixels(3);
        for (float r : residual) {
            assertEquals(0.125, r, 1e-6, "residual of a model offset by a constant");
        }
        ResultsTable table = Analyzer.getResultsTable();
        assertEquals("RMSE", table.getStringValue("quantity", 0));
        // a constant offset c has root mean square c
        assertEquals(0.125, table.getValue("value", 0), 1e-6, "RMSE, dF/F0");
        assertEquals("dF/F0", table.getStringValue("unit", 0));
    }
}
