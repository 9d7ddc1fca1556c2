package org.dendrokin.core.calib;

import java.util.ArrayList;
import java.util.EnumMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;

import org.dendrokin.core.Checks;

/**
 * How many samples of each {@link SampleStatus} a calibration produced, with the limits used; it writes the
 * warning sentences for results.json and the report. Summaries of parts (e.g. frames) add up with
 * {@link #plus}.
 */
public final class CalibrationSummary {
    private final EnumMap<SampleStatus, Long> counts;
    private final SaturationLimits limits;

    public CalibrationSummary(Map<SampleStatus, Long> counts, SaturationLimits limits) {
        this.counts = new EnumMap<>(SampleStatus.class);
        for (SampleStatus s : SampleStatus.values()) {
            long v = counts.getOrDefault(s, 0L);
            Checks.require(v >= 0, "counts must not be negative");
            this.counts.put(s, v);
        }
        this.limits = limits;
    }

    public long count(SampleStatus status) {
        return counts.get(status);
    }

    public SaturationLimits limits() {
        return limits;
    }

    /** Samples that had a finite input. */
    public long finiteInputs() {
        long total = 0;
        for (SampleStatus s : SampleStatus.values()) {
            if (s != SampleStatus.MISSING) {
                total += counts.get(s);
            }
        }
        return total;
    }

    /** Samples kept but flagged near saturation, over the samples with finite input (0 when there are none). */
    public double fractionFlagged() {
        return fraction(count(SampleStatus.FLAGGED));
    }

    /** Samples the calibration turned into NaN, over the samples with finite input. */
    public double fractionNan() {
        return fraction(count(SampleStatus.REJECTED) + count(SampleStatus.ABOVE_RANGE)
                + count(SampleStatus.BELOW_RANGE));
    }

    private double fraction(long part) {
        long n = finiteInputs();
        return n == 0 ? 0 : (double) part / n;
    }

    /** The sum of two summaries made with the same limits. */
    public CalibrationSummary plus(CalibrationSummary other) {
        Checks.require(limits.equals(other.limits), "summaries made with different limits cannot be added");
        EnumMap<SampleStatus, Long> sum = new EnumMap<>(SampleStatus.class);
        for (SampleStatus s : SampleStatus.values()) {
            sum.put(s, count(s) + other.count(s));
        }
        return new CalibrationSummary(sum, limits);
    }

    /** Plain sentences about the samples that were set to NaN or flagged; empty when there were none. */
    public List<String> warnings(Calibration calibration) {
        List<String> out = new ArrayList<>();
        if (calibration instanceof NoCalibration) {
            return out;
        }
        long n = finiteInputs();
        if (!calibration.saturates()) {
            long lost = count(SampleStatus.ABOVE_RANGE) + count(SampleStatus.BELOW_RANGE);
            if (lost > 0) {
                out.add(String.format(Locale.ROOT, "%d of %d samples (%s) lie where the %s method's formula gives no "
                        + "finite value and were set to NaN.", lost, n, Format.percent((double) lost / n),
                        calibration.method()));
            }
            return out;
        }
        String[] names = calibration.rangeNames();
        long above = count(SampleStatus.ABOVE_RANGE);
        if (above > 0) {
            out.add(String.format(Locale.ROOT, "%d of %d samples (%s) were at or beyond %s (%s) and were set to "
                    + "NaN: no finite concentration corresponds to them (saturated indicator, or noise, background "
                    + "or bleaching error pushing the signal past the calibration).", above, n,
                    Format.percent((double) above / n), names[1], Format.number(calibration.rangeEnd())));
        }
        long below = count(SampleStatus.BELOW_RANGE);
        if (below > 0) {
            out.add(String.format(Locale.ROOT, "%d of %d samples (%s) were at or below %s (%s) and were set to "
                    + "NaN: the calibration gives no positive concentration there (often noise or an "
                    + "over-estimated background).", below, n, Format.percent((double) below / n), names[0],
                    Format.number(calibration.rangeStart())));
        }
        long rejected = count(SampleStatus.REJECTED);
        if (rejected > 0) {
            out.add(String.format(Locale.ROOT, "%d of %d samples (%s) were above %s of the indicator's range "
                    + "(fractional saturation f > %s) and were set to NaN: there %s.", rejected, n,
                    Format.percent((double) rejected / n), Format.percent(limits.rejectAbove()),
                    Format.number(limits.rejectAbove()), amplification(calibration, limits.rejectAbove())));
        }
        long flagged = count(SampleStatus.FLAGGED);
        if (flagged > 0) {
            out.add(String.format(Locale.ROOT, "%d of %d samples (%s) lie above %s of the indicator's range "
                    + "(fractional saturation f > %s); they are kept but flagged, because there %s.", flagged, n,
                    Format.percent((double) flagged / n), Format.percent(limits.flagAbove()),
                    Format.number(limits.flagAbove()), amplification(calibration, limits.flagAbove())));
        }
        return out;
    }

    private static String amplification(Calibration calibration, double f) {
        double n = calibration.hillCoefficient();
        if (!(n > 0) || f >= 1) {
            return "a small error in the signal becomes a large error in concentration";
        }
        double factor = 1 / (n * (1 - f));
        return String.format(Locale.ROOT, "a 1%% error in the signal becomes an error of at least %s%% in "
                + "concentration (1 / (n (1 - f)) with n = %s)", Format.number(Math.round(factor * 10) / 10.0),
                Format.number(n));
    }
}
