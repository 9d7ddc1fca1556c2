package org.dendrokin.core.fit;

import java.util.Locale;

/**
 * Robust variances of fitted quantities when residuals are correlated between neighbouring samples of a kymograph,
 * or unequal in a way the weights do not describe: the sandwich (Huber 1967, White 1980) with a product Bartlett
 * kernel over positions and frames (Newey and West 1987, in two dimensions).
 *
 * <p>For a quantity with gradient a on the optimiser's scale (a unit vector for a parameter), each used sample i
 * contributes the influence v_i = e_i z_i, with e_i = (y_i - f_i) / sigma_i the weighted residual,
 * z_i = h^T J~_i, h = A^-1 a, A = J~^T J~ and J~_i the weighted Jacobian row d(f_i / sigma_i) / du. The model's
 * variance is s^2 a^T A^-1 a (s^2 = chi^2 / (n - p), as for {@link WaldT}); the robust variance is
 * <pre>
 *   V = n / (n - p) sum_i sum_k K(dx_ik, dt_ik) v_i v_k,   K(dx, dt) = (1 - |dx| / Wx)+ (1 - |dt| / Wt)+
 * </pre>
 * with dx, dt the distances of samples i and k in positions and frames. It is computed without visiting the pairs:
 * the sum equals (1 / (Wx Wt)) sum over all Wx x Wt windows (sliding over the zero-padded grid) of the squared
 * window sum of v, which is formed frame by frame from prefix sums along each frame and a running sum over the last
 * Wt frames, so one pass costs O(n) per quantity and no n x p array is kept. The double sum is a positive
 * semi-definite quadratic form, so V is never negative. With Wx = Wt = 1 it is White's heteroscedasticity-consistent
 * variance (HC1).
 *
 * <p>Window sizes come from the data. Along each direction, T is the effective number of positions (or frames) that
 * carry the influence, (sum_x m_x)^2 / sum_x m_x^2 with m_x the sum of v^2 at position x, and rho the lag-1
 * autocorrelation of v; W is the larger of Andrews' (1991) AR(1) plug-in for the Bartlett kernel,
 * 1.1447 (alpha T)^(1/3) with alpha = 4 rho^2 / ((1 - rho)^2 (1 + rho)^2), and 1.3 sqrt(T), the window Lazarus,
 * Lewis, Stock and Watson (2018) recommend for tests that keep their level; rounded up, at most T / 2. Windows that
 * wide are a fraction b = W / T of the data, and since the influences sum to zero at the optimum the kernel estimate
 * is then biased low by the factor 1 - b + b^2 / 3 (Kiefer and Vogelsang 2005, for the Bartlett kernel); V is divided
 * by that factor for each direction. The robust interval uses Student's t with nu = n_eff / (Kx Kt) degrees of
 * freedom (at most n - p), where n_eff = (sum v^2)^2 / sum v^4 and K = (2 W^2 + 1) / (3 W) is the sum of the squared
 * kernel weights along a direction: the kernel estimate averages about n_eff / (Kx Kt) independent squares
 * (Satterthwaite's approximation), and wide windows over few informative samples make it noisy.
 *
 * <p>Whether the residuals show structure at all is tested before the robust variance replaces the model's: the
 * lag-1 products of v along positions and along frames against their spread under independence,
 * z = sum v_i v_i+1 / sqrt(sum v_i^2 v_i+1^2), and the spread of the residuals against the weights' promise,
 * z = (HC / model - 1) / sqrt(2 sum z_i^4 / (sum z_i^2)^2) (the HC1 ratio of a Gaussian sample has that standard
 * error). Structure is found when one of the three exceeds {@value #STRUCTURE_Z}; on data that the model and its
 * weights describe this is rare (the interval of D or k was replaced in 3 of 200 seeded white-noise fits), so such
 * fits keep their model-based intervals.
 */
final class Sandwich {
    /** |z| beyond which the residuals count as structured. */
    static final double STRUCTURE_Z = 3;
    /** Andrews' (1991) constant of the data-dependent bandwidth for the Bartlett kernel. */
    static final double ANDREWS_BARTLETT = 1.1447;
    /** Lazarus, Lewis, Stock and Watson's (2018) window 1.3 sqrt(T), chosen for coverage rather than precision. */
    static final double COVERAGE_BANDWIDTH = 1.3;
    /** Largest |rho| used in the bandwidth formula (it diverges at 1). */
    static final double MAX_RHO = 0.97;
    /** Grid points per block of frames of the first pass, and the most blocks (fixed: results do not depend on cores). */
    private static final int POINTS_PER_BLOCK = 8192;
    private static final int MAX_BLOCKS = 64;

    private Sandwich() {
    }

    /** The weighted residuals and weighted Jacobian rows of one frame (row of the grid). */
    interface Frames {
        /**
         * Called from several threads at once, each with its own arrays.
         *
         * @param frame the frame (grid row)
         * @param e     receives (y - f) / sigma at each position, 0 for a point left out of the fit. Modified.
         * @param jw    receives d(f / sigma) / du_j at position c in [c * p + j], zeros for a point left out.
         *              Modified.
         */
        void frame(int frame, double[] e, double[] jw);
    }

    /**
     * The robust variance of one quantity and what it rests on.
     *
     * @param modelVariance  s^2 a^T A^-1 a, the model-based variance on the optimiser's scale
     * @param robustVariance the kernel (sandwich) variance V (NaN, not computed, when no structure was found)
     * @param dof            nu, the degrees of freedom of V
     * @param windowColumns  Wx, the kernel's width in positions
     * @param windowRows     Wt, the kernel's width in frames
     * @param zColumns       the lag-1 correlation of the influences along positions, as a z statistic
     * @param zRows          the same along frames
     * @param zSpread        the spread of the residuals against the weights, as a z statistic
     */
    record Assessment(double modelVariance, double robustVariance, double dof, int windowColumns, int windowRows,
                      double zColumns, double zRows, double zSpread) {
        /** True if any of the three tests finds structure. */
        boolean structured() {
            return Sandwich.structured(zColumns, zRows, zSpread);
        }

        /** V / model variance. */
        double ratio() {
            return robustVariance / modelVariance;
        }

        /**
         * The factor by which the robust interval's half width exceeds the model's:
         * t(0.975, nu) sqrt(V) / (t(0.975, n - p) sqrt(model variance)).
         */
        double widening(double modelQuantile) {
            return quantile() * Math.sqrt(ratio()) / modelQuantile;
        }

        /** t(0.975, nu), nu rounded down. */
        double quantile() {
            return WaldT.tQuantile((int) Math.max(1, Math.floor(dof)));
        }

        /** True if the robust interval replaces the model-based one: structure found, and the interval widens. */
        boolean applies(double modelQuantile) {
            return structured() && widening(modelQuantile) > 1;
        }

        /** A sentence for the robust interval: what was found, and the kernel, ratio and degrees of freedom. */
        String appliedNote() {
            return String.format(Locale.ROOT, "residuals structured (lag-1 z %.1f along the path, %.1f in time; "
                    + "spread z %.1f): sandwich variance %.2f x the model's, Bartlett kernel over %d positions x %d "
                    + "frames, t with %.0f degrees of freedom", zColumns, zRows, zSpread, ratio(), windowColumns,
                    windowRows, dof);
        }

        /** A sentence for a model-based interval that the robust one did not replace, and why. */
        String keptNote(double modelQuantile) {
            if (!structured()) {
                return String.format(Locale.ROOT, "no residual structure found (lag-1 z %.1f along the path, %.1f "
                        + "in time; spread z %.1f; all within +-%.0f)", zColumns, zRows, zSpread, STRUCTURE_Z);
            }
            return String.format(Locale.ROOT, "residuals structured, but the robust interval would be narrower "
                    + "(factor %.2f): the model-based interval stands", widening(modelQuantile));
        }
    }

    /**
     * Assesses several quantities at once (two passes over the frames).
     *
     * @param frames  the residuals and Jacobian rows, frame by frame
     * @param rows    frames of the grid
     * @param columns positions of the grid
     * @param ainv    A^-1 = (J~^T J~)^-1 on the optimiser's scale, p x p. Not modified.
     * @param s2      chi^2 / (n - p)
     * @param n       points used in the fit
     * @param targets the gradients a of the quantities on the optimiser's scale, each of length p. Not modified.
     * @return one assessment per target, null for a quantity no sample informs
     */
    static Assessment[] assess(Frames frames, int rows, int columns, double[][] ainv, double s2, int n,
                               double[][] targets) {
        int p = ainv.length;
        int q = targets.length;
        double[][] h = new double[q][p];
        double[] modelVariance = new double[q];
        for (int k = 0; k < q; k++) {
            for (int a = 0; a < p; a++) {
                double acc = 0;
                for (int b = 0; b < p; b++) {
                    acc += ainv[a][b] * targets[k][b];
                }
                h[k][a] = acc;
                modelVariance[k] += targets[k][a] * acc;
            }
            modelVariance[k] *= s2;
        }
        // first pass: lag-1 products, spread, and where the influence lies; blocks of frames in parallel, each
        // block starting from the frame before it for the products in time, added in block order
        int framesPerBlock = Math.max(Math.max(1, POINTS_PER_BLOCK / Math.max(1, columns)),
                (rows + MAX_BLOCKS - 1) / MAX_BLOCKS);
        int blocks = (rows + framesPerBlock - 1) / framesPerBlock;
        FirstPass[] parts = new FirstPass[blocks];
        java.util.stream.IntStream range = java.util.stream.IntStream.range(0, blocks);
        if (blocks > 1) {
            range = range.parallel();
        }
        range.forEach(b -> parts[b] = new FirstPass(frames, h, p, columns, rows, b * framesPerBlock,
                Math.min(rows, (b + 1) * framesPerBlock)));
        FirstPass all = parts[0];
        for (int b = 1; b < blocks; b++) {
            all.add(parts[b]);
        }
        double[] sumV2 = all.sumV2;
        double[] sumV4 = all.sumV4;
        double[] sumZ2 = all.sumZ2;
        double[] sumZ4 = all.sumZ4;
        double[] lagX = all.lagX;
        double[] lagX2 = all.lagX2;
        double[] lagT = all.lagT;
        double[] lagT2 = all.lagT2;
        double[][] massX = all.massX;
        double[][] massT = all.massT;
        boolean[] active = new boolean[q];
        for (int k = 0; k < q; k++) {
            active[k] = sumV2[k] > 0 && modelVariance[k] > 0;
        }
        Assessment[] out = new Assessment[q];
        int[] wx = new int[q];
        int[] wt = new int[q];
        double[] zx = new double[q];
        double[] zt = new double[q];
        double[] zs = new double[q];
        for (int k = 0; k < q; k++) {
            if (!active[k]) {
                continue;
            }
            zx[k] = lagX2[k] > 0 ? lagX[k] / Math.sqrt(lagX2[k]) : 0;
            zt[k] = lagT2[k] > 0 ? lagT[k] / Math.sqrt(lagT2[k]) : 0;
            double hc = sumV2[k] * n / (n - p) / modelVariance[k];
            zs[k] = sumZ4[k] > 0 ? (hc - 1) / Math.sqrt(2 * sumZ4[k] / (sumZ2[k] * sumZ2[k])) : 0;
            wx[k] = window(lagX[k] / sumV2[k], effectiveCount(massX[k]));
            wt[k] = window(lagT[k] / sumV2[k], effectiveCount(massT[k]));
        }
        // second pass, for the quantities whose residuals have structure: the window sums
        boolean[] needed = new boolean[q];
        for (int k = 0; k < q; k++) {
            needed[k] = active[k] && structured(zx[k], zt[k], zs[k]);
            if (active[k] && !needed[k]) {
                out[k] = new Assessment(modelVariance[k], Double.NaN, Double.NaN, wx[k], wt[k], zx[k], zt[k], zs[k]);
            }
        }
        double[] hac = windowSums(frames, rows, columns, h, wx, wt, needed, p);
        for (int k = 0; k < q; k++) {
            if (!needed[k]) {
                continue;
            }
            double bx = wx[k] / effectiveCount(massX[k]);
            double bt = wt[k] / effectiveCount(massT[k]);
            double robust = hac[k] / ((double) wx[k] * wt[k]) * n / (n - p)
                    / (fixedBandwidthBias(bx) * fixedBandwidthBias(bt));
            double nEff = sumV2[k] * sumV2[k] / sumV4[k];
            double dof = Math.max(1, Math.min(n - p, nEff / (kernelSquares(wx[k]) * kernelSquares(wt[k]))));
            out[k] = new Assessment(modelVariance[k], robust, dof, wx[k], wt[k], zx[k], zt[k], zs[k]);
        }
        return out;
    }

    /** True if a lag-1 statistic or the spread statistic is beyond {@link #STRUCTURE_Z}. */
    static boolean structured(double zColumns, double zRows, double zSpread) {
        return Math.abs(zColumns) > STRUCTURE_Z || Math.abs(zRows) > STRUCTURE_Z || zSpread > STRUCTURE_Z;
    }

    /** The first pass's sums over frames [from, to), per quantity. */
    private static final class FirstPass {
        final double[] sumV2;
        final double[] sumV4;
        final double[] sumZ2;
        final double[] sumZ4;
        final double[] lagX;
        final double[] lagX2;
        final double[] lagT;
        final double[] lagT2;
        final double[][] massX;
        /** Sum of v^2 per frame, over all frames; each block fills its own. */
        final double[][] massT;

        FirstPass(Frames frames, double[][] h, int p, int columns, int rows, int from, int to) {
            int q = h.length;
            sumV2 = new double[q];
            sumV4 = new double[q];
            sumZ2 = new double[q];
            sumZ4 = new double[q];
            lagX = new double[q];
            lagX2 = new double[q];
            lagT = new double[q];
            lagT2 = new double[q];
            massX = new double[q][columns];
            massT = new double[q][rows];
            double[] e = new double[columns];
            double[] jw = new double[columns * p];
            double[][] cur = new double[q][columns];
            double[][] prev = new double[q][columns];
            if (from > 0) {
                influences(frames, from - 1, e, jw, h, prev, p);
            }
            for (int f = from; f < to; f++) {
                frames.frame(f, e, jw);
                for (int k = 0; k < q; k++) {
                    double[] v = cur[k];
                    double[] w = prev[k];
                    double[] hk = h[k];
                    double[] mx = massX[k];
                    double s2 = 0;
                    double s4 = 0;
                    double z2s = 0;
                    double z4s = 0;
                    double lx = 0;
                    double lx2 = 0;
                    double lt = 0;
                    double lt2 = 0;
                    double before = 0;
                    for (int c = 0; c < columns; c++) {
                        double z = zOf(jw, c, hk, p);
                        double vc = e[c] * z;
                        v[c] = vc;
                        double z2 = z * z;
                        double v2 = vc * vc;
                        z2s += z2;
                        z4s += z2 * z2;
                        s2 += v2;
                        s4 += v2 * v2;
                        mx[c] += v2;
                        lx += vc * before;
                        lx2 += v2 * before * before;
                        before = vc;
                        double wc = w[c];
                        lt += vc * wc;
                        lt2 += v2 * wc * wc;
                    }
                    sumV2[k] += s2;
                    sumV4[k] += s4;
                    sumZ2[k] += z2s;
                    sumZ4[k] += z4s;
                    lagX[k] += lx;
                    lagX2[k] += lx2;
                    lagT[k] += lt;
                    lagT2[k] += lt2;
                    massT[k][f] = s2;
                }
                double[][] swap = prev;
                prev = cur;
                cur = swap;
            }
        }

        /** Adds another block's sums (its frames are disjoint from this one's). */
        void add(FirstPass o) {
            for (int k = 0; k < sumV2.length; k++) {
                sumV2[k] += o.sumV2[k];
                sumV4[k] += o.sumV4[k];
                sumZ2[k] += o.sumZ2[k];
                sumZ4[k] += o.sumZ4[k];
                lagX[k] += o.lagX[k];
                lagX2[k] += o.lagX2[k];
                lagT[k] += o.lagT[k];
                lagT2[k] += o.lagT2[k];
                for (int c = 0; c < massX[k].length; c++) {
                    massX[k][c] += o.massX[k][c];
                }
                for (int f = 0; f < massT[k].length; f++) {
                    massT[k][f] += o.massT[k][f];
                }
            }
        }
    }

    /** z = h^T J~ of position c. */
    private static double zOf(double[] jw, int c, double[] h, int p) {
        double z = 0;
        for (int j = 0; j < p; j++) {
            z += h[j] * jw[c * p + j];
        }
        return z;
    }

    /** Fills v[k][c] = e_c h_k^T J~_c for one frame. */
    private static void influences(Frames frames, int f, double[] e, double[] jw, double[][] h, double[][] v, int p) {
        frames.frame(f, e, jw);
        int columns = e.length;
        for (int k = 0; k < h.length; k++) {
            double[] hk = h[k];
            double[] vk = v[k];
            for (int c = 0; c < columns; c++) {
                vk[c] = e[c] * zOf(jw, c, hk, p);
            }
        }
    }

    /** For each quantity, the Bartlett double sum of its influences (a second pass over the frames). */
    private static double[] windowSums(Frames frames, int rows, int columns, double[][] h, int[] wx, int[] wt,
                                       boolean[] active, int p) {
        int q = h.length;
        double[] total = new double[q];
        boolean any = false;
        for (boolean a : active) {
            any |= a;
        }
        if (!any) {
            return total;
        }
        double[] e = new double[columns];
        double[] jw = new double[columns * p];
        double[][] v = new double[q][columns];
        KernelSum[] sums = new KernelSum[q];
        for (int k = 0; k < q; k++) {
            sums[k] = active[k] ? new KernelSum(columns, wx[k], wt[k]) : null;
        }
        for (int f = 0; f < rows; f++) {
            influences(frames, f, e, jw, h, v, p);
            for (int k = 0; k < q; k++) {
                if (sums[k] != null) {
                    sums[k].add(v[k]);
                }
            }
        }
        for (int k = 0; k < q; k++) {
            total[k] = sums[k] == null ? 0 : sums[k].total();
        }
        return total;
    }

    /**
     * sum_i sum_k (Wx - |dx|)+ (Wt - |dt|)+ v_i v_k over a grid fed one row (frame) at a time, as the sum over all
     * Wx x Wt windows of the zero-padded grid of the squared window sum: window j of a row covers positions
     * [j - Wx + 1, j], j = 0 .. columns + Wx - 2 (from prefix sums), and a running sum adds each row's window sums
     * and drops those of the row Wt back (kept in a ring of Wt rows). Two samples dx, dt apart share
     * (Wx - |dx|)+ (Wt - |dt|)+ windows, hence the identity. Not thread-safe.
     */
    static final class KernelSum {
        private final int columns;
        private final int wx;
        private final int wt;
        private final double[][] ring;
        private final double[] running;
        private final double[] prefix;
        private int rows;
        private double total;

        KernelSum(int columns, int wx, int wt) {
            this.columns = columns;
            this.wx = wx;
            this.wt = wt;
            this.ring = new double[wt][columns + wx - 1];
            this.running = new double[columns + wx - 1];
            this.prefix = new double[columns + 1];
        }

        /** Adds the next row. @param v the row's values, length columns. Not modified. */
        void add(double[] v) {
            for (int c = 0; c < columns; c++) {
                prefix[c + 1] = prefix[c] + v[c];
            }
            double[] slot = ring[rows % wt];
            for (int j = 0; j < running.length; j++) {
                if (rows >= wt) {
                    running[j] -= slot[j];     // the row leaving the window
                }
                slot[j] = prefix[Math.min(columns, j + 1)] - prefix[Math.max(0, j - wx + 1)];
                running[j] += slot[j];
            }
            rows++;
            total += squares();
        }

        /** The double sum over the rows added so far (the windows that reach past the last row included). */
        double total() {
            double t = total;
            double[] run = running.clone();
            for (int f = rows; f < rows + wt - 1; f++) {
                if (f >= wt) {
                    double[] slot = ring[f % wt];    // row f - wt, still in the ring: no row was added after it
                    for (int j = 0; j < run.length; j++) {
                        run[j] -= slot[j];
                    }
                }
                for (double r : run) {
                    t += r * r;
                }
            }
            return t;
        }

        private double squares() {
            double acc = 0;
            for (double r : running) {
                acc += r * r;
            }
            return acc;
        }
    }

    /** (sum m)^2 / sum m^2, the number of equally loaded slots the mass is spread over (at least 1). */
    static double effectiveCount(double[] mass) {
        double s = 0;
        double s2 = 0;
        for (double m : mass) {
            s += m;
            s2 += m * m;
        }
        return s2 > 0 ? Math.max(1, s * s / s2) : 1;
    }

    /**
     * The Bartlett window along one direction: Andrews' (1991) AR(1) plug-in, 1.1447 (alpha T)^(1/3) with
     * alpha = 4 rho^2 / ((1 - rho)^2 (1 + rho)^2), or 1.3 sqrt(T) (Lazarus, Lewis, Stock and Watson 2018), whichever
     * is larger, rounded up, and at most T / 2.
     *
     * @param rho    lag-1 autocorrelation of the influences along the direction
     * @param length T, the effective number of positions (or frames) carrying the influence
     */
    static int window(double rho, double length) {
        double r = Math.max(-MAX_RHO, Math.min(MAX_RHO, rho));
        double alpha = 4 * r * r / ((1 - r) * (1 - r) * (1 + r) * (1 + r));
        double s = Math.max(ANDREWS_BARTLETT * Math.cbrt(alpha * length), COVERAGE_BANDWIDTH * Math.sqrt(length));
        int w = (int) Math.ceil(s);
        return Math.max(1, Math.min(w, (int) Math.floor(length / 2)));
    }

    /**
     * Kiefer and Vogelsang's (2005) mean of the Bartlett estimate relative to the variance it estimates when the
     * window is a fraction b of the series and the influences sum to zero (as they do at a least-squares optimum):
     * 1 - b + b^2 / 3.
     */
    static double fixedBandwidthBias(double b) {
        double c = Math.min(b, 1);
        return 1 - c + c * c / 3;
    }

    /** Sum of the squared Bartlett weights (1 - |l| / W)^2 over the lags |l| < W: (2 W^2 + 1) / (3 W). */
    static double kernelSquares(int w) {
        return (2.0 * w * w + 1) / (3.0 * w);
    }
}
