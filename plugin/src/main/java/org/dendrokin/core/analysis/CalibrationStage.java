package org.dendrokin.core.analysis;

import java.util.ArrayList;
import java.util.List;
import java.util.Locale;

import org.dendrokin.core.calib.Calibration;
import org.dendrokin.core.calib.CalibrationSummary;
import org.dendrokin.core.calib.Calibrator;
import org.dendrokin.core.calib.SampleStatus;
import org.dendrokin.core.calib.SignalKind;
import org.dendrokin.core.kymo.Kymograph;
import org.dendrokin.core.preprocess.Robust;

/**
 * Applies a session's calibration to its corrected kymographs: picks the signal the method needs (intensity,
 * two-channel ratio or dF/F0), calibrates every sample with the saturation limits, and measures the noise of
 * the result over the baseline frames.
 */
public final class CalibrationStage {
    private CalibrationStage() {
    }

    /**
     * The calibrated signal.
     *
     * @param signal       the analysed kymograph (uM, or dF/F0 for {@code none})
     * @param sdMicromolar per-sample SD from the calibration's own uncertainty (uM), or null for {@code none}
     * @param summary      counts of flagged and NaN samples, or null for {@code none}
     * @param noiseSd      robust SD of the analysed signal over the baseline frames, in its unit
     * @param warnings     plain sentences (flags and NaN counts with their thresholds)
     */
    public record Calibrated(Kymograph signal, Kymograph sdMicromolar, CalibrationSummary summary, double noiseSd,
                             List<String> warnings) {
        public Calibrated {
            warnings = List.copyOf(warnings);
        }

        /** True when some sample got a positive SD from the calibration's own uncertainty. */
        public boolean propagated() {
            if (sdMicromolar == null) {
                return false;
            }
            for (double v : sdMicromolar.values()) {
                if (v > 0) {
                    return true;
                }
            }
            return false;
        }
    }

    /**
     * The ratio kymograph for the ratio method: each channel minus its background of that frame, numerator
     * over denominator; NaN where the denominator is not positive.
     *
     * @param numerator   raw numerator-channel kymograph. Not modified.
     * @param numBg       numerator background per frame. Not modified.
     * @param denominator raw denominator-channel kymograph, same grid. Not modified.
     * @param denBg       denominator background per frame. Not modified.
     */
    public static Kymograph ratio(Kymograph numerator, double[] numBg, Kymograph denominator, double[] denBg) {
        return Calibrator.ratio(subtract(numerator, numBg), subtract(denominator, denBg));
    }

    private static Kymograph subtract(Kymograph k, double[] perFrame) {
        int nx = k.positionCount();
        double[] v = k.values();
        for (int f = 0; f < k.frameCount(); f++) {
            for (int p = 0; p < nx; p++) {
                v[f * nx + p] -= perFrame[f];
            }
        }
        return k.withValues(v, k.signalUnit());
    }

    /**
     * @param request       the calibration
     * @param intensity     background-subtracted, bleach-corrected intensity (for intensity methods)
     * @param deltaF        dF/F0 (for {@code dynamic-range} and {@code none})
     * @param ratio         numerator over denominator, both background subtracted (ratio method), or null
     * @param baselineFirst first baseline frame, inclusive, for the noise level
     * @param baselineLast  last baseline frame, inclusive
     */
    public static Calibrated apply(CalibrationRequest request, Kymograph intensity, Kymograph deltaF,
                                   Kymograph ratio, int baselineFirst, int baselineLast) {
        Calibration cal = request.calibration();
        if (!request.calibrates()) {
            return new Calibrated(deltaF, null, null, baselineNoise(deltaF, baselineFirst, baselineLast), List.of());
        }
        Kymograph input = switch (cal.input()) {
            case INTENSITY -> intensity;
            case DF_F0 -> deltaF;
            case RATIO -> {
                if (ratio == null) {
                    throw new IllegalStateException("the ratio method needs the ratio kymograph");
                }
                yield ratio;
            }
        };
        Calibrator.CalibratedKymograph out = Calibrator.apply(cal, request.limits(), input);
        List<String> warnings = new ArrayList<>(out.summary().warnings(cal));
        if (cal.input() == SignalKind.INTENSITY) {
            long kept = out.summary().count(SampleStatus.VALID) + out.summary().count(SampleStatus.FLAGGED);
            if (kept == 0 && out.summary().finiteInputs() > 0) {
                warnings.add(String.format(Locale.ROOT, "No sample of the kymograph lies inside the calibration's "
                        + "range (%s to %s); check that the calibration's intensities were measured in the same band, "
                        + "after the same background subtraction, on the same setup.",
                        fmt(cal.rangeStart()), fmt(cal.rangeEnd())));
            }
        }
        return new Calibrated(out.values(), out.sdMicromolar(), out.summary(),
                baselineNoise(out.values(), baselineFirst, baselineLast), warnings);
    }

    /** Median over positions of the robust (MAD) SD over the baseline frames; NaN when it cannot be measured. */
    static double baselineNoise(Kymograph k, int first, int last) {
        int nx = k.positionCount();
        List<Double> sds = new ArrayList<>();
        for (int p = 0; p < nx; p++) {
            double[] column = k.column(p);
            List<Double> finite = new ArrayList<>();
            for (int f = Math.max(0, first); f <= Math.min(last, column.length - 1); f++) {
                if (Double.isFinite(column[f])) {
                    finite.add(column[f]);
                }
            }
            if (finite.size() >= 3) {
                double sd = Robust.madSd(finite.stream().mapToDouble(Double::doubleValue).toArray());
                if (Double.isFinite(sd)) {
                    sds.add(sd);
                }
            }
        }
        return sds.isEmpty() ? Double.NaN : Robust.median(sds.stream().mapToDouble(Double::doubleValue).toArray());
    }

    private static String fmt(double v) {
        return String.format(Locale.ROOT, "%.6g", v);
    }
}
