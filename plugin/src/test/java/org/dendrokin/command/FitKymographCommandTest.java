package org.dendrokin.command;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Path;
import java.util.Random;

import org.dendrokin.core.kymo.Kymograph;
import org.dendrokin.io.KymographCsv;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.scijava.Context;
import org.scijava.command.CommandModule;
import org.scijava.command.CommandService;

class FitKymographCommandTest {
    @Test
    void recoversDAndKFromASyntheticKymograph(@TempDir Path dir) throws Exception {
        double dTrue = 0.8;
        double kTrue = 0.05;
        double[] d = new double[81];
        for (int i = 0; i < d.length; i++) {
            d[i] = 0.5 * i;
        }
        double[] t = new double[61];
        for (int i = 0; i < t.length; i++) {
            t[i] = 0.5 * i;
        }
        Random random = new Random(32);
        double[] v = new double[d.length * t.length];
        double amount = 1.5 * Math.sqrt(2 * Math.PI);
        for (int f = 0; f < t.length; f++) {
            for (int p = 0; p < d.length; p++) {
                double tau = t[f] - 5;
                double s = 0;
                if (tau >= 0) {
                    double var = 1 + 2 * dTrue * tau;
                    double x = d[p] - 20;
                    // REF: Crank 1975, Gaussian pulse spreading with first-order decay [published formula]; sheet s2.2, s2.3
                    s = amount / Math.sqrt(2 * Math.PI * var) * Math.exp(-x * x / (2 * var)) * Math.exp(-kTrue * tau);
                }
                v[f * d.length + p] = s + 0.02 * random.nextGaussian();
            }
        }
        Path csv = dir.resolve("k.csv");
        KymographCsv.write(new Kymograph(d, t, v, "dF/F0"), csv);
        try (Context context = new Context(CommandService.class)) {
            CommandModule m = context.service(CommandService.class).run(FitKymographCommand.class, true,
                    "kymograph", csv.toFile(), "signalUnit", "dF/F0", "models", "diffusion-decay",
                    "stimulusTimeS", 5.0, "stimulusUm", 20.0, "criterion", "aicc").get();
            assertFalse(m.isCanceled(), m::getCancelReason);
            assertEquals("diffusion-decay", m.getOutput("bestModel"));
            double dFit = (double) m.getOutput("dUm2PerS");
            // parameter recovery at high signal-to-noise: within 5%
            assertEquals(dTrue, dFit, 0.05 * dTrue, "D, um^2/s");
            assertEquals(kTrue, (double) m.getOutput("kPerS"), 0.05 * kTrue, "k, 1/s");
            assertTrue((double) m.getOutput("dLowUm2PerS") < dFit && dFit < (double) m.getOutput("dHighUm2PerS"),
                    "interval around the estimate");
        }
    }
}
