package org.dendrokin.core.spines;

import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.List;
import java.util.Locale;

import org.dendrokin.core.Progress;
import org.dendrokin.core.fit.ParameterEstimate;
import org.dendrokin.synth.SessionSpec;
import org.dendrokin.synth.Truth;
import org.junit.jupiter.api.Tag;
import org.junit.jupiter.api.Test;

/**
 * Recovery of neck exchange time constants from realistic synthetic movies (our own seeded generator: curved dendrite,
 * spines with neck time constants drawn from 0.1 to 2 s, a stimulated spine, blur, uneven loading, bleaching,
 * Poisson-Gaussian camera noise), each spine's head following the two-compartment exchange with the shaft.
 */
@Tag("slow")
class SpineNeckRecoveryTest {
    private static final int SEEDS = 16;

    /** Tallies over the spines that were found and fitted, per class. */
    private static final class Tally {
        int fitted;
        int covered;
        int identifiable;
        int identifiableCovered;
        int within20;

        void add(ParameterEstimate e, double truth) {
            fitted++;
            boolean c = e.ci95() != null && e.ci95().contains(truth);
            covered += c ? 1 : 0;
            if (e.identifiable()) {
                identifiable++;
                identifiableCovered += c ? 1 : 0;
                within20 += Math.abs(e.value() / truth - 1) <= 0.2 ? 1 : 0;
            }
        }

        @Override
        public String toString() {
            return String.format(Locale.ROOT, "fitted %d, interval holds truth %d; identifiable %d, of which interval "
                    + "holds truth %d, within 20%% %d", fitted, covered, identifiable, identifiableCovered, within20);
        }
    }

    private static Tally[] run(boolean blur) {
        Tally stimulated = new Tally();
        Tally others = new Tally();
        for (long seed = 1; seed <= SEEDS; seed++) {
            SessionSpec spec = SyntheticSpines.fastSpec(seed);
            if (!blur) {
                spec = spec.withOptics(SessionSpec.Optics.NONE);
            }
            SyntheticSpines s = SyntheticSpines.of(spec, List.of());
            Truth t = s.truth();
            SpineAnalysis.Result r = SpineAnalysis.run(s.inputs,
                    SpineSettings.defaults().withHeadDecay(t.signal().kPerS()), Progress.NONE);
            double px = t.movie().pixelSizeUm();
            for (Truth.Spine truth : t.spines()) {
                for (Spine sp : r.spines()) {
                    boolean same = Math.hypot(sp.site().xPx() - truth.headXPx(), sp.site().yPx() - truth.headYPx())
                            * px < truth.headRadiusUm();
                    if (same && sp.tauNeck().isPresent()) {
                        (truth.stimulated() && sp.stimulated() ? stimulated : others)
                                .add(sp.tauNeck().get(), truth.tauNeckS());
                    }
                }
            }
        }
        return new Tally[] {stimulated, others};
    }

    @Test
    void neckTimeConstantsOfRealisticMoviesAreRecovered() {
        // REF: Svoboda, Tank & Denk 1996, Science 272:716 (spine head as a compartment coupled to the dendrite through
        // its neck, one exchange time constant) [from memory; fairly sure]; truth from the generator's integration.
        Tally[] t = run(true);
        System.out.println("neck recovery, blur 0.17 um: stimulated spine: " + t[0] + "; other spines: " + t[1]);
        // The stimulated spine is found as such and its neck time constant recovered within 20% in >= 90% of seeds.
        assertTrue(t[0].fitted >= 0.9 * SEEDS, "stimulated spine found and fitted: " + t[0]);
        assertTrue(t[0].within20 >= 0.9 * t[0].identifiable, "stimulated spine within 20%: " + t[0]);
        // Other spines whose time constant the fit calls identifiable: within 20% in most, and intervals (all fits)
        // holding the truth in most. Blur carries light of the neck and shaft into the head's disc, which biases
        // the stimulated spine's time constant up by about 8% (see docs/spines.md), so its intervals hold the truth
        // less often than 90%; the figures are in the guide.
        assertTrue(t[1].within20 >= 0.8 * t[1].identifiable, "other spines within 20%: " + t[1]);
        int covered = t[0].covered + t[1].covered;
        int fitted = t[0].fitted + t[1].fitted;
        assertTrue(covered >= 0.8 * fitted, "intervals holding the truth: " + covered + " of " + fitted);
    }

    @Test
    void withoutBlurIntervalsHoldTheTruthInNineOfTen() {
        // REF: Svoboda, Tank & Denk 1996, Science 272:716 [from memory; fairly sure]; truth from the generator.
        Tally[] t = run(false);
        System.out.println("neck recovery, no blur: stimulated spine: " + t[0] + "; other spines: " + t[1]);
        assertTrue(t[0].fitted >= 0.9 * SEEDS, "stimulated spine found and fitted: " + t[0]);
        assertTrue(t[0].covered >= 0.9 * t[0].fitted, "stimulated spine intervals: " + t[0]);
        assertTrue(t[0].within20 >= 0.9 * t[0].identifiable, "stimulated spine within 20%: " + t[0]);
        int covered = t[0].identifiableCovered + t[1].identifiableCovered;
        int identifiable = t[0].identifiable + t[1].identifiable;
        assertTrue(covered >= 0.9 * identifiable, "identifiable intervals holding the truth: " + covered + " of "
                + identifiable);
    }
}
