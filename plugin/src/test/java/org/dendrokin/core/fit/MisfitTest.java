package org.dendrokin.core.fit;

import static org.junit.jupiter.api.Assertions.assertEquals;

import java.util.Random;

import org.dendrokin.core.kymo.Kymograph;
import org.junit.jupiter.api.Test;

/** The lack-of-fit figure against processes whose lag-1 correlation is known, and the three patterns. */
class MisfitTest {
    private static final int NX = 80;
    private static final int NT = 200;

    private interface Residual {
        double at(int frame, int position);
    }

    /** A kymograph that is exactly the residual (the fit is zero), noise level 1 everywhere. */
    private static Misfit.Result measure(Residual r) {
        double[] d = new double[NX];
        double[] t = new double[NT];
        double[] v = new double[NX * NT];
        for (int p = 0; p < NX; p++) {
            d[p] = 0.2 * p;
        }
        for (int f = 0; f < NT; f++) {
            t[f] = 0.5 * f;
            for (int p = 0; p < NX; p++) {
                v[f * NX + p] = r.at(f, p);
            }
        }
        double[] sigma = new double[NX];
        java.util.Arrays.fill(sigma, 1);
        return Misfit.of(new Kymograph(d, t, v, "dF/F0"), new double[NX * NT], sigma, 20, 8.0);
    }

    @Test
    void whiteNoiseIsNoiseLike() {
        Random random = new Random(5);
        Misfit.Result m = measure((f, p) -> random.nextGaussian());
        // REF: lag-1 autocorrelation of independent noise is 0 with SE 1/sqrt(n) (Bartlett 1946) [published]
        assertEquals(0, m.temporalCorrelation(), 4 / Math.sqrt(NX * (NT - 20)), "lag-1 correlation of white noise");
        assertEquals(1, m.chiSquarePerPoint(), 0.02, "mean squared standardised residual");
        assertEquals(Misfit.Verdict.NOISE_LIKE, m.verdict());
    }

    @Test
    void anAutoregressiveResidualHasItsCoefficientAsCorrelation() {
        double phi = 0.8;
        Random random = new Random(6);
        double[] state = new double[NX];
        double[][] e = new double[NT][NX];
        for (int f = 0; f < NT; f++) {
            for (int p = 0; p < NX; p++) {
                state[p] = phi * state[p] + Math.sqrt(1 - phi * phi) * random.nextGaussian();
                e[f][p] = state[p];
            }
        }
        Misfit.Result m = measure((f, p) -> e[f][p]);
        // REF: an AR(1) process x_t = phi x_(t-1) + noise has lag-1 autocorrelation phi (Box and Jenkins 1970) [published]
        assertEquals(phi, m.temporalCorrelation(), 0.02, "lag-1 correlation of an AR(1) residual");
        assertEquals(Misfit.Verdict.MISFIT, m.verdict());
    }

    @Test
    void offsetsThatLastTheWholeMovieAreStripes() {
        Random random = new Random(7);
        double[] offset = new double[NX];
        for (int p = 0; p < NX; p++) {
            offset[p] = 3 * random.nextGaussian();
        }
        Misfit.Result m = measure((f, p) -> offset[p] + random.nextGaussian());
        // REF: a constant offset of variance 9 over unit noise gives correlation 9 / 10 between frames [common practice]
        assertEquals(0.9, m.temporalCorrelation(), 0.05);
        assertEquals(Misfit.Verdict.MISFIT, m.verdict());
        assertEquals(Misfit.Pattern.STRIPES, m.pattern());
    }

    @Test
    void aSlowMisfitAtTheStimulusIsABlob() {
        Random random = new Random(8);
        // a smooth bump within 2 um and 5 frames of the stimulus (8 um, frame 20), over unit noise
        Misfit.Result m = measure((f, p) -> {
            double bump = f >= 20 && f < 25 && Math.abs(0.2 * p - 8) < 2 ? 20 : 0;
            return bump + random.nextGaussian();
        });
        assertEquals(Misfit.Pattern.STIMULUS_BLOB, m.pattern(), m.toString());
    }
}
