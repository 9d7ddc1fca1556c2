package org.dendrokin.core.kymo;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.concurrent.atomic.AtomicInteger;

import org.dendrokin.core.Progress;
import org.dendrokin.core.path.DendritePath;
import org.junit.jupiter.api.Test;

class KymographExtractorTest {

    @Test
    void reproducesALinearImageAtEachSampleCentre() {
        // frame t: 7 + 3 column + 5 row + 11 t, in array indices
        ArrayFrames frames = ArrayFrames.of(64, 48, 3, t -> (c, r) -> 7 + 3 * c + 5 * r + 11 * t);
        double pixelUm = 0.5;
        DendritePath path = DendritePath.of(new double[] {8.3, 50.1, 40.7}, new double[] {10.2, 30.9, 40.4}, false);
        Extraction e = KymographExtractor.extract(frames, path, pixelUm, 0.2, 2.0, 0.35, Progress.NONE);
        Kymograph k = e.kymograph();
        double[] x = e.xPx();
        double[] y = e.yPx();
        assertEquals(0, e.samplesOutside(), "samples outside");
        for (int t = 0; t < 3; t++) {
            assertEquals(0.2 * t, k.timeS(t), 1e-12, "time (s) of frame " + t);
            for (int s = 0; s < k.positionCount(); s++) {
                // REF: bilinear interpolation and a symmetric band reproduce a linear function exactly; pixel i's
                // centre is at i + 0.5 (ImageJ convention) [common practice]
                double expected = 7 + 3 * (x[s] - 0.5) + 5 * (y[s] - 0.5) + 11 * t;
                assertEquals(expected, k.value(t, s), 1e-3, "intensity at sample " + s + ", frame " + t);
            }
        }
        assertEquals(0.35, k.distanceStepUm(), 1e-12, "distance step (um)");
        assertEquals("intensity", k.signalUnit());
    }

    @Test
    void bandAveragesAcrossTheTangent() {
        // a ridge along row 20 (array index): 100 on it, 0 elsewhere; a horizontal path on its centre line
        ArrayFrames frames = ArrayFrames.of(40, 40, 1, t -> (c, r) -> r == 20 ? 100 : 0);
        DendritePath path = DendritePath.of(new double[] {5.5, 30.5}, new double[] {20.5, 20.5}, false);
        Extraction thin = KymographExtractor.extract(frames, path, 1.0, 1.0, 0.0, 1.0, Progress.NONE);
        Extraction wide = KymographExtractor.extract(frames, path, 1.0, 1.0, 5.0, 1.0, Progress.NONE);
        // REF: a band of 5 points one pixel apart, one of them on the ridge: mean 100 / 5 [common practice]
        assertEquals(100.0, thin.kymograph().value(0, 3), 1e-9, "on the line");
        assertEquals(20.0, wide.kymograph().value(0, 3), 1e-9, "over a 5 px band");
    }

    @Test
    void samplesOutsideTheImageAreNaNAndCounted() {
        ArrayFrames frames = ArrayFrames.of(20, 20, 4, t -> (c, r) -> 1);
        // from x = 10.5 to x = 30.5: samples at x > 20 (the right border) lie outside
        DendritePath path = DendritePath.of(new double[] {10.5, 30.5}, new double[] {10.5, 10.5}, false);
        Extraction e = KymographExtractor.extract(frames, path, 1.0, 1.0, 0.0, 1.0, Progress.NONE);
        // REF: x = 10.5 + k inside [0, 20] for k <= 9; 21 samples in all [common practice]
        assertEquals(21, e.kymograph().positionCount(), "samples");
        assertEquals(11.0 / 21, e.fractionOutside(), 1e-12, "fraction outside");
        assertEquals(11L * 4, e.samplesOutside(), "NaN values");
        assertEquals(e.samplesOutside(), e.kymograph().nanCount(), "NaN values in the kymograph");
        assertEquals(1.0, e.kymograph().value(2, 9), 1e-12, "last sample inside");
        assertTrue(Double.isNaN(e.kymograph().value(2, 10)), "first sample outside");
    }

    @Test
    void reportsProgressAndStopsWhenCancelled() {
        ArrayFrames frames = ArrayFrames.of(10, 10, 5, t -> (c, r) -> t);
        DendritePath path = DendritePath.of(new double[] {1, 9}, new double[] {5, 5}, false);
        AtomicInteger reports = new AtomicInteger();
        Progress counting = (stage, done, total) -> reports.incrementAndGet();
        KymographExtractor.extract(frames, path, 1.0, 1.0, 1.0, 1.0, counting);
        assertEquals(5, reports.get(), "one report a frame");
        Progress cancelled = new Progress() {
            @Override
            public void report(String stage, long done, long total) {
            }

            @Override
            public boolean isCancelled() {
                return true;
            }
        };
        assertThrows(Progress.CancelledException.class,
                () -> KymographExtractor.extract(frames, path, 1.0, 1.0, 1.0, 1.0, cancelled));
    }
}
