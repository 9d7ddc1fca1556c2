package org.dendrokin.core.fit;

import java.util.ArrayList;
import java.util.List;
import java.util.stream.IntStream;

import org.dendrokin.core.Checks;
import org.dendrokin.core.model.ModelCatalogue;
import org.dendrokin.core.units.Unit;

/**
 * The diffusion-decay model c_t = D c_xx - k c after a Gaussian pulse, in closed form, on a kymograph grid:
 * <pre>
 *   c(x, t) = b + A s0 / sqrt(V) exp(-(x - x0)^2 / (2 V)) exp(-k tau),   V = s0^2 + 2 D tau,  tau = t - t0 &gt;= 0
 *   c(x, t) = b                                                          for t &lt; t0
 * </pre>
 * (a Gaussian of peak A and standard deviation s0 released at (x0, t0) spreads with variance s0^2 + 2 D tau and
 * decays with rate k; Crank 1975 ch. 2 and 14; sheet s2.2, s2.3). With sealed (no-flux) ends at xLo and xHi the
 * method of images adds the mirrored sources 2 xLo - x0 + 2nL and x0 + 2nL, L = xHi - xLo, for every integer n
 * that matters (Crank 1975 ch. 2). The Jacobian is analytic.
 *
 * <p>Parameters: D (um^2/s, log scale), k (1/s, log scale), amplitude A (signal unit), position x0 (um; unless
 * fixed), width s0 (um, log scale), baseline b (signal unit).
 *
 * <p>When the stimulus time is fitted too, a pulse of width s0 released at t0 cannot be told from a narrower one
 * released earlier (V depends on s0^2 + 2 D (t - t0) only, and A on A s0 e^(k t0)), so t0 and s0 are not both
 * identifiable. The model then becomes a point source (s0 = 0) of amount A (signal unit times um) released at
 * the fitted {@code stimulus_time} t0 (s): c = b + A / sqrt(4 pi D tau) exp(-(x - x0)^2 / (4 D tau)) exp(-k tau)
 * (sheet s2.1), and t0 is the effective release time of an instantaneous point source.
 */
public final class DiffusionDecayPulse implements FitModel {
    public static final String NAME = ModelCatalogue.DIFFUSION_DECAY.name();
    private static final int MAX_IMAGES = 50;
    /** Samples between exact restarts of the Gaussian recurrence (rounding grows like BLOCK^2 ulp, about 3e-14). */
    private static final int BLOCK = 16;
    /**
     * Grid points per block of frames summed by one task, and the most blocks; both fixed, so that the sums do not
     * depend on the number of cores.
     */
    private static final int POINTS_PER_TASK = 4096;
    private static final int MAX_TASKS = 64;

    private final double[] xUm;
    private final double[] tS;
    private final double fixedTimeS;
    private final double fixedPositionUm;
    private final double[] walls;
    private final List<ParameterSpec> specs;
    private final int iPosition;
    private final int iWidth;
    /** True when t0 is fitted: the model is then a point source and has no width parameter. */
    private final boolean point;
    private final int iBase;
    private final int iTime;
    /** Column spacing, um, if the columns are evenly spaced (to 1e-10 of a step), else NaN. */
    private final double stepUm;
    /** Work arrays of the one-pass sums, one set per thread, reused from evaluation to evaluation. */
    private final ThreadLocal<Scratch> scratch;

    private static final class Scratch {
        final double[] e;
        final double[] eq;
        final double[] ex;
        final double[] m;
        final double[] s = new double[16];
        final double[] ms;

        Scratch(int nx, int np) {
            e = new double[nx];
            eq = new double[nx];
            ex = new double[nx];
            m = new double[np * 4];
            ms = new double[np * 4];
        }
    }

    /**
     * @param distancesUm     positions of the columns, um. Not modified.
     * @param timesS          times of the rows, s. Not modified.
     * @param stimulusTimeS   t0, s, or NaN to fit it
     * @param stimulusPosUm   x0, um, or NaN to fit it
     * @param sealedEndsUm    {xLo, xHi} of sealed ends, um, or null for an open (infinite) dendrite
     * @param signalUnit      unit of amplitude and baseline
     */
    public DiffusionDecayPulse(double[] distancesUm, double[] timesS, double stimulusTimeS, double stimulusPosUm,
                               double[] sealedEndsUm, Unit signalUnit) {
        Checks.require(distancesUm.length > 0 && timesS.length > 0, "the kymograph is empty");
        this.xUm = distancesUm.clone();
        this.tS = timesS.clone();
        this.fixedTimeS = stimulusTimeS;
        this.fixedPositionUm = stimulusPosUm;
        if (sealedEndsUm != null) {
            Checks.require(sealedEndsUm.length == 2 && sealedEndsUm[1] > sealedEndsUm[0],
                    "sealed ends need xLo < xHi");
        }
        this.walls = sealedEndsUm == null ? null : sealedEndsUm.clone();
        List<ParameterSpec> s = new ArrayList<>();
        s.add(ParameterSpec.positive("D", Unit.DIFFUSION));
        s.add(ParameterSpec.positive("k", Unit.RATE));
        s.add(ParameterSpec.linear("amplitude", signalUnit));
        iPosition = Double.isNaN(stimulusPosUm) ? s.size() : -1;
        if (iPosition >= 0) {
            s.add(ParameterSpec.linear("position", Unit.MICROMETRE));
        }
        iWidth = Double.isNaN(stimulusTimeS) ? -1 : s.size();
        point = iWidth < 0;
        if (iWidth >= 0) {
            s.add(ParameterSpec.positive("width", Unit.MICROMETRE));
        }
        iBase = s.size();
        s.add(ParameterSpec.linear("baseline", signalUnit));
        iTime = Double.isNaN(stimulusTimeS) ? s.size() : -1;
        if (iTime >= 0) {
            s.add(ParameterSpec.linear("stimulus_time", Unit.SECOND));
        }
        this.specs = List.copyOf(s);
        this.stepUm = evenStep(xUm);
        int nx = xUm.length;
        int np = specs.size();
        this.scratch = ThreadLocal.withInitial(() -> new Scratch(nx, np));
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
        return NAME;
    }

    @Override
    public List<ParameterSpec> parameters() {
        return specs;
    }

    @Override
    public int size() {
        return xUm.length * tS.length;
    }

    @Override
    public List<String> headlineParameters() {
        return List.of("D", "k");
    }

    @Override
    public List<DerivedQuantity> derivedQuantities() {
        // D and k come first, in the catalogue entry's order
        return ModelCatalogue.DIFFUSION_DECAY.closedForms().stream().map(DerivedQuantity::of).toList();
    }

    /** Parameter vector in this model's order from the full set (D, k, A, x0, s0, b, t0). */
    public double[] pack(double d, double k, double amplitude, double positionUm, double widthUm, double baseline,
                         double timeS) {
        double[] p = new double[specs.size()];
        p[0] = d;
        p[1] = k;
        p[2] = amplitude;
        if (iPosition >= 0) {
            p[iPosition] = positionUm;
        }
        if (iWidth >= 0) {
            p[iWidth] = widthUm;
        } else {
            p[2] = amplitude * widthUm * Math.sqrt(2 * Math.PI);   // the released amount of a point source
        }
        p[iBase] = baseline;
        if (iTime >= 0) {
            p[iTime] = timeS;
        }
        return p;
    }

    @Override
    public void evaluate(double[] p, double[] values, double[] jac) {
        int np = specs.size();
        double d = p[0];
        double k = p[1];
        double amp = p[2];
        double x0 = iPosition >= 0 ? p[iPosition] : fixedPositionUm;
        double s0 = iWidth >= 0 ? p[iWidth] : 0;
        double base = p[iBase];
        double t0 = iTime >= 0 ? p[iTime] : fixedTimeS;
        int nx = xUm.length;
        double lenUm = walls == null ? 0 : walls[1] - walls[0];
        if (jac != null) {
            java.util.Arrays.fill(jac, 0);
        }
        for (int f = 0; f < tS.length; f++) {
            double tau = tS[f] - t0;
            int row = f * nx;
            if (tau < 0 || (point && tau <= 0)) {
                for (int c = 0; c < nx; c++) {
                    values[row + c] = base;
                    if (jac != null) {
                        jac[(row + c) * np + iBase] = 1;
                    }
                }
                continue;
            }
            double v = s0 * s0 + 2 * d * tau;
            double decay = Math.exp(-k * tau);
            // peak factor without the amplitude: s0 / sqrt(V) for a pulse of peak A, 1 / sqrt(2 pi V) for a point
            // source of amount A
            double shape = (point ? 1 / Math.sqrt(2 * Math.PI * v) : s0 / Math.sqrt(v)) * decay;
            double cut = 80 * v;                        // exp(-40) is below double precision relative to the peak
            // Images within reach of the grid; capped because past ~50 the profile is flat to double precision
            // (V above about 100 L^2) and an optimiser straying there must not stall on a huge loop.
            int images = walls == null ? 0
                    : (int) Math.min(MAX_IMAGES, Math.ceil((Math.sqrt(cut) + lenUm) / (2 * lenUm)) + 1);
            for (int c = 0; c < nx; c++) {
                double x = xUm[c];
                double e = 0;     // sum of exp(-(x - xi)^2 / 2V)
                double eq = 0;    // sum of (x - xi)^2 exp(...)
                double ex = 0;    // sum of sign_i (x - xi) exp(...), sign -1 for mirrored sources
                for (int m = -images; m <= images; m++) {
                    double xi = x0 + 2 * m * lenUm;
                    double dx = x - xi;
                    double q = dx * dx;
                    if (q < cut) {
                        double g = Math.exp(-q / (2 * v));
                        e += g;
                        eq += q * g;
                        ex += dx * g;
                    }
                    if (walls != null) {
                        double xm = 2 * walls[0] - x0 + 2 * m * lenUm;
                        double dm = x - xm;
                        double qm = dm * dm;
                        if (qm < cut) {
                            double g = Math.exp(-qm / (2 * v));
                            e += g;
                            eq += qm * g;
                            ex -= dm * g;
                        }
                    }
                }
                int g0 = row + c;
                values[g0] = base + amp * shape * e;
                if (jac != null) {
                    int r = g0 * np;
                    double val = amp * shape;
                    // dc/dV = A shape (-e / (2V) + eq / (2V^2))
                    double dV = val * (-e / (2 * v) + eq / (2 * v * v));
                    jac[r] = dV * 2 * tau;
                    jac[r + 1] = -tau * val * e;
                    jac[r + 2] = shape * e;
                    if (iPosition >= 0) {
                        jac[r + iPosition] = val * ex / v;
                    }
                    if (!point) {
                        jac[r + iWidth] = val * e / s0 + dV * 2 * s0;
                    }
                    jac[r + iBase] = 1;
                    if (iTime >= 0) {
                        // d/dt0 = -d/dtau; d/dtau = -k c + dV 2D
                        jac[r + iTime] = k * val * e - dV * 2 * d;
                    }
                }
            }
        }
    }

    @Override
    public boolean hasNormalEquations() {
        return true;
    }

    /**
     * One pass per frame, frames split into fixed blocks summed in parallel and added in block order (so the result
     * does not depend on the number of cores). Within a frame every Jacobian row is a frame-dependent p x 4 matrix
     * M times phi_c = (e_c, eq_c, ex_c, 1) (the sums over images of g, (x - xi)^2 g and the signed (x - xi) g, as in
     * {@link #evaluate}), so a frame adds M S M^T to A with S = sum_c w_c phi_c phi_c^T, and M t to g with
     * t = sum_c w_c r_c phi_c: fifteen running sums per grid point. On evenly spaced columns each Gaussian comes
     * from the recurrence g_{c+1} = g_c rho_c, rho_{c+1} = rho_c exp(-h^2 / V), restarted from exact exponentials
     * every {@value #BLOCK} samples and confined to the samples within sqrt(80 V) of the source (where the plain
     * evaluation cuts too).
     */
    @Override
    public void normalEquations(double[] p, FitData data, NormalEquations out, double[] fitted) {
        Checks.require(data.size() == size(), "the data do not lie on this model's grid");
        int nx = xUm.length;
        int nt = tS.length;
        int framesPerTask = Math.max(Math.max(1, POINTS_PER_TASK / nx), (nt + MAX_TASKS - 1) / MAX_TASKS);
        int tasks = (nt + framesPerTask - 1) / framesPerTask;
        double[][] parts = new double[tasks][];
        IntStream range = IntStream.range(0, tasks);
        if (tasks > 1) {
            range = range.parallel();
        }
        range.forEach(b -> parts[b] = sweep(p, data, fitted, b * framesPerTask,
                Math.min(nt, (b + 1) * framesPerTask)));
        out.clear();
        for (double[] part : parts) {
            out.addPacked(part);
        }
    }

    /** A (p x p), g (p) and chi^2 of frames [from, to), packed in one array. */
    private double[] sweep(double[] p, FitData data, double[] fitted, int from, int to) {
        int np = specs.size();
        double d = p[0];
        double k = p[1];
        double amp = p[2];
        double x0 = iPosition >= 0 ? p[iPosition] : fixedPositionUm;
        double s0 = iWidth >= 0 ? p[iWidth] : 0;
        double base = p[iBase];
        double t0 = iTime >= 0 ? p[iTime] : fixedTimeS;
        int nx = xUm.length;
        double lenUm = walls == null ? 0 : walls[1] - walls[0];
        double[] part = new double[np * np + np + 1];
        int gOff = np * np;
        int chiOff = gOff + np;
        Scratch work = scratch.get();
        double[] e = work.e;
        double[] eq = work.eq;
        double[] ex = work.ex;
        double[] m = work.m;
        double[] sm = work.s;
        double[] ms = work.ms;
        for (int f = from; f < to; f++) {
            double tau = tS[f] - t0;
            int row = f * nx;
            if (tau < 0 || (point && tau <= 0)) {
                double sw = 0;
                double swr = 0;
                double swrr = 0;
                for (int c = 0; c < nx; c++) {
                    int g = row + c;
                    double w = data.weight(g);
                    double r = data.observed(g) - base;
                    sw += w;
                    swr += w * r;
                    swrr += w * r * r;
                    if (fitted != null) {
                        fitted[g] = base;
                    }
                }
                part[iBase * np + iBase] += sw;
                part[gOff + iBase] += swr;
                part[chiOff] += swrr;
                continue;
            }
            double v = s0 * s0 + 2 * d * tau;
            double decay = Math.exp(-k * tau);
            double shape = (point ? 1 / Math.sqrt(2 * Math.PI * v) : s0 / Math.sqrt(v)) * decay;
            double cut = 80 * v;
            int images = walls == null ? 0
                    : (int) Math.min(MAX_IMAGES, Math.ceil((Math.sqrt(cut) + lenUm) / (2 * lenUm)) + 1);
            java.util.Arrays.fill(e, 0);
            java.util.Arrays.fill(eq, 0);
            java.util.Arrays.fill(ex, 0);
            for (int mi = -images; mi <= images; mi++) {
                addSource(x0 + 2 * mi * lenUm, 1, v, cut, e, eq, ex);
                if (walls != null) {
                    addSource(2 * walls[0] - x0 + 2 * mi * lenUm, -1, v, cut, e, eq, ex);
                }
            }
            double val = amp * shape;
            double see = 0, seq = 0, sex = 0, se = 0, sqq = 0, sqx = 0, sq = 0, sxx = 0, sx = 0, s1 = 0;
            double te = 0, tq = 0, tx = 0, t1 = 0, chi = 0;
            for (int c = 0; c < nx; c++) {
                int g = row + c;
                double ec = e[c];
                double qc = eq[c];
                double xc = ex[c];
                double value = base + val * ec;
                if (fitted != null) {
                    fitted[g] = value;
                }
                double w = data.weight(g);
                double r = data.observed(g) - value;
                double we = w * ec;
                double wq = w * qc;
                double wx = w * xc;
                double wr = w * r;
                see += we * ec;
                seq += we * qc;
                sex += we * xc;
                se += we;
                sqq += wq * qc;
                sqx += wq * xc;
                sq += wq;
                sxx += wx * xc;
                sx += wx;
                s1 += w;
                te += wr * ec;
                tq += wr * qc;
                tx += wr * xc;
                t1 += wr;
                chi += wr * r;
            }
            double[] s = sm;
            s[0] = see;  s[1] = seq;  s[2] = sex;  s[3] = se;
            s[4] = seq;  s[5] = sqq;  s[6] = sqx;  s[7] = sq;
            s[8] = sex;  s[9] = sqx;  s[10] = sxx; s[11] = sx;
            s[12] = se;  s[13] = sq;  s[14] = sx;  s[15] = s1;
            rowFactors(m, tau, val, v, shape, d, k, s0);
            for (int a = 0; a < np; a++) {
                for (int j = 0; j < 4; j++) {
                    double acc = 0;
                    for (int l = 0; l < 4; l++) {
                        acc += m[a * 4 + l] * s[l * 4 + j];
                    }
                    ms[a * 4 + j] = acc;
                }
            }
            for (int a = 0; a < np; a++) {
                for (int b = 0; b < np; b++) {
                    double acc = 0;
                    for (int j = 0; j < 4; j++) {
                        acc += ms[a * 4 + j] * m[b * 4 + j];
                    }
                    part[a * np + b] += acc;
                }
                part[gOff + a] += m[a * 4] * te + m[a * 4 + 1] * tq + m[a * 4 + 2] * tx + m[a * 4 + 3] * t1;
            }
            part[chiOff] += chi;
        }
        return part;
    }

    /**
     * The p x 4 matrix M (row-major) of one frame with d value / d theta = M phi, phi = (e, eq, ex, 1) the sums over
     * images of g, (x - xi)^2 g and the signed (x - xi) g at a column; the rows follow the Jacobian of
     * {@link #evaluate}.
     */
    private void rowFactors(double[] m, double tau, double val, double v, double shape, double d, double k,
                            double s0) {
        java.util.Arrays.fill(m, 0);
        m[0] = -tau * val / v;
        m[1] = tau * val / (v * v);
        m[4] = -tau * val;
        m[8] = shape;
        if (iPosition >= 0) {
            m[iPosition * 4 + 2] = val / v;
        }
        if (!point) {
            m[iWidth * 4] = val / s0 - s0 * val / v;
            m[iWidth * 4 + 1] = s0 * val / (v * v);
        }
        m[iBase * 4 + 3] = 1;
        if (iTime >= 0) {
            m[iTime * 4] = k * val + d * val / v;
            m[iTime * 4 + 1] = -d * val / (v * v);
        }
    }

    @Override
    public boolean hasRangeEvaluation() {
        return true;
    }

    /**
     * Frame by frame as in the one-pass sums: the Gaussians of a frame from the recurrence of
     * {@link #normalEquations}, then each Jacobian row as M phi.
     */
    @Override
    public void evaluateRange(double[] p, int from, int to, double[] values, double[] jac) {
        Checks.require(0 <= from && from <= to && to <= size(), "the range lies outside this model's grid");
        int np = specs.size();
        double d = p[0];
        double k = p[1];
        double amp = p[2];
        double x0 = iPosition >= 0 ? p[iPosition] : fixedPositionUm;
        double s0 = iWidth >= 0 ? p[iWidth] : 0;
        double base = p[iBase];
        double t0 = iTime >= 0 ? p[iTime] : fixedTimeS;
        int nx = xUm.length;
        double lenUm = walls == null ? 0 : walls[1] - walls[0];
        Scratch work = scratch.get();
        double[] e = work.e;
        double[] eq = work.eq;
        double[] ex = work.ex;
        double[] m = work.m;
        java.util.Arrays.fill(jac, 0, (to - from) * np, 0);
        for (int f = from / nx; f * nx < to; f++) {
            int first = Math.max(from, f * nx) - f * nx;
            int last = Math.min(to, (f + 1) * nx) - f * nx;
            double tau = tS[f] - t0;
            if (tau < 0 || (point && tau <= 0)) {
                for (int c = first; c < last; c++) {
                    int i = f * nx + c - from;
                    values[i] = base;
                    jac[i * np + iBase] = 1;
                }
                continue;
            }
            double v = s0 * s0 + 2 * d * tau;
            double decay = Math.exp(-k * tau);
            double shape = (point ? 1 / Math.sqrt(2 * Math.PI * v) : s0 / Math.sqrt(v)) * decay;
            double cut = 80 * v;
            int images = walls == null ? 0
                    : (int) Math.min(MAX_IMAGES, Math.ceil((Math.sqrt(cut) + lenUm) / (2 * lenUm)) + 1);
            java.util.Arrays.fill(e, 0);
            java.util.Arrays.fill(eq, 0);
            java.util.Arrays.fill(ex, 0);
            for (int mi = -images; mi <= images; mi++) {
                addSource(x0 + 2 * mi * lenUm, 1, v, cut, e, eq, ex);
                if (walls != null) {
                    addSource(2 * walls[0] - x0 + 2 * mi * lenUm, -1, v, cut, e, eq, ex);
                }
            }
            double val = amp * shape;
            rowFactors(m, tau, val, v, shape, d, k, s0);
            for (int c = first; c < last; c++) {
                int i = f * nx + c - from;
                values[i] = base + val * e[c];
                int r = i * np;
                for (int a = 0; a < np; a++) {
                    jac[r + a] = m[a * 4] * e[c] + m[a * 4 + 1] * eq[c] + m[a * 4 + 2] * ex[c] + m[a * 4 + 3];
                }
            }
        }
    }

    /**
     * Adds one source's exp(-(x - mu)^2 / 2V) to e, its (x - mu)^2 multiple to eq and sign (x - mu) times it to ex,
     * at the columns within sqrt(cut) of mu.
     */
    private void addSource(double mu, double sign, double v, double cut, double[] e, double[] eq, double[] ex) {
        int nx = xUm.length;
        double inv2v = 1 / (2 * v);
        double h = stepUm;
        if (Double.isNaN(h)) {
            for (int c = 0; c < nx; c++) {
                double dx = xUm[c] - mu;
                double q = dx * dx;
                if (q < cut) {
                    double g = Math.exp(-q * inv2v);
                    e[c] += g;
                    eq[c] += q * g;
                    ex[c] += sign * dx * g;
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
                double q = dx * dx;
                if (q < cut) {
                    e[c] += g;
                    eq[c] += q * g;
                    ex[c] += sign * dx * g;
                }
                g *= ratio;
                ratio *= stepRatio;
            }
        }
    }
}
