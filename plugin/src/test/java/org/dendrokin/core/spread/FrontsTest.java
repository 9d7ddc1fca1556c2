package org.dendrokin.core.spread;

import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.ArrayList;
import java.util.List;

import org.junit.jupiter.api.Test;

/** The front decision on arrival times that no straight line can be fitted to: a verdict and a warning, no exception. */
class FrontsTest {
    @Test
    void arrivalTimesWithOneDistinctFiniteValueGiveNoFrontAndAWarning() {
        // An infinite peak (a division by a background-subtracted zero upstream) gives a NaN arrival time; the
        // finite ones here are all equal, so the robust line through them has one distinct x.
        double[] distance = {1, 2, 3, 4, 5, 6, 7, 8};
        double[] arrival = {1, 1, 1, 1, Double.NaN, Double.NaN, Double.NaN, Double.NaN};
        double[] peaks = {1, 1, 1, 1, 1, 1, 1, 1};
        List<String> warnings = new ArrayList<>();
        SpreadAnalysis.Front front = Fronts.decide(distance, arrival, peaks, distance.length, 0.25, 0.5, 10, warnings);
        assertFalse(front.present(), "no front from arrival times that do not vary");
        assertTrue(warnings.stream().anyMatch(w -> w.startsWith("The front speed is not available")), warnings::toString);
    }

    @Test
    void aSingleFiniteArrivalTimeGivesNoFrontAndAWarning() {
        double[] distance = {1, 2, 3, 4, 5, 6};
        double[] arrival = {2, Double.NaN, Double.NaN, Double.NaN, Double.NaN, Double.NaN};
        double[] peaks = {1, 1, 1, 1, 1, 1};
        List<String> warnings = new ArrayList<>();
        SpreadAnalysis.Front front = Fronts.decide(distance, arrival, peaks, distance.length, 0.25, 0.5, 10, warnings);
        assertFalse(front.present());
        assertTrue(warnings.stream().anyMatch(w -> w.startsWith("The front speed is not available")), warnings::toString);
    }
}
