package org.dendrokin.core.calib;

import static org.junit.jupiter.api.Assertions.assertEquals;

import org.junit.jupiter.api.Test;

/** An indicator that dims on binding (as fura-2 at its 380 nm excitation), fitted from standards. */
class DecreasingHillTest extends CalibrationContract {
    @Override
    Calibration calibration() {
        return new FittedHill(new HillCurve(10, 1, 0.144, 2.9), null);
    }

    @Override
    double[] concentrationsMicromolar() {
        return new double[] {0.005, 0.02, 0.1, 0.144, 0.3, 1.0, 5.0};
    }

    @Test
    void mirrorsTheRisingCurve() {
        Calibration falling = calibration();
        Hill rising = new Hill(0.144, 2.9, 1, 10);
        for (double c : concentrationsMicromolar()) {
            // REF: F_falling(c) = 11 - F_rising(c) for a = 10, b = 1 against a = 1, b = 10 [common practice: derived in the test]; sheet s1.3
            assertEquals(11 - rising.signal(c), falling.signal(c), 1e-12, "intensity at " + c + " uM");
        }
        // REF: inverted Hill form, worked inverse F = 3 on the rising curve [from memory: Hill 1910; sure of the form]; sheet s1.3
        assertEquals(0.09348734, falling.concentrationMicromolar(11 - 3), 1e-6 * 0.09348734);
    }
}
