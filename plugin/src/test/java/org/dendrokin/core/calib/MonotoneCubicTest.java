package org.dendrokin.core.calib;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.apache.commons.math3.analysis.interpolation.SplineInterpolator;
import org.apache.commons.math3.analysis.polynomials.PolynomialSplineFunction;
import org.junit.jupiter.api.Test;

class MonotoneCubicTest {
    // REF: Fritsch & Carlson 1980 SIAM J Numer Anal 17:238, "RPN 14" test data [from memory: Fritsch & Carlson 1980; fairly sure]
    private static final double[] X = {7.99, 8.09, 8.19, 8.7, 9.2, 10, 12, 15, 20};
    private static final double[] Y = {0, 2.76429e-5, 4.37498e-2, 0.169183, 0.469428, 0.943740, 0.998636, 0.999919,
        0.999994};

    @Test
    void passesThroughEveryNode() {
        MonotoneCubic p = new MonotoneCubic(X, Y);
        for (int i = 0; i < X.length; i++) {
            // REF: Hermite interpolation reproduces node values [common practice]
            assertEquals(Y[i], p.value(X[i]), 1e-15, "value at node " + i);
        }
    }

    @Test
    void staysMonotoneWhereANaturalSplineOvershoots() {
        MonotoneCubic p = new MonotoneCubic(X, Y);
        PolynomialSplineFunction spline = new SplineInterpolator().interpolate(X, Y);
        double previous = Double.NEGATIVE_INFINITY;
        boolean splineLeftRange = false;
        for (int i = 0; i <= 4000; i++) {
            double x = X[0] + (X[X.length - 1] - X[0]) * i / 4000.0;
            double v = p.value(x);
            // REF: Fritsch & Carlson 1980: monotone data give a monotone interpolant [published theorem]
            assertTrue(v >= previous - 1e-15, "monotone at x = " + x);
            assertTrue(v >= 0 && v <= 0.999994 + 1e-15, "within the data's range at x = " + x);
            previous = v;
            double s = spline.value(x);
            splineLeftRange |= s < -1e-6 || s > 1.000001;
        }
        // REF: Commons Math natural cubic spline on the same data [common practice]: it overshoots, so this test can fail
        assertTrue(splineLeftRange, "the natural spline leaves [0, 1] on these data");
    }

    @Test
    void reproducesLinearDataExactly() {
        double[] x = {0, 1, 3, 4, 10};
        double[] y = {1, 3, 7, 9, 21};  // y = 2x + 1
        MonotoneCubic p = new MonotoneCubic(x, y);
        for (double q = 0; q <= 10; q += 0.37) {
            // REF: the secant tangents of collinear data make every cubic term vanish [common practice: derived in the test]
            assertEquals(2 * q + 1, p.value(q), 1e-12, "value at " + q);
            assertEquals(2.0, p.derivative(q), 1e-12, "slope at " + q);
        }
        assertTrue(Double.isNaN(p.value(-0.1)) && Double.isNaN(p.value(10.1)), "no extrapolation");
    }

    @Test
    void derivativeMatchesCentralDifferences() {
        MonotoneCubic p = new MonotoneCubic(X, Y);
        for (double x : new double[] {8.0, 8.5, 9.0, 11, 13, 17}) {
            double h = 1e-6;
            double expected = (p.value(x + h) - p.value(x - h)) / (2 * h);
            // REF: central difference [common practice]
            assertEquals(expected, p.derivative(x), 1e-6, "slope at " + x);
        }
    }
}
