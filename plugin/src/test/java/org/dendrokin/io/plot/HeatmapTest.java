package org.dendrokin.io.plot;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.awt.image.BufferedImage;
import java.util.Random;

import org.apache.commons.math3.stat.descriptive.rank.Percentile;
import org.dendrokin.core.kymo.Kymograph;
import org.junit.jupiter.api.Test;

/** The rules every data picture keeps: its colours say where they clip, and saturated samples stand out. */
class HeatmapTest {
    private static Kymograph kymograph(double[] values, int nx) {
        int nt = values.length / nx;
        double[] d = new double[nx];
        double[] t = new double[nt];
        for (int i = 0; i < nx; i++) {
            d[i] = 0.2 * i;
        }
        for (int i = 0; i < nt; i++) {
            t[i] = 0.5 * i;
        }
        return new Kymograph(d, t, values, "dF/F0");
    }

    @Test
    void theColourRangeIsThePercentilesAndTheCaptionSaysHowFarTheDataReach() {
        Random random = new Random(11);
        double[] v = new double[100 * 200];
        for (int i = 0; i < v.length; i++) {
            v[i] = random.nextGaussian() * 0.05;
        }
        v[4321] = 1.29;   // a focal peak far above the noise
        Kymograph k = kymograph(v, 100);
        Heatmap map = Heatmap.of(k, "signal");
        Percentile p = new Percentile().withEstimationType(Percentile.EstimationType.R_7);
        // REF: Commons Math Percentile (R-7, linear interpolation) as an independent implementation [common practice]
        assertEquals(p.evaluate(v, 99.5), map.hi(), 2e-3, "upper end of the colours, dF/F0");
        assertEquals(p.evaluate(v, 0.5), map.lo(), 2e-3, "lower end of the colours, dF/F0");
        Heatmap.Clipping c = map.clipping(k);
        // REF: by the definition of the 0.5th and 99.5th percentiles, about 1% of the values lie beyond them [common practice]
        assertEquals(0.01, (c.below() + c.above()) / (double) c.total(), 0.002, "share beyond the colour range");
        String sentence = map.scaleSentence(k);
        assertTrue(sentence.contains("the data reach") && sentence.contains("1.29"), sentence);
        assertTrue(sentence.contains("arrow"), sentence);
    }

    @Test
    void aRangeThatCoversEveryValueSaysSo() {
        double[] v = new double[50 * 40];
        for (int i = 0; i < v.length; i++) {
            v[i] = (i % 50) / 49.0;
        }
        Kymograph k = kymograph(v, 50);
        Heatmap map = Heatmap.withRange("ramp", ColourScale.SEQUENTIAL, 0, 1);
        assertEquals(0, map.clipping(k).below() + map.clipping(k).above());
        assertTrue(map.scaleSentence(k).contains("covers every value"), map.scaleSentence(k));
    }

    @Test
    void saturatedSamplesAreCountedAndDrawnInTheirOwnColour() {
        double[] v = new double[20 * 10];
        java.util.Arrays.fill(v, 1000);
        v[0] = 65535;   // a saturated 16-bit sample in the first frame, first position
        Kymograph k = kymograph(v, 20);
        Heatmap map = Heatmap.withRange("raw", ColourScale.SEQUENTIAL, 900, 1100).withSaturation(65535);
        assertEquals(1, map.clipping(k).saturated());
        assertEquals(0, map.clipping(k).above(), "a saturated sample is not counted as merely clipped");
        assertTrue(map.scaleSentence(k).contains("Magenta marks 1 saturated sample"), map.scaleSentence(k));
        BufferedImage image = map.render(k);
        // the plot area starts 80 px from the left and 40 px from the top; its first cell is the first sample
        assertEquals(Heatmap.SATURATED.getRGB() & 0xFFFFFF, image.getRGB(81, 41) & 0xFFFFFF, "saturated colour");
    }
}
