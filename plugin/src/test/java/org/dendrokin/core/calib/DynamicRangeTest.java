package org.dendrokin.core.calib;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;

import org.junit.jupiter.api.Test;

class DynamicRangeTest extends CalibrationContract {
    @Override
    Calibration calibration() {
        return new DynamicRange(0.345, 100, 0.05);
    }

    @Override
    double[] concentrationsMicromolar() {
        return new double[] {0.001, 0.01, 0.05, 0.2, 0.345, 1, 5, 30};
    }

    @Test
    void workedExampleAWithKnownRestingLevel() {
        DynamicRange cal = new DynamicRange(0.345, 100, 0.050);
        // REF: Maravall et al. 2000 Biophys J 78:2655, F0/Fmin = (Kd + Rf c0)/(Kd + c0) [published method; forms derived]; sheet s1.4
        assertEquals(13.53165, cal.restingOverMinimum(), 1e-6 * 13.53165);
        // REF: Maravall et al. 2000, worked example A, c at dF/F0 = 1 [published method; forms derived]; sheet s1.4
        assertEquals(0.1232827, cal.concentrationMicromolar(1.0), 1e-6 * 0.1232827);
        // REF: Maravall et al. 2000, worked example A, dF/F0max = 6.390084 [published method; forms derived]; sheet s1.4
        assertEquals(6.390084, cal.rangeEnd(), 1e-6 * 6.390084);
    }

    @Test
    void workedExampleBIsExact() {
        DynamicRange cal = new DynamicRange(0.170, 8.5, 0.0175);
        // REF: Maravall et al. 2000, worked example B: dfmax = 4, c = 80 nM exactly [published method; forms derived]; sheet s1.4
        assertEquals(4.0, cal.rangeEnd(), 1e-12 * 4);
        assertEquals(0.080, cal.concentrationMicromolar(1.0), 1e-12 * 0.080);
        // REF: same example through (1.1) with Fmin = 1, Fmax = 8.5, F = 3.4 [published formula GPT85]; sheet s1.1, s1.4
        assertEquals(new SingleWavelength(0.170, 1, 8.5).concentrationMicromolar(3.4),
                cal.concentrationMicromolar(1.0), 1e-12);
    }

    @Test
    void workedExampleCHill() {
        DynamicRange cal = new DynamicRange(0.144, 20, 0.050, 2.9);
        // REF: Maravall et al. 2000 with the Hill form, worked example C [published method; forms derived]; sheet s1.4
        assertEquals(1.844817, cal.restingOverMinimum(), 1e-6 * 1.844817);
        assertEquals(0.09652388, cal.concentrationMicromolar(2.0), 1e-6 * 0.09652388);
    }

    @Test
    void propagatesEachConstantLikeNumericalDerivatives() {
        double df = 1.5;
        double[] base = {0.345, 20, 0.05, 1.3};
        double[] sd = {0.03, 2, 0.01, 0.1};
        for (int k = 0; k < 4; k++) {
            double[] sds = new double[4];
            sds[k] = sd[k];
            DynamicRange cal = new DynamicRange(base[0], base[1], base[2], base[3], sds);
            double[] up = base.clone();
            double[] down = base.clone();
            double h = 1e-6 * base[k];
            up[k] += h;
            down[k] -= h;
            double slope = (new DynamicRange(up[0], up[1], up[2], up[3]).concentrationMicromolar(df)
                    - new DynamicRange(down[0], down[1], down[2], down[3]).concentrationMicromolar(df)) / (2 * h);
            // REF: sd = |dc/dtheta| sd(theta), slope by central difference [common practice]; sheet s1.4
            assertEquals(Math.abs(slope) * sd[k], cal.concentrationSdMicromolar(df), 1e-5 * Math.abs(slope) * sd[k],
                    "propagated SD from constant " + k);
        }
    }

    @Test
    void rejectsRfNotAboveOne() {
        assertThrows(IllegalArgumentException.class, () -> new DynamicRange(0.345, 1.0, 0.05));
        assertThrows(IllegalArgumentException.class, () -> new DynamicRange(0.345, 10, 0));
    }
}
