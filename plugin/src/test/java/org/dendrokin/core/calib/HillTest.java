package org.dendrokin.core.calib;

import static org.junit.jupiter.api.Assertions.assertEquals;

import org.junit.jupiter.api.Test;

class HillTest extends CalibrationContract {
    @Override
    Calibration calibration() {
        return new Hill(0.144, 2.9, 1, 10);
    }

    @Override
    double[] concentrationsMicromolar() {
        return new double[] {0.005, 0.02, 0.1, 0.144, 0.3, 1.0, 5.0};
    }

    @Test
    void workedExamplesOfTheHillForm() {
        Hill cal = new Hill(0.144, 2.9, 1, 10);
        // REF: Hill 1910 form F = Fmin + (Fmax - Fmin) c^n/(c^n + K^n) [from memory: Hill 1910; sure of the form]; sheet s1.3
        assertEquals(3.320148, cal.signal(0.100), 1e-6 * 3.320148);
        // REF: inverted Hill form c = K ((F - Fmin)/(Fmax - F))^(1/n) [from memory: Hill 1910; sure of the form]; sheet s1.3
        assertEquals(0.09348734, cal.concentrationMicromolar(3), 1e-6 * 0.09348734);
        // REF: fraction bound c^n/(c^n + K^n), GCaMP6f-like K and n [from memory: Hill 1910; sure of the form]; sheet s1.3
        assertEquals(0.1935757, new HillCurve(0, 1, 0.375, 2.27).bound(0.200), 1e-6 * 0.1935757);
    }

    @Test
    void propagatesHillCoefficientUncertainty() {
        Hill cal = new Hill(0.144, 2.9, 1, 10, 0, 0.2, 0, 0);
        double signal = 7;
        double h = 1e-5;
        double slope = (new Hill(0.144, 2.9 + h, 1, 10).concentrationMicromolar(signal)
                - new Hill(0.144, 2.9 - h, 1, 10).concentrationMicromolar(signal)) / (2 * h);
        // REF: sd = |dc/dn| sd(n), slope by central difference [common practice]
        assertEquals(Math.abs(slope) * 0.2, cal.concentrationSdMicromolar(signal), 1e-6 * Math.abs(slope) * 0.2);
    }
}
