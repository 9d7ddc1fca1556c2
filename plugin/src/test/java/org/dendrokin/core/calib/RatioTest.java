package org.dendrokin.core.calib;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;

import org.dendrokin.core.kymo.Kymograph;
import org.junit.jupiter.api.Test;

class RatioTest extends CalibrationContract {
    @Override
    Calibration calibration() {
        return new Ratio(0.224, 0.3, 6.0, 5.0);
    }

    @Test
    void workedExampleWithBeta() {
        // REF: Grynkiewicz, Poenie & Tsien 1985 J Biol Chem 260:3440, c = Kd beta (R - Rmin)/(Rmax - R) [published formula]; sheet s1.2
        assertEquals(0.2986667, new Ratio(0.224, 0.3, 6.0, 5.0).concentrationMicromolar(1.5), 1e-6 * 0.2986667);
    }

    @Test
    void betaUncertaintyScalesTheConcentration() {
        Ratio cal = new Ratio(0.224, 0.3, 6.0, 5.0, 0, 0, 0, 0.5);
        double c = cal.concentrationMicromolar(2.0);
        // REF: c is proportional to beta, so sd(c) = c sd(beta)/beta [common practice: derived in the test]
        assertEquals(c * 0.1, cal.concentrationSdMicromolar(2.0), 1e-12 * c);
        Ratio rmin = new Ratio(0.224, 0.3, 6.0, 5.0, 0, 0.02, 0, 0);
        double h = 1e-5;
        double slope = (new Ratio(0.224, 0.3 + h, 6.0, 5.0).concentrationMicromolar(2.0)
                - new Ratio(0.224, 0.3 - h, 6.0, 5.0).concentrationMicromolar(2.0)) / (2 * h);
        // REF: sd = |dc/dRmin| sd(Rmin), slope by central difference [common practice]
        assertEquals(Math.abs(slope) * 0.02, rmin.concentrationSdMicromolar(2.0), 1e-6 * Math.abs(slope) * 0.02);
    }

    @Test
    void ratioOfTwoChannelsIsTakenSampleBySample() {
        double[] d = {0, 1};
        double[] t = {0};
        Kymograph r = Calibrator.ratio(new Kymograph(d, t, new double[] {3, 4}, "a.u."),
                new Kymograph(d, t, new double[] {2, 0}, "a.u."));
        // REF: R = F1/F2, undefined for F2 <= 0 [common practice]; sheet s1.2
        assertArrayEquals(new double[] {1.5, Double.NaN}, r.values(), 0.0);
    }

    @Test
    void rejectsRmaxNotAboveRmin() {
        assertThrows(IllegalArgumentException.class, () -> new Ratio(0.224, 6.0, 0.3, 5.0));
        assertThrows(IllegalArgumentException.class, () -> new Ratio(0.224, 0.3, 6.0, 0));
    }
}
