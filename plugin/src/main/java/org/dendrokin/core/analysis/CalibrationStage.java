package org.dendrokin.core.analysis;

import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.function.Function;

import org.dendrokin.core.Checks;
import org.dendrokin.core.calib.Calibration;
import org.dendrokin.core.calib.CalibrationSummary;
import org.dendrokin.core.calib.Calibrator;
import org.dendrokin.core.calib.LifetimePrecision;
import org.dendrokin.core.calib.SampleStatus;
import org.dendrokin.core.calib.SignalKind;
import org.dendrokin.core.kymo.FrameSource;
import org.dendrokin.core.kymo.Kymograph;
import org.dendrokin.core.kymo.PhotonWeighting;
import org.dendrokin.core.preprocess.Robust;
import org.dendrokin.core.units.Unit;

/**
 * Applies a session's calibration to its corrected kymographs: picks the signal the method needs (intensity,
 * two-channel ratio, the ratio over its baseline, dF/F0 or a mean lifetime), calibrates every sample with the
 * saturation limits, and measures the noise of the result over the baseline frames.
 */
public final class CalibrationStage {
    private CalibrationStage() {
    }

    /**
     * The calibrated signal.
     *
     * @param signal       the analysed kymograph (uM; dF/F0 for {@code none}; R/R0 or dR/R0 for {@code ratio-change};
     *                     ns or the fraction bound for {@code lifetime})
     * @param sdMicromolar per-sample SD in the signal's unit, from the calibration's own uncertainty (and, for a
     *                     lifetime, its photon-limited precision), or null for {@code none}
     * @param summary      counts of flagged and NaN samples, or null for the methods without a saturated end
     *                     ({@code none}, {@code ratio-change}, {@code lifetime})
     * @param noiseSd      robust SD of the analysed signal over the baseline frames, in its unit
     * @param warnings     plain sentences (flags and NaN counts with their thresholds)
     */
    public record Calibrated(Kymograph signal, Kymograph sdMicromolar, CalibrationSummary summary, double noiseSd,
                             List<String> warnings) {
        public Calibrated {
            warnings = List.copyOf(warnings);
        }

        /** True when some sample got a positive SD from the calibration's uncertainty (or a lifetime's precision). */
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
     * The mean lifetime along the path, with the photons behind each sample.
     *
     * @param lifetimeNs mean lifetime of each sample, ns (photon-weighted across the band when photons were given)
     * @param photons    photons collected for each sample (band-mean count per pixel times
     *                   {@link PhotonWeighting#pixelsPerSample}), or null when no photon counts were given
     * @param warnings   plain sentences (equal weights, samples without photons)
     */
    public record Lifetime(Kymograph lifetimeNs, Kymograph photons, List<String> warnings) {
        public Lifetime {
            Checks.require(lifetimeNs != null, "a lifetime kymograph is needed");
            warnings = List.copyOf(warnings);
        }
    }

    /**
     * Extracts the lifetime signal: with photon counts, the photon-weighted mean lifetime across the band,
     * tau = sum c_i N_i tau_i / sum c_i N_i ({@link PhotonWeighting}), and the photons of each sample; without
     * them, the plain band average of the lifetimes, with a warning.
     *
     * @param request         the lifetime (and photon) movies
     * @param extractor       the session's band average: a movie to its kymograph along the path (fixed, or moved
     *                        with the measured motion), the same for every movie of the session
     * @param pixelsPerSample pixels behind one sample, {@link PhotonWeighting#pixelsPerSample}
     */
    public static Lifetime lifetime(LifetimeRequest request, Function<FrameSource, Kymograph> extractor,
                                    double pixelsPerSample) {
        Checks.positiveFinite(pixelsPerSample, "pixels per sample");
        List<String> warnings = new ArrayList<>();
        if (request.photons() == null) {
            warnings.add("No photon counts were given, so the lifetime was averaged across the band with equal "
                    + "weights (dim pixels count as much as bright ones) and its photon-limited precision is not "
                    + "known; give \"photons\" or \"photon_channel\" in the calibration block.");
            Kymograph tau = extractor.apply(request.lifetimeNs());
            return new Lifetime(tau.withValues(tau.values(), Unit.NANOSECOND.symbol()), null, warnings);
        }
        PhotonWeighting.Weighted w = PhotonWeighting.extract(request.lifetimeNs(), request.photons(), extractor,
                Unit.NANOSECOND.symbol());
        double[] photons = w.meanWeight().values();
        long dark = 0;
        long finite = 0;
        for (int i = 0; i < photons.length; i++) {
            if (Double.isFinite(photons[i])) {
                finite++;
                if (!(photons[i] > 0)) {
                    dark++;
                }
            }
            photons[i] *= pixelsPerSample;
        }
        if (dark > 0) {
            warnings.add(String.format(Locale.ROOT, "%d of %d samples had no photons across the band, so their "
                    + "lifetime is undefined (left empty).", dark, finite));
        }
        return new Lifetime(w.mean(), w.meanWeight().withValues(photons, "photons"), warnings);
    }

    /**
     * The lifetime signal of a session that samples its path once a pixel, or null when the calibration reads no
     * lifetime movie: {@link #lifetime(LifetimeRequest, Function, double)} with the pixels per sample of a band
     * {@code bandWidthUm} wide.
     *
     * @param request     the calibration; its {@link CalibrationRequest#lifetime()} may be null
     * @param extractor   the session's band average (see {@link #lifetime(LifetimeRequest, Function, double)})
     * @param bandWidthUm width of the band averaged across the path, um
     * @param pixelSizeUm pixel size, um, which is also the step along the path
     */
    public static Lifetime lifetime(CalibrationRequest request, Function<FrameSource, Kymograph> extractor,
                                    double bandWidthUm, double pixelSizeUm) {
        if (request.lifetime() == null) {
            return null;
        }
        return lifetime(request.lifetime(), extractor, PhotonWeighting.pixelsPerSample(bandWidthUm, pixelSizeUm,
                pixelSizeUm));
    }

    /**
     * The ratio over its baseline, R/R0, with R0 the median of R over the baseline frames at each position (the
     * finite values among them). A position whose R0 is missing or not positive is NaN in every frame.
     *
     * @param ratio R, numerator over denominator, both background subtracted. Not modified.
     * @param first first baseline frame, inclusive
     * @param last  last baseline frame, inclusive
     * @return R/R0 (unit "R/R0") and the number of positions without a usable R0
     */
    static RelativeRatio overBaseline(Kymograph ratio, int first, int last) {
        int nx = ratio.positionCount();
        int nt = ratio.frameCount();
        int lo = Math.max(0, first);
        int hi = Math.min(nt - 1, last);
        double[] v = ratio.values();
        double[] base = new double[Math.max(0, hi - lo + 1)];
        int unusable = 0;
        for (int p = 0; p < nx; p++) {
            for (int f = lo; f <= hi; f++) {
                base[f - lo] = v[f * nx + p];
            }
            double r0 = base.length == 0 ? Double.NaN : Robust.median(base);
            if (!(r0 > 0)) {
                unusable++;
            }
            for (int f = 0; f < nt; f++) {
                v[f * nx + p] = r0 > 0 ? v[f * nx + p] / r0 : Double.NaN;
            }
        }
        return new RelativeRatio(ratio.withValues(v, Unit.R_OVER_R0.symbol()), unusable);
    }

    record RelativeRatio(Kymograph ratioOverBaseline, int positionsWithoutBaseline) {
    }

    /**
     * @param request       the calibration
     * @param intensity     background-subtracted, bleach-corrected intensity (for intensity methods)
     * @param deltaF        dF/F0 (for {@code dynamic-range} and {@code none})
     * @param ratio         numerator over denominator, both background subtracted (ratio and ratio-change methods),
     *                      or null
     * @param baselineFirst first baseline frame, inclusive, for the noise level (and R0)
     * @param baselineLast  last baseline frame, inclusive
     */
    public static Calibrated apply(CalibrationRequest request, Kymograph intensity, Kymograph deltaF,
                                   Kymograph ratio, int baselineFirst, int baselineLast) {
        return apply(request, intensity, deltaF, ratio, null, baselineFirst, baselineLast);
    }

    /**
     * As {@link #apply(CalibrationRequest, Kymograph, Kymograph, Kymograph, int, int)}, with the lifetime signal
     * for the lifetime method. A lifetime's photon-limited SD (tau / sqrt(N), {@link LifetimePrecision}) is
     * propagated with the uncertainty of the reference lifetimes into the per-sample SD.
     *
     * @param lifetime the lifetime along the path ({@link #lifetime}), or null
     * @throws AnalysisInputException when the lifetime method is asked for and no lifetime signal was given
     */
    public static Calibrated apply(CalibrationRequest request, Kymograph intensity, Kymograph deltaF,
                                   Kymograph ratio, Lifetime lifetime, int baselineFirst, int baselineLast) {
        Calibration cal = request.calibration();
        if (!request.calibrates()) {
            return new Calibrated(deltaF, null, null, baselineNoise(deltaF, baselineFirst, baselineLast), List.of());
        }
        List<String> warnings = new ArrayList<>();
        Kymograph signalSd = null;
        Kymograph input = switch (cal.input()) {
            case INTENSITY -> intensity;
            case DF_F0 -> deltaF;
            case RATIO -> requireRatio(ratio, cal);
            case RATIO_OVER_BASELINE -> {
                RelativeRatio r = overBaseline(requireRatio(ratio, cal), baselineFirst, baselineLast);
                if (r.positionsWithoutBaseline() > 0) {
                    warnings.add(String.format(Locale.ROOT, "At %d of %d positions the ratio had no positive "
                            + "median over the baseline frames %d to %d, so R/R0 is undefined there (left empty).",
                            r.positionsWithoutBaseline(), ratio.positionCount(), baselineFirst, baselineLast));
                }
                yield r.ratioOverBaseline();
            }
            case LIFETIME -> {
                if (lifetime == null) {
                    throw new AnalysisInputException(AnalysisInputException.Subject.SETTINGS, "the lifetime method "
                            + "needs the lifetime movie, which was not read");
                }
                warnings.addAll(lifetime.warnings());
                signalSd = lifetime.photons() == null ? null : photonSd(lifetime);
                yield lifetime.lifetimeNs();
            }
        };
        Calibrator.CalibratedKymograph out = Calibrator.apply(cal, request.limits(), input, signalSd);
        warnings.addAll(out.summary().warnings(cal));
        if (cal.input() == SignalKind.INTENSITY) {
            long kept = out.summary().count(SampleStatus.VALID) + out.summary().count(SampleStatus.FLAGGED);
            if (kept == 0 && out.summary().finiteInputs() > 0) {
                warnings.add(String.format(Locale.ROOT, "No sample of the kymograph lies inside the calibration's "
                        + "range (%s to %s); check that the calibration's intensities were measured in the same band, "
                        + "after the same background subtraction, on the same setup.",
                        fmt(cal.rangeStart()), fmt(cal.rangeEnd())));
            }
        }
        return new Calibrated(out.values(), out.sdMicromolar(), cal.saturates() ? out.summary() : null,
                baselineNoise(out.values(), baselineFirst, baselineLast), warnings);
    }

    private static Kymograph requireRatio(Kymograph ratio, Calibration cal) {
        if (ratio == null) {
            throw new IllegalStateException("the " + cal.method() + " method needs the ratio kymograph");
        }
        return ratio;
    }

    /** tau / sqrt(N) at every sample, ns. */
    private static Kymograph photonSd(Lifetime lifetime) {
        double[] tau = lifetime.lifetimeNs().values();
        double[] n = lifetime.photons().values();
        double[] sd = new double[tau.length];
        for (int i = 0; i < tau.length; i++) {
            sd[i] = LifetimePrecision.sdNs(tau[i], n[i]);
        }
        return lifetime.lifetimeNs().withValues(sd, Unit.NANOSECOND.symbol());
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
