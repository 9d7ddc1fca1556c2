package org.dendrokin.core.model;

import java.util.Objects;

import org.dendrokin.core.Checks;

/**
 * The 1D cable a model runs on: length, grid spacing, ends and cross-section. Nodes sit at
 * x_i = i * h, i = 0 .. n - 1, both ends included, with n = round(lengthUm / dxUm) + 1 and
 * h = lengthUm / (n - 1), so the grid always spans the whole length (h differs from dxUm only when dxUm
 * does not divide the length).
 *
 * @param lengthUm     cable length, um, positive
 * @param dxUm         requested grid spacing, um, positive, at most half the length
 * @param boundary     what happens at both ends
 * @param crossSection area along the cable; {@link CrossSection#UNIFORM} for a plain cable
 */
public record Domain(double lengthUm, double dxUm, Boundary boundary, CrossSection crossSection) {
    public Domain {
        Checks.positiveFinite(lengthUm, "domain length (um)");
        Checks.positiveFinite(dxUm, "grid spacing dx (um)");
        Checks.require(dxUm <= lengthUm / 2, "grid spacing dx (" + dxUm
                + " um) must be at most half the domain length (" + lengthUm + " um)");
        Objects.requireNonNull(boundary, "boundary");
        Objects.requireNonNull(crossSection, "crossSection");
        Checks.require(Math.round(lengthUm / dxUm) + 1 <= 10_000_000, "the grid has too many nodes (length / dx)");
    }

    /** A cable with a uniform cross-section. */
    public Domain(double lengthUm, double dxUm, Boundary boundary) {
        this(lengthUm, dxUm, boundary, CrossSection.UNIFORM);
    }

    /** Number of grid nodes, both ends included. */
    public int nodeCount() {
        return (int) Math.round(lengthUm / dxUm) + 1;
    }

    /** The spacing actually used, um: lengthUm / (nodeCount - 1). */
    public double spacingUm() {
        return lengthUm / (nodeCount() - 1);
    }

    /** Position of node i, um. */
    public double nodeUm(int i) {
        return i * spacingUm();
    }
}
