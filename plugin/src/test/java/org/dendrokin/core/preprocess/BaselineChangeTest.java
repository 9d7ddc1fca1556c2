package org.dendrokin.core.preprocess;

import static org.junit.jupiter.api.Assertions.assertEquals;

import java.util.Random;

import org.dendrokin.core.kymo.Kymograph;
import org.junit.jupiter.api.Test;

class BaselineChangeTest {
    @Test
    void removesEachPositionsRestingLevelAndMeasuresTheNoise() {
        Random random = new Random(21);
        int nx = 50;
        int nt = 400;
        double[] v = new double[nx * nt];
        double[] d = new double[nx];
        double[] t = new double[nt];
        for (int p = 0; p < nx; p++) {
            d[p] = p;
        }
        for (int f = 0; f < nt; f++) {
            t[f] = f;
            for (int p = 0; p < nx; p++) {
                v[f * nx + p] = 0.05 + 0.001 * p + (f >= 300 ? 0.2 : 0) + 0.01 * random.nextGaussian();
            }
        }
        BaselineChange.Result r = BaselineChange.of(new Kymograph(d, t, v, "uM"), 0, 299);
        double late = 0;
        for (int f = 300; f < nt; f++) {
            late += r.kymograph().value(f, 40) / 100;
        }
        // REF: the generating step of 0.2 uM above a resting level [common practice: synthetic truth]
        assertEquals(0.2, late, 0.005, "change after the step at position 40, uM");
        // REF: 1.4826 MAD estimates the SD of normal noise [common practice]; 300 frames give about 6% spread
        assertEquals(0.01, r.noiseSd(), 0.001, "baseline noise SD, uM");
        assertEquals("uM", r.kymograph().signalUnit());
    }
}
