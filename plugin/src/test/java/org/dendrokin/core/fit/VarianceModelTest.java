package org.dendrokin.core.fit;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Arrays;
import java.util.Random;

import org.dendrokin.core.kymo.Kymograph;
import org.dendrokin.core.units.Unit;
import org.junit.jupiter.api.Test;

/** The noise variance model s0^2 + g signal, estimated without a model fit. */
class VarianceModelTest {
    static final int NX = 80;
    static final int NT = 200;
    static final double BASE = 0.1;
    static final double T0 = 5;

    /** A diffusion-decay pulse (peak 2 above a baseline of 0.1) without noise. */
    static double[] pulse() {
        double[] x = Synthetic.grid(0.5, NX);
        double[] t = Synthetic.grid(0.25, NT);
        DiffusionDecayPulse m = new DiffusionDecayPulse(x, t, T0, 20, null, Unit.DF_F0);
        double[] v = new double[m.size()];
        m.evaluate(m.pack(0.5, 0.05, 2, 20, 1, BASE, T0), v, null);
        return v;
    }

    static Kymograph kymograph(double[] v) {
        return new Kymograph(Synthetic.grid(0.5, NX), Synthetic.grid(0.25, NT), v, "dF/F0");
    }

    static double[] constant(double s0) {
        double[] s = new double[NX];
        Arrays.fill(s, s0);
        return s;
    }

    @Test
    void recoversThePhotonGainOfPoissonGaussianNoise() {
        double s0 = 0.02;
        double gain = 0.01;
        double[] v = pulse();
        Random random = new Random(20261209L);
        for (int i = 0; i < v.length; i++) {
            v[i] += Math.sqrt(s0 * s0 + gain * (v[i] - BASE)) * random.nextGaussian();
        }
        VarianceModel m = VarianceModel.estimate(kymograph(v), constant(s0), BASE, 20);
        assertTrue(m.signalDependent(), m.describe());
        // REF: Poisson-Gaussian noise, variance a + b signal (Foi et al. 2008 IEEE TIP 17:1737) with the generating
        // gain as truth [published model; known truth of the synthetic data]
        // 10%: about 2.5 standard errors here, plus the small bias of a smoothed signal level
        assertEquals(gain, m.gain(), 0.1 * gain, "gain (dF/F0): " + m.describe());
        assertTrue(Math.abs(m.gain() - gain) < 4 * m.gainStandardError(), "within 4 standard errors: " + m.describe());
        FitData data = m.fitData(kymograph(v));
        assertEquals(NX, data.columns(), "the fit data keep the grid");
        double peakSigma = data.sigma(24 * NX + 40);   // 1 s after the release, at its centre
        assertTrue(peakSigma > 3 * s0, "a bright sample gets a larger sigma: " + peakSigma);
    }

    @Test
    void constantNoiseKeepsTheBaselineWeights() {
        double[] v = pulse();
        Synthetic.addNoise(v, 0.05, 20261210L);
        double[] s0 = constant(0.05);
        VarianceModel m = VarianceModel.estimate(kymograph(v), s0, BASE, 20);
        assertFalse(m.signalDependent(), m.describe());
        // REF: with no gain the weights are the baseline ones, as before the model existed [common practice]
        assertArrayEquals(FitData.of(kymograph(v), s0).sigmas(), m.fitData(kymograph(v)).sigmas(), 0);
    }

    @Test
    void noiseCorrelatedInTimeIsNotTakenForGain() {
        double[] v = pulse();
        Random random = new Random(20261211L);
        double[] e = SandwichTest.ar1Field(NX, NT, 0, 0.5, random);
        for (int i = 0; i < v.length; i++) {
            v[i] += 0.03 * e[i];
        }
        VarianceModel m = VarianceModel.estimate(kymograph(v), constant(0.03), BASE, 20);
        // second differences of AR(1) noise (rho 0.5) have 0.5 of its variance, (6 - 8 rho + 2 rho^2) / 6; the
        // fitted scale takes that up, and the gain stays near zero
        // REF: variance of a second difference of an AR(1) series [derived in the test]
        assertFalse(m.signalDependent(), m.describe());
        assertTrue(Math.abs(m.gain()) < 3 * m.gainStandardError(), m.describe());
    }

    @Test
    void tooLittleSignalGivesNoGain() {
        double[] v = new double[NX * NT];
        Arrays.fill(v, BASE);
        Synthetic.addNoise(v, 0.05, 20261212L);
        VarianceModel m = VarianceModel.estimate(kymograph(v), constant(0.05), BASE, 20);
        assertFalse(m.signalDependent(), m.describe());
    }
}
