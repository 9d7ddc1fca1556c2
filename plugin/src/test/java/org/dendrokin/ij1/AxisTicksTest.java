package org.dendrokin.ij1;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.junit.jupiter.api.Test;

class AxisTicksTest {
    @Test
    void stepsAreOneTwoOrFiveTimesAPowerOfTenAndTheTicksFallInsideTheRange() {
        double[][] ranges = {{0, 99.5}, {0, 35.8}, {-0.0468, 0.55}, {377, 847}, {1.09e-4, 0.07}, {-3, -2.2}, {0, 1e6}};
        for (double[] r : ranges) {
            AxisTicks t = AxisTicks.of(r[0], r[1], 5);
            double mantissa = t.step() / Math.pow(10, Math.floor(Math.log10(t.step())));
            // REF: Heckbert, "Nice numbers for graph labels", Graphics Gems (1990): steps 1, 2 or 5 x 10^k [published]
            assertTrue(Math.abs(mantissa - 1) < 1e-9 || Math.abs(mantissa - 2) < 1e-9 || Math.abs(mantissa - 5) < 1e-9,
                    "step " + t.step());
            assertTrue(t.values().length >= 2 && t.values().length <= 11, t.values().length + " ticks");
            for (double v : t.values()) {
                assertTrue(v >= r[0] - 1e-12 && v <= r[1] + 1e-12, v + " in " + r[0] + ".." + r[1]);
                assertEquals(0, Math.IEEEremainder(v, t.step()), 1e-9 * t.step(), v + " is a multiple of the step");
            }
        }
    }

    @Test
    void aHundredSecondsInFiveTicksIsEveryTwentySeconds() {
        AxisTicks t = AxisTicks.of(0, 99.5, 5);
        // REF: the rule above by hand: 99.5 / 5 = 19.9, the next nice number is 20 [from memory: Heckbert 1990]
        assertEquals(20, t.step(), 0);
        assertArrayEquals(new double[] {0, 20, 40, 60, 80}, t.values(), 0);
        assertEquals("40", t.label(40));
    }

    @Test
    void labelsCarryTheStepsDecimalsAndNoFloatingPointDust() {
        AxisTicks t = AxisTicks.of(0, 0.7, 7);
        assertEquals(0.1, t.step(), 1e-15);
        assertEquals("0.3", t.label(t.values()[3]));
        assertEquals("0.0", t.label(0));
        assertEquals("0.0", t.label(-0.0));
        assertEquals("-0.2", AxisTicks.of(-0.5, 0.5, 5).label(-0.2));
    }

    @Test
    void anEmptyOrNonFiniteRangeGivesOneTickOrNone() {
        assertArrayEquals(new double[] {3}, AxisTicks.of(3, 3, 5).values(), 0);
        assertEquals(0, AxisTicks.of(Double.NaN, 1, 5).values().length);
    }
}
