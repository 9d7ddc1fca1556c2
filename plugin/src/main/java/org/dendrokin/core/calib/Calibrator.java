package org.dendrokin.core.calib;

import java.util.EnumMap;

import org.dendrokin.core.Checks;
import org.dendrokin.core.kymo.Kymograph;

/**
 * Applies a {@link Calibration} to many samples with the {@link SaturationLimits}: each sample gets a
 * concentration (or NaN), a first-order SD from the calibration's own uncertainty, and a
 * {@link SampleStatus}; the counts go into a {@link CalibrationSummary}. Nothing is clipped silently.
 */
public final class Calibrator {
    private Calibrator() {
    }

    /** Concentrations, their SDs and statuses for one array of signals. Arrays are owned by the caller. */
    public record CalibratedValues(double[] values, double[] sdMicromolar, SampleStatus[] status,
                                   CalibrationSummary summary) {
    }

    /** A calibrated kymograph, the kymograph of its per-sample SDs (uM), and the counts. */
    public record CalibratedKymograph(Kymograph values, Kymograph sdMicromolar, CalibrationSummary summary) {
    }

    /** Status of one signal value under a calibration and limits. */
    public static SampleStatus classify(Calibration calibration, SaturationLimits limits, double signal) {
        if (Double.isNaN(signal)) {
            return SampleStatus.MISSING;
        }
        if (calibration instanceof NoCalibration) {
            return SampleStatus.VALID;
        }
        if (!calibration.saturates()) {
            if (Double.isFinite(calibration.concentrationMicromolar(signal))) {
                return SampleStatus.VALID;
            }
            double towardsEnd = (signal - calibration.rangeStart()) / (calibration.rangeEnd() - calibration.rangeStart());
            return towardsEnd > 0.5 ? SampleStatus.ABOVE_RANGE : SampleStatus.BELOW_RANGE;
        }
        double f = calibration.saturation(signal);
        if (!(f > 0)) {
            return SampleStatus.BELOW_RANGE;
        }
        if (!(f < 1)) {
            return SampleStatus.ABOVE_RANGE;
        }
        if (f > limits.rejectAbove()) {
            return SampleStatus.REJECTED;
        }
        if (f > limits.flagAbove()) {
            return SampleStatus.FLAGGED;
        }
        return SampleStatus.VALID;
    }

    /**
     * Calibrates each signal. Values are the concentration (uM; dF/F0 for {@code none}) for VALID and FLAGGED
     * samples and NaN otherwise; the SD is {@link Calibration#concentrationSdMicromolar(double)} for those
     * samples and NaN otherwise.
     *
     * @param signal signals in the unit of {@link Calibration#input()}. Not modified.
     */
    public static CalibratedValues apply(Calibration calibration, SaturationLimits limits, double[] signal) {
        return apply(calibration, limits, signal, null);
    }

    /**
     * Calibrates each signal as {@link #apply(Calibration, SaturationLimits, double[])} does, with the SD of each
     * value from both the calibration's uncertainty and an independent error of the signal itself,
     * {@link Calibration#concentrationSdMicromolar(double, double)} (e.g. the photon-count-limited precision of a
     * lifetime).
     *
     * @param signal   signals in the unit of {@link Calibration#input()}. Not modified.
     * @param signalSd standard deviation of each signal, same unit and length, or null for none. Not modified.
     */
    public static CalibratedValues apply(Calibration calibration, SaturationLimits limits, double[] signal,
                                         double[] signalSd) {
        Checks.require(calibration != null && limits != null, "a calibration and limits are needed");
        Checks.require(signalSd == null || signalSd.length == signal.length, "one signal SD per signal is needed");
        int n = signal.length;
        double[] values = new double[n];
        double[] sd = new double[n];
        SampleStatus[] status = new SampleStatus[n];
        long[] counts = new long[SampleStatus.values().length];
        for (int i = 0; i < n; i++) {
            SampleStatus s = classify(calibration, limits, signal[i]);
            status[i] = s;
            counts[s.ordinal()]++;
            if (s == SampleStatus.VALID || s == SampleStatus.FLAGGED) {
                values[i] = calibration.concentrationMicromolar(signal[i]);
                sd[i] = signalSd == null ? calibration.concentrationSdMicromolar(signal[i])
                        : calibration.concentrationSdMicromolar(signal[i], signalSd[i]);
            } else {
                values[i] = Double.NaN;
                sd[i] = Double.NaN;
            }
        }
        EnumMap<SampleStatus, Long> map = new EnumMap<>(SampleStatus.class);
        for (SampleStatus s : SampleStatus.values()) {
            map.put(s, counts[s.ordinal()]);
        }
        return new CalibratedValues(values, sd, status, new CalibrationSummary(map, limits));
    }

    /**
     * Calibrates every sample of a kymograph whose values are in the unit of {@link Calibration#input()}.
     * The result's unit is {@link Calibration#outputUnit()}; the SD kymograph is in the same unit.
     */
    public static CalibratedKymograph apply(Calibration calibration, SaturationLimits limits, Kymograph signal) {
        return apply(calibration, limits, signal, null);
    }

    /**
     * Calibrates every sample of a kymograph, with the SD of each value from the calibration's uncertainty and from
     * the signal's own SD ({@link #apply(Calibration, SaturationLimits, double[], double[])}).
     *
     * @param signalSd kymograph of the signal's SD on the same grid, or null for none. Not modified.
     */
    public static CalibratedKymograph apply(Calibration calibration, SaturationLimits limits, Kymograph signal,
                                            Kymograph signalSd) {
        Checks.require(signalSd == null || (signalSd.positionCount() == signal.positionCount()
                && signalSd.frameCount() == signal.frameCount()), "the signal and its SD differ in size");
        CalibratedValues v = apply(calibration, limits, signal.values(), signalSd == null ? null : signalSd.values());
        String unit = calibration.outputUnit().symbol();
        return new CalibratedKymograph(
                new Kymograph(signal.distancesUm(), signal.timesS(), v.values(), unit),
                new Kymograph(signal.distancesUm(), signal.timesS(), v.sdMicromolar(), unit),
                v.summary());
    }

    /**
     * The ratio kymograph R = numerator / denominator, sample by sample, for the ratio method; both inputs
     * already background-subtracted. A denominator at or below zero gives NaN (no ratio is defined there).
     */
    public static Kymograph ratio(Kymograph numerator, Kymograph denominator) {
        Checks.require(numerator.positionCount() == denominator.positionCount()
                && numerator.frameCount() == denominator.frameCount(), "the two channels' kymographs differ in size");
        double[] a = numerator.values();
        double[] b = denominator.values();
        double[] r = new double[a.length];
        for (int i = 0; i < a.length; i++) {
            r[i] = b[i] > 0 ? a[i] / b[i] : Double.NaN;
        }
        return new Kymograph(numerator.distancesUm(), numerator.timesS(), r, "");
    }
}
