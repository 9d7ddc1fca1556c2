package org.dendrokin.synth;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.junit.jupiter.api.Test;

/** The recorded movie's noise against Poisson-Gaussian statistics, about the generator's own expected values. */
class CameraNoiseTest {
    @Test
    void varianceIsMeanOverGainPlusReadNoiseSquared() {
        double gain = 2.5;
        double read = 4;
        SessionSpec spec = SessionSpec.realistic(21)
                .withCamera(new SessionSpec.Camera(700, gain, 100, read, true))
                .withImaging(SessionSpec.Imaging.standard().withFrames(60));
        SessionGenerator.Rendering r = SessionGenerator.render(spec);
        double offset = spec.camera().offsetCounts();
        // Pixels grouped by expected level above the offset; residuals about the expected value.
        int bins = 8;
        double[] edges = {0, 20, 50, 100, 200, 400, 700, 1200, 1e9};
        double[] n = new double[bins];
        double[] sum = new double[bins];
        double[] sumSq = new double[bins];
        double[] level = new double[bins];
        for (int p = 0; p < r.expected().length; p++) {
            float[] e = r.expected()[p];
            short[] rec = r.recorded()[p];
            for (int i = 0; i < e.length; i++) {
                double above = e[i] - offset;
                int b = 0;
                while (b + 1 < bins && above >= edges[b + 1]) {
                    b++;
                }
                double res = (rec[i] & 0xffff) - e[i];
                n[b]++;
                sum[b] += res;
                sumSq[b] += res * res;
                level[b] += above;
            }
        }
        int tested = 0;
        for (int b = 0; b < bins; b++) {
            if (n[b] < 2000) {
                continue;
            }
            double mean = sum[b] / n[b];
            double var = sumSq[b] / n[b] - mean * mean;
            double meanLevel = level[b] / n[b];
            // REF: Poisson-Gaussian camera model, var = signal / gain + read^2, plus 1/12 from rounding to whole
            // counts [common practice]; Poisson variance equals its mean [published: standard]
            double predicted = meanLevel / gain + read * read + 1.0 / 12;
            // The level varies within a bin; the bin's variance is still that of its mean level (linear in the level).
            assertEquals(0, mean, 5 * Math.sqrt(predicted / n[b]), "mean residual (counts) near level " + meanLevel);
            assertEquals(predicted, var, 5 * predicted * Math.sqrt(2 / n[b]),
                    "residual variance (counts^2) near level " + meanLevel);
            tested++;
        }
        assertTrue(tested >= 5, "levels tested: " + tested);
    }
}
