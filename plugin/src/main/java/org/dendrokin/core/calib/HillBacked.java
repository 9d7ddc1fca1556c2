package org.dendrokin.core.calib;

/**
 * Shared behaviour of the calibrations whose inverse is a {@link HillCurve} in the signal itself
 * (single-wavelength, ratio, hill, fitted standards). Subclasses say how the uncertainty of their own
 * constants enters through {@link #constantGradient(double)} and the matching covariance.
 */
abstract class HillBacked implements Calibration {
    final HillCurve curve;
    private final double[][] covariance;

    /**
     * @param curve      the curve in the signal's own units
     * @param covariance covariance of the constants in the order of {@link #constantGradient}, or null
     */
    HillBacked(HillCurve curve, double[][] covariance) {
        this.curve = curve;
        this.covariance = Uncertainty.copy(covariance);
    }

    /** dc/dtheta for this method's constants, in the order of the covariance. Default: (a, b, K, n). */
    double[] constantGradient(double signal) {
        return curve.gradient(signal);
    }

    /** The curve in the signal's units (a copy-free immutable record). */
    public HillCurve curve() {
        return curve;
    }

    @Override
    public double concentrationMicromolar(double signal) {
        return curve.concentration(signal);
    }

    @Override
    public double signal(double concentrationMicromolar) {
        return curve.signal(concentrationMicromolar);
    }

    @Override
    public double derivative(double signal) {
        return curve.derivative(signal);
    }

    @Override
    public double saturation(double signal) {
        return curve.fraction(signal);
    }

    @Override
    public double concentrationSdMicromolar(double signal) {
        return Uncertainty.sd(constantGradient(signal), covariance);
    }

    @Override
    public double rangeStart() {
        return curve.a();
    }

    @Override
    public double rangeEnd() {
        return curve.b();
    }

    @Override
    public double hillCoefficient() {
        return curve.n();
    }

    static String fmt(double v) {
        return Format.number(v);
    }
}
