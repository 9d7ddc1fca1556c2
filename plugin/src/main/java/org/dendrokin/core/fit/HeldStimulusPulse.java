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
 * which keeps the large baseline term free of cancellation.
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
            double sw = 0;
            double swy = 0;
            for (int c = 0; c < nx; c++) {
                int g = f * nx + c;
                sw += data.weight(g);
                swy += data.weight(g) * data.observed(g);
            }
            double m = sw > 0 ? swy / sw : 0;
            double ss = 0;
            for (int c = 0; c < nx; c++) {
                int g = f * nx + c;
                double r = data.observed(g) - m;
                ss += data.weight(g) * r * r;
            }
            w[f] = sw;
            mean[f] = m;
            spread[f] = ss;
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
            double[][] m = {
                {-tau * val / v, tau * val / (v * v), 0},
                {-tau * val, 0, 0},
                {shape, 0, 0},
                {val / s0 - s0 * val / v, s0 * val / (v * v), 0},
                {0, 0, 1}};
            double[][] s = {{see, seq, se}, {seq, sqq, sq}, {se, sq, wf}};
            double[] tv = {t2e, t2q, t1};
            for (int a = 0; a < 5; a++) {
                double ms0 = m[a][0] * s[0][0] + m[a][1] * s[1][0] + m[a][2] * s[2][0];
                double ms1 = m[a][0] * s[0][1] + m[a][1] * s[1][1] + m[a][2] * s[2][1];
                double ms2 = m[a][0] * s[0][2] + m[a][1] * s[1][2] + m[a][2] * s[2][2];
                for (int b = 0; b < 5; b++) {
                    part[a * 5 + b] += ms0 * m[b][0] + ms1 * m[b][1] + ms2 * m[b][2];
                }
                part[25 + a] += m[a][0] * tv[0] + m[a][1] * tv[1] + m[a][2] * tv[2];
            }
            part[30] += chi;
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
     * One source's sums over the columns within reach: its Gaussian by DiffusionDecayPulse's recurrence into scratch
     * rows first, then one plain loop of the seven sums over those columns (two simple loops run faster than one
     * that carries the recurrence and the sums together).
     */
    private void addOpen(int row, double mu, double v, double cut, FitData data, double[] sums) {
        int nx = xUm.length;
        double[][] work = scratch.get();
        double[] e = work[0];
        double[] q = work[1];
        int first;
        int last;
        if (Double.isNaN(stepUm)) {
            first = 0;
            last = nx - 1;
        } else {
            double reach = Math.sqrt(cut);
            double lo = Math.ceil((mu - reach - xUm[0]) / stepUm);
            double hi = Math.floor((mu + reach - xUm[0]) / stepUm);
            if (hi < 0 || lo > nx - 1) {
                return;
            }
            first = (int) Math.max(0, lo);
            last = (int) Math.min(nx - 1, hi);
        }
        java.util.Arrays.fill(e, first, last + 1, 0);
        java.util.Arrays.fill(q, first, last + 1, 0);
        addSource(mu, v, cut, e, q);
        double see = 0, seq = 0, se = 0, sqq = 0, sq = 0, te = 0, tq = 0;
        for (int c = first; c <= last; c++) {
            double ec = e[c];
            double qc = q[c];
            double w = data.weight(row + c);
            double wy = w * data.observed(row + c);
            double we = w * ec;
            double wq = w * qc;
            // fused multiply-adds: fewer operations per sample, and each sum rounded once per term
            see = Math.fma(we, ec, see);
            seq = Math.fma(we, qc, seq);
            se += we;
            sqq = Math.fma(wq, qc, sqq);
            sq += wq;
            te = Math.fma(wy, ec, te);
            tq = Math.fma(wy, qc, tq);
        }
        sums[0] += see;
        sums[1] += seq;
        sums[2] += se;
        sums[3] += sqq;
        sums[4] += sq;
        sums[5] += te;
        sums[6] += tq;
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
