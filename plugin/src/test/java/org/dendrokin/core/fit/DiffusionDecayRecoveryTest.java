package org.dendrokin.core.fit;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertNotNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.List;

import org.dendrokin.core.Progress;
import org.dendrokin.core.kymo.Kymograph;
import org.junit.jupiter.api.Test;

/** Parameter recovery for diffusion-decay on synthetic kymographs with known truth, and hard data. */
class DiffusionDecayRecoveryTest {
    static final double D = 0.5;
    static final double K = 0.05;
    static final List<String> DD = List.of(DiffusionDecayPulse.NAME);

    private static FitResult fit(Kymograph k, KymographFits.Setup setup) {
        return KymographFits.fit(k, setup.withModels(DD), Progress.NONE).fits().get(0);
    }

    private static void assertRecovered(FitResult f, double tolerance, String what) {
        assertTrue(f.converged(), what + ": " + f.reason());
        // REF: parameter recovery against the known truth of the synthetic data [common practice]
        assertEquals(D, f.estimate("D").orElseThrow().value(), tolerance * D, what + ": D (um^2/s)");
        assertEquals(K, f.estimate("k").orElseThrow().value(), tolerance * K, what + ": k (1/s)");
    }

    @Test
    void recoversDAndKAtHighSignalToNoise() {
        Kymograph k = Synthetic.pulse(50, 100, 0.5, 0.25, D, K, 2, 12, 1.0, 0.1, 5, 0.01, 101);
        FitResult f = fit(k, KymographFits.Setup.of(5, 12));
        assertRecovered(f, 0.05, "SNR 200");
        assertTrue(f.estimate("D").orElseThrow().ci95().contains(D), "D interval holds the truth");
        assertEquals(Interval.PROFILE, f.estimate("D").orElseThrow().ci95().method(), "D interval method");
        // REF: Crank 1975 steady state length constant lambda = sqrt(D / k) [published formula]; sheet s2.4
        assertEquals(Math.sqrt(D / K), f.estimate("length_constant").orElseThrow().value(), 0.05 * Math.sqrt(D / K));
    }

    @Test
    void recoversDAndKAtLowSignalToNoise() {
        Kymograph k = Synthetic.pulse(50, 100, 0.5, 0.25, D, K, 2, 12, 1.0, 0.1, 5, 0.2, 102);
        assertRecovered(fit(k, KymographFits.Setup.of(5, 12)), 0.20, "SNR 10");
    }

    @Test
    void recoversStimulusTimeAndPositionWhenFree() {
        // a narrow pulse (s0 = 0.3 um, so an equivalent point source is released 0.09 s earlier: under a frame)
        Kymograph k = Synthetic.pulse(50, 100, 0.5, 0.25, D, K, 6, 12.3, 0.3, 0.1, 5.1, 0.02, 103);
        FitResult f = fit(k, KymographFits.Setup.of(5, 12).withFreeStimulus(true, true));
        assertRecovered(f, 0.05, "free stimulus");
        // REF: known truth of the synthetic data [common practice]
        assertEquals(12.3, f.estimate("position").orElseThrow().value(), 0.05, "stimulus position (um)");
        // REF: Gaussian pulse = point source released s0^2 / (2D) earlier, Crank 1975 [published formula]; sheet s2.1, s2.2
        assertEquals(5.1 - 0.09, f.estimate("stimulus_time").orElseThrow().value(), 0.05, "stimulus time (s)");
    }

    @Test
    void closedFormRecoversEngineMadeDataOnADendriteWithSealedEnds() {
        // made by the engine (Crank-Nicolson, fine grid), fitted by the closed form with mirror images
        Kymograph k = Synthetic.engine("diffusion-decay", new double[] {1.0, K}, 40, 100, 0.5, 0.25, 2, 0.1, 5, 4,
                1.0, 0.01, 104);
        FitResult f = fit(k, KymographFits.Setup.of(5, 4).withSealedEnds(true));
        assertTrue(f.converged(), f.reason());
        // REF: parameter recovery, truth D = 1 um^2/s, k = 0.05 /s of the engine run [common practice]
        assertEquals(1.0, f.estimate("D").orElseThrow().value(), 0.05, "D (um^2/s)");
        assertEquals(K, f.estimate("k").orElseThrow().value(), 0.05 * K, "k (1/s)");
    }

    @Test
    void flatKymographGivesWarningsAndNoConfidentConstants() {
        Kymograph k = Synthetic.pulse(40, 80, 0.5, 0.25, D, K, 0, 10, 1.0, 0.1, 5, 0.05, 105);
        KymographFits.Outcome o = KymographFits.fit(k, KymographFits.Setup.of(5, 10).withModels(DD), Progress.NONE);
        FitResult f = o.fits().get(0);
        boolean confident = f.converged() && f.estimate("D").orElseThrow().identifiable()
                && f.estimate("k").orElseThrow().identifiable();
        assertFalse(confident, "a flat kymograph must not give well-determined D and k");
        assertFalse(f.warnings().isEmpty() && o.warnings().isEmpty() && f.converged(), "something is said");
    }

    @Test
    void responseAtTheVeryEndOfThePathIsFitted() {
        Kymograph k = Synthetic.pulse(40, 100, 0.5, 0.25, D, K, 2, 19.5, 1.0, 0.1, 5, 0.01, 106);
        FitResult f = fit(k, KymographFits.Setup.of(5, 19.5));
        assertTrue(f.converged(), f.reason());
        // half the pulse is off the path: the open-line model still holds, so D and k are recovered
        // REF: known truth of the synthetic data [common practice]
        assertEquals(D, f.estimate("D").orElseThrow().value(), 0.1 * D, "D (um^2/s)");
    }

    @Test
    void nanStretchesAreLeftOutAndReported() {
        Kymograph clean = Synthetic.pulse(50, 100, 0.5, 0.25, D, K, 2, 12, 1.0, 0.1, 5, 0.01, 107);
        double[] v = clean.values();
        for (int f = 30; f < 70; f++) {
            for (int p = 20; p < 26; p++) {
                v[f * 50 + p] = Double.NaN;
            }
        }
        Kymograph k = clean.withValues(v, "dF/F0");
        KymographFits.Outcome o = KymographFits.fit(k, KymographFits.Setup.of(5, 12).withModels(DD), Progress.NONE);
        FitResult f = o.fits().get(0);
        assertRecovered(f, 0.05, "with NaN stretch");
        assertTrue(o.warnings().stream().anyMatch(w -> w.contains("missing")), "missing samples are reported");
    }

    @Test
    void singleFrameAfterTheStimulusIsMarkedNotConverged() {
        Kymograph k = Synthetic.pulse(30, 21, 0.5, 0.25, D, K, 2, 7, 1.0, 0.1, 5, 0.01, 108);
        KymographFits.Outcome o = KymographFits.fit(k, KymographFits.Setup.of(5, 7), Progress.NONE);
        for (FitResult f : o.fits()) {
            assertFalse(f.converged(), f.model() + " cannot converge on one frame");
            assertFalse(f.reason().isBlank(), "the reason is given");
        }
        assertEquals(null, o.bestModel(), "no best model");
        assertNotNull(o.warnings().stream().filter(w -> w.contains("frame")).findFirst().orElse(null));
    }
}
