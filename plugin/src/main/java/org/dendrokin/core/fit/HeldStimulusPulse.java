package org.dendrokin.core.fit;

import java.util.List;
import java.util.stream.IntStream;

import org.dendrokin.core.Checks;
import org.dendrokin.core.units.Unit;

/**
 * The diffusion-decay pulse of {@link DiffusionDecayPulse} with the stimulus time t0 and position x0 held (the
 * session analysis' default), with one-pass normal equations that do only the work this case needs; the joint fit
 * over many sessions spends nearly all its time in them. Parameters, values and Jacobian are those of
 * {@code DiffusionDecayPulse} (D, k, amplitude, width, baseline), which {@link #evaluate} calls.
 *
 * <p>With x0 held, the Jacobian row of sample (f, c) is M_f phi_c with phi_c = (e_c, q_c, 1), e_c the sum over
 * sources (the pulse and, with sealed ends, its mirror images) of g = exp(-(x_c - x_i)^2 / 2V) and q_c that of
 * (x_c - x_i)^2 g. A frame adds M_f S_f M_f^T to A, M_f t_f to g and its chi^2, and every term of S_f, t_f and chi^2
 * either contains e or q, which vanish outside the pulse's reach sqrt(80 V) (the cut of {@code DiffusionDecayPulse}),
 * or is a sum over the whole frame that does not depend on the parameters: sum w, the weighted mean of y and
 * sum w (y - mean)^2, computed once per data set. So each frame costs only the samples the pulse reaches, seven
 * running sums each (w e^2, w e q, w e, w q^2, w q, w y e, w y q), and chi^2 is assembled per frame as
 * sum w (y - mean)^2 + W (mean - b)^2 - 2 a sum w e (y - b) + a^2 sum w e^2 (a = amplitude factor of the frame),
 * which keeps the large baseline term free of cancellation. On evenly spaced columns (x_c = x_0 + c h) the distance
 * x_c - mu is stepped by h instead of recomputed, which agrees with DiffusionDecayPulse to rounding.
 */
final class HeldStimulusPulse implements FitModel {
    private static final int BLOCK = 16;
    private static final int MAX_IMAGES = 50;
    private static final int POINTS_PER_TASK = 4096;
    private static final int MAX_TASKS = 64;
    private static final int D = 0;
    private static final int K = 1;
    private static final int AMP = 2;
    private static final int WIDTH = 3;
    private static final int BASE = 4;

    private final DiffusionDecayPulse reference;
    private final double[] xUm;
    private final double[] tS;
    private final double t0;
    private final double x0;
    private final double[] walls;
    private final double stepUm;
    private final ThreadLocal<double[][]> scratch;
    /** Whole-frame sums of the last data set seen (W, mean, sum w (y - mean)^2 per frame), keyed by identity. */
    private volatile FrameTotals totals;

    private record FrameTotals(FitData data, double[] w, double[] mean, double[] spread) {
    }

    /**
     * @param distancesUm   positions of the columns, um. Not modified.
     * @param timesS        times of the rows, s. Not modified.
     * @param stimulusTimeS t0, s
     * @param stimulusPosUm x0, um
     * @param sealedEndsUm  {xLo, xHi} of sealed ends, um, or null for an open dendrite
     * @param signalUnit    unit of amplitude and baseline
     */
    HeldStimulusPulse(double[] distancesUm, double[] timesS, double stimulusTimeS, double stimulusPosUm,
                      double[] sealedEndsUm, Unit signalUnit) {
        Checks.finite(stimulusTimeS, "stimulus time (s)");
        Checks.finite(stimulusPosUm, "stimulus position (um)");
        this.reference = new DiffusionDecayPulse(distancesUm, timesS, stimulusTimeS, stimulusPosUm, sealedEndsUm,
                signalUnit);
        this.xUm = distancesUm.clone();
        this.tS = timesS.clone();
        this.t0 = stimulusTimeS;
        this.x0 = stimulusPosUm;
        this.walls = sealedEndsUm == null ? null : sealedEndsUm.clone();
        this.stepUm = evenStep(xUm);
        int nx = xUm.length;
        this.scratch = ThreadLocal.withInitial(() -> new double[][] {new double[nx], new double[nx]});
    }

    private static double evenStep(double[] x) {
        int n = x.length;
        if (n < 2) {
            return Double.NaN;
        }
        double h = (x[n - 1] - x[0]) / (n - 1);
        if (!(h > 0)) {
            return Double.NaN;
        }
        for (int c = 0; c < n; c++) {
            if (Math.abs(x[c] - (x[0] + c * h)) > 1e-10 * h) {
                return Double.NaN;
            }
        }
        return h;
    }

    @Override
    public String name() {
        return reference.name();
    }

    @Override
    public List<ParameterSpec> parameters() {
        return reference.parameters();
    }

    @Override
    public int size() {
        return reference.size();
    }

    @Override
    public void evaluate(double[] parameters, double[] values, double[] jacobian) {
        reference.evaluate(parameters, values, jacobian);
    }

    @Override
    public boolean hasNormalEquations() {
        return true;
    }

    @Override
    public List<String> headlineParameters() {
        return reference.headlineParameters();
    }

    @Override
    public List<DerivedQuantity> derivedQuantities() {
        return reference.derivedQuantities();
    }

    /** Frames split into fixed blocks summed in parallel and added in block order, as DiffusionDecayPulse does. */
    @Override
    public void normalEquations(double[] p, FitData data, NormalEquations out, double[] fitted) {
        Checks.require(data.size() == size(), "the data do not lie on this model's grid");
        FrameTotals whole = totals(data);
        int nx = xUm.length;
        int nt = tS.length;
        int framesPerTask = Math.max(Math.max(1, POINTS_PER_TASK / nx), (nt + MAX_TASKS - 1) / MAX_TASKS);
        int tasks = (nt + framesPerTask - 1) / framesPerTask;
        double[][] parts = new double[tasks][];
        IntStream range = IntStream.range(0, tasks);
        if (tasks > 1) {
            range = range.parallel();
        }
        range.forEach(b -> parts[b] = sweep(p, data, whole, b * framesPerTask, Math.min(nt, (b + 1) * framesPerTask)));
        out.clear();
        for (double[] part : parts) {
            out.addPacked(part);
        }
        if (fitted != null) {
            reference.evaluate(p, fitted, null);
        }
    }

    private FrameTotals totals(FitData data) {
        FrameTotals t = totals;
        if (t != null && t.data() == data) {
            return t;
        }
        int nx = xUm.length;
        int nt = tS.length;
        double[] w = new double[nt];
        double[] mean = new double[nt];
        double[] spread = new double[nt];
        for (int f = 0; f < nt; f++) {
            // one pass about a shift K taken from the frame itself: sum w (y - mean)^2 = S2 - S1^2 / W with
            // S1 = sum w (y - K), S2 = sum w (y - K)^2, which cancels little because K lies among the values
            // (the shifted-data algorithm; Chan, Golub and LeVeque 1983, Am Stat 37:242)
            double shift = Double.NaN;
            double sw = 0;
            double s1 = 0;
            double s2 = 0;
            for (int c = 0; c < nx; c++) {
                int g = f * nx + c;
                double wg = data.weight(g);
                if (wg > 0) {
                    if (Double.isNaN(shift)) {
                        shift = data.observed(g);
                    }
                    double r = data.observed(g) - shift;
                    sw += wg;
                    s1 += wg * r;
                    s2 += wg * r * r;
                }
            }
            w[f] = sw;
            mean[f] = sw > 0 ? shift + s1 / sw : 0;
            spread[f] = sw > 0 ? Math.max(0, s2 - s1 * s1 / sw) : 0;
        }
        t = new FrameTotals(data, w, mean, spread);
        totals = t;
        return t;
    }

    /** A (5 x 5), g (5) and chi^2 of frames [from, to), packed as NormalEquations.addPacked reads them. */
    private double[] sweep(double[] p, FitData data, FrameTotals whole, int from, int to) {
        double d = p[D];
        double k = p[K];
        double amp = p[AMP];
        double s0 = p[WIDTH];
        double base = p[BASE];
        int nx = xUm.length;
        double[] part = new double[5 * 5 + 5 + 1];
        double[] sums = new double[7];
        double[] u = new double[4];
        double[] r = new double[4];
        for (int f = from; f < to; f++) {
            double tau = tS[f] - t0;
            double wf = whole.w()[f];
            double off = whole.mean()[f] - base;
            double chiBase = whole.spread()[f] + wf * off * off;
            if (tau < 0) {
                part[BASE * 5 + BASE] += wf;
                part[25 + BASE] += wf * off;
                part[30] += chiBase;
                continue;
            }
            double v = s0 * s0 + 2 * d * tau;
            double shape = s0 / Math.sqrt(v) * Math.exp(-k * tau);
            double val = amp * shape;
            java.util.Arrays.fill(sums, 0);
            frameSums(f * nx, v, data, sums);
            double see = sums[0];
            double seq = sums[1];
            double se = sums[2];
            double sqq = sums[3];
            double sq = sums[4];
            double te = sums[5];
            double tq = sums[6];
            // S over phi = (e, q, 1) and t = sum w r phi with r = y - b - val e
            double ue = te - base * se;       // sum w e (y - b)
            double uq = tq - base * sq;       // sum w q (y - b)
            double t1 = wf * off - val * se;
            double t2e = ue - val * see;
            double t2q = uq - val * seq;
            double chi = chiBase - 2 * val * ue + val * val * see;
            // M's rows D, k, amplitude and width have (e, q) parts only, the baseline's row is (0, 0, 1): with
            // u = M[., e] and r = M[., q] over those four, A += see u u^T + seq (u r^T + r u^T) + sqq r r^T,
            // A[., b] += se u + sq r, A[b, b] += W, g += t_e u + t_q r, g[b] += t_1
            double inv = 1 / v;
            u[D] = -tau * val * inv;
            r[D] = tau * val * inv * inv;
            u[K] = -tau * val;
            r[K] = 0;
            u[AMP] = shape;
            r[AMP] = 0;
            u[WIDTH] = val / s0 - s0 * val * inv;
            r[WIDTH] = s0 * val * inv * inv;
            for (int a = 0; a < 4; a++) {
                double ua = u[a];
                double ra = r[a];
                double sa = see * ua + seq * ra;
                double qa = seq * ua + sqq * ra;
                for (int b = 0; b <= a; b++) {
                    part[a * 5 + b] += sa * u[b] + qa * r[b];
                }
                part[a * 5 + BASE] += se * ua + sq * ra;
                part[25 + a] += t2e * ua + t2q * ra;
            }
            part[BASE * 5 + BASE] += wf;
            part[25 + BASE] += t1;
            part[30] += chi;
        }
        // the loops above filled the lower triangle of the first four rows and the baseline column: mirror them
        for (int a = 0; a < 5; a++) {
            for (int b = a + 1; b < 5; b++) {
                if (b == BASE) {
                    part[BASE * 5 + a] = part[a * 5 + BASE];
                } else {
                    part[a * 5 + b] = part[b * 5 + a];
                }
            }
        }
        return part;
    }

    /**
     * The seven sums of one frame over the samples the pulse reaches: w e^2, w e q, w e, w q^2, w q, w y e, w y q,
     * added to {@code sums}. An open dendrite has one source, summed in one loop with the Gaussian recurrence of
     * DiffusionDecayPulse; sealed ends add the mirror images, gathered into e and q per column first.
     */
    private void frameSums(int row, double v, FitData data, double[] sums) {
        double cut = 80 * v;
        int nx = xUm.length;
        if (walls == null) {
            addOpen(row, x0, v, cut, data, sums);
            return;
        }
        double lenUm = walls[1] - walls[0];
        int images = (int) Math.min(MAX_IMAGES, Math.ceil((Math.sqrt(cut) + lenUm) / (2 * lenUm)) + 1);
        double[][] work = scratch.get();
        double[] e = work[0];
        double[] q = work[1];
        java.util.Arrays.fill(e, 0);
        java.util.Arrays.fill(q, 0);
        for (int mi = -images; mi <= images; mi++) {
            addSource(x0 + 2 * mi * lenUm, v, cut, e, q);
            addSource(2 * walls[0] - x0 + 2 * mi * lenUm, v, cut, e, q);
        }
        double see = 0, seq = 0, se = 0, sqq = 0, sq = 0, te = 0, tq = 0;
        for (int c = 0; c < nx; c++) {
            double ec = e[c];
            if (ec == 0) {
                continue;
            }
            double qc = q[c];
            double w = data.weight(row + c);
            double wy = w * data.observed(row + c);
            double we = w * ec;
            see += we * ec;
            seq += we * qc;
            se += we;
            sqq += w * qc * qc;
            sq += w * qc;
            te += wy * ec;
            tq += wy * qc;
        }
        sums[0] += see;
        sums[1] += seq;
        sums[2] += se;
        sums[3] += sqq;
        sums[4] += sq;
        sums[5] += te;
        sums[6] += tq;
    }

    /**
     * One source's sums over the columns within reach, the Gaussian by the recurrence of DiffusionDecayPulse
     * (g_{c+1} = g_c rho_c, rho_{c+1} = rho_c exp(-h^2 / V), restarted from exact exponentials every BLOCK samples)
     * carried in the same loop as the sums. Uneven columns take one exponential each.
     */
    private void addOpen(int row, double mu, double v, double cut, FitData data, double[] sums) {
        int nx = xUm.length;
        double inv2v = 1 / (2 * v);
        double see = 0, seq = 0, se = 0, sqq = 0, sq = 0, te = 0, tq = 0;
        double h = stepUm;
        if (Double.isNaN(h)) {
            for (int c = 0; c < nx; c++) {
                double dx = xUm[c] - mu;
                double qq = dx * dx;
                if (qq < cut) {
                    double g = Math.exp(-qq * inv2v);
                    double w = data.weight(row + c);
                    double wy = w * data.observed(row + c);
                    double qg = qq * g;
                    double we = w * g;
                    double wq = w * qg;
                    see = Math.fma(we, g, see);
                    seq = Math.fma(we, qg, seq);
                    se += we;
                    sqq = Math.fma(wq, qg, sqq);
                    sq += wq;
                    te = Math.fma(wy, g, te);
                    tq = Math.fma(wy, qg, tq);
                }
            }
        } else {
            // the columns strictly within reach, as DiffusionDecayPulse's cut q < 80 V selects them
            double reach = Math.sqrt(cut);
            double lo = Math.ceil((mu - reach - xUm[0]) / h);
            double hi = Math.floor((mu + reach - xUm[0]) / h);
            if (hi < 0 || lo > nx - 1) {
                return;
            }
            int first = (int) Math.max(0, lo);
            int last = (int) Math.min(nx - 1, hi);
            while (first <= last && sq(xUm[first] - mu) >= cut) {
                first++;
            }
            while (last >= first && sq(xUm[last] - mu) >= cut) {
                last--;
            }
            double stepRatio = Math.exp(-h * h / v);
            // fused multiply-adds: fewer operations per sample, and each term rounded once
            for (int start = first; start <= last; start += BLOCK) {
                int end = Math.min(last, start + BLOCK - 1);
                double dx = xUm[start] - mu;
                double g = Math.exp(-dx * dx * inv2v);
                double ratio = Math.exp(-(2 * dx * h + h * h) * inv2v);
                for (int c = start; c <= end; c++) {
                    double qq = dx * dx;
                    double w = data.weight(row + c);
                    double wy = w * data.observed(row + c);
                    double qg = qq * g;
                    double we = w * g;
                    double wq = w * qg;
                    see = Math.fma(we, g, see);
                    seq = Math.fma(we, qg, seq);
                    se += we;
                    sqq = Math.fma(wq, qg, sqq);
                    sq += wq;
                    te = Math.fma(wy, g, te);
                    tq = Math.fma(wy, qg, tq);
                    g *= ratio;
                    ratio *= stepRatio;
                    dx += h;
                }
            }
        }
        sums[0] += see;
        sums[1] += seq;
        sums[2] += se;
        sums[3] += sqq;
        sums[4] += sq;
        sums[5] += te;
        sums[6] += tq;
    }

    private static double sq(double x) {
        return x * x;
    }

    /** Adds a source's g to e and (x - mu)^2 g to q at the columns within reach (DiffusionDecayPulse's recurrence). */
    private void addSource(double mu, double v, double cut, double[] e, double[] q) {
        int nx = xUm.length;
        double inv2v = 1 / (2 * v);
        double h = stepUm;
        if (Double.isNaN(h)) {
            for (int c = 0; c < nx; c++) {
                double dx = xUm[c] - mu;
                double qq = dx * dx;
                if (qq < cut) {
                    double g = Math.exp(-qq * inv2v);
                    e[c] += g;
                    q[c] += qq * g;
                }
            }
            return;
        }
        double reach = Math.sqrt(cut);
        double lo = Math.ceil((mu - reach - xUm[0]) / h);
        double hi = Math.floor((mu + reach - xUm[0]) / h);
        if (hi < 0 || lo > nx - 1) {
            return;
        }
        int first = (int) Math.max(0, lo);
        int last = (int) Math.min(nx - 1, hi);
        double stepRatio = Math.exp(-h * h / v);
        for (int start = first; start <= last; start += BLOCK) {
            int end = Math.min(last, start + BLOCK - 1);
            double dx0 = xUm[start] - mu;
            double g = Math.exp(-dx0 * dx0 * inv2v);
            double ratio = Math.exp(-(2 * dx0 * h + h * h) * inv2v);
            for (int c = start; c <= end; c++) {
                double dx = xUm[c] - mu;
                double qq = dx * dx;
                if (qq < cut) {
                    e[c] += g;
                    q[c] += qq * g;
                }
                g *= ratio;
                ratio *= stepRatio;
            }
        }
    }
}
