package org.dendrokin.core.fit;

import static org.junit.jupiter.api.Assertions.assertEquals;

import org.dendrokin.core.units.Unit;
import org.junit.jupiter.api.Test;

/** The delta method for a derived quantity against its closed-form variance. */
class DeltaMethodTest {
    @Test
    void lengthConstantVarianceOnTheLogScale() {
        // ln lambda = (ln D - ln k) / 2, so var ln lambda = (C_DD + C_kk - 2 C_Dk) / 4 exactly
        double[][] cov = {{0.010, 0.004}, {0.004, 0.020}};
        double[] u = {Math.log(0.5), Math.log(0.05)};
        DerivedQuantity lambda = new DerivedQuantity("length_constant", Unit.MICROMETRE, true,
                th -> Math.sqrt(th[0] / th[1]));
        ParameterEstimate e = DeltaMethod.estimate(lambda, u, v -> new double[] {Math.exp(v[0]), Math.exp(v[1])},
                cov, 2.0, Interval.DELTA);
        double se = Math.sqrt((0.010 + 0.020 - 2 * 0.004) / 4);
        // REF: delta method, var g(X) = grad g^T C grad g, exact for g linear in the coordinates [common practice]; sheet s8.2
        assertEquals(Math.sqrt(10), e.value(), 1e-12, "length constant (um)");
        assertEquals(Math.sqrt(10) * se, e.standardError(), 1e-8, "standard error (um)");
        assertEquals(Math.sqrt(10) * Math.exp(-2 * se), e.ci95().lower(), 1e-8, "lower end (um)");
        assertEquals(Math.sqrt(10) * Math.exp(2 * se), e.ci95().upper(), 1e-8, "upper end (um)");
    }
}
