package org.dendrokin.ij1;

import static org.junit.jupiter.api.Assertions.assertEquals;

import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;

import ij.measure.ResultsTable;

import org.dendrokin.core.fit.FitResult;
import org.dendrokin.core.fit.Interval;
import org.dendrokin.core.fit.KymographFits;
import org.dendrokin.core.fit.ParameterEstimate;
import org.dendrokin.core.units.Unit;
import org.junit.jupiter.api.Test;

/** Fits become one table row per parameter, with unit and interval, then the criteria and the weight. */
class FitRowsTest {
    @Test
    void parametersDerivedQuantitiesAndCriteriaBecomeRows() {
        FitResult fit = new FitResult("diffusion-decay", true, "",
                List.of(new ParameterEstimate("D", Unit.DIFFUSION, 0.81, 0.03,
                                new Interval(0.75, 0.88, Interval.PROFILE), List.of(), false, true),
                        new ParameterEstimate("k", Unit.RATE, 0.049, 0.002, null, List.of(), false, true)),
                List.of(new ParameterEstimate("length_constant", Unit.MICROMETRE, 4.1, Double.NaN, null, List.of(), false,
                        true)),
                1000, 990, 0.02, -120.5, -120.1, -110.0, null, null, List.of(), 10);
        Map<String, Double> weights = new LinkedHashMap<>();
        weights.put("diffusion-decay", 0.93);
        KymographFits.Outcome outcome = new KymographFits.Outcome(List.of(fit), "diffusion-decay", "aicc", weights,
                new double[] {0.1}, null, List.of());
        ResultsTable t = Tables.quantities();
        Analyze_Session_Folder.addFits(t, outcome);
        assertEquals(8, t.size(), "D, k, length constant, AICC, AIC, BIC, RMSE, Akaike weight");
        assertEquals("diffusion-decay (best)", t.getStringValue("source", 0));
        assertEquals("D", t.getStringValue("quantity", 0));
        assertEquals(0.81, t.getValue("value", 0), 0);
        assertEquals("um^2/s", t.getStringValue("unit", 0));
        assertEquals(0.75, t.getValue("ci95_low", 0), 0);
        assertEquals(0.88, t.getValue("ci95_high", 0), 0);
        assertEquals("profile-likelihood", t.getStringValue("note", 0));
        assertEquals("length_constant", t.getStringValue("quantity", 2));
        assertEquals(true, Double.isNaN(t.getValue("ci95_low", 2)), "no interval");
        assertEquals("Akaike weight", t.getStringValue("quantity", 7));
    }
}
