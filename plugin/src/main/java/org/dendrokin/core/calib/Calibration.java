package org.dendrokin.core.calib;

import java.util.Map;

import org.dendrokin.core.units.Unit;

/**
 * Turns a measured signal into a concentration (uM) and back. The signal is what {@link #input()} says:
 * a background-subtracted intensity, a ratio of two background-subtracted channels, or dF/F0. Every
 * implementation is monotone on its valid range, which runs from {@link #rangeStart()} (the signal at the
 * low-concentration end) to {@link #rangeEnd()} (the signal at saturation); outside it, and at either end,
 * {@link #concentrationMicromolar(double)} returns NaN, never an infinity or a negative number.
 *
 * <p>A few methods report another quantity than a concentration, in their {@link #outputUnit()}: dF/F0
 * ({@link NoCalibration}), R/R0 or dR/R0 ({@link RatioChange}), a lifetime in ns ({@link MeanLifetime}) or the
 * fraction of bound sensor ({@link TwoStateLifetime}). They have no saturated end ({@link #saturates()} is
 * false): {@link #concentrationMicromolar(double)} then returns that quantity, and values a little beyond the
 * nominal range (a fraction bound of -0.02 at rest) are kept, since they are noise around a finite value.
 *
 * <p>Implementations are immutable and thread-safe.
 */
public interface Calibration {

    /** The method name as written in session.json, e.g. {@code "single-wavelength"}. */
    String method();

    /** What the signal given to this calibration is. */
    SignalKind input();

    /** The unit of {@link #concentrationMicromolar(double)}: uM, or dF/F0 for the method {@code none}. */
    default Unit outputUnit() {
        return Unit.MICROMOLAR;
    }

    /**
     * Concentration (uM; for methods without a saturated end, the value in {@link #outputUnit()}) for a signal, or
     * NaN when the signal lies outside the open valid range.
     */
    double concentrationMicromolar(double signal);

    /** The forward model: the signal that a concentration (uM, >= 0) would give. */
    double signal(double concentrationMicromolar);

    /** dc/dsignal (uM per signal unit) at a signal inside the valid range; NaN outside it. */
    double derivative(double signal);

    /**
     * Fractional saturation f of the indicator at this signal (dimensionless): 0 at the low end of the
     * range, 1 at the saturated end. Values outside [0, 1] mean the signal is outside the range.
     */
    double saturation(double signal);

    /**
     * First-order (delta-method) standard deviation of the concentration (uM) caused by the uncertainty of
     * the calibration's own constants, sqrt(g^T C g) with g = dc/dtheta and C their covariance. Zero when no
     * uncertainty was given; NaN outside the valid range or when the method cannot say.
     */
    double concentrationSdMicromolar(double signal);

    /**
     * Standard deviation of the concentration (uM) from the calibration's uncertainty and an independent
     * error of the signal itself (same unit as the signal): sqrt(sd_cal^2 + (dc/dsignal * signalSd)^2).
     */
    default double concentrationSdMicromolar(double signal, double signalSd) {
        double cal = concentrationSdMicromolar(signal);
        double fromSignal = derivative(signal) * signalSd;
        if (Double.isNaN(cal)) {
            return Math.abs(fromSignal);
        }
        return Math.hypot(cal, fromSignal);
    }

    /** Signal at the low-concentration end of the valid range (e.g. Fmin). */
    double rangeStart();

    /** Signal at the saturated end of the valid range (e.g. Fmax). */
    double rangeEnd();

    /** How a user calls the two ends of the range in sentences, e.g. {"Fmin", "Fmax"}. */
    default String[] rangeNames() {
        return new String[] {"Fmin", "Fmax"};
    }

    /**
     * True when the method has a saturated end at which the error of the result has no bound, so that samples near
     * it are flagged or set to NaN by the {@link SaturationLimits}; false for the methods that report a relative
     * change, a lifetime or a fraction, which keep every sample for which their formula is finite.
     */
    default boolean saturates() {
        return true;
    }

    /** Hill coefficient that governs error amplification near saturation (1 for 1:1 binding), or NaN. */
    double hillCoefficient();

    /** The constants, keyed as in session.json (e.g. {@code kd_uM}, {@code f_min}), in a stable order. */
    Map<String, Double> constants();

    /** One sentence for reports naming the method, its equation and its constants. */
    String description();
}
