package org.dendrokin.core.calib;

import java.util.LinkedHashMap;
import java.util.Locale;
import java.util.Map;

import org.dendrokin.core.Checks;

/**
 * Calibration by monotone interpolation of a table of standards, for indicators that follow no binding
 * curve well. Replicates are averaged; the mean intensities must change strictly monotonically with
 * concentration. Concentration is interpolated as a function of intensity by the Fritsch-Carlson monotone
 * cubic ({@link MonotoneCubic}), so it never overshoots between standards (a natural or Akima spline can);
 * intensities outside the range of the table give NaN: the table is never extrapolated. No uncertainty is
 * propagated ({@link #concentrationSdMicromolar} is NaN: unknown).
 */
public final class MonotoneTable implements Calibration {
    private final double[] levelsMicromolar;
    private final double[] meanIntensities;
    private final MonotoneCubic inverse;
    private final boolean rising;

    /**
     * @param levelsMicromolar distinct concentrations, uM, strictly increasing, at least 2. Not modified.
     * @param meanIntensities  intensity at each, strictly increasing or strictly decreasing. Not modified.
     * @throws IllegalArgumentException naming the first pair of standards that breaks monotonicity
     */
    public MonotoneTable(double[] levelsMicromolar, double[] meanIntensities) {
        int n = levelsMicromolar.length;
        Checks.require(n >= 2, "monotone interpolation needs standards at 2 or more different concentrations, got "
                + n);
        Checks.sameLength(n, meanIntensities);
        for (int i = 1; i < n; i++) {
            Checks.require(levelsMicromolar[i] > levelsMicromolar[i - 1], "concentrations must increase");
        }
        this.rising = meanIntensities[n - 1] > meanIntensities[0];
        for (int i = 1; i < n; i++) {
            boolean ok = rising ? meanIntensities[i] > meanIntensities[i - 1]
                    : meanIntensities[i] < meanIntensities[i - 1];
            Checks.require(ok, String.format(Locale.ROOT, "the standards are not monotone: the mean intensity at "
                    + "%s uM (%s) does not %s that at %s uM (%s), so monotone interpolation cannot be used",
                    Format.number(levelsMicromolar[i]), Format.number(meanIntensities[i]),
                    rising ? "exceed" : "fall below", Format.number(levelsMicromolar[i - 1]),
                    Format.number(meanIntensities[i - 1])));
        }
        this.levelsMicromolar = levelsMicromolar.clone();
        this.meanIntensities = meanIntensities.clone();
        double[] f = new double[n];
        double[] c = new double[n];
        for (int i = 0; i < n; i++) {
            int k = rising ? i : n - 1 - i;
            f[i] = meanIntensities[k];
            c[i] = levelsMicromolar[k];
        }
        this.inverse = new MonotoneCubic(f, c);
    }

    /** From a table with replicates: averages each concentration's intensities first. */
    public static MonotoneTable of(Standards standards) {
        return new MonotoneTable(standards.distinctConcentrations(), standards.meanIntensities());
    }

    public double[] levelsMicromolar() {
        return levelsMicromolar.clone();
    }

    public double[] meanIntensities() {
        return meanIntensities.clone();
    }

    @Override
    public String method() {
        return "standards";
    }

    @Override
    public SignalKind input() {
        return SignalKind.INTENSITY;
    }

    @Override
    public double concentrationMicromolar(double signal) {
        double s = saturation(signal);
        if (!(s > 0 && s < 1)) {
            return Double.NaN;
        }
        return inverse.value(signal);
    }

    /** The intensity the table gives for a concentration inside its range, by bisection on the interpolant. */
    @Override
    public double signal(double concentrationMicromolar) {
        double cLo = levelsMicromolar[0];
        double cHi = levelsMicromolar[levelsMicromolar.length - 1];
        if (!(concentrationMicromolar >= cLo && concentrationMicromolar <= cHi)) {
            return Double.NaN;
        }
        double lo = inverse.first();
        double hi = inverse.last();
        for (int i = 0; i < 200 && hi > lo; i++) {
            double mid = 0.5 * (lo + hi);
            if (mid == lo || mid == hi) {
                break;
            }
            double c = inverse.value(mid);
            if ((c < concentrationMicromolar) == rising) {
                lo = mid;
            } else {
                hi = mid;
            }
        }
        double cLoF = inverse.value(lo);
        double cHiF = inverse.value(hi);
        return Math.abs(cLoF - concentrationMicromolar) <= Math.abs(cHiF - concentrationMicromolar) ? lo : hi;
    }

    @Override
    public double derivative(double signal) {
        return Double.isNaN(concentrationMicromolar(signal)) ? Double.NaN : inverse.derivative(signal);
    }

    @Override
    public double saturation(double signal) {
        return (signal - rangeStart()) / (rangeEnd() - rangeStart());
    }

    @Override
    public double concentrationSdMicromolar(double signal) {
        return Double.NaN;
    }

    @Override
    public double rangeStart() {
        return meanIntensities[0];
    }

    @Override
    public double rangeEnd() {
        return meanIntensities[meanIntensities.length - 1];
    }

    @Override
    public String[] rangeNames() {
        return new String[] {"the intensity of the lowest standard", "the intensity of the highest standard"};
    }

    @Override
    public double hillCoefficient() {
        return Double.NaN;
    }

    @Override
    public Map<String, Double> constants() {
        Map<String, Double> m = new LinkedHashMap<>();
        m.put("lowest_standard_uM", levelsMicromolar[0]);
        m.put("highest_standard_uM", levelsMicromolar[levelsMicromolar.length - 1]);
        m.put("intensity_at_lowest", rangeStart());
        m.put("intensity_at_highest", rangeEnd());
        m.put("levels", (double) levelsMicromolar.length);
        return m;
    }

    @Override
    public String description() {
        return String.format(Locale.ROOT, "standards calibration by monotone (Fritsch-Carlson) interpolation of "
                + "%d concentrations from %s to %s uM; intensities outside %s to %s give no concentration",
                levelsMicromolar.length, Format.number(levelsMicromolar[0]),
                Format.number(levelsMicromolar[levelsMicromolar.length - 1]), Format.number(rangeStart()),
                Format.number(rangeEnd()));
    }
}
