package org.dendrokin.synth;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

class CoverageHarnessTest {
    @Test
    void theFullPipelineRecoversDAndKOnSessionsMadeUnderItsOwnAssumptions(@TempDir Path work) throws Exception {
        CoverageHarness.Scenario clean = CoverageHarness.scenarios().get("clean");
        List<CoverageHarness.Outcome> outcomes = CoverageHarness.run(clean, 101, 2, work, false, 1, null);
        for (CoverageHarness.Outcome o : outcomes) {
            assertTrue(o.fitted(), "seed " + o.seed() + ": " + o.failure());
            // REF: true D and k of the generator's closed-form pulse (Crank 1975; sheet s2.2, s2.3) [published
            // formula]; a parameter-recovery check of the whole pipeline on independent data
            assertEquals(0, o.d().relativeError(), 0.05, "relative error of D, seed " + o.seed());
            assertEquals(0, o.k().relativeError(), 0.05, "relative error of k, seed " + o.seed());
            assertTrue(o.d().upper() > o.d().lower(), "an interval of D");
        }
        try (var left = Files.list(work)) {
            assertEquals(0, left.count(), "session folders are removed unless kept");
        }
    }

    @Test
    void summaryCountsCoverageErrorsAndWidthsAsDefined() {
        // Four sessions, truth D = 1 and k = 0.1: covered, covered, missed (too high), and one without a fit.
        List<CoverageHarness.Outcome> outcomes = List.of(
                outcome(1, 1.02, 0.98, 1.06, 0.1, 0.09, 0.11),
                outcome(2, 0.97, 0.95, 1.01, 0.105, 0.1, 0.11),
                outcome(3, 1.10, 1.05, 1.15, 0.12, 0.115, 0.125),
                new CoverageHarness.Outcome("x", 4, CoverageHarness.Estimate.none(1),
                        CoverageHarness.Estimate.none(0.1), null, "not converged", 1));
        CoverageHarness.Summary s = CoverageHarness.summarise("x", outcomes);
        assertEquals(4, s.sessions());
        assertEquals(3, s.fitted());
        assertEquals(0.5, s.coverageD(), 1e-12, "2 of 4 sessions hold the true D");
        assertEquals(0.5, s.coverageK(), 1e-12, "2 of 4 hold the true k");
        assertEquals(0.03, s.medianAbsErrorD(), 1e-12, "median of 0.02, 0.03, 0.10");
        assertEquals(0.02, s.medianErrorD(), 1e-12, "median of 0.02, -0.03, 0.10");
        assertEquals(0.08, s.medianWidthD(), 1e-12, "median of 0.08, 0.06, 0.10");
        assertTrue(CoverageHarness.markdown(List.of(s)).contains("| x | 4 | 3 | wald-t | 50% | 50% |"));
    }

    private static CoverageHarness.Outcome outcome(long seed, double d, double dLo, double dHi, double k, double kLo,
            double kHi) {
        return new CoverageHarness.Outcome("x", seed, new CoverageHarness.Estimate(1, d, dLo, dHi, "wald-t", dLo, dHi),
                new CoverageHarness.Estimate(0.1, k, kLo, kHi, "wald-t", kLo, kHi), "diffusion-decay", null, 1);
    }
}
