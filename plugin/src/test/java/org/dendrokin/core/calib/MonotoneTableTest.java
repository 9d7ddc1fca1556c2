package org.dendrokin.core.calib;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.junit.jupiter.api.Test;

class MonotoneTableTest extends CalibrationContract {
    private static final double[] LEVELS = {0, 0.025, 0.05, 0.1, 0.2, 0.4, 0.8, 1.6, 100};

    @Override
    Calibration calibration() {
        HillCurve truth = new HillCurve(1, 10, 0.144, 2.9);
        double[] f = new double[LEVELS.length];
        for (int i = 0; i < f.length; i++) {
            f[i] = truth.signal(LEVELS[i]);
        }
        return new MonotoneTable(LEVELS, f);
    }

    @Override
    double[] concentrationsMicromolar() {
        return new double[] {0.001, 0.03, 0.144, 0.5, 1.2, 20, 90};
    }

    @Test
    void givesTheStandardsBackAtTheirIntensities() {
        Calibration cal = calibration();
        for (int i = 1; i < LEVELS.length - 1; i++) {
            double f = cal.signal(LEVELS[i]);
            // REF: interpolation reproduces its nodes [common practice]; sheet s1.7
            assertEquals(LEVELS[i], cal.concentrationMicromolar(f), 1e-12, "standard " + i);
        }
    }

    @Test
    void averagesReplicatesAndRefusesANonMonotoneTable() {
        Standards ok = new Standards(new double[] {0, 0, 1, 1, 2}, new double[] {1, 3, 5, 7, 9});
        MonotoneTable t = MonotoneTable.of(ok);
        // REF: mean of replicates, (1 + 3)/2 and (5 + 7)/2 [common practice]
        assertEquals(2.0, t.rangeStart(), 0.0);
        assertEquals(6.0, t.meanIntensities()[1], 0.0);
        Standards bad = new Standards(new double[] {0, 1, 2, 3}, new double[] {1, 5, 4, 9});
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class, () -> MonotoneTable.of(bad));
        assertTrue(e.getMessage().contains("not monotone") && e.getMessage().contains("2 uM"), e.getMessage());
    }
}
