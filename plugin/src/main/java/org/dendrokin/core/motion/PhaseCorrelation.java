package org.dendrokin.core.motion;

import java.util.Arrays;

import org.apache.commons.math3.util.KthSelector;

/**
 * Sub-pixel translation of a tile against a fixed reference tile by phase correlation (Kuglin and Hines 1975,
 * Proc. IEEE Int. Conf. on Cybernetics and Society, 163-165), with a Gaussian weighting of the spectrum and a
 * three-point Gaussian fit to the peak.
 *
 * <p>Each tile f (and the reference g) is apodised: its median (over every seventh pixel) is subtracted and the result
 * multiplied by the weights w (a taper to zero at the tile's edges, so that the edges of the tile are not taken for
 * image structure). The median, not the mean: where structure is sparse on a flat background the median is the
 * background, and w (f - median) then has no component of the shape of w, which would stay in place while the image
 * moves and pull the peak towards zero. With F and G their spectra (see {@link RealFft2d}), the correlation surface
 * is
 * <pre>
 *   r(x, y) = IDFT[ L(k) F(k) conj G(k) / |F(k) conj G(k)| ](x, y),
 *   L(k) = exp(-2 pi^2 s^2 (kx^2 / nx^2 + ky^2 / ny^2))
 * </pre>
 * with k = (kx, ky) the signed frequencies in cycles per transform length and s = {@code sigmaPx}. Dividing by the
 * magnitude ("whitening") keeps only the phase, which a translation changes and a change of brightness mostly does
 * not: edges and fine structure decide the match, not where the tile is brightest. For a pure circular translation
 * by d, F conj G / |F conj G| = exp(-2 pi i (kx dx / nx + ky dy / ny)), and r is the sampled Gaussian of standard
 * deviation s centred on d, up to the tails of L that are left out. The three-point Gaussian estimator along x and
 * along y through the largest sample and its neighbours (Willert and Gharib 1991, Exp Fluids 10:181-193) is exact
 * for a sampled Gaussian, so it gives the sub-pixel position without the bias a parabola has on a correlation peak.
 * L also removes the noise-dominated highest frequencies, where the whitened spectrum would otherwise give noise the
 * same weight as structure. Left out: the constant term (k = 0) and the frequencies where L is below 1e-3
 * (|kx / nx| or |ky / ny| above sqrt(ln 1000 / (2 pi^2 s^2)), 0.39 at s = 1.5), which saves a fifth of the
 * transforms; only the rows of r within the search range are computed.
 *
 * <p>Sign: if the tile shows the reference moved by (dx, dy) pixels, f(x, y) = g(x - dx, y - dy), the peak is at
 * (dx, dy). The peak is searched for within {@code maxShiftPx} of zero in x and in y.
 *
 * <p>Peak height: the fitted peak amplitude divided by its value for a pure translation,
 * {@code (sum over the kept k != 0 of L(k)) / (nx ny)}; 1 means the tile is the reference translated, values near 0
 * that nothing in it matches. Independent noise alone gives peaks of about 0.1 for a 64 x 64 transform at s = 1.5.
 *
 * <p>Holds scratch arrays: one instance serves one thread ({@link #copy} makes one for another).
 */
final class PhaseCorrelation {
    private static final int MEDIAN_STRIDE = 7;
    private final int tileWidth;
    private final int tileHeight;
    private final double[] weights;
    private final double sigmaPx;
    private final int maxShiftPx;
    private final RealFft2d fft;
    private final double[] lowPass;
    private final int columns;
    private final double normalisation;
    private final double[] image;
    private final double[] re;
    private final double[] im;
    private final double[] refRe;
    private final double[] refIm;
    private final double[] crossRe;
    private final double[] crossIm;
    private final double[] surface;
    private final double[] level;
    private final KthSelector selector = new KthSelector();
    private boolean hasReference;

    /**
     * A measured translation.
     *
     * @param dxPx       shift along x (columns), pixels; content moved to larger x is positive
     * @param dyPx       shift along y (rows), pixels; content moved down is positive
     * @param peakHeight normalised peak amplitude, dimensionless, about 0..1 (see the class comment)
     * @param atLimit    true if the integer peak lies on the edge of the search range
     */
    record Shift(double dxPx, double dyPx, double peakHeight, boolean atLimit) {
    }

    /**
     * @param tileWidth  tile columns, at most {@code nx}
     * @param tileHeight tile rows, at most {@code ny}
     * @param weights    apodisation weights, {@code tileWidth * tileHeight}, row-major, zero or positive. Not
     *                   modified (copied).
     * @param nx         transform columns, a power of two
     * @param ny         transform rows, a power of two
     * @param sigmaPx    standard deviation of the correlation peak, pixels, positive
     * @param maxShiftPx largest shift searched along each axis, pixels, below {@code min(nx, ny) / 2}
     */
    PhaseCorrelation(int tileWidth, int tileHeight, double[] weights, int nx, int ny, double sigmaPx,
            int maxShiftPx) {
        if (tileWidth > nx || tileHeight > ny || weights.length != tileWidth * tileHeight) {
            throw new IllegalArgumentException("a " + tileWidth + " x " + tileHeight + " tile with "
                    + weights.length + " weights does not fit a " + nx + " x " + ny + " transform");
        }
        if (maxShiftPx < 1 || 2 * maxShiftPx >= Math.min(nx, ny)) {
            throw new IllegalArgumentException("the largest shift must be 1 to " + (Math.min(nx, ny) / 2 - 1)
                    + " pixels for a " + nx + " x " + ny + " transform, got " + maxShiftPx);
        }
        this.tileWidth = tileWidth;
        this.tileHeight = tileHeight;
        this.weights = weights.clone();
        this.sigmaPx = sigmaPx;
        this.maxShiftPx = maxShiftPx;
        this.fft = new RealFft2d(nx, ny);
        int half = fft.halfWidth();
        // frequencies where L is below 1e-3 are left out, which saves transforming columns that would carry nothing
        double cutoff = Math.sqrt(Math.log(1e3) / (2 * Math.PI * Math.PI * sigmaPx * sigmaPx));
        this.columns = Math.min(half, (int) Math.floor(cutoff * nx) + 1);
        this.lowPass = new double[ny * half];
        double sum = 0;
        double c = -2 * Math.PI * Math.PI * sigmaPx * sigmaPx;
        for (int ky = 0; ky < ny; ky++) {
            double fy = (ky <= ny / 2 ? ky : ky - ny) / (double) ny;
            for (int kx = 0; kx < columns; kx++) {
                double fx = kx / (double) nx;
                if (fx > cutoff || Math.abs(fy) > cutoff) {
                    continue;
                }
                double l = Math.exp(c * (fx * fx + fy * fy));
                lowPass[ky * half + kx] = l;
                // the columns kx = 1..nx/2-1 stand for their mirror images too
                sum += kx == 0 || kx == nx / 2 ? l : 2 * l;
            }
        }
        this.normalisation = (sum - lowPass[0]) / ((double) nx * ny);
        this.image = new double[nx * ny];
        this.re = new double[ny * half];
        this.im = new double[ny * half];
        this.refRe = new double[ny * half];
        this.refIm = new double[ny * half];
        this.crossRe = new double[ny * half];
        this.crossIm = new double[ny * half];
        this.surface = new double[nx * ny];
        this.level = new double[(tileWidth * tileHeight + MEDIAN_STRIDE - 1) / MEDIAN_STRIDE];
    }

    /**
     * Sets the reference tile.
     *
     * @param tile {@code tileWidth * tileHeight} values, row-major. Not modified.
     */
    void reference(double[] tile) {
        apodise(tile);
        fft.forward(image, refRe, refIm, columns);
        hasReference = true;
    }

    /** A new instance with the same settings and reference and scratch of its own, for another thread. */
    PhaseCorrelation copy() {
        PhaseCorrelation c = new PhaseCorrelation(tileWidth, tileHeight, weights, fft.nx(), fft.ny(), sigmaPx,
                maxShiftPx);
        System.arraycopy(refRe, 0, c.refRe, 0, refRe.length);
        System.arraycopy(refIm, 0, c.refIm, 0, refIm.length);
        c.hasReference = hasReference;
        return c;
    }

    /**
     * The translation of a tile against the reference.
     *
     * @param tile {@code tileWidth * tileHeight} values, row-major; non-finite values count as the tile's median.
     *             Not modified.
     */
    Shift measure(float[] tile) {
        if (!hasReference) {
            throw new IllegalStateException("set the reference before measuring");
        }
        apodise(tile);
        fft.forward(image, re, im, columns);
        int half = fft.halfWidth();
        for (int ky = 0; ky < fft.ny(); ky++) {
            for (int i = ky * half, end = i + columns; i < end; i++) {
                double pr = re[i] * refRe[i] + im[i] * refIm[i];
                double pi = im[i] * refRe[i] - re[i] * refIm[i];
                double magnitude = Math.sqrt(pr * pr + pi * pi);
                double s = magnitude > 0 ? lowPass[i] / magnitude : 0;
                crossRe[i] = pr * s;
                crossIm[i] = pi * s;
            }
        }
        crossRe[0] = 0;
        crossIm[0] = 0;
        fft.inverse(crossRe, crossIm, surface, columns, maxShiftPx + 1);
        return peak();
    }

    private Shift peak() {
        int nx = fft.nx();
        int ny = fft.ny();
        int bestX = 0;
        int bestY = 0;
        double best = Double.NEGATIVE_INFINITY;
        for (int sy = -maxShiftPx; sy <= maxShiftPx; sy++) {
            int rowStart = ((sy + ny) % ny) * nx;
            for (int sx = -maxShiftPx; sx <= maxShiftPx; sx++) {
                double v = surface[rowStart + (sx + nx) % nx];
                if (v > best) {
                    best = v;
                    bestX = sx;
                    bestY = sy;
                }
            }
        }
        double offsetX = gaussianOffset(at(bestX - 1, bestY), best, at(bestX + 1, bestY));
        double offsetY = gaussianOffset(at(bestX, bestY - 1), best, at(bestX, bestY + 1));
        double amplitude = best / Math.exp(-(offsetX * offsetX + offsetY * offsetY) / (2 * sigmaPx * sigmaPx));
        boolean atLimit = Math.abs(bestX) == maxShiftPx || Math.abs(bestY) == maxShiftPx;
        return new Shift(bestX + offsetX, bestY + offsetY, amplitude / normalisation, atLimit);
    }

    private double at(int sx, int sy) {
        int nx = fft.nx();
        int ny = fft.ny();
        return surface[((sy + ny) % ny) * nx + (sx + nx) % nx];
    }

    /**
     * Position of the peak between three samples at -1, 0, +1, the middle one the largest: the vertex of the
     * parabola through their logarithms (exact for a Gaussian), or through the values themselves if one is not
     * positive. Lies within [-0.5, 0.5].
     */
    static double gaussianOffset(double left, double centre, double right) {
        if (left > 0 && centre > 0 && right > 0) {
            double l = Math.log(left);
            double c = Math.log(centre);
            double r = Math.log(right);
            double curvature = l - 2 * c + r;
            return curvature < 0 ? 0.5 * (l - r) / curvature : 0;
        }
        double curvature = left - 2 * centre + right;
        return curvature < 0 ? 0.5 * (left - right) / curvature : 0;
    }

    private void apodise(float[] tile) {
        // the median of every seventh pixel (7 is prime to the power-of-two width, so every column contributes)
        int finite = 0;
        for (int i = 0; i < tile.length; i += MEDIAN_STRIDE) {
            float v = tile[i];
            if (Float.isFinite(v)) {
                level[finite++] = v;
            }
        }
        // the selector works on the whole array it is given
        double[] values = finite == level.length ? level : Arrays.copyOf(level, finite);
        double median = finite == 0 ? 0 : selector.select(values, null, finite / 2);
        int nx = fft.nx();
        for (int y = 0; y < tileHeight; y++) {
            for (int x = 0; x < tileWidth; x++) {
                float v = tile[y * tileWidth + x];
                image[y * nx + x] = Float.isFinite(v) ? weights[y * tileWidth + x] * (v - median) : 0;
            }
        }
    }

    private void apodise(double[] tile) {
        float[] asFloat = new float[tile.length];
        for (int i = 0; i < tile.length; i++) {
            asFloat[i] = (float) tile[i];
        }
        apodise(asFloat);
    }
}
