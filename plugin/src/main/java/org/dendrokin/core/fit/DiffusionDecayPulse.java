package org.dendrokin.core.fit;

import java.util.ArrayList;
import java.util.List;

import org.dendrokin.core.Checks;
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
    public static final String NAME = "diffusion-decay";
    private static final int MAX_IMAGES = 50;

    private final double[] xUm;
    private final double[] tS;
    private final double fixedTimeS;
    private final double fixedPositionUm;
    private final double[] walls;
    private final List<ParameterSpec> specs;
    private final int iPosition;
    private final int iTime;

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
        if (!Double.isNaN(stimulusTimeS)) {
            s.add(ParameterSpec.positive("width", Unit.MICROMETRE));
        }
        s.add(ParameterSpec.linear("baseline", signalUnit));
        iTime = Double.isNaN(stimulusTimeS) ? s.size() : -1;
        if (iTime >= 0) {
            s.add(ParameterSpec.linear("stimulus_time", Unit.SECOND));
        }
        this.specs = List.copyOf(s);
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
        return List.of(new DerivedQuantity("length_constant", Unit.MICROMETRE, true,
                th -> Math.sqrt(th[0] / th[1])));
    }

    /** Parameter vector in this model's order from the full set (D, k, A, x0, s0, b, t0). */
    public double[] pack(double d, double k, double amplitude, double positionUm, double widthUm, double baseline,
                         double timeS) {
        double[] p = new double[specs.size()];
        p[0] = d;
        p[1] = k;
        p[2] = amplitude;
        int i = 3;
        if (iPosition >= 0) {
            p[i++] = positionUm;
        }
        if (iTime < 0) {
            p[i++] = widthUm;
        } else {
            p[2] = amplitude * widthUm * Math.sqrt(2 * Math.PI);   // the released amount of a point source
        }
        p[i++] = baseline;
        if (iTime >= 0) {
            p[i] = timeS;
        }
        return p;
    }

    @Override
    public void evaluate(double[] p, double[] values, double[] jac) {
        int np = specs.size();
        double d = p[0];
        double k = p[1];
        double amp = p[2];
        int i = 3;
        double x0 = iPosition >= 0 ? p[i++] : fixedPositionUm;
        boolean point = iTime >= 0;
        int iWidth = point ? -1 : i;
        double s0 = point ? 0 : p[i++];
        int iBase = i;
        double base = p[i];
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
}
