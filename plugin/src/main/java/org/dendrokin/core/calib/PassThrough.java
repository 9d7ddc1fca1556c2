package org.dendrokin.core.calib;

import java.util.Map;

/**
 * A "calibration" that passes the signal on with slope 1 (dF/F0 as it is, R/R0 or dR/R0): no range, no saturation,
 * no dye constants and no uncertainty of its own. Implementations give the mapping, its name and its description.
 */
interface PassThrough extends Calibration {
    @Override
    default double derivative(double signal) {
        return 1;
    }

    @Override
    default double saturation(double signal) {
        return Double.NaN;
    }

    @Override
    default double concentrationSdMicromolar(double signal) {
        return 0;
    }

    @Override
    default double rangeStart() {
        return Double.NEGATIVE_INFINITY;
    }

    @Override
    default double rangeEnd() {
        return Double.POSITIVE_INFINITY;
    }

    @Override
    default boolean saturates() {
        return false;
    }

    @Override
    default double hillCoefficient() {
        return Double.NaN;
    }

    @Override
    default Map<String, Double> constants() {
        return Map.of();
    }
}
