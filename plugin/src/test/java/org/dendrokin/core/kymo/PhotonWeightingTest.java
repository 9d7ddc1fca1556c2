package org.dendrokin.core.kymo;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.SplittableRandom;

import org.dendrokin.core.Progress;
import org.dendrokin.core.path.DendritePath;
import org.junit.jupiter.api.Test;

/** The photon-weighted band average: {@link PhotonWeighting}. */
class PhotonWeightingTest {
    private static final int W = 24;
    private static final int H = 12;
    private static final int FRAMES = 3;

    /** Lifetimes between 1 and 3 ns and photon counts between 0 and 400, seeded. */
    private static ArrayFrames[] movies(long seed) {
        SplittableRandom random = new SplittableRandom(seed);
        float[][] tau = new float[FRAMES][W * H];
        float[][] n = new float[FRAMES][W * H];
        for (int f = 0; f < FRAMES; f++) {
            for (int i = 0; i < W * H; i++) {
                tau[f][i] = (float) random.nextDouble(1, 3);
                n[f][i] = (float) Math.floor(random.nextDouble(0, 400));
            }
        }
        return new ArrayFrames[] {new ArrayFrames(W, H, tau), new ArrayFrames(W, H, n)};
    }

    @Test
    void eachSampleIsThePhotonWeightedMeanOfItsPixels() {
        ArrayFrames[] m = movies(31);
        float[][] tau = new float[FRAMES][];
        float[][] n = new float[FRAMES][];
        for (int f = 0; f < FRAMES; f++) {
            tau[f] = m[0].readRows(f, 0, H, new float[W * H]);
            n[f] = m[1].readRows(f, 0, H, new float[W * H]);
        }
        // A horizontal path through the centres of row 5 (ImageJ y = 5.5), from column 2 to column 20, band 3 pixels:
        // each sample reads exactly the pixels of rows 4, 5 and 6 in its column.
        DendritePath path = DendritePath.of(new double[] {2.5, 20.5}, new double[] {5.5, 5.5}, false);
        double px = 0.25;
        PhotonWeighting.Weighted w = PhotonWeighting.extract(m[0], m[1], path, px, 0.1, 3 * px, px, "ns",
                Progress.NONE);
        assertEquals(19, w.mean().positionCount());
        for (int f = 0; f < FRAMES; f++) {
            for (int k = 0; k < 19; k++) {
                int col = 2 + k;
                double sumNTau = 0;
                double sumN = 0;
                for (int row = 4; row <= 6; row++) {
                    sumNTau += (double) n[f][row * W + col] * tau[f][row * W + col];
                    sumN += n[f][row * W + col];
                }
                // REF: tau = sum N_i tau_i / sum N_i over the band's pixels, computed directly [common practice];
                // 1e-6 relative: the product N tau is a frame value, held in single precision like every frame value
                assertEquals(sumNTau / sumN, w.mean().value(f, k), 1e-6 * sumNTau / sumN, "lifetime (ns), frame " + f
                        + ", sample " + k);
                assertEquals(sumN / 3, w.meanWeight().value(f, k), 1e-9, "band-mean photons per pixel");
            }
        }
        assertEquals("ns", w.mean().signalUnit());
        assertEquals(3.0, PhotonWeighting.pixelsPerSample(3 * px, px, px), 0, "3 pixels across, 1 along");
    }

    @Test
    void constantLifetimeAndConstantWeightsReduceToThePlainAverage() {
        DendritePath curve = DendritePath.of(new double[] {3.2, 11.7, 20.1}, new double[] {2.4, 8.9, 6.3}, false);
        ArrayFrames[] m = movies(32);
        ArrayFrames flat = ArrayFrames.of(W, H, FRAMES, t -> (c, r) -> 2.25);
        ArrayFrames even = ArrayFrames.of(W, H, FRAMES, t -> (c, r) -> 40);
        PhotonWeighting.Weighted sameTau = PhotonWeighting.extract(flat, m[1], curve, 0.3, 0.1, 0.8, 0.3, "ns",
                Progress.NONE);
        PhotonWeighting.Weighted sameN = PhotonWeighting.extract(m[0], even, curve, 0.3, 0.1, 0.8, 0.3, "ns",
                Progress.NONE);
        Kymograph plain = KymographExtractor.extract(m[0], curve, 0.3, 0.1, 0.8, 0.3, Progress.NONE).kymograph();
        for (int i = 0; i < plain.values().length; i++) {
            // REF: a weighted mean of equal values is that value; equal weights give the unweighted mean [common practice]
            assertEquals(2.25, sameTau.mean().values()[i], 1e-6, "one lifetime everywhere");
            assertEquals(plain.values()[i], sameN.mean().values()[i], 1e-6 * plain.values()[i], "equal weights "
                    + "(single-precision products)");
        }
    }

    @Test
    void pixelsWithoutPhotonsAddNothingAndAnEmptyBandIsNaN() {
        // lifetime exports often hold NaN or 0 where no photon arrived
        ArrayFrames tau = ArrayFrames.of(W, H, 1, t -> (c, r) -> r == 4 ? Double.NaN : r == 6 ? 0 : 2.0);
        ArrayFrames n = ArrayFrames.of(W, H, 1, t -> (c, r) -> r == 5 && c < 10 ? 100 : r == 6 ? -3 : 0);
        DendritePath path = DendritePath.of(new double[] {2.5, 20.5}, new double[] {5.5, 5.5}, false);
        PhotonWeighting.Weighted w = PhotonWeighting.extract(tau, n, path, 1, 1, 3, 1, "ns", Progress.NONE);
        assertEquals(2.0, w.mean().value(0, 0), 1e-12, "only the pixel with photons counts");
        assertTrue(Double.isNaN(w.mean().value(0, 15)), "no photons in the band: no lifetime");
        assertEquals(0.0, w.meanWeight().value(0, 15), 0, "negative counts are no photons");
    }

    @Test
    void followsAMovingPathThroughTheExtractorItIsGiven() {
        ArrayFrames[] m = movies(33);
        DendritePath path = DendritePath.of(new double[] {2.5, 15.5}, new double[] {5.5, 5.5}, false);
        double[] dx = {0, 2, -1};
        double[] dy = {0, 1, 3};
        PhotonWeighting.Weighted moving = PhotonWeighting.extract(m[0], m[1], source -> KymographExtractor.extract(
                source, path, 1, 1, 3, 1, dx, dy, Progress.NONE).kymograph(), "ns");
        for (int f = 0; f < FRAMES; f++) {
            DendritePath moved = DendritePath.of(new double[] {2.5 + dx[f], 15.5 + dx[f]},
                    new double[] {5.5 + dy[f], 5.5 + dy[f]}, false);
            PhotonWeighting.Weighted still = PhotonWeighting.extract(m[0], m[1], moved, 1, 1, 3, 1, "ns",
                    Progress.NONE);
            for (int k = 0; k < still.mean().positionCount(); k++) {
                // REF: whole-pixel shifts move the band onto other whole pixels [common practice]
                assertEquals(still.mean().value(f, k), moving.mean().value(f, k), 1e-9, "frame " + f + ", sample " + k);
            }
        }
    }

    @Test
    void refusesMoviesOfDifferentSizes() {
        ArrayFrames a = ArrayFrames.of(W, H, 2, t -> (c, r) -> 1);
        ArrayFrames b = ArrayFrames.of(W, H + 1, 2, t -> (c, r) -> 1);
        assertThrows(IllegalArgumentException.class, () -> PhotonWeighting.weightedValues(a, b));
    }
}
