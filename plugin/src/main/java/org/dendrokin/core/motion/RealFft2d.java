package org.dendrokin.core.motion;

import org.apache.commons.math3.transform.DftNormalization;
import org.apache.commons.math3.transform.FastFourierTransformer;
import org.apache.commons.math3.transform.TransformType;

/**
 * The two-dimensional discrete Fourier transform of a real image, by rows then columns, on Commons Math's radix-2
 * transform. Forward:
 * <pre>
 *   X(ky, kx) = sum_{y &lt; ny} sum_{x &lt; nx} f(y, x) exp(-2 pi i (kx x / nx + ky y / ny))
 * </pre>
 * inverse with the factor 1 / (nx ny). Because f is real, X(ny - ky, nx - kx) = conj X(ky, kx), so only the
 * columns kx = 0..nx/2 are kept ("half spectrum", {@code ny * (nx/2 + 1)} values, row-major by ky). Real input
 * also halves the row work: two real rows are transformed as the real and imaginary parts of one complex row and
 * separated by the same symmetry (Press et al., Numerical Recipes, 3rd ed. 2007, section 12.3); the inverse
 * packs two Hermitian rows the same way. The cost is about half that of the complex transform.
 *
 * <p>Holds scratch rows, so one instance serves one thread.
 */
final class RealFft2d {
    private final int nx;
    private final int ny;
    private final int half;
    private final double[][] row;
    private final double[][] column;
    private final double[] workRe;
    private final double[] workIm;

    /**
     * @param nx columns, a power of two, at least 4
     * @param ny rows, a power of two, at least 4
     */
    RealFft2d(int nx, int ny) {
        if (!isPowerOfTwo(nx) || !isPowerOfTwo(ny) || nx < 4 || ny < 4) {
            throw new IllegalArgumentException("transform sizes must be powers of two of at least 4, got " + nx
                    + " x " + ny);
        }
        this.nx = nx;
        this.ny = ny;
        this.half = nx / 2 + 1;
        this.row = new double[2][nx];
        this.column = new double[2][ny];
        this.workRe = new double[ny * half];
        this.workIm = new double[ny * half];
    }

    static boolean isPowerOfTwo(int n) {
        return n > 0 && (n & (n - 1)) == 0;
    }

    int nx() {
        return nx;
    }

    int ny() {
        return ny;
    }

    /** Columns of the half spectrum, {@code nx/2 + 1}. */
    int halfWidth() {
        return half;
    }

    /**
     * @param image row-major real image, {@code ny * nx} values. Not modified.
     * @param re    receives the real parts of the half spectrum, {@code ny * (nx/2 + 1)}, index
     *              {@code ky * (nx/2 + 1) + kx}. Modified.
     * @param im    receives the imaginary parts, the same layout. Modified.
     */
    void forward(double[] image, double[] re, double[] im) {
        forward(image, re, im, half);
    }

    /**
     * As {@link #forward(double[], double[], double[])}, but only the columns kx &lt; {@code columns} of the half
     * spectrum are computed; the others are left as they were.
     *
     * @param columns number of leading half-spectrum columns wanted, 1 to {@code nx/2 + 1}
     */
    void forward(double[] image, double[] re, double[] im, int columns) {
        double[] zr = row[0];
        double[] zi = row[1];
        int mask = nx - 1;
        for (int y = 0; y < ny; y += 2) {
            System.arraycopy(image, y * nx, zr, 0, nx);
            System.arraycopy(image, (y + 1) * nx, zi, 0, nx);
            FastFourierTransformer.transformInPlace(row, DftNormalization.STANDARD, TransformType.FORWARD);
            int a = y * half;
            int b = a + half;
            for (int kx = 0; kx < columns; kx++) {
                int m = (nx - kx) & mask;
                // Z = A + i B with A, B the spectra of the two real rows; A(k) = (Z(k) + conj Z(-k)) / 2,
                // B(k) = (Z(k) - conj Z(-k)) / 2i
                re[a + kx] = 0.5 * (zr[kx] + zr[m]);
                im[a + kx] = 0.5 * (zi[kx] - zi[m]);
                re[b + kx] = 0.5 * (zi[kx] + zi[m]);
                im[b + kx] = 0.5 * (zr[m] - zr[kx]);
            }
        }
        columns(re, im, columns, TransformType.FORWARD);
    }

    /**
     * The inverse of {@link #forward}: the real image whose half spectrum is given. The spectrum must be that of a
     * real image (Hermitian); a non-Hermitian part is discarded, not reported.
     *
     * @param re    real parts of the half spectrum. Not modified.
     * @param im    imaginary parts of the half spectrum. Not modified.
     * @param image receives the real image, {@code ny * nx} values, row-major. Modified.
     */
    void inverse(double[] re, double[] im, double[] image) {
        inverse(re, im, image, half, ny / 2);
    }

    /**
     * As {@link #inverse(double[], double[], double[])} for a spectrum that is zero beyond column {@code columns - 1},
     * computing only the rows within {@code rowReach} of row 0 (circularly: y &lt;= rowReach or y &gt;= ny - rowReach,
     * and the partner of each in its pair); the other rows of {@code image} are left as they were.
     *
     * @param columns  number of leading half-spectrum columns that may be non-zero; the rest are taken as zero
     * @param rowReach rows wanted on each side of row 0
     */
    void inverse(double[] re, double[] im, double[] image, int columns, int rowReach) {
        System.arraycopy(re, 0, workRe, 0, re.length);
        System.arraycopy(im, 0, workIm, 0, im.length);
        columns(workRe, workIm, columns, TransformType.INVERSE);
        double[] zr = row[0];
        double[] zi = row[1];
        for (int y = 0; y < ny; y += 2) {
            if (y > rowReach && y + 1 < ny - rowReach) {
                continue;
            }
            int a = y * half;
            int b = a + half;
            // Z = A + i B over the whole row, with A(nx - k) = conj A(k); its inverse is a + i b for real a, b
            for (int k = 0; k < columns; k++) {
                zr[k] = workRe[a + k] - workIm[b + k];
                zi[k] = workIm[a + k] + workRe[b + k];
            }
            for (int k = columns; k <= nx - columns; k++) {
                zr[k] = 0;
                zi[k] = 0;
            }
            for (int k = Math.max(half, nx - columns + 1); k < nx; k++) {
                int m = nx - k;
                zr[k] = workRe[a + m] + workIm[b + m];
                zi[k] = -workIm[a + m] + workRe[b + m];
            }
            FastFourierTransformer.transformInPlace(row, DftNormalization.STANDARD, TransformType.INVERSE);
            System.arraycopy(zr, 0, image, y * nx, nx);
            System.arraycopy(zi, 0, image, (y + 1) * nx, nx);
        }
    }

    private void columns(double[] re, double[] im, int columns, TransformType type) {
        double[] cr = column[0];
        double[] ci = column[1];
        for (int kx = 0; kx < columns; kx++) {
            for (int ky = 0, i = kx; ky < ny; ky++, i += half) {
                cr[ky] = re[i];
                ci[ky] = im[i];
            }
            FastFourierTransformer.transformInPlace(column, DftNormalization.STANDARD, type);
            for (int ky = 0, i = kx; ky < ny; ky++, i += half) {
                re[i] = cr[ky];
                im[i] = ci[ky];
            }
        }
    }
}
