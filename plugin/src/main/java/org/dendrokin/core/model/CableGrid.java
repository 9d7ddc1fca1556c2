package org.dendrokin.core.model;

/**
 * The discrete Laplacian of a cable with varying cross-section, in flux-conservative (finite-volume) form.
 * With node areas A_i (um^2), face areas A_{i+1/2} taken from the profile at the face, and spacing h (um):
 * <pre>
 *   (L u)_i = [A_{i+1/2} (u_{i+1} - u_i) - A_{i-1/2} (u_i - u_{i-1})] / (V_i h),   V_i = A_i h w_i
 * </pre>
 * with w_i = 1 inside and 1/2 at a sealed (no-flux) end, whose control volume is half a cell and has no
 * outer face. Then sum_i V_i (L u)_i = 0 exactly (the differences telescope), so diffusion conserves the
 * amount sum_i V_i u_i. For a uniform area this is the usual 3-point Laplacian with mirror ends. At a fixed
 * end the row is zero, so the end value never changes. L is in 1/um^2; multiply by D (um^2/s).
 * <p>
 * With {@code compact} (uniform cross-section only) the time derivative is taken through the mass matrix
 * B = I + (h^2/12) d2 of the compact fourth-order scheme, B u_t = D L u: rows (1/12, 10/12, 1/12) inside,
 * (10/12, 2/12) at a sealed end (mirror symmetry), identity at a fixed end; the trapezoid weights satisfy
 * B^T w = w, so the amount is still conserved. Without it B = I.
 */
final class CableGrid {
    final int n;
    final double h;
    final double[] lower;
    final double[] diag;
    final double[] upper;
    /** Control volume of each node, um^3 (area x length share); amounts are sum volume x concentration. */
    final double[] volume;
    final boolean fixedEnds;
    /** Mass matrix B (tridiagonal); identity unless compact. */
    final double[] massLower;
    final double[] massDiag;
    final double[] massUpper;
    final boolean compact;

    CableGrid(Domain domain) {
        this(domain, 2);
    }

    /** @param order 2 or 4; 4 is honoured only for a uniform cross-section. */
    CableGrid(Domain domain, int order) {
        n = domain.nodeCount();
        h = domain.spacingUm();
        fixedEnds = domain.boundary() == Boundary.FIXED;
        lower = new double[n];
        diag = new double[n];
        upper = new double[n];
        volume = new double[n];
        CrossSection cs = domain.crossSection();
        double[] face = new double[n - 1];
        for (int i = 0; i < n - 1; i++) {
            face[i] = cs.areaUm2((i + 0.5) * h);
        }
        for (int i = 0; i < n; i++) {
            double share = (i == 0 || i == n - 1) ? 0.5 : 1.0;
            volume[i] = cs.areaUm2(i * h) * h * share;
        }
        for (int i = 0; i < n; i++) {
            if (fixedEnds && (i == 0 || i == n - 1)) {
                continue;
            }
            double scale = 1.0 / (volume[i] * h);
            if (i > 0) {
                lower[i] = face[i - 1] * scale;
            }
            if (i < n - 1) {
                upper[i] = face[i] * scale;
            }
            diag[i] = -(lower[i] + upper[i]);
        }
        compact = order == 4 && cs.isUniform() && n >= 3;
        massLower = new double[n];
        massDiag = new double[n];
        massUpper = new double[n];
        for (int i = 0; i < n; i++) {
            massDiag[i] = 1;
        }
        if (compact) {
            for (int i = 0; i < n; i++) {
                if (fixedEnds && (i == 0 || i == n - 1)) {
                    continue;
                }
                if (i == 0) {
                    massDiag[i] = 10.0 / 12;
                    massUpper[i] = 2.0 / 12;
                } else if (i == n - 1) {
                    massDiag[i] = 10.0 / 12;
                    massLower[i] = 2.0 / 12;
                } else {
                    massLower[i] = 1.0 / 12;
                    massDiag[i] = 10.0 / 12;
                    massUpper[i] = 1.0 / 12;
                }
            }
        }
    }

    /** out = B u. Allocation-free. */
    void applyMass(double[] u, double[] out) {
        int last = n - 1;
        out[0] = massDiag[0] * u[0] + massUpper[0] * u[1];
        for (int i = 1; i < last; i++) {
            out[i] = massLower[i] * u[i - 1] + massDiag[i] * u[i] + massUpper[i] * u[i + 1];
        }
        out[last] = massLower[last] * u[last - 1] + massDiag[last] * u[last];
    }

    double x(int i) {
        return i * h;
    }

    /** out = L u. Allocation-free. */
    void apply(double[] u, double[] out) {
        int last = n - 1;
        out[0] = diag[0] * u[0] + upper[0] * u[1];
        for (int i = 1; i < last; i++) {
            out[i] = lower[i] * u[i - 1] + diag[i] * u[i] + upper[i] * u[i + 1];
        }
        out[last] = lower[last] * u[last - 1] + diag[last] * u[last];
    }

    /** Amount of a concentration profile: sum of volume x value. */
    double amount(double[] u) {
        double s = 0;
        for (int i = 0; i < n; i++) {
            s += volume[i] * u[i];
        }
        return s;
    }
}
