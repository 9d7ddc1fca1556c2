package org.dendrokin.core.calib;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.List;

import org.dendrokin.core.kymo.Kymograph;
import org.junit.jupiter.api.Test;

class CalibratorTest {
    private final SingleWavelength cal = new SingleWavelength(0.345, 100, 1000, 0.03, 0, 0);

    @Test
    void saturatedAndOutOfRangeSamplesBecomeNaNAndAreCounted() {
        // f = 0.5, 0.85 (flagged), 0.97 (rejected), F = Fmax, F > Fmax, F = Fmin, F < Fmin, missing
        double[] signal = {550, 865, 973, 1000, 1500, 100, 20, Double.NaN};
        Calibrator.CalibratedValues v = Calibrator.apply(cal, SaturationLimits.DEFAULT, signal);
        for (int i = 2; i < signal.length; i++) {
            assertTrue(Double.isNaN(v.values()[i]), "sample " + i + " has no concentration");
        }
        for (double c : v.values()) {
            assertFalse(Double.isInfinite(c) || c < 0, "never infinite or negative: " + c);
        }
        // REF: GPT85 single-wavelength form, f = 0.5 gives c = Kd [published formula]; sheet s1.1
        assertEquals(0.345, v.values()[0], 1e-12);
        CalibrationSummary s = v.summary();
        assertEquals(1, s.count(SampleStatus.FLAGGED));
        assertEquals(1, s.count(SampleStatus.REJECTED));
        assertEquals(2, s.count(SampleStatus.ABOVE_RANGE));
        assertEquals(2, s.count(SampleStatus.BELOW_RANGE));
        assertEquals(1, s.count(SampleStatus.MISSING));
        assertEquals(1.0 / 7, s.fractionFlagged(), 1e-15);
        List<String> w = s.warnings(cal);
        assertEquals(4, w.size(), String.join("\n", w));
        assertTrue(w.get(0).startsWith("2 of 7 samples") && w.get(0).contains("Fmax (1000)"), w.get(0));
        assertTrue(w.get(3).contains("f > 0.8") && w.get(3).contains("at least 5%"), w.get(3));
        assertTrue(w.get(2).contains("f > 0.95") && w.get(2).contains("at least 20%"), w.get(2));
    }

    @Test
    void kymographKeepsItsAxesAndGetsMicromolar() {
        Kymograph k = new Kymograph(new double[] {0, 0.5}, new double[] {0, 1}, new double[] {550, 700, 400, 1200},
                "a.u.");
        Calibrator.CalibratedKymograph out = Calibrator.apply(cal, SaturationLimits.DEFAULT, k);
        assertEquals("uM", out.values().signalUnit());
        assertEquals(0.5, out.values().distanceUm(1), 0.0);
        // REF: GPT85 worked form with Kd = 0.345, Fmin = 100, Fmax = 1000, F = 400 gives 0.1725 [published formula]; sheet s1.1
        assertEquals(0.1725, out.values().value(1, 0), 1e-12);
        assertEquals(0.1725 * 0.03 / 0.345, out.sdMicromolar().value(1, 0), 1e-12, "SD from Kd's SD (uM)");
        assertTrue(Double.isNaN(out.values().value(1, 1)), "F > Fmax is NaN");
    }

    @Test
    void signalNoiseAddsInQuadratureToTheCalibrationSd() {
        double signal = 700;
        double fromKd = cal.concentrationSdMicromolar(signal);
        double fromSignal = cal.derivative(signal) * 12;
        // REF: independent errors add in quadrature, sd^2 = sd_cal^2 + (dc/dF sd_F)^2 [common practice]
        assertEquals(Math.hypot(fromKd, fromSignal), cal.concentrationSdMicromolar(signal, 12), 1e-15);
    }

    @Test
    void summariesAddUp() {
        CalibrationSummary a = Calibrator.apply(cal, SaturationLimits.DEFAULT, new double[] {550, 1500}).summary();
        CalibrationSummary b = Calibrator.apply(cal, SaturationLimits.DEFAULT, new double[] {865}).summary();
        CalibrationSummary sum = a.plus(b);
        assertEquals(3, sum.finiteInputs());
        assertEquals(1, sum.count(SampleStatus.FLAGGED));
        assertEquals(1, sum.count(SampleStatus.ABOVE_RANGE));
    }

    @Test
    void noCalibrationPassesValuesThrough() {
        Calibrator.CalibratedValues v = Calibrator.apply(NoCalibration.INSTANCE, SaturationLimits.DEFAULT,
                new double[] {-0.2, 3.0});
        assertEquals(-0.2, v.values()[0], 0.0);
        assertEquals(3.0, v.values()[1], 0.0);
        assertTrue(v.summary().warnings(NoCalibration.INSTANCE).isEmpty());
    }
}
