package org.dendrokin.ij1;

import static org.junit.jupiter.api.Assertions.assertEquals;

import java.util.List;

import ij.measure.ResultsTable;

import org.junit.jupiter.api.Test;

import com.google.gson.JsonObject;
import com.google.gson.JsonParser;

/** Fits as results.json writes them become one table row per parameter, with unit and interval. */
class FitRowsTest {
    @Test
    void parametersDerivedQuantitiesAndCriteriaBecomeRows() {
        JsonObject fit = JsonParser.parseString("""
                {"model": "diffusion-decay", "converged": true, "aic": -120.5, "aicc": -120.1, "bic": -110.0,
                 "rmse": 0.02, "akaike_weight": 0.93,
                 "parameters": {"D": {"value": 0.81, "unit": "um^2/s", "ci95": [0.75, 0.88], "ci_method": "profile-likelihood"},
                                "k": {"value": 0.049, "unit": "1/s", "ci95": [0.045, 0.053], "ci_method": null}},
                 "derived": {"length_constant": {"value": 4.1, "unit": "um", "ci95": null}}}
                """).getAsJsonObject();
        ResultsTable t = Tables.quantities();
        Analyze_Session_Folder.addFits(t, List.of(fit), "diffusion-decay");
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
