package org.dendrokin.core.fit;

import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.List;
import java.util.Locale;

import org.dendrokin.core.Progress;
import org.dendrokin.core.kymo.Kymograph;
import org.junit.jupiter.api.Tag;
import org.junit.jupiter.api.Test;

/** Interval coverage and model selection over many seeded replicates; run with -Dgroups=slow. */
@Tag("slow")
class FitStatisticsSlowTest {
    @Test
    void ninetyFivePercentIntervalsHoldTheTruthInAbout95PercentOfReplicates() {
        double d = 0.5;
        double k = 0.05;
        int replicates = 200;
        int coveredD = 0;
        int coveredK = 0;
        int coveredDWald = 0;
        int converged = 0;
        for (int r = 0; r < replicates; r++) {
            Kymograph kymo = Synthetic.pulse(30, 60, 0.5, 0.4, d, k, 2, 7, 1.0, 0.1, 4, 0.1, 5000 + r);
            FitResult f = KymographFits.fit(kymo, KymographFits.Setup.of(4, 7).withModels(
                    List.of(DiffusionDecayPulse.NAME)), Progress.NONE).fits().get(0);
            if (!f.converged()) {
                continue;
            }
            converged++;
            ParameterEstimate ed = f.estimate("D").orElseThrow();
            coveredD += ed.ci95().contains(d) ? 1 : 0;
            coveredK += f.estimate("k").orElseThrow().ci95().contains(k) ? 1 : 0;
            coveredDWald += ed.otherIntervals().stream().filter(i -> i.method().equals(Interval.WALD_T))
                    .anyMatch(i -> i.contains(d)) ? 1 : 0;
        }
        double fd = coveredD / (double) replicates;
        double fk = coveredK / (double) replicates;
        String report = String.format(Locale.ROOT, "converged %d/%d; profile coverage D %.3f, k %.3f; Wald-t "
                + "coverage D %.3f", converged, replicates, fd, fk, coveredDWald / (double) replicates);
        System.out.println("COVERAGE " + report);
        // REF: a 95% interval holds the truth in 95% of replicates; 92-98% is about +-2 binomial SD at n = 200 [common practice]; sheet s8.2
        assertTrue(fd >= 0.92 && fd <= 0.98, report);
        assertTrue(fk >= 0.92 && fk <= 0.98, report);
    }

    @Test
    void aiccPicksTheTrueModelAtSignalToNoiseTen() {
        int replicates = 100;   // per generating model, so 200 data sets in all
        int right = 0;
        int total = 0;
        StringBuilder wrong = new StringBuilder();
        for (int r = 0; r < replicates; r++) {
            // diffusion-decay truth: peak 2, noise 0.2
            Kymograph dd = Synthetic.pulse(40, 80, 0.5, 0.25, 0.5, 0.05, 2, 10, 1.0, 0.1, 4, 0.2, 7000 + r);
            KymographFits.Outcome o1 = KymographFits.fit(dd, KymographFits.Setup.of(4, 10).withSealedEnds(true)
                    .withOptions(ModelFit.Options.defaults().withProfiles(false)), Progress.NONE);
            total++;
            if (DiffusionDecayPulse.NAME.equals(o1.bestModel())) {
                right++;
            } else {
                wrong.append(" dd#").append(r).append("->").append(o1.bestModel());
            }
            // nagumo truth: plateau 1.5, noise 0.15
            Kymograph ng = Synthetic.engine("nagumo", new double[] {1.0, 0.5, 0.2}, 40, 80, 0.5, 0.5, 1.5, 0.2, 4, 4,
                    2, 0.15, 8000 + r);
            KymographFits.Outcome o2 = KymographFits.fit(ng, KymographFits.Setup.of(4, 4).withSealedEnds(true)
                    .withOptions(ModelFit.Options.defaults().withProfiles(false)), Progress.NONE);
            total++;
            if ("nagumo".equals(o2.bestModel())) {
                right++;
            } else {
                wrong.append(" nagumo#").append(r).append("->").append(o2.bestModel());
            }
        }
        double fraction = right / (double) total;
        String report = String.format(Locale.ROOT, "AICc picked the true model in %d of %d replicates (%.3f);%s",
                right, total, fraction, wrong);
        System.out.println("SELECTION " + report);
        // REF: AICc (Hurvich & Tsai 1989) selects the generating model in most replicates at good SNR [common practice]; sheet s8.3
        assertTrue(fraction >= 0.95, report);
    }
}
