package org.dendrokin.core.calib;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.apache.commons.math3.analysis.UnivariateFunction;
import org.apache.commons.math3.analysis.differentiation.DerivativeStructure;
import org.apache.commons.math3.analysis.differentiation.FiniteDifferencesDifferentiator;
import org.apache.commons.math3.analysis.differentiation.UnivariateDifferentiableFunction;
import org.junit.jupiter.api.Test;

/**
 * What every calibration promises: a monotone inverse, a forward model it inverts exactly, NaN (never an
 * infinity or a negative number) at and beyond the ends of its range, and a derivative that matches the
 * inverse. Implementations subclass this and add their published worked examples.
 */
abstract class CalibrationContract {

    /** The calibration under test. */
    abstract Calibration calibration();

    /** Concentrations (uM) inside the valid range, spanning it widely, ascending. */
    double[] concentrationsMicromolar() {
        double k = 0.3;
        return new double[] {1e-3 * k, 0.01 * k, 0.1 * k, 0.5 * k, k, 2 * k, 10 * k, 100 * k};
    }

    @Test
    void concentrationToSignalToConcentrationRoundTrips() {
        Calibration cal = calibration();
        for (double c : concentrationsMicromolar()) {
            double back = cal.concentrationMicromolar(cal.signal(c));
            // REF: inverse of the forward model, identity derived in the test [common practice]; sheet s1.1
            assertEquals(c, back, 1e-9 * c, "round trip of " + c + " uM");
        }
    }

    @Test
    void inverseIsMonotoneInsideTheRange() {
        Calibration cal = calibration();
        double lo = cal.rangeStart();
        double hi = cal.rangeEnd();
        double previous = Double.NaN;
        for (int i = 1; i < 400; i++) {
            double c = cal.concentrationMicromolar(lo + (hi - lo) * i / 400.0);
            assertTrue(Double.isFinite(c) && c >= 0, "finite, non-negative concentration inside the range: " + c);
            if (!Double.isNaN(previous)) {
                assertTrue(c > previous, "concentration rises towards saturation at step " + i);
            }
            previous = c;
        }
    }

    @Test
    void endsAndBeyondGiveNaNNeverInfinityOrNegative() {
        Calibration cal = calibration();
        double lo = cal.rangeStart();
        double hi = cal.rangeEnd();
        double span = hi - lo;
        for (double s : new double[] {hi, hi + 0.01 * span, hi + 10 * span, lo, lo - 0.01 * span, lo - 10 * span}) {
            double c = cal.concentrationMicromolar(s);
            assertTrue(Double.isNaN(c), "signal " + s + " outside the open range gives NaN, got " + c);
            assertTrue(Double.isNaN(cal.derivative(s)), "derivative is NaN outside the range at " + s);
        }
    }

    @Test
    void derivativeMatchesFiniteDifferences() {
        Calibration cal = calibration();
        for (double c : concentrationsMicromolar()) {
            double s = cal.signal(c);
            double span = Math.abs(cal.rangeEnd() - cal.rangeStart());
            double distance = Math.min(Math.abs(s - cal.rangeStart()), Math.abs(cal.rangeEnd() - s));
            double h = Math.min(1e-4 * span, 0.05 * distance);
            UnivariateFunction inverse = cal::concentrationMicromolar;
            UnivariateDifferentiableFunction d = new FiniteDifferencesDifferentiator(5, h).differentiate(inverse);
            double expected = d.value(new DerivativeStructure(1, 1, 0, s)).getPartialDerivative(1);
            // REF: Commons Math FiniteDifferencesDifferentiator, 5-point stencil [common practice]
            assertEquals(expected, cal.derivative(s), 1e-5 * Math.abs(expected), "dc/dsignal at c = " + c + " uM");
        }
    }

    @Test
    void saturationIsZeroAtTheStartAndOneAtTheEnd() {
        Calibration cal = calibration();
        // REF: fractional saturation f = (F - Fmin) / (Fmax - Fmin) [common practice]; sheet s1.5
        assertEquals(0.0, cal.saturation(cal.rangeStart()), 1e-12, "f at the low end");
        assertEquals(1.0, cal.saturation(cal.rangeEnd()), 1e-12, "f at the saturated end");
    }
}
