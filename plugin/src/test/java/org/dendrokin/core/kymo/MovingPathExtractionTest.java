package org.dendrokin.core.kymo;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.SplittableRandom;

import org.dendrokin.core.Progress;
import org.dendrokin.core.path.DendritePath;
import org.junit.jupiter.api.Test;

/** Extraction along a path that moves with the image: {@link KymographExtractor} with per-frame shifts. */
class MovingPathExtractionTest {
    private static final DendritePath CURVE = DendritePath.of(new double[] {6.3, 30.1, 52.7, 40.2},
            new double[] {9.2, 28.9, 20.4, 40.6}, false);

    /** Frames of seeded random values, so that every pixel read shows in the result. */
    private static ArrayFrames randomFrames(int width, int height, int frameCount, long seed) {
        float[][] frames = new float[frameCount][width * height];
        SplittableRandom random = new SplittableRandom(seed);
        for (float[] frame : frames) {
            for (int i = 0; i < frame.length; i++) {
                frame[i] = (float) random.nextDouble(0, 1000);
            }
        }
        return new ArrayFrames(width, height, frames);
    }

    @Test
    void zeroShiftsGiveThePlainExtractionExactly() {
        ArrayFrames frames = randomFrames(64, 48, 4, 11);
        for (double band : new double[] {0, 1.0, 2.6}) {
            Extraction plain = KymographExtractor.extract(frames, CURVE, 0.5, 0.1, band, 0.35, Progress.NONE);
            Extraction moving = KymographExtractor.extract(frames, CURVE, 0.5, 0.1, band, 0.35, new double[4],
                    new double[4], Progress.NONE);
            // REF: the same arithmetic in the same order as the unmoved extraction, so equal to the last bit
            // [common practice]
            assertArrayEquals(plain.kymograph().values(), moving.kymograph().values(), 0, "band " + band + " um");
            assertEquals(plain.samplesOutside(), moving.samplesOutside(), "samples outside, band " + band);
            assertArrayEquals(plain.xPx(), moving.xPx(), 0, "sample x");
        }
    }

    @Test
    void eachFrameEqualsThePlainExtractionAlongTheTranslatedPath() {
        // shifts with whole and fractional parts of both signs; the last moves part of the path off the image
        double[] dx = {0.0, 0.37, -1.62, 3.999, -0.001, 14.4};
        double[] dy = {0.0, -0.81, 2.25, 0.5, -3.7, 1.3};
        ArrayFrames frames = randomFrames(64, 48, dx.length, 12);
        double pixelUm = 0.4;
        Extraction moving = KymographExtractor.extract(frames, CURVE, pixelUm, 0.1, 1.2, pixelUm, dx, dy,
                Progress.NONE);
        long outside = 0;
        for (int f = 0; f < dx.length; f++) {
            DendritePath moved = DendritePath.of(add(CURVE.xPx(), dx[f]), add(CURVE.yPx(), dy[f]), false);
            Extraction plain = KymographExtractor.extract(frames, moved, pixelUm, 0.1, 1.2, pixelUm,
                    Progress.NONE);
            double[] expected = plain.kymograph().row(f);
            double[] actual = moving.kymograph().row(f);
            for (int k = 0; k < expected.length; k++) {
                // REF: the definition: the path moved by the frame's shift, sampled by the unmoved method; the
                // tolerance allows for rounding in resampling the translated vertices [common practice]
                if (Double.isNaN(expected[k])) {
                    assertTrue(Double.isNaN(actual[k]), "frame " + f + ", sample " + k + " should be outside");
                } else {
                    assertEquals(expected[k], actual[k], 1e-9 * Math.abs(expected[k]) + 1e-9,
                            "intensity, frame " + f + ", sample " + k);
                }
            }
            outside += plain.samplesOutside() / dx.length;
        }
        assertTrue(outside > 0, "the last shift should move samples off the image");
        assertEquals(outside, moving.samplesOutside(), "samples outside, all frames");
        assertEquals(moving.samplesOutside(), moving.kymograph().nanCount(), "NaN values");
        assertEquals(outside / (double) (dx.length * moving.kymograph().positionCount()), moving.fractionOutside(),
                1e-15, "fraction of samples outside");
    }

    @Test
    void followsALinearImageToTheMovedSampleCentres() {
        // frame t: 7 + 3 column + 5 row + 11 t, in array indices
        ArrayFrames frames = ArrayFrames.of(64, 48, 3, t -> (c, r) -> 7 + 3 * c + 5 * r + 11 * t);
        double[] dx = {0.25, -2.5, 1.125};
        double[] dy = {-0.75, 1.5, 3.0};
        Extraction e = KymographExtractor.extract(frames, CURVE, 0.5, 0.2, 2.0, 0.35, dx, dy, Progress.NONE);
        double[] x = e.xPx();
        double[] y = e.yPx();
        for (int t = 0; t < 3; t++) {
            for (int s = 0; s < x.length; s++) {
                // REF: bilinear interpolation and a symmetric band reproduce a linear function exactly, here at the
                // sample centre moved by the frame's shift (pixel i's centre at i + 0.5) [common practice]
                double expected = 7 + 3 * (x[s] + dx[t] - 0.5) + 5 * (y[s] + dy[t] - 0.5) + 11 * t;
                assertEquals(expected, e.kymograph().value(t, s), 1e-3, "intensity at sample " + s + ", frame " + t);
            }
        }
    }

    @Test
    void refusesShiftsThatDoNotMatchTheFrames() {
        ArrayFrames frames = randomFrames(20, 20, 3, 13);
        DendritePath path = DendritePath.of(new double[] {2, 15}, new double[] {5, 5}, false);
        assertThrows(IllegalArgumentException.class, () -> KymographExtractor.extract(frames, path, 1, 1, 1, 1,
                new double[2], new double[2], Progress.NONE));
        assertThrows(IllegalArgumentException.class, () -> KymographExtractor.extract(frames, path, 1, 1, 1, 1,
                new double[] {0, Double.NaN, 0}, new double[3], Progress.NONE));
    }

    private static double[] add(double[] v, double d) {
        double[] out = new double[v.length];
        for (int i = 0; i < v.length; i++) {
            out[i] = v[i] + d;
        }
        return out;
    }
}
