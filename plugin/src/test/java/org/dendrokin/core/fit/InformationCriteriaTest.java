package org.dendrokin.core.fit;

import static org.junit.jupiter.api.Assertions.assertEquals;

import org.junit.jupiter.api.Test;

class InformationCriteriaTest {
    @Test
    void sheetWorkedExampleWithKEqualsPPlusOne() {
        // REF: AIC/AICc/BIC worked example, line p = 2, RSS 0.2229091, n = 10 [common practice: Akaike 1974, Hurvich & Tsai 1989, Schwarz 1978]; sheet s8.3
        assertEquals(-32.03576, InformationCriteria.aic(0.2229091, 10, 2), 1e-4, "AIC line");
        assertEquals(-28.03576, InformationCriteria.aicc(0.2229091, 10, 2), 1e-4, "AICc line");
        assertEquals(-31.12801, InformationCriteria.bic(0.2229091, 10, 2), 1e-4, "BIC line");
        // REF: same example, quadratic p = 3, RSS 0.1955606 [common practice]; sheet s8.3
        assertEquals(-31.34470, InformationCriteria.aic(0.1955606, 10, 3), 1e-4, "AIC quadratic");
        assertEquals(-23.34470, InformationCriteria.aicc(0.1955606, 10, 3), 1e-4, "AICc quadratic");
    }

    @Test
    void akaikeWeightsOfTheWorkedExample() {
        double[] w = InformationCriteria.weights(new double[] {-34.03576, -33.34470});
        // REF: Akaike weights from AIC (K = p), line 0.5855336, quadratic 0.4144664 [common practice: Burnham & Anderson 2002]; sheet s8.3
        assertEquals(0.5855336, w[0], 1e-6, "weight of the line");
        assertEquals(0.4144664, w[1], 1e-6, "weight of the quadratic");
    }

    @Test
    void nonConvergedFitsGetNoWeight() {
        double[] w = InformationCriteria.weights(new double[] {10, Double.NaN});
        // REF: definition w_i = exp(-delta_i/2) / sum exp(-delta_j/2) over the candidate models [common practice]; sheet s8.3
        assertEquals(1.0, w[0], 1e-15);
        assertEquals(0.0, w[1], 0.0);
    }
}
