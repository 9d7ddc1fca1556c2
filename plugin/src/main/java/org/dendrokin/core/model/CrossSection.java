package org.dendrokin.core.model;

import java.util.Arrays;

import org.dendrokin.core.Checks;

/**
 * Cross-section area along the cable, as a piecewise-linear table of (position um, area um^2); constant
 * beyond the first and last entry. Immutable. The uniform profile (area 1 um^2 everywhere) gives the plain
 * cable equation; a varying one makes thin and thick segments, or spine-dense stretches that add volume.
 */
public final class CrossSection {
    /** Area 1 um^2 everywhere. */
    public static final CrossSection UNIFORM = new CrossSection(new double[] {0}, new double[] {1});

    private final double[] positionsUm;
    private final double[] areasUm2;

    private CrossSection(double[] positionsUm, double[] areasUm2) {
        this.positionsUm = positionsUm;
        this.areasUm2 = areasUm2;
    }

    /**
     * @param positionsUm positions along the cable, um, strictly increasing, at least one
     * @param areasUm2    cross-section area at each position, um^2, positive
     */
    public static CrossSection of(double[] positionsUm, double[] areasUm2) {
        Checks.require(positionsUm.length >= 1, "a cross-section profile needs at least one point");
        Checks.require(positionsUm.length == areasUm2.length,
                "a cross-section profile needs as many areas as positions");
        for (int i = 0; i < positionsUm.length; i++) {
            Checks.finite(positionsUm[i], "cross-section position");
            Checks.positiveFinite(areasUm2[i], "cross-section area (um^2)");
            Checks.require(i == 0 || positionsUm[i] > positionsUm[i - 1],
                    "cross-section positions must increase");
        }
        return new CrossSection(positionsUm.clone(), areasUm2.clone());
    }

    /** True for a profile with one value everywhere. */
    public boolean isUniform() {
        for (double a : areasUm2) {
            if (a != areasUm2[0]) {
                return false;
            }
        }
        return true;
    }

    /** Area at a position, um^2 (linear interpolation, constant outside the table). */
    public double areaUm2(double xUm) {
        int n = positionsUm.length;
        if (xUm <= positionsUm[0]) {
            return areasUm2[0];
        }
        if (xUm >= positionsUm[n - 1]) {
            return areasUm2[n - 1];
        }
        int i = Arrays.binarySearch(positionsUm, xUm);
        if (i >= 0) {
            return areasUm2[i];
        }
        int hi = -i - 1;
        int lo = hi - 1;
        double w = (xUm - positionsUm[lo]) / (positionsUm[hi] - positionsUm[lo]);
        return areasUm2[lo] * (1 - w) + areasUm2[hi] * w;
    }

    public double[] positionsUm() {
        return positionsUm.clone();
    }

    public double[] areasUm2() {
        return areasUm2.clone();
    }
}
