package org.dendrokin.ij1;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.List;
import java.util.Map;

import org.dendrokin.core.fit.FitResult;
import org.dendrokin.core.fit.Interval;
import org.dendrokin.core.fit.KymographFits;
import org.dendrokin.core.fit.ParameterEstimate;
import org.dendrokin.core.units.Unit;
import org.junit.jupiter.api.Test;

import ij.measure.ResultsTable;

/** The fit table never shows an interval for a quantity the data cannot fix. */
class FitTableTest {
    @Test
    void aNonIdentifiableParameterGetsNoIntervalButAnIdentifiableOneKeepsIt() {
        ParameterEstimate d = new ParameterEstimate("D", Unit.DIFFUSION, 0.9, 0.01,
                new Interval(0.88, 0.92, Interval.WALD_T), List.of(), false, false);
        ParameterEstimate speed = new ParameterEstimate("front_speed", Unit.SPEED, 1.2, 0.05,
                new Interval(1.1, 1.3, Interval.WALD_T), List.of(), false, true);
        FitResult fit = new FitResult("nagumo", true, null, List.of(d), List.of(speed), 100, 1.0, 0.1,
                10, 11, 12, null, null, List.of(), 5);
        KymographFits.Outcome outcome = new KymographFits.Outcome(List.of(fit), "nagumo", "aicc",
                Map.of("nagumo", 1.0), new double[] {0.1}, null, List.of());

        ResultsTable t = Fit_Spread_Models.table(outcome);

        assertEquals("D", t.getStringValue("quantity", 0));
        assertTrue(Double.isNaN(t.getValue("ci95_low", 0)) && Double.isNaN(t.getValue("ci95_high", 0)),
                "no interval for a parameter the data do not fix");
        assertTrue(t.getStringValue("note", 0).contains("not identifiable"), t.getStringValue("note", 0));
        assertEquals("front_speed", t.getStringValue("quantity", 1));
        assertEquals(1.1, t.getValue("ci95_low", 1), 1e-12);
        assertEquals(1.3, t.getValue("ci95_high", 1), 1e-12);
    }

    @Test
    void everyOtherIntervalOfAnIdentifiableParameterGetsARowOfItsOwn() {
        ParameterEstimate k = new ParameterEstimate("k", Unit.RATE, 0.05, 0.001,
                new Interval(0.048, 0.052, Interval.PROFILE), List.of(new Interval(0.0481, 0.0519, Interval.WALD_T),
                        new Interval(0.0479, 0.0522, Interval.BOOTSTRAP)), false, true);
        FitResult fit = new FitResult("diffusion-decay", true, null, List.of(k), List.of(), 100, 1.0, 0.1,
                10, 11, 12, null, null, List.of(), 5);
        KymographFits.Outcome outcome = new KymographFits.Outcome(List.of(fit), "diffusion-decay", "aicc",
                Map.of("diffusion-decay", 1.0), new double[] {0.1}, null, List.of());

        ResultsTable t = Fit_Spread_Models.table(outcome);

        assertEquals(Interval.PROFILE, t.getStringValue("note", 0));
        assertEquals(Interval.WALD_T, t.getStringValue("note", 1));
        assertEquals(Interval.BOOTSTRAP, t.getStringValue("note", 2));
        assertEquals(0.0479, t.getValue("ci95_low", 2), 1e-12);
        assertEquals(0.0522, t.getValue("ci95_high", 2), 1e-12);
        assertEquals("k", t.getStringValue("quantity", 2));
    }
}
