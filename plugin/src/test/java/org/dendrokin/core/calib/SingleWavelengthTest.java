package org.dendrokin.core.calib;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.junit.jupiter.api.Test;

class SingleWavelengthTest extends CalibrationContract {
    @Override
    Calibration calibration() {
        return new SingleWavelength(0.345, 100, 1000);
    }

    @Test
    void workedExampleOfGrynkiewicz() {
        // REF: Grynkiewicz, Poenie & Tsien 1985 J Biol Chem 260:3440, c = Kd (F - Fmin)/(Fmax - F) [published formula]; sheet s1.1
        assertEquals(0.1725, new SingleWavelength(0.345, 100, 1000).concentrationMicromolar(400), 1e-12 * 0.1725);
    }

    @Test
    void errorAmplificationNearSaturationMatchesTheSheet() {
        SingleWavelength cal = new SingleWavelength(0.345, 100, 1000);  // Rf = 10
        double[] f = {0.5, 0.8, 0.9, 0.95};
        double[] expected = {2.444, 5.694, 11.23, 22.34};
        for (int i = 0; i < f.length; i++) {
            double signal = 100 + f[i] * 900;
            double amplification = cal.derivative(signal) * signal / cal.concentrationMicromolar(signal);
            // REF: d ln c / d ln F = F (Fmax - Fmin) / ((F - Fmin)(Fmax - F)), table for Rf = 10 [published: derived from GPT85]; sheet s1.5
            assertEquals(expected[i], amplification, 5e-4 * expected[i], "amplification at f = " + f[i]);
        }
    }

    @Test
    void propagatesKdAndFmaxUncertainty() {
        double signal = 700;
        SingleWavelength kdOnly = new SingleWavelength(0.345, 100, 1000, 0.03, 0, 0);
        double c = kdOnly.concentrationMicromolar(signal);
        // REF: c is proportional to Kd, so sd(c) = c sd(Kd)/Kd exactly [common practice: derived in the test]
        assertEquals(c * 0.03 / 0.345, kdOnly.concentrationSdMicromolar(signal), 1e-12 * c);

        SingleWavelength fmaxOnly = new SingleWavelength(0.345, 100, 1000, 0, 0, 20);
        double h = 1e-3;
        double slope = (new SingleWavelength(0.345, 100, 1000 + h).concentrationMicromolar(signal)
                - new SingleWavelength(0.345, 100, 1000 - h).concentrationMicromolar(signal)) / (2 * h);
        // REF: first-order propagation sd = |dc/dFmax| sd(Fmax), slope by central difference [common practice]
        assertEquals(Math.abs(slope) * 20, fmaxOnly.concentrationSdMicromolar(signal), 1e-6 * Math.abs(slope) * 20);
        assertEquals(0.0, new SingleWavelength(0.345, 100, 1000).concentrationSdMicromolar(signal), 0.0,
                "no uncertainty given: exact calibration");
    }

    @Test
    void rejectsUnusableConstantsWithTheirNames() {
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class,
                () -> new SingleWavelength(0.345, 1000, 100));
        assertTrue(e.getMessage().contains("f_max") && e.getMessage().contains("f_min"), e.getMessage());
        e = assertThrows(IllegalArgumentException.class, () -> new SingleWavelength(0, 100, 1000));
        assertTrue(e.getMessage().contains("kd_uM"), e.getMessage());
        e = assertThrows(IllegalArgumentException.class, () -> new SingleWavelength(0.3, 100, 1000, -1, 0, 0));
        assertTrue(e.getMessage().contains("kd_uM_sd"), e.getMessage());
    }
}
