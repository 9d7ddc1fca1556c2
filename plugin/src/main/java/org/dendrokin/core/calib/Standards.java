package org.dendrokin.core.calib;

import java.util.Arrays;

import org.dendrokin.core.Checks;

/**
 * A table of standards: known concentrations (uM) and the background-subtracted intensity measured for
 * each on the same setup. Replicates (equal concentrations) are allowed. Immutable; arrays are copied.
 */
public final class Standards {
    private final double[] concentrationsMicromolar;
    private final double[] intensities;

    /**
     * @param concentrationsMicromolar concentration of each standard, uM, finite and &gt;= 0. Not modified.
     * @param intensities              intensity of each standard, finite. Not modified.
     */
    public Standards(double[] concentrationsMicromolar, double[] intensities) {
        Checks.require(concentrationsMicromolar.length == intensities.length,
                "the standards have " + concentrationsMicromolar.length + " concentrations but "
                        + intensities.length + " intensities");
        for (int i = 0; i < intensities.length; i++) {
            Checks.require(Double.isFinite(concentrationsMicromolar[i]) && concentrationsMicromolar[i] >= 0,
                    "standard " + (i + 1) + " has concentration " + concentrationsMicromolar[i]
                            + "; concentrations must be zero or positive");
            Checks.finite(intensities[i], "the intensity of standard " + (i + 1));
        }
        this.concentrationsMicromolar = concentrationsMicromolar.clone();
        this.intensities = intensities.clone();
    }

    public int size() {
        return intensities.length;
    }

    public double concentrationMicromolar(int i) {
        return concentrationsMicromolar[i];
    }

    public double intensity(int i) {
        return intensities[i];
    }

    public double[] concentrationsMicromolar() {
        return concentrationsMicromolar.clone();
    }

    public double[] intensities() {
        return intensities.clone();
    }

    /** The different concentrations, ascending. */
    public double[] distinctConcentrations() {
        return Arrays.stream(concentrationsMicromolar).distinct().sorted().toArray();
    }

    /** Mean intensity at each of {@link #distinctConcentrations()}, in the same order. */
    public double[] meanIntensities() {
        double[] levels = distinctConcentrations();
        double[] sum = new double[levels.length];
        int[] count = new int[levels.length];
        for (int i = 0; i < size(); i++) {
            int k = Arrays.binarySearch(levels, concentrationsMicromolar[i]);
            sum[k] += intensities[i];
            count[k]++;
        }
        for (int k = 0; k < levels.length; k++) {
            sum[k] /= count[k];
        }
        return sum;
    }
}
