package org.dendrokin.core.model;

import java.util.Arrays;
import java.util.List;

import org.dendrokin.core.Checks;

/**
 * A reaction network on a cable, deterministic: every species diffuses with its own D and reacts at every
 * node, dc_s/dt = D_s (L c_s) + sum_r N[s][r] v_r(c). Prepared once per grid, stimuli and sampling.
 * <p>
 * Scheme: Strang splitting, as {@link ScalarRun}: a reaction half step at every node by the two-stage
 * L-stable Rosenbrock method ROS2 (Verwer et al. 1999) with the exact Jacobian of the rate expressions
 * (an m x m solve per stage, m = number of species, so stiff reactions such as fast buffering stay stable),
 * one Crank-Nicolson diffusion step per species (Thomas algorithm), and another reaction half step.
 * Second order in dt and h. At fixed ends every species is held at its resting value and does not react.
 * Time step rule: {@link SolverSettings} with the network's rate scale and its largest D.
 * <p>
 * Not thread-safe; {@code solve} allocates nothing.
 */
public final class NetworkRun {
    private static final double GAMMA = 1 + 1 / Math.sqrt(2);
    private static final int CACHE = 4;

    private final ReactionNetwork network;
    private final CableGrid grid;
    private final int n;
    private final int m;
    private final Timeline timeline;
    private final List<Stimulus> stimuli;
    private final int[] stimulusSpecies;
    private final double[][] profile;
    private final boolean[][] clampMask;
    private final double minWidthUm;
    private final int frames;
    private final int positions;
    private final OutputSampler sampler;
    private final SolverSettings settings;
    private final double[] d;

    private final double[][] c;
    private final double[] rhs;
    private final double[][] source;
    private final boolean[] injectionOn;
    private final boolean[] clampOn;
    private final double[] node;
    private final double[] stage;
    private final double[] f;
    private final double[] k1;
    private final double[] k2;
    private final double[] w;
    private final int[] pivot;
    private final double[] cacheC;
    private final double[][] cacheLower;
    private final double[][] cacheCPrime;
    private final double[][] cacheInvPivot;
    private final double[][] cachePLower;
    private final double[][] cachePDiag;
    private final double[][] cachePUpper;
    private final double[] work;
    private final double[][] cPrev;
    private int cacheNext;
    private long lastStepCount;

    private NetworkRun(ReactionNetwork network, Domain domain, double[] outputTimesS, double[] outputPositionsUm,
            List<Stimulus> stimuli, SolverSettings settings, String observedDefault) {
        this.network = network.forThread();
        this.grid = new CableGrid(domain, settings.spatialOrder());
        this.n = grid.n;
        this.m = network.speciesCount();
        this.settings = settings;
        this.d = network.diffusionUm2PerS();
        this.stimuli = List.copyOf(stimuli);
        this.timeline = new Timeline(outputTimesS, this.stimuli, false);
        this.frames = outputTimesS.length;
        this.positions = outputPositionsUm.length;
        sampler = new OutputSampler(outputPositionsUm, domain.lengthUm(), grid.h, n);
        int count = this.stimuli.size();
        stimulusSpecies = new int[count];
        profile = new double[count][];
        clampMask = new boolean[count][];
        double narrowest = Double.POSITIVE_INFINITY;
        for (int s = 0; s < count; s++) {
            Stimulus st = this.stimuli.get(s);
            String name = st.species() == null ? observedDefault : st.species();
            stimulusSpecies[s] = network.indexOf(name);
            Checks.require(stimulusSpecies[s] >= 0, "a stimulus names species '" + name
                    + "', which the network does not have " + network.species());
            if (st.kind() == Stimulus.Kind.CLAMP) {
                clampMask[s] = new boolean[n];
                boolean any = false;
                for (int i = 0; i < n; i++) {
                    boolean end = grid.fixedEnds && (i == 0 || i == n - 1);
                    clampMask[s][i] = !end && st.clamps(grid.x(i));
                    any |= clampMask[s][i];
                }
                Checks.require(any, "the clamp at " + st.positionUm() + " um covers no grid node");
                narrowest = Math.min(narrowest, grid.h);
            } else {
                profile[s] = new double[n];
                for (int i = 0; i < n; i++) {
                    boolean end = grid.fixedEnds && (i == 0 || i == n - 1);
                    profile[s][i] = end ? 0 : st.profile(grid.x(i));
                }
                narrowest = Math.min(narrowest, st.widthUm());
            }
        }
        minWidthUm = narrowest;
        c = new double[m][n];
        rhs = new double[n];
        source = new double[m][n];
        injectionOn = new boolean[count];
        clampOn = new boolean[count];
        node = new double[m];
        stage = new double[m];
        f = new double[m];
        k1 = new double[m];
        k2 = new double[m];
        w = new double[m * m];
        pivot = new int[m];
        cacheC = new double[CACHE * m];
        Arrays.fill(cacheC, Double.NaN);
        cacheLower = new double[CACHE * m][n];
        cacheCPrime = new double[CACHE * m][n];
        cacheInvPivot = new double[CACHE * m][n];
        cachePLower = new double[CACHE * m][n];
        cachePDiag = new double[CACHE * m][n];
        cachePUpper = new double[CACHE * m][n];
        work = new double[n];
        cPrev = new double[m][n];
    }

    /**
     * @param network           the reactions and species
     * @param domain            the cable
     * @param outputTimesS      sampling times, s
     * @param outputPositionsUm sampling positions, um
     * @param stimuli           protocol; a stimulus without a species acts on {@code observed}
     * @param settings          time-step rule
     * @param observed          the species stimuli default to
     */
    public static NetworkRun prepare(ReactionNetwork network, Domain domain, double[] outputTimesS,
            double[] outputPositionsUm, List<Stimulus> stimuli, SolverSettings settings, String observed) {
        Checks.require(network.indexOf(observed) >= 0, "species '" + observed + "' is not in the network");
        return new NetworkRun(network, domain, outputTimesS.clone(), outputPositionsUm.clone(), stimuli, settings,
                observed);
    }

    public int frameCount() {
        return frames;
    }

    public int positionCount() {
        return positions;
    }

    public ReactionNetwork network() {
        return network;
    }

    /** The spatial order actually used (4 only on a uniform cross-section). */
    public int spatialOrder() {
        return grid.compact ? 4 : 2;
    }

    public long lastStepCount() {
        return lastStepCount;
    }

    /**
     * Solves the network and samples every species.
     *
     * @param out {@code out[s][frame * positions + position]} = c_s(t, x), one row per species (a row may be
     *            null to skip that species). Modified.
     */
    public void solve(double[][] out) {
        Checks.require(out.length == m, "need one output row per species");
        double[] init = network.initial();
        for (int s = 0; s < m; s++) {
            Arrays.fill(c[s], init[s]);
            Arrays.fill(source[s], 0);
        }
        Arrays.fill(injectionOn, false);
        Arrays.fill(clampOn, false);
        double dMax = 0;
        for (double v : d) {
            dMax = Math.max(dMax, v);
        }
        double dtMax = settings.maxStep(network.rateScalePerS(), grid.h, dMax, minWidthUm);
        boolean smooth = false;
        long steps = 0;
        int interior = 0;
        Timeline tl = timeline;
        int nb = tl.breakCount();
        for (int j = 0; j < nb; j++) {
            boolean injectionsChanged = false;
            for (int e = tl.eventStart[j]; e < tl.eventStart[j + 1]; e++) {
                int s = tl.eventStimulus[e];
                switch (tl.eventType[e]) {
                    case Timeline.INJECTION_OFF, Timeline.INJECTION_ON -> {
                        injectionOn[s] = tl.eventType[e] == Timeline.INJECTION_ON;
                        injectionsChanged = true;
                    }
                    case Timeline.CLAMP_OFF, Timeline.CLAMP_ON -> {
                        clampOn[s] = tl.eventType[e] == Timeline.CLAMP_ON;
                        smooth = true;
                    }
                    case Timeline.PULSE -> {
                        double a = stimuli.get(s).amount();
                        double[] g = profile[s];
                        double[] target = c[stimulusSpecies[s]];
                        for (int i = 0; i < n; i++) {
                            target[i] += a * g[i];
                        }
                        smooth = true;
                    }
                    default -> throw new IllegalStateException();
                }
            }
            if (injectionsChanged) {
                for (double[] row : source) {
                    Arrays.fill(row, 0);
                }
                for (int s = 0; s < injectionOn.length; s++) {
                    if (injectionOn[s]) {
                        Stimulus st = stimuli.get(s);
                        double r = st.amount() / st.durationS();
                        double[] g = profile[s];
                        double[] row = source[stimulusSpecies[s]];
                        for (int i = 0; i < n; i++) {
                            row[i] += r * g[i];
                        }
                    }
                }
                // sources enter as B q, like the time derivative (B = I unless compact)
                for (double[] row : source) {
                    System.arraycopy(row, 0, work, 0, n);
                    grid.applyMass(work, row);
                }
            }
            boolean anyClamp = false;
            for (boolean on : clampOn) {
                anyClamp |= on;
            }
            if (anyClamp) {
                applyClamps();
            }
            for (int o = tl.outputStart[j]; o < tl.outputStart[j + 1]; o++) {
                int frame = tl.outputFrame[o];
                for (int s = 0; s < m; s++) {
                    if (out[s] != null) {
                        sampler.sample(c[s], out[s], frame);
                    }
                }
            }
            if (j == nb - 1) {
                break;
            }
            double gap = tl.breaksS[j + 1] - tl.breaksS[j];
            double target = settings.fixedStepS() > 0 ? settings.fixedStepS() : dtMax;
            long count = Math.max(1, (long) Math.ceil(gap / target - 1e-9));
            double dt = gap / count;
            double t = tl.breaksS[j];
            for (long step = 0; step < count; step++) {
                double tNext = step == count - 1 ? tl.breaksS[j + 1] : tl.breaksS[j] + (step + 1) * dt;
                boolean interpolate = interior < tl.interiorTimeS.length && tl.interiorTimeS[interior] <= tNext;
                if (interpolate) {
                    for (int s = 0; s < m; s++) {
                        if (out[s] != null) {
                            System.arraycopy(c[s], 0, cPrev[s], 0, n);
                        }
                    }
                }
                react(0.5 * dt);
                for (int s = 0; s < m; s++) {
                    diffuse(s, dt, smooth && settings.smoothing());
                }
                smooth = false;
                react(0.5 * dt);
                if (anyClamp) {
                    applyClamps();
                }
                while (interior < tl.interiorTimeS.length && tl.interiorTimeS[interior] <= tNext) {
                    // outputs between steps: linear in time, second order like the scheme
                    double w = (tl.interiorTimeS[interior] - t) / (tNext - t);
                    int frame = tl.interiorFrame[interior];
                    for (int s = 0; s < m; s++) {
                        if (out[s] != null) {
                            sampler.blend(cPrev[s], c[s], w, out[s], frame);
                        }
                    }
                    interior++;
                }
                t = tNext;
            }
            steps += count;
        }
        lastStepCount = steps;
    }

    private void applyClamps() {
        for (int s = 0; s < clampOn.length; s++) {
            if (clampOn[s]) {
                boolean[] mask = clampMask[s];
                double value = stimuli.get(s).amount();
                double[] row = c[stimulusSpecies[s]];
                for (int i = 0; i < n; i++) {
                    if (mask[i]) {
                        row[i] = value;
                    }
                }
            }
        }
    }

    /** Cache slot of A = B - cc L (factored) and P = B + cc L for one species; computed on a miss. */
    private int factorisation(int species, double cc) {
        for (int k = 0; k < CACHE; k++) {
            if (cacheC[species * CACHE + k] == cc) {
                return species * CACHE + k;
            }
        }
        int slot = species * CACHE + cacheNext;
        cacheNext = (cacheNext + 1) % CACHE;
        double[] lower = cacheLower[slot];
        double[] diag = rhs;    // scratch: rhs is rebuilt before each use
        double[] upper = work;  // scratch: work is only used when sources change
        for (int i = 0; i < n; i++) {
            lower[i] = grid.massLower[i] - cc * grid.lower[i];
            diag[i] = grid.massDiag[i] - cc * grid.diag[i];
            upper[i] = grid.massUpper[i] - cc * grid.upper[i];
            cachePLower[slot][i] = grid.massLower[i] + cc * grid.lower[i];
            cachePDiag[slot][i] = grid.massDiag[i] + cc * grid.diag[i];
            cachePUpper[slot][i] = grid.massUpper[i] + cc * grid.upper[i];
        }
        TridiagonalSolver.factor(lower, diag, upper, cacheCPrime[slot], cacheInvPivot[slot]);
        cacheC[slot] = cc;
        return slot;
    }

    /** Crank-Nicolson (B - c L) u1 = (B + c L) u0 + dt B q for one species, or two backward-Euler half steps. */
    private void diffuse(int s, double dt, boolean rannacher) {
        double ds = d[s];
        double[] u = c[s];
        double[] q = source[s];
        if (ds == 0) {
            if (grid.compact) {
                // B u_t = B q: an immobile species just accumulates its source
                for (int i = 0; i < n; i++) {
                    work[i] = dt * q[i];
                }
                TridiagonalSolver.solve(grid.massLower, grid.massDiag, grid.massUpper, work, work, rhs);
                for (int i = 0; i < n; i++) {
                    u[i] += work[i];
                }
            } else {
                for (int i = 0; i < n; i++) {
                    u[i] += dt * q[i];
                }
            }
            return;
        }
        double cc = 0.5 * dt * ds;
        int slot = factorisation(s, cc);
        double[] lower = cacheLower[slot];
        double[] cPrime = cacheCPrime[slot];
        double[] invPivot = cacheInvPivot[slot];
        if (rannacher) {
            double half = 0.5 * dt;
            for (int sub = 0; sub < 2; sub++) {
                grid.applyMass(u, rhs);
                for (int i = 0; i < n; i++) {
                    rhs[i] += half * q[i];
                }
                TridiagonalSolver.solveFactored(lower, cPrime, invPivot, rhs, u);
            }
            return;
        }
        double[] pl = cachePLower[slot];
        double[] pd = cachePDiag[slot];
        double[] pu = cachePUpper[slot];
        int last = n - 1;
        rhs[0] = pd[0] * u[0] + pu[0] * u[1] + dt * q[0];
        for (int i = 1; i < last; i++) {
            rhs[i] = pl[i] * u[i - 1] + pd[i] * u[i] + pu[i] * u[i + 1] + dt * q[i];
        }
        rhs[last] = pl[last] * u[last - 1] + pd[last] * u[last] + dt * q[last];
        TridiagonalSolver.solveFactored(lower, cPrime, invPivot, rhs, u);
    }

    /**
     * ROS2 at every node: W k1 = f(u), W k2 = f(u + tau k1) - 2 k1, u1 = u + tau (3 k1 + k2) / 2,
     * W = I - gamma tau J.
     */
    private void react(double tau) {
        if (network.reactions().isEmpty()) {
            return;
        }
        int from = grid.fixedEnds ? 1 : 0;
        int to = grid.fixedEnds ? n - 1 : n;
        double gt = GAMMA * tau;
        for (int i = from; i < to; i++) {
            for (int s = 0; s < m; s++) {
                node[s] = c[s][i];
            }
            network.jacobian(node, w);
            for (int a = 0; a < m * m; a++) {
                w[a] = -gt * w[a];
            }
            for (int a = 0; a < m; a++) {
                w[a * m + a] += 1;
            }
            luFactor();
            network.rates(node, f);
            System.arraycopy(f, 0, k1, 0, m);
            luSolve(k1);
            for (int s = 0; s < m; s++) {
                stage[s] = node[s] + tau * k1[s];
            }
            network.rates(stage, f);
            for (int s = 0; s < m; s++) {
                k2[s] = f[s] - 2 * k1[s];
            }
            luSolve(k2);
            for (int s = 0; s < m; s++) {
                c[s][i] = node[s] + tau * (1.5 * k1[s] + 0.5 * k2[s]);
            }
        }
    }

    /** In-place LU with partial pivoting of the m x m matrix w. */
    private void luFactor() {
        for (int col = 0; col < m; col++) {
            int best = col;
            double big = Math.abs(w[col * m + col]);
            for (int r = col + 1; r < m; r++) {
                double v = Math.abs(w[r * m + col]);
                if (v > big) {
                    big = v;
                    best = r;
                }
            }
            pivot[col] = best;
            if (best != col) {
                for (int k = 0; k < m; k++) {
                    double t = w[col * m + k];
                    w[col * m + k] = w[best * m + k];
                    w[best * m + k] = t;
                }
            }
            double p = w[col * m + col];
            if (p == 0) {
                throw new IllegalStateException(
                        "singular reaction step matrix; the reactions are too stiff for the step");
            }
            for (int r = col + 1; r < m; r++) {
                double factor = w[r * m + col] / p;
                w[r * m + col] = factor;
                for (int k = col + 1; k < m; k++) {
                    w[r * m + k] -= factor * w[col * m + k];
                }
            }
        }
    }

    private void luSolve(double[] b) {
        for (int col = 0; col < m; col++) {
            int p = pivot[col];
            if (p != col) {
                double t = b[col];
                b[col] = b[p];
                b[p] = t;
            }
            for (int r = col + 1; r < m; r++) {
                b[r] -= w[r * m + col] * b[col];
            }
        }
        for (int r = m - 1; r >= 0; r--) {
            double sum = b[r];
            for (int k = r + 1; k < m; k++) {
                sum -= w[r * m + k] * b[k];
            }
            b[r] = sum / w[r * m + r];
        }
    }
}
