package org.dendrokin.synth;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Path;
import java.util.List;

import org.junit.jupiter.api.Tag;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * The default 95% intervals of D and k hold the truth in at least 90% of 100 realistic movies (curved spiny
 * dendrite, blur, uneven loading and background, Poisson-Gaussian noise, bleaching; {@link SessionSpec#realistic}),
 * each analysed by the whole pipeline. The figure is also in docs/benchmarks.md ("Coverage on realistic movies").
 */
@Tag("slow")
class RealisticCoverageTest {
    @Test
    void theDefaultIntervalsHoldTheTrueDAndKInNineOfTenRealisticMovies(@TempDir Path work) {
        CoverageHarness.Scenario realistic = CoverageHarness.scenarios().get("realistic");
        List<CoverageHarness.Outcome> outcomes = CoverageHarness.run(realistic, 1, 100, work, false, 2, null);
        CoverageHarness.Summary s = CoverageHarness.summarise("realistic", outcomes);
        assertEquals(100, s.fitted(), "every realistic movie is fitted");
        // REF: true D and k of the generator's closed-form pulse (Crank 1975; sheet s2.2, s2.3) [published formula];
        // a 95% interval should hold them in about 95 of 100 movies, the goal is at least 90
        assertTrue(s.coverageD() >= 0.90, "D held in " + s.coverageD() + " of the movies");
        assertTrue(s.coverageK() >= 0.90, "k held in " + s.coverageK() + " of the movies");
        // and the estimates themselves stay close: the intervals are not wide because the fits are poor
        assertTrue(s.medianAbsErrorD() < 0.05 && s.medianAbsErrorK() < 0.08, "median errors " + s.medianAbsErrorD()
                + ", " + s.medianAbsErrorK());
    }
}
