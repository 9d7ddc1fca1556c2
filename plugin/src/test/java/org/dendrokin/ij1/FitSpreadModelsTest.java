package org.dendrokin.ij1;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Random;

import ij.IJ;
import ij.ImagePlus;
import ij.WindowManager;
import ij.measure.ResultsTable;
import ij.plugin.filter.Analyzer;

import org.dendrokin.core.Progress;
import org.dendrokin.core.fit.KymographFits;
import org.dendrokin.core.kymo.Kymograph;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;

/** Fit Spread Models run by its menu label on a synthetic kymograph with known D and k. */
class FitSpreadModelsTest {
    private static final double D = 0.8;
    private static final double K = 0.05;

    @BeforeAll
    static void imagej() {
        HeadlessImageJ.start();
    }

    /**
     * A Gaussian pulse of s0 = 1 um and peak 1.5 released at 20 um and 5 s on a 40 um path, spreading with D
     * and decaying with k, plus noise of SD 0.02 (fixed seed); 81 positions x 61 frames.
     */
    static Kymograph synthetic() {
        double[] d = new double[81];
        for (int i = 0; i < d.length; i++) {
            d[i] = 0.5 * i;
        }
        double[] t = new double[61];
        for (int i = 0; i < t.length; i++) {
            t[i] = 0.5 * i;
        }
        Random random = new Random(31);
        double[] v = new double[d.length * t.length];
        double amount = 1.5 * Math.sqrt(2 * Math.PI);
        for (int f = 0; f < t.length; f++) {
            for (int p = 0; p < d.length; p++) {
                double tau = t[f] - 5;
                double signal = 0;
                if (tau >= 0) {
                    double var = 1 + 2 * D * tau;
                    double x = d[p] - 20;
                    // REF: Crank 1975, Gaussian pulse spreading with first-order decay [published formula]; sheet s2.2, s2.3
                    signal = amount / Math.sqrt(2 * Math.PI * var) * Math.exp(-x * x / (2 * var)) * Math.exp(-K * tau);
                }
                v[f * d.length + p] = signal + 0.02 * random.nextGaussian();
            }
        }
        return new Kymograph(d, t, v, "dF/F0");
    }

    private static double value(ResultsTable t, String source, String quantity) {
        for (int i = 0; i < t.size(); i++) {
            if (t.getStringValue("source", i).startsWith(source) && t.getStringValue("quantity", i).equals(quantity)) {
                return t.getValue("value", i);
            }
        }
        throw new AssertionError(source + " " + quantity + " not in the table");
    }

    @Test
    void recoversDAndKAndAgreesWithTheFittingCore() {
        Kymograph k = synthetic();
        WindowManager.setTempCurrentImage(KymographImage.toImage(k, "synthetic"));
        IJ.run("Fit Spread Models...", "models=[diffusion-decay] time=5 position=20 criterion=aicc save=[]");
        ImagePlus stack = WindowManager.getCurrentImage();
        ResultsTable t = Analyzer.getResultsTable();
        double d = value(t, "diffusion-decay", "D");
        double rate = value(t, "diffusion-decay", "k");
        // parameter recovery at high signal-to-noise: within 5%
        assertEquals(D, d, 0.05 * D, "D, um^2/s");
        assertEquals(K, rate, 0.05 * K, "k, 1/s");
        KymographFits.Outcome core = KymographFits.fit(k, KymographFits.Setup.of(5, 20)
                .withModels(java.util.List.of("diffusion-decay")), Progress.NONE);
        // the image holds 32-bit floats, so the core is given slightly different data: 1e-4 relative
        assertEquals(core.fits().get(0).estimate("D").orElseThrow().value(), d, 1e-4 * d, "same D as the core");
        assertEquals(3, stack.getStackSize(), "measured, fitted, residual");
        assertTrue(stack.getTitle().startsWith("synthetic fit diffusion-decay"), stack.getTitle());
    }
}
