package org.dendrokin.core.calib;

import org.dendrokin.core.units.Unit;

/** The method {@code none}: the signal stays dF/F0; every value passes through unchanged and unflagged. */
public final class NoCalibration implements PassThrough {
    public static final NoCalibration INSTANCE = new NoCalibration();

    private NoCalibration() {
    }

    @Override
    public String method() {
        return "none";
    }

    @Override
    public SignalKind input() {
        return SignalKind.DF_F0;
    }

    @Override
    public Unit outputUnit() {
        return Unit.DF_F0;
    }

    /** Returns the dF/F0 value itself (this method does not produce a concentration). */
    @Override
    public double concentrationMicromolar(double signal) {
        return signal;
    }

    @Override
    public double signal(double value) {
        return value;
    }

    @Override
    public String description() {
        return "no calibration: the signal is dF/F0";
    }
}
