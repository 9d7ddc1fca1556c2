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
    /** Seeds 1 to this; {@code -Ddendrokin.spine.seeds=96} for the guide's longer run. */
    private static final int SEEDS = Integer.getInteger("dendrokin.spine.seeds", 16);
    /** {@code -Ddendrokin.spine.driver=measured} drives the neck fits by the measured kymograph, for comparison. */
    private static final boolean FITTED_SHAFT = !"measured".equals(System.getProperty("dendrokin.spine.driver"));

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
            SyntheticSpines s = SyntheticSpines.of(spec, List.of(), FITTED_SHAFT);
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
        // The stimulated spine is found as such in >= 90% of seeds, and its neck time constant, where the fit calls
        // it determined, recovered within 20% in most of them.
        assertTrue(t[0].fitted >= 0.9 * SEEDS, "stimulated spine found and fitted: " + t[0]);
        assertTrue(t[0].within20 >= 0.8 * t[0].identifiable, "stimulated spine within 20%: " + t[0]);
        assertTrue(t[1].within20 >= 0.8 * t[1].identifiable, "other spines within 20%: " + t[1]);
        // Intervals of all fitted spines hold the truth in >= 90% (the aim). The neck fits are driven by the
        // shaft's fitted model, as in a session; driven by the measured kymograph, whose noise and smoothing along the
        // path bias them, they held it in about 88% over 96 seeds (docs/spines.md, Checks).
        int covered = t[0].covered + t[1].covered;
        int fitted = t[0].fitted + t[1].fitted;
        assertTrue(covered >= 0.9 * fitted, "intervals holding the truth: " + covered + " of " + fitted);
    }

    @Test
    void withoutBlurTheNeckTimeConstantsAreRecoveredToo() {
        // REF: Svoboda, Tank & Denk 1996, Science 272:716 [from memory; fairly sure]; truth from the generator.
        // Without blur the same holds (blur was once thought to cause the intervals' shortfall; it does not).
        Tally[] t = run(false);
        System.out.println("neck recovery, no blur: stimulated spine: " + t[0] + "; other spines: " + t[1]);
        assertTrue(t[0].fitted >= 0.9 * SEEDS, "stimulated spine found and fitted: " + t[0]);
        assertTrue(t[0].within20 >= 0.9 * t[0].identifiable, "stimulated spine within 20%: " + t[0]);
        int covered = t[0].covered + t[1].covered;
        int fitted = t[0].fitted + t[1].fitted;
        assertTrue(covered >= 0.9 * fitted, "intervals holding the truth: " + covered + " of " + fitted);
    }

    @Test
    void onTheModelsOwnPredictionTheStimulatedSpinesIntervalsHoldTheTruth() {
        // The fit's own calibration, apart from how a movie is measured: each seed's stimulated head replaced by
        // the model's prediction at the true tau_neck (the other parameters as fitted, the shaft as measured) plus
        // white noise of the head's measured noise level, 5 draws a seed. A 95% interval should then hold the truth
        // in about 95% of fits; the shortfall on movies driven by the measured kymograph (docs/spines.md, Checks) is
        // in that input, not in the fit.
        int fits = 0;
        int covered = 0;
        double sumLog = 0;
        for (long seed = 1; seed <= SEEDS; seed++) {
            SyntheticSpines s = SyntheticSpines.of(SyntheticSpines.fastSpec(seed), List.of());
            Truth t = s.truth();
            SpineSettings set = SpineSettings.defaults().withHeadDecay(t.signal().kPerS());
            Spine sp = SpineAnalysis.run(s.inputs, set, Progress.NONE).spines().stream().filter(Spine::stimulated)
                    .findFirst().orElse(null);
            if (sp == null) {
                continue;
            }
            double truth = t.spines().stream().filter(Truth.Spine::stimulated).findFirst().orElseThrow().tauNeckS();
            double offsetSd = Math.max(sp.offPathUm() * SpineAnalysis.NECK_SLOPE_SD, s.inputs.pixelSizeUm());
            ShaftDriver driver = new ShaftDriver(s.inputs.shaft(), sp.positionUm() - 4 * offsetSd,
                    sp.positionUm() + 4 * offsetSd, set.shaftSmoothingUm());
            double[] times = s.inputs.shaft().timesS();
            NeckExchangeModel model = new NeckExchangeModel(times, driver, sp.positionUm(), offsetSd,
                    s.inputs.stimulusTimeS(), set.headDecayPerS(), true);
            double[] p = sp.exchange().values();
            p[0] = truth;
            double[] clean = new double[model.size()];
            model.evaluate(p, clean, null);
            java.util.Random random = new java.util.Random(seed);
            for (int draw = 0; draw < 5; draw++) {
                double[] y = new double[times.length];
                for (int f = 0; f < y.length; f++) {
                    y[f] = clean[f] + sp.noiseSd() * random.nextGaussian();
                }
                ParameterEstimate e = NeckExchangeFit.fit(times, y, sp.noiseSd(), driver, sp.positionUm(), offsetSd,
                        s.inputs.stimulusTimeS(), set.headDecayPerS(), true, true, Progress.NONE)
                        .estimate(NeckExchangeModel.TAU).orElseThrow();
                fits++;
                covered += e.ci95() != null && e.ci95().contains(truth) ? 1 : 0;
                sumLog += Math.log(e.value() / truth);
            }
        }
        System.out.printf(java.util.Locale.ROOT, "neck fit on the model's prediction plus noise: %d of %d intervals "
                + "hold the truth, estimate / truth %.4f (geometric mean)%n", covered, fits, Math.exp(sumLog / fits));
        // REF: a 95% interval holds the truth in 95% of repetitions [common practice]; 0.9 allows for the binomial
        // spread of about 75 fits (sd 2.5%) and the profile's approximation
        assertTrue(fits >= 0.9 * 5 * SEEDS, "fits made: " + fits);
        assertTrue(covered >= 0.9 * fits, "intervals holding the truth: " + covered + " of " + fits);
        // and the estimate is unbiased to within 3% (the movies' stimulated spine reads about 7% long)
        assertTrue(Math.abs(sumLog / fits) < 0.03, "estimate / truth " + Math.exp(sumLog / fits));
    }
}
