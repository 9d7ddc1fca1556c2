package org.dendrokin.core.fit;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.List;

import org.dendrokin.core.Progress;
import org.junit.jupiter.api.Test;

class BootstrapTest {
    @Test
    void parametricBootstrapIntervalsMatchTheCertifiedSpreadOnMgh17() {
        ModelFit.Options options = ModelFit.Options.defaults().withProfiles(false).withTolerance(1e-12)
                .withMaxEvaluations(2000).withBootstrap(300, 20261202L);
        // REF: NIST StRD MGH17 (certified values), data file as shipped in commons-math3 3.6.1 tests jar
        NistStrdTest.Dataset set = NistStrdTest.read("MGH17");
        FitResult fit = ModelFit.fit(new NistStrdTest.NistModel(set, NistStrdTest.MGH17, true),
                FitData.unweighted(set.y()), List.of(set.start2()), options, Progress.NONE);
        assertTrue(fit.converged(), fit.reason());
        for (int j : new int[] {0, 3}) {
            ParameterEstimate e = fit.parameters().get(j);
            Interval boot = e.otherIntervals().stream().filter(i -> i.method().equals(Interval.BOOTSTRAP))
                    .findFirst().orElse(null);
            assertNotNull(boot, "a bootstrap interval for b" + (j + 1));
            // REF: NIST StRD MGH17 certified SD; a 95% interval spans about 2 x 1.96 SD [published: NIST StRD MGH17.dat; common practice]; sheet s8.4
            // 25%: 300 replicates estimate the 2.5th and 97.5th percentiles to roughly 10% each.
            assertEquals(2 * 1.96 * set.certifiedSd()[j], boot.width(), 0.25 * 2 * 1.96 * set.certifiedSd()[j],
                    "bootstrap interval width of b" + (j + 1));
            assertTrue(boot.contains(set.certified()[j]), "holds the certified value");
        }
    }
}
