package org.dendrokin.core.calib;

import java.util.Map;

import org.dendrokin.core.units.Unit;

/**
 * The mean fluorescence lifetime itself, in ns, with no conversion: the read-out of a lifetime reporter when no
 * reference lifetimes are known. A lifetime at or below zero (an empty pixel in many lifetime exports) gives NaN.
 * No constants, no saturated end, no uncertainty of its own (the photon-count-limited precision of the lifetime is
 * the signal's own error, see {@link LifetimePrecision}).
 */
public final class MeanLifetime implements Calibration {
    public static final MeanLifetime INSTANCE = new MeanLifetime();

    private MeanLifetime() {
    }

    @Override
    public String method() {
        return "lifetime";
    }

    @Override
    public SignalKind input() {
        return SignalKind.LIFETIME;
    }

    @Override
    public Unit outputUnit() {
        return Unit.NANOSECOND;
    }

    /** The lifetime (ns) when positive, else NaN. */
    @Override
    public double concentrationMicromolar(double lifetimeNs) {
        return lifetimeNs > 0 ? lifetimeNs : Double.NaN;
    }

    @Override
    public double signal(double lifetimeNs) {
        return lifetimeNs;
    }

    @Override
    public double derivative(double lifetimeNs) {
        return lifetimeNs > 0 ? 1 : Double.NaN;
    }

    @Override
    public double saturation(double signal) {
        return Double.NaN;
    }

    @Override
    public double concentrationSdMicromolar(double lifetimeNs) {
        return lifetimeNs > 0 ? 0 : Double.NaN;
    }

    @Override
    public double rangeStart() {
        return 0;
    }

    @Override
    public double rangeEnd() {
        return Double.POSITIVE_INFINITY;
    }

    @Override
    public boolean saturates() {
        return false;
    }

    @Override
    public String[] rangeNames() {
        return new String[] {"zero", "infinity"};
    }

    @Override
    public double hillCoefficient() {
        return Double.NaN;
    }

    @Override
    public Map<String, Double> constants() {
        return Map.of();
    }

    @Override
    public String description() {
        return "mean fluorescence lifetime in ns, not converted";
    }
}
