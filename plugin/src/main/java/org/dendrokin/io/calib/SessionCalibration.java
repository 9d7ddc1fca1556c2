package org.dendrokin.io.calib;

import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Locale;
import java.util.Map;

import org.dendrokin.core.calib.Calibration;
import org.dendrokin.core.calib.CalibrationSummary;
import org.dendrokin.core.calib.Calibrator;
import org.dendrokin.core.calib.SampleStatus;
import org.dendrokin.core.calib.SaturationLimits;
import org.dendrokin.core.calib.SignalKind;
import org.dendrokin.core.kymo.Kymograph;
import org.dendrokin.core.preprocess.Robust;
import org.dendrokin.io.InputException;
import org.dendrokin.io.text.Numbers;

import com.google.gson.JsonArray;
import com.google.gson.JsonNull;
import com.google.gson.JsonObject;
import com.google.gson.JsonPrimitive;

/**
 * Applies a session's calibration to its corrected kymographs: picks the signal the method needs
 * (intensity, two-channel ratio or dF/F0), calibrates every sample with the saturation limits, and writes
 * the {@code calibration} object of results.json and the report's sentence. Used by the analyze pipeline.
 */
public final class SessionCalibration {
    /** The per-sample SD of the concentration, same layout as kymograph.csv, written when an SD was propagated. */
    public static final String SD_CSV = "concentration_sd.csv";

    private SessionCalibration() {
    }

    /** An array of one value per frame. */
    public static double[] constant(double value, int frames) {
        double[] out = new double[frames];
        Arrays.fill(out, value);
        return out;
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
     * The calibrated signal.
     *
     * @param signal       the analysed kymograph (uM, or dF/F0 for {@code none})
     * @param sdMicromolar per-sample SD from the calibration's own uncertainty (uM), or null for {@code none}
     * @param summary      counts of flagged and NaN samples, or null for {@code none}
     * @param noiseSd      robust SD of the analysed signal over the baseline frames, in its unit
     * @param warnings     plain sentences (flags and NaN counts with their thresholds)
     */
    public record Applied(Kymograph signal, Kymograph sdMicromolar, CalibrationSummary summary, double noiseSd,
                          List<String> warnings) {
        public Applied {
            warnings = List.copyOf(warnings);
        }
    }

    /**
     * Checks, before any work, that the movie can feed the method: the ratio method needs two channels.
     *
     * @param setup        the parsed calibration
     * @param sessionFile  session.json, named in the message
     * @param movieFile    the movie, named in the message
     * @param channelCount channels in the movie
     */
    public static void requireChannels(CalibrationSetup setup, Path sessionFile, Path movieFile, int channelCount) {
        if (setup.channels() == null) {
            return;
        }
        int need = Math.max(setup.channels().numerator(), setup.channels().denominator());
        if (channelCount < need) {
            throw new InputException(sessionFile, String.format(Locale.ROOT, "key \"calibration.method\" is \"ratio\", "
                    + "which needs a movie with %d channels (numerator channel %d over denominator channel %d), but "
                    + "%s has %d channel%s", need, setup.channels().numerator(), setup.channels().denominator(),
                    movieFile.getFileName(), channelCount, channelCount == 1 ? "" : "s"));
        }
    }

    /**
     * @param setup         the parsed calibration
     * @param intensity     background-subtracted, bleach-corrected intensity (for intensity methods)
     * @param deltaF        dF/F0 (for {@code dynamic-range} and {@code none})
     * @param ratio         numerator over denominator, both background subtracted (ratio method), or null
     * @param baselineFirst first baseline frame, inclusive, for the noise level
     * @param baselineLast  last baseline frame, inclusive
     */
    public static Applied apply(CalibrationSetup setup, Kymograph intensity, Kymograph deltaF, Kymograph ratio,
                                int baselineFirst, int baselineLast) {
        Calibration cal = setup.calibration();
        if (!setup.calibrates()) {
            return new Applied(deltaF, null, null, baselineNoise(deltaF, baselineFirst, baselineLast), List.of());
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
        Calibrator.CalibratedKymograph out = Calibrator.apply(cal, setup.limits(), input);
        List<String> warnings = new ArrayList<>(out.summary().warnings(cal));
        if (cal.input() == SignalKind.INTENSITY) {
            long kept = out.summary().count(SampleStatus.VALID) + out.summary().count(SampleStatus.FLAGGED);
            if (kept == 0 && out.summary().finiteInputs() > 0) {
                warnings.add(String.format(Locale.ROOT, "No sample of the kymograph lies inside the calibration's "
                        + "range (%s to %s); check that the calibration's intensities were measured in the same band, "
                        + "after the same background subtraction, on the same setup.",
                        Numbers.forPeople(cal.rangeStart()), Numbers.forPeople(cal.rangeEnd())));
            }
        }
        return new Applied(out.values(), out.sdMicromolar(), out.summary(),
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

    /**
     * The {@code calibration} object of results.json: method, description, constants, source file, the limits
     * with their reason, counts and fractions of flagged and NaN samples, and whether an uncertainty was
     * propagated (the per-sample SD then goes to {@code concentration_sd.csv}).
     */
    public static JsonObject toJson(CalibrationSetup setup, Applied applied) {
        Calibration cal = setup.calibration();
        JsonObject o = new JsonObject();
        o.addProperty("method", cal.method());
        o.addProperty("description", cal.description());
        o.addProperty("signal_in", switch (cal.input()) {
            case INTENSITY -> "background-subtracted intensity";
            case RATIO -> "ratio of background-subtracted channels";
            case DF_F0 -> "dF/F0";
        });
        o.addProperty("unit", cal.outputUnit().symbol());
        JsonObject constants = new JsonObject();
        for (Map.Entry<String, Double> e : cal.constants().entrySet()) {
            double v = e.getValue();
            constants.add(e.getKey(), Double.isFinite(v) ? new JsonPrimitive(v) : JsonNull.INSTANCE);
        }
        o.add("constants", constants);
        o.add("source_file", setup.sourceFile() == null ? JsonNull.INSTANCE : new JsonPrimitive(setup.sourceFile()));
        if (setup.channels() != null) {
            JsonObject ch = new JsonObject();
            ch.addProperty("numerator_channel", setup.channels().numerator());
            ch.addProperty("denominator_channel", setup.channels().denominator());
            o.add("channels", ch);
        }
        if (applied.summary() != null) {
            CalibrationSummary s = applied.summary();
            SaturationLimits l = s.limits();
            JsonObject t = new JsonObject();
            t.addProperty("flag_saturation_above", l.flagAbove());
            t.addProperty("reject_saturation_above", l.rejectAbove());
            t.addProperty("why", "fractional saturation f of the indicator's range; the error amplification "
                    + "d ln c / d ln F is at least 1 / (n (1 - f)): 5 at f = 0.8 and 20 at f = 0.95 for n = 1");
            o.add("thresholds", t);
            JsonObject counts = new JsonObject();
            counts.addProperty("samples_with_signal", s.finiteInputs());
            counts.addProperty("flagged", s.count(SampleStatus.FLAGGED));
            counts.addProperty("nan_near_saturation", s.count(SampleStatus.REJECTED));
            counts.addProperty("nan_at_or_above_saturation", s.count(SampleStatus.ABOVE_RANGE));
            counts.addProperty("nan_at_or_below_zero", s.count(SampleStatus.BELOW_RANGE));
            o.add("counts", counts);
            o.addProperty("fraction_flagged", s.fractionFlagged());
            o.addProperty("fraction_nan", s.fractionNan());
            o.addProperty("uncertainty_propagated", propagated(applied));
        }
        JsonArray w = new JsonArray();
        applied.warnings().forEach(w::add);
        o.add("warnings", w);
        return o;
    }

    /** True when some sample got a positive SD from the calibration's own uncertainty. */
    public static boolean propagated(Applied applied) {
        if (applied.sdMicromolar() == null) {
            return false;
        }
        for (double v : applied.sdMicromolar().values()) {
            if (v > 0) {
                return true;
            }
        }
        return false;
    }

    /** One sentence for the report: the method, its constants, and what was flagged. */
    public static String sentence(CalibrationSetup setup, Applied applied) {
        Calibration cal = setup.calibration();
        StringBuilder b = new StringBuilder(capitalise(cal.description()));
        if (setup.sourceFile() != null) {
            b.append(" (from ").append(setup.sourceFile()).append(')');
        }
        b.append('.');
        if (applied.summary() != null) {
            CalibrationSummary s = applied.summary();
            b.append(String.format(Locale.ROOT, " Samples above %s of the indicator's range are flagged (%s of the "
                    + "samples) and above %s set to NaN; %s of the samples have no concentration in all.",
                    pct(s.limits().flagAbove()), pct(s.fractionFlagged()), pct(s.limits().rejectAbove()),
                    pct(s.fractionNan())));
            b.append(propagated(applied)
                    ? " The calibration's own uncertainty was propagated to a per-sample SD (concentration_sd.csv)."
                    : " No uncertainty of the calibration constants was given, so none was propagated.");
        }
        return b.toString();
    }

    private static String pct(double f) {
        return String.format(Locale.ROOT, "%.1f%%", 100 * f);
    }

    private static String capitalise(String s) {
        return s.isEmpty() ? s : Character.toUpperCase(s.charAt(0)) + s.substring(1);
    }
}
