package org.dendrokin.core.model;

import java.util.Arrays;
import java.util.List;

import org.dendrokin.core.Checks;

/**
 * A one-species reaction-diffusion model on a cable, prepared once per grid, stimuli and output sampling,
 * then run many times with different parameters (what a fit does).
 * <pre>
 *   diffusion-decay:  u_t = D u_xx - k u                     parameters D (um^2/s), k (1/s)
 *   nagumo:           u_t = D u_xx + k u (1 - u)(u - a)      parameters D (um^2/s), k (1/s), a (dimensionless)
 *   fisher-kpp:       u_t = D u_xx + r u (1 - u)             parameters D (um^2/s), r (1/s)
 * </pre>
 * plus the stimuli (pulses, injections, clamps). With a varying cross-section the diffusion term is the
 * flux-conservative (1/A) d/dx(A D du/dx) of {@link CableGrid}. The initial state is zero.
 * <p>
 * Scheme: Strang splitting (Strang 1968; sheet s6.4) of each step dt into a reaction half step, a
 * Crank-Nicolson diffusion step (Crank &amp; Nicolson 1947; sheet s6.2; tridiagonal, Thomas algorithm) and
 * another reaction half step. Reaction half steps are exact for decay (exp(-k dt/2)) and for the logistic
 * term of Fisher-KPP, and the L-stable two-stage Rosenbrock method ROS2 (Verwer, Spee, Blom &amp; Hundsdorfer
 * 1999) for Nagumo's cubic, so stiff reactions (k dt large) stay stable. Every part is second order, so the
 * whole step is second order in dt and, through the 3-point Laplacian, in h. Injections enter the
 * Crank-Nicolson step as a constant source over the step. The time step follows {@link SolverSettings}.
 * <p>
 * Sensitivities: {@link #solveWithSensitivities} differentiates every sub-step of the same scheme
 * (forward sensitivity equations discretised exactly as u is), so they are the exact derivatives of
 * {@link #solve}'s output as long as the number of steps does not change.
 * <p>
 * Not thread-safe: one instance per thread. {@code solve} allocates nothing.
 */
public final class ScalarRun {
    private enum Model {
        DIFFUSION_DECAY("diffusion-decay", "D", "k"),
        NAGUMO("nagumo", "D", "k", "a"),
        FISHER_KPP("fisher-kpp", "D", "r");

        final String label;
        final List<String> parameters;

        Model(String label, String... parameters) {
            this.label = label;
            this.parameters = List.of(parameters);
        }
    }

    /** Names of the scalar models, as {@link #prepare} accepts them. */
    public static final List<String> MODELS = List.of("diffusion-decay", "nagumo", "fisher-kpp");

    private static final double GAMMA = 1 + 1 / Math.sqrt(2);
    private static final int CACHE = 4;

    private final Model model;
    private final CableGrid grid;
    private final int n;
    private final Timeline timeline;
    private final List<Stimulus> stimuli;
    private final double[][] profile;
    private final boolean[][] clampMask;
    private final double minWidthUm;
    private final int frames;
    private final int positions;
    private final OutputSampler sampler;
    private final SolverSettings settings;

    // work arrays, reused by every solve
    private final double[] u;
    private final double[] rhs;
    private final double[] lapU0;
    private final double[] source;
    private final boolean[] injectionOn;
    private final boolean[] clampOn;
    private final double[][] sens;
    private final double[] sensRhs;
    private final double[][] sensScaled;
    private final double[][] scratch;
    // u and the sensitivities sampled at the output positions before and after a step with outputs inside it
    private final double[] sampledA;
    private final double[] sampledB;
    private final double[][] sensSampledA;
    private final double[][] sensSampledB;
    private final double[] cacheC = new double[CACHE];
    private final double[][] cacheLower;
    private final double[][] cacheCPrime;
    private final double[][] cacheInvPivot;
    private final double[][] cachePLower;
    private final double[][] cachePDiag;
    private final double[][] cachePUpper;
    private final double[][] cacheLowerOverPivot;
    private final double[][] cacheElim;
    private final double[][] cacheSubst;
    private final double[][] cacheTwInvPivot;
    private final double[][] cacheLapLower;
    private final double[][] cacheLapDiag;
    private final double[][] cacheLapUpper;
    private final double[][] cacheSLower;
    private final double[][] cacheSDiag;
    private final double[][] cacheSUpper;
    private final double[] stage;
    private boolean sourceActive;
    private int cacheNext;
    private long lastStepCount;
    private double[] initial;

    private ScalarRun(Model model, Domain domain, double[] outputTimesS, double[] outputPositionsUm,
            List<Stimulus> stimuli, SolverSettings settings) {
        this.model = model;
        this.grid = new CableGrid(domain, settings.spatialOrder());
        this.n = grid.n;
        this.settings = settings;
        this.stimuli = List.copyOf(stimuli);
        this.timeline = new Timeline(outputTimesS, this.stimuli, false);
        this.frames = outputTimesS.length;
        this.positions = outputPositionsUm.length;
        sampler = new OutputSampler(outputPositionsUm, domain.lengthUm(), grid.h, n);
        int count = this.stimuli.size();
        StimulusLayout layout = new StimulusLayout(grid, this.stimuli);
        profile = layout.profile;
        clampMask = layout.clampMask;
        minWidthUm = layout.minWidthUm;
        u = new double[n];
        rhs = new double[n];
        lapU0 = new double[n];
        source = new double[n];
        injectionOn = new boolean[count];
        clampOn = new boolean[count];
        sens = new double[model.parameters.size()][n];
        sensRhs = new double[n];
        sensScaled = new double[model.parameters.size()][n];
        scratch = new double[model == Model.NAGUMO ? 10 : 0][n];
        sampledA = new double[positions];
        sampledB = new double[positions];
        sensSampledA = new double[model.parameters.size()][positions];
        sensSampledB = new double[model.parameters.size()][positions];
        cacheLower = new double[CACHE][n];
        cacheCPrime = new double[CACHE][n];
        cacheInvPivot = new double[CACHE][n];
        cachePLower = new double[CACHE][n];
        cachePDiag = new double[CACHE][n];
        cachePUpper = new double[CACHE][n];
        cacheLowerOverPivot = new double[CACHE][n];
        cacheElim = new double[CACHE][n];
        cacheSubst = new double[CACHE][n];
        cacheTwInvPivot = new double[CACHE][n];
        cacheLapLower = new double[CACHE][n];
        cacheLapDiag = new double[CACHE][n];
        cacheLapUpper = new double[CACHE][n];
        cacheSLower = new double[CACHE][n];
        cacheSDiag = new double[CACHE][n];
        cacheSUpper = new double[CACHE][n];
        stage = new double[n];
        Arrays.fill(cacheC, Double.NaN);
    }

    /**
     * Prepares a run with the default {@link SolverSettings}.
     *
     * @param model             "diffusion-decay" (D, k), "nagumo" (D, k, a) or "fisher-kpp" (D, r)
     * @param domain            the cable
     * @param outputTimesS      times at which to sample the solution, s, zero or positive, any order
     * @param outputPositionsUm positions at which to sample, um, within [0, length]; values between nodes
     *                          are interpolated linearly
     * @param stimuli           the protocol, in any order; stimuli after the last output time are ignored
     * @throws IllegalArgumentException for an unknown model name or inconsistent sampling
     */
    public static ScalarRun prepare(String model, Domain domain, double[] outputTimesS, double[] outputPositionsUm,
            List<Stimulus> stimuli) {
        return prepare(model, domain, outputTimesS, outputPositionsUm, stimuli, SolverSettings.DEFAULT);
    }

    /** As {@link #prepare(String, Domain, double[], double[], List)}, with explicit solver settings. */
    public static ScalarRun prepare(String model, Domain domain, double[] outputTimesS, double[] outputPositionsUm,
            List<Stimulus> stimuli, SolverSettings settings) {
        Model m = null;
        for (Model candidate : Model.values()) {
            if (candidate.label.equals(model)) {
                m = candidate;
            }
        }
        Checks.require(m != null, "unknown scalar model '" + model + "'; known: " + MODELS);
        for (Stimulus s : stimuli) {
            Checks.require(s.species() == null || s.species().equals("u"),
                    "the " + model + " model has one species, u; a stimulus names '" + s.species() + "'");
        }
        return new ScalarRun(m, domain, outputTimesS.clone(), outputPositionsUm.clone(), stimuli, settings);
    }

    /** Parameter names in the order {@link #solve} expects them. */
    public List<String> parameterNames() {
        return model.parameters;
    }

    /** The model name. */
    public String modelName() {
        return model.label;
    }

    public int frameCount() {
        return frames;
    }

    public int positionCount() {
        return positions;
    }

    public int nodeCount() {
        return n;
    }

    /**
     * Replaces the zero initial state by the given node values (for checks against closed forms that start
     * from a profile rather than from a stimulus). Not part of the model JSON.
     *
     * @param values one value per grid node, or null for zero. Copied.
     */
    void setInitialState(double[] values) {
        Checks.require(values == null || values.length == n, "initial state needs one value per node (" + n + ")");
        initial = values == null ? null : values.clone();
    }

    /** The spatial order actually used (4 only on a uniform cross-section). */
    public int spatialOrder() {
        return grid.compact ? 4 : 2;
    }

    /** Number of time steps the last solve took. */
    public long lastStepCount() {
        return lastStepCount;
    }

    /**
     * Solves the model and samples it.
     *
     * @param parameters values in the order of {@link #parameterNames()}. Not modified.
     * @param out        receives u(t_frame, x_position) at {@code out[frame * positions + position]}, length
     *                   frames x positions. Modified.
     * @throws IllegalArgumentException for a parameter out of range (negative D or rate, non-finite value)
     */
    public void solve(double[] parameters, double[] out) {
        run(parameters, out, null);
    }

    /**
     * Solves the model and its forward sensitivities.
     *
     * @param parameters as for {@link #solve}. Not modified.
     * @param out        as for {@link #solve}. Modified.
     * @param sensOut    receives du/d(parameter p) at {@code sensOut[p][frame * positions + position]}; one row
     *                   per parameter, each of length frames x positions. Modified.
     */
    public void solveWithSensitivities(double[] parameters, double[] out, double[][] sensOut) {
        Checks.require(sensOut.length == model.parameters.size(),
                "need one sensitivity row per parameter (" + model.parameters.size() + ")");
        for (double[] row : sensOut) {
            Checks.require(row.length == frames * positions, "each sensitivity row needs frames x positions values");
        }
        run(parameters, out, sensOut);
    }

    private void run(double[] p, double[] out, double[][] sensOut) {
        Checks.require(p.length == model.parameters.size(), model.label + " takes " + model.parameters.size()
                + " parameters " + model.parameters + ", got " + p.length);
        Checks.require(out.length == frames * positions, "output needs frames x positions values");
        double d = Checks.nonNegativeFinite(p[0], "diffusion coefficient D (um^2/s)");
        double rate;
        switch (model) {
            case DIFFUSION_DECAY -> {
                Checks.nonNegativeFinite(p[1], "decay rate k (1/s)");
                rate = 0;   // integrated exactly; linear decay commutes with diffusion, so it sets no limit
            }
            case NAGUMO -> {
                rate = Checks.nonNegativeFinite(p[1], "rate k (1/s)");
                Checks.finite(p[2], "threshold a");
            }
            case FISHER_KPP -> rate = Checks.nonNegativeFinite(p[1], "growth rate r (1/s)");
            default -> throw new IllegalStateException();
        }
        boolean withSens = sensOut != null;
        if (initial != null) {
            System.arraycopy(initial, 0, u, 0, n);
        } else {
            Arrays.fill(u, 0);
        }
        Arrays.fill(source, 0);
        Arrays.fill(injectionOn, false);
        Arrays.fill(clampOn, false);
        sourceActive = false;
        if (withSens) {
            for (double[] s : sens) {
                Arrays.fill(s, 0);
            }
        }
        double dtMax = settings.maxStep(rate, grid.h, d, minWidthUm);
        boolean smooth = false;
        boolean anyClamp = false;
        long steps = 0;
        int interior = 0;
        Timeline tl = timeline;
        int nb = tl.breakCount();
        double[] before = sampledA;
        double[] after = sampledB;
        double[][] sensBefore = sensSampledA;
        double[][] sensAfter = sensSampledB;
        boolean afterIsCurrent = false;   // after holds u at the current time, sampled
        for (int j = 0; j < nb; j++) {
            afterIsCurrent = false;       // events may change u
            boolean injectionsChanged = false;
            for (int e = tl.eventStart[j]; e < tl.eventStart[j + 1]; e++) {
                int s = tl.eventStimulus[e];
                switch (tl.eventType[e]) {
                    case Timeline.INJECTION_OFF -> {
                        injectionOn[s] = false;
                        injectionsChanged = true;
                    }
                    case Timeline.INJECTION_ON -> {
                        injectionOn[s] = true;
                        injectionsChanged = true;
                    }
                    case Timeline.CLAMP_OFF -> {
                        clampOn[s] = false;
                        smooth = true;
                    }
                    case Timeline.CLAMP_ON -> {
                        clampOn[s] = true;
                        smooth = true;
                    }
                    case Timeline.PULSE -> {
                        double a = stimuli.get(s).amount();
                        double[] g = profile[s];
                        for (int i = 0; i < n; i++) {
                            u[i] += a * g[i];
                        }
                        smooth = true;
                    }
                    default -> throw new IllegalStateException();
                }
            }
            if (injectionsChanged) {
                // the source enters as B q, like the time derivative (B = I unless compact)
                Arrays.fill(rhs, 0);
                for (int s = 0; s < injectionOn.length; s++) {
                    if (injectionOn[s]) {
                        Stimulus st = stimuli.get(s);
                        double r = st.amount() / st.durationS();
                        double[] g = profile[s];
                        for (int i = 0; i < n; i++) {
                            rhs[i] += r * g[i];
                        }
                    }
                }
                grid.applyMass(rhs, source);
                sourceActive = false;
                for (boolean on : injectionOn) {
                    sourceActive |= on;
                }
            }
            anyClamp = false;
            for (boolean c : clampOn) {
                anyClamp |= c;
            }
            if (anyClamp) {
                applyClamps(withSens);
            }
            for (int o = tl.outputStart[j]; o < tl.outputStart[j + 1]; o++) {
                int frame = tl.outputFrame[o];
                sampler.sample(u, out, frame);
                if (withSens) {
                    for (int q = 0; q < sens.length; q++) {
                        sampler.sample(sens[q], sensOut[q], frame);
                    }
                }
            }
            if (j == nb - 1) {
                break;
            }
            double gap = tl.breaksS[j + 1] - tl.breaksS[j];
            long count = settings.stepCount(gap, dtMax);
            double dt = gap / count;
            int slot = factorisation(0.5 * dt * d);
            double t = tl.breaksS[j];
            for (long step = 0; step < count; step++) {
                double tNext = step == count - 1 ? tl.breaksS[j + 1] : tl.breaksS[j] + (step + 1) * dt;
                boolean interpolate = interior < tl.interiorTimeS.length && tl.interiorTimeS[interior] <= tNext;
                if (interpolate) {
                    if (afterIsCurrent) {
                        double[] swap = before;
                        before = after;
                        after = swap;
                        double[][] swapSens = sensBefore;
                        sensBefore = sensAfter;
                        sensAfter = swapSens;
                    } else {
                        sampler.sample(u, before, 0);
                        if (withSens) {
                            for (int q = 0; q < sens.length; q++) {
                                sampler.sample(sens[q], sensBefore[q], 0);
                            }
                        }
                    }
                }
                boolean rannacher = smooth && settings.smoothing();
                if (!withSens && !rannacher && n >= 3) {
                    fusedStep(p, slot, dt);
                } else if (!rannacher && n >= 3) {
                    fusedSensitivityStep(p, slot, dt);
                } else {
                    react(p, 0.5 * dt, withSens);
                    diffuse(slot, dt, d, rannacher, withSens);
                    react(p, 0.5 * dt, withSens);
                }
                smooth = false;
                if (anyClamp) {
                    applyClamps(withSens);
                }
                afterIsCurrent = false;
                if (interpolate) {
                    sampler.sample(u, after, 0);
                    if (withSens) {
                        for (int q = 0; q < sens.length; q++) {
                            sampler.sample(sens[q], sensAfter[q], 0);
                        }
                    }
                    afterIsCurrent = true;
                }
                while (interior < tl.interiorTimeS.length && tl.interiorTimeS[interior] <= tNext) {
                    // outputs between steps: linear in time, second order like the scheme
                    double w = (tl.interiorTimeS[interior] - t) / (tNext - t);
                    int frame = tl.interiorFrame[interior];
                    sampler.mix(before, after, w, out, frame);
                    if (withSens) {
                        for (int q = 0; q < sens.length; q++) {
                            sampler.mix(sensBefore[q], sensAfter[q], w, sensOut[q], frame);
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

    private void applyClamps(boolean withSens) {
        for (int s = 0; s < clampOn.length; s++) {
            if (clampOn[s]) {
                boolean[] mask = clampMask[s];
                double value = stimuli.get(s).amount();
                for (int i = 0; i < n; i++) {
                    if (mask[i]) {
                        u[i] = value;
                        if (withSens) {
                            for (double[] sv : sens) {
                                sv[i] = 0;
                            }
                        }
                    }
                }
            }
        }
    }

    /**
     * Returns the cache slot holding, for c = dt D / 2, the factorisation of A = B - c L and the coefficients
     * of P = B + c L; computes them on a miss.
     */
    private int factorisation(double c) {
        for (int k = 0; k < CACHE; k++) {
            if (cacheC[k] == c) {
                return k;
            }
        }
        int k = cacheNext;
        cacheNext = (cacheNext + 1) % CACHE;
        double[] lower = cacheLower[k];
        double[] diag = rhs;          // scratch: rhs is rebuilt before each use
        double[] upper = lapU0;       // scratch as well
        for (int i = 0; i < n; i++) {
            lower[i] = grid.massLower[i] - c * grid.lower[i];
            diag[i] = grid.massDiag[i] - c * grid.diag[i];
            upper[i] = grid.massUpper[i] - c * grid.upper[i];
            cachePLower[k][i] = grid.massLower[i] + c * grid.lower[i];
            cachePDiag[k][i] = grid.massDiag[i] + c * grid.diag[i];
            cachePUpper[k][i] = grid.massUpper[i] + c * grid.upper[i];
        }
        TridiagonalSolver.factor(lower, diag, upper, cacheCPrime[k], cacheInvPivot[k]);
        if (n >= 3) {
            TridiagonalSolver.factorTwisted(lower, diag, upper, cacheElim[k], cacheSubst[k], cacheTwInvPivot[k]);
        }
        for (int i = 0; i < n; i++) {
            cacheLowerOverPivot[k][i] = lower[i] * cacheInvPivot[k][i];
            double ip = cacheTwInvPivot[k][i];
            cacheSLower[k][i] = cachePLower[k][i] * ip;
            cacheSDiag[k][i] = cachePDiag[k][i] * ip;
            cacheSUpper[k][i] = cachePUpper[k][i] * ip;
            cacheLapLower[k][i] = grid.lower[i] * ip;
            cacheLapDiag[k][i] = grid.diag[i] * ip;
            cacheLapUpper[k][i] = grid.upper[i] * ip;
        }
        cacheC[k] = c;
        return k;
    }

    /**
     * One diffusion step of length dt: Crank-Nicolson (B - c L) u1 = (B + c L) u0 + dt B q with c = dt D / 2,
     * or, when {@code rannacher}, two backward-Euler half steps (B - c L) u' = B u + (dt/2) B q, which use the
     * same matrix. B is the mass matrix of {@link CableGrid} (I for the standard Laplacian). Sensitivities
     * follow the differentiated equations; only D appears in them.
     */
    private void diffuse(int slot, double dt, double d, boolean rannacher, boolean withSens) {
        double[] lower = cacheLower[slot];
        double[] cPrime = cacheCPrime[slot];
        double[] invPivot = cacheInvPivot[slot];
        double c = 0.5 * dt * d;
        if (rannacher) {
            double half = 0.5 * dt;
            for (int sub = 0; sub < 2; sub++) {
                grid.applyMass(u, rhs);
                for (int i = 0; i < n; i++) {
                    rhs[i] += half * source[i];
                }
                TridiagonalSolver.solveFactored(lower, cPrime, invPivot, rhs, u);
                if (withSens) {
                    // d/dD of (B - c L) u' = ...: (B - c L) s' = B s + (dt/2) L u'
                    grid.apply(u, lapU0);
                    for (int q = 0; q < sens.length; q++) {
                        double[] s = sens[q];
                        grid.applyMass(s, sensRhs);
                        if (q == 0) {
                            for (int i = 0; i < n; i++) {
                                sensRhs[i] += half * lapU0[i];
                            }
                        }
                        TridiagonalSolver.solveFactored(lower, cPrime, invPivot, sensRhs, s);
                    }
                }
            }
            return;
        }
        if (withSens) {
            grid.apply(u, lapU0);
        }
        double[] pl = cachePLower[slot];
        double[] pd = cachePDiag[slot];
        double[] pu = cachePUpper[slot];
        int last = n - 1;
        double[] uu = u;
        rhs[0] = pd[0] * uu[0] + pu[0] * uu[1] + dt * source[0];
        for (int i = 1; i < last; i++) {
            rhs[i] = pl[i] * uu[i - 1] + pd[i] * uu[i] + pu[i] * uu[i + 1] + dt * source[i];
        }
        rhs[last] = pl[last] * uu[last - 1] + pd[last] * uu[last] + dt * source[last];
        TridiagonalSolver.solveFactored(lower, cPrime, invPivot, rhs, u);
        if (withSens) {
            // d/dD: (B - c L) s1 = (B + c L) s0 + (dt/2) L (u0 + u1)
            grid.apply(u, rhs);
            for (int i = 0; i < n; i++) {
                lapU0[i] += rhs[i];
            }
            for (int q = 0; q < sens.length; q++) {
                double[] s = sens[q];
                sensRhs[0] = pd[0] * s[0] + pu[0] * s[1];
                for (int i = 1; i < last; i++) {
                    sensRhs[i] = pl[i] * s[i - 1] + pd[i] * s[i] + pu[i] * s[i + 1];
                }
                sensRhs[last] = pl[last] * s[last - 1] + pd[last] * s[last];
                if (q == 0) {
                    for (int i = 0; i < n; i++) {
                        sensRhs[i] += 0.5 * dt * lapU0[i];
                    }
                }
                TridiagonalSolver.solveFactored(lower, cPrime, invPivot, sensRhs, s);
            }
        }
    }

    /**
     * One Strang step without sensitivities, as simple sweeps: the first reaction half step (a loop with no
     * dependence between nodes, which the JIT vectorises), the Crank-Nicolson right-hand side already divided by
     * the pivots of the twisted factorisation (vectorised too), the two-ended elimination and substitution of
     * {@link TridiagonalSolver#solveTwisted} (the only serial recurrences, two independent ones interleaved) and
     * the second reaction half step. The arithmetic is that of {@link #react}, {@link #diffuse}, {@link #react}
     * up to rounding. The loops live in static methods of their own: inlined into {@link #run}, the JIT did not
     * vectorise them.
     */
    private void fusedStep(double[] p, int slot, double dt) {
        double tau = 0.5 * dt;
        reactInto(p, tau, u, stage);
        if (sourceActive) {
            scaledRightHandSide(stage, cacheSLower[slot], cacheSDiag[slot], cacheSUpper[slot], rhs, n);
            addScaledSource(source, cacheTwInvPivot[slot], dt, rhs, n);
            TridiagonalSolver.solveTwisted(cacheElim[slot], cacheSubst[slot], rhs, u);
        } else {
            solveProduct(stage, cacheSLower[slot], cacheSDiag[slot], cacheSUpper[slot], cacheElim[slot],
                    cacheSubst[slot], rhs, u, n);
        }
        reactInto(p, tau, u, u);
    }

    /**
     * {@link TridiagonalSolver#solveTwisted} for the right-hand side P v (rows scaled by the pivots), formed inside
     * the elimination: the two recurrences leave the processor idle between their steps, and the three-point
     * products fill that time instead of a pass of their own. Same arithmetic as {@link #scaledRightHandSide}
     * followed by solveTwisted. Needs n &gt;= 3. {@code out} may be {@code v}: v is read only by the elimination,
     * out written only by the substitution.
     */
    private static void solveProduct(double[] v, double[] sl, double[] sd, double[] su, double[] elim,
            double[] subst, double[] work, double[] out, int n) {
        int m = TridiagonalSolver.twistRow(n);
        int last = n - 1;
        double top = sd[0] * v[0] + su[0] * v[1];
        work[0] = top;
        double bottom = sl[last] * v[last - 1] + sd[last] * v[last];
        work[last] = bottom;
        int i = 1;
        int j = last - 1;
        for (; i < m && j > m; i++, j--) {
            double ri = sl[i] * v[i - 1] + sd[i] * v[i] + su[i] * v[i + 1];
            double rj = sl[j] * v[j - 1] + sd[j] * v[j] + su[j] * v[j + 1];
            top = Math.fma(-elim[i], top, ri);
            work[i] = top;
            bottom = Math.fma(-elim[j], bottom, rj);
            work[j] = bottom;
        }
        for (; i < m; i++) {
            top = Math.fma(-elim[i], top, sl[i] * v[i - 1] + sd[i] * v[i] + su[i] * v[i + 1]);
            work[i] = top;
        }
        for (; j > m; j--) {
            bottom = Math.fma(-elim[j], bottom, sl[j] * v[j - 1] + sd[j] * v[j] + su[j] * v[j + 1]);
            work[j] = bottom;
        }
        double rm = sl[m] * v[m - 1] + sd[m] * v[m] + su[m] * v[m + 1];
        double x = rm - elim[m] * top - subst[m] * bottom;
        TridiagonalSolver.substituteTwisted(subst, work, m, x, out, n);
    }

    /**
     * One Strang step with sensitivities, in the same simple sweeps as {@link #fusedStep}: u and every
     * sensitivity share the twisted factorisation. d/dD of (B - c L) u1 = (B + c L) u0 + dt B q with c = dt D / 2
     * gives (B - c L) s1 = (B + c L) s0 + (dt/2) L (u0 + u1); the other parameters enter only the reaction.
     * Same arithmetic as {@link #react}, {@link #diffuse}, {@link #react} up to rounding.
     */
    private void fusedSensitivityStep(double[] p, int slot, double dt) {
        double tau = 0.5 * dt;
        react(p, tau, true);
        double[] sl = cacheSLower[slot];
        double[] sd = cacheSDiag[slot];
        double[] su = cacheSUpper[slot];
        double[] elim = cacheElim[slot];
        double[] subst = cacheSubst[slot];
        double half = 0.5 * dt;
        // the right-hand side of dD needs u before the step, so it is formed first
        scaledRightHandSide(sens[0], sl, sd, su, sensScaled[0], n);
        addScaledLaplacian(u, cacheLapLower[slot], cacheLapDiag[slot], cacheLapUpper[slot], half, sensScaled[0], n);
        if (sourceActive) {
            scaledRightHandSide(u, sl, sd, su, rhs, n);
            addScaledSource(source, cacheTwInvPivot[slot], dt, rhs, n);
            TridiagonalSolver.solveTwisted(elim, subst, rhs, u);
        } else {
            solveProduct(u, sl, sd, su, elim, subst, rhs, u, n);
        }
        for (int q = 1; q < sens.length; q++) {
            solveProduct(sens[q], sl, sd, su, elim, subst, sensScaled[q], sens[q], n);
        }
        addScaledLaplacian(u, cacheLapLower[slot], cacheLapDiag[slot], cacheLapUpper[slot], half, sensScaled[0], n);
        TridiagonalSolver.solveTwisted(elim, subst, sensScaled[0], sens[0]);
        react(p, tau, true);
    }

    /** out += f (L v) divided row by row by the pivots, with L's rows already scaled ({@code ll, ld, lu}). */
    private static void addScaledLaplacian(double[] v, double[] ll, double[] ld, double[] lu, double f, double[] out,
            int n) {
        int last = n - 1;
        out[0] += f * (ld[0] * v[0] + lu[0] * v[1]);
        for (int i = 1; i < last; i++) {
            out[i] += f * (ll[i] * v[i - 1] + ld[i] * v[i] + lu[i] * v[i + 1]);
        }
        out[last] += f * (ll[last] * v[last - 1] + ld[last] * v[last]);
    }

    /** out = P v divided row by row by the pivots, with P's rows already scaled ({@code sl, sd, su}). */
    private static void scaledRightHandSide(double[] v, double[] sl, double[] sd, double[] su, double[] out, int n) {
        int last = n - 1;
        out[0] = sd[0] * v[0] + su[0] * v[1];
        for (int i = 1; i < last; i++) {
            out[i] = sl[i] * v[i - 1] + sd[i] * v[i] + su[i] * v[i + 1];
        }
        out[last] = sl[last] * v[last - 1] + sd[last] * v[last];
    }

    private static void addScaledSource(double[] source, double[] invPivot, double dt, double[] out, int n) {
        for (int i = 0; i < n; i++) {
            out[i] += dt * invPivot[i] * source[i];
        }
    }

    /**
     * One reaction sub-step of length tau without sensitivities, {@code to[i] = R(from[i])}; from and to may be
     * the same array. One loop per model with no dependence between nodes, so that it vectorises.
     */
    private void reactInto(double[] p, double tau, double[] from, double[] to) {
        int count = n;
        switch (model) {
            case DIFFUSION_DECAY -> {
                double e = Math.exp(-p[1] * tau);
                for (int i = 0; i < count; i++) {
                    to[i] = from[i] * e;
                }
            }
            case FISHER_KPP -> {
                double e = Math.exp(p[1] * tau);
                double em1 = Math.expm1(p[1] * tau);
                for (int i = 0; i < count; i++) {
                    double v = from[i];
                    to[i] = v * e / (1 + v * em1);
                }
            }
            case NAGUMO -> nagumoRos2(from, to, count, p[1], p[2], tau);
            default -> throw new IllegalStateException();
        }
    }

    /** ROS2 for Nagumo's cubic at every node, {@code to[i] = R(from[i])} (the same arithmetic as {@link #react}). */
    private static void nagumoRos2(double[] from, double[] to, int count, double k, double a, double tau) {
        double gtk = GAMMA * tau * k;
        double ap1 = 1 + a;
        for (int i = 0; i < count; i++) {
            double v = from[i];
            double f = k * v * (1 - v) * (v - a);
            double w = 1 / (1 - gtk * ((-3 * v + 2 * ap1) * v - a));
            double k1 = f * w;
            double v2 = v + tau * k1;
            double f2 = k * v2 * (1 - v2) * (v2 - a);
            double k2 = (f2 - 2 * k1) * w;
            to[i] = v + tau * (1.5 * k1 + 0.5 * k2);
        }
    }

    /** One reaction sub-step of length tau at every node, with its tangent-linear update of the sensitivities. */
    private void react(double[] p, double tau, boolean withSens) {
        switch (model) {
            case DIFFUSION_DECAY -> {
                double k = p[1];
                if (k == 0) {
                    return;
                }
                double e = Math.exp(-k * tau);
                for (int i = 0; i < n; i++) {
                    u[i] *= e;
                }
                if (withSens) {
                    double[] sD = sens[0];
                    double[] sK = sens[1];
                    for (int i = 0; i < n; i++) {
                        sD[i] *= e;
                        // u was already multiplied by e: d(e u0)/dk = -tau e u0 = -tau u
                        sK[i] = e * sK[i] - tau * u[i];
                    }
                }
            }
            case FISHER_KPP -> {
                double r = p[1];
                if (r == 0) {
                    return;
                }
                double e = Math.exp(r * tau);
                double em1 = Math.expm1(r * tau);
                if (!withSens) {
                    for (int i = 0; i < n; i++) {
                        double v = u[i];
                        u[i] = v * e / (1 + v * em1);
                    }
                    return;
                }
                double[] sD = sens[0];
                double[] sR = sens[1];
                for (int i = 0; i < n; i++) {
                    double v = u[i];
                    double den = 1 + v * em1;
                    double inv2 = 1 / (den * den);
                    double du = e * inv2;
                    double dr = tau * e * v * (1 - v) * inv2;
                    u[i] = v * e / den;
                    sD[i] *= du;
                    sR[i] = du * sR[i] + dr;
                }
            }
            case NAGUMO -> {
                double k = p[1];
                double a = p[2];
                if (k == 0) {
                    return;
                }
                if (withSens) {
                    nagumoWithSens(k, a, tau);
                    return;
                }
                double gt = GAMMA * tau;
                double ap1 = 1 + a;
                for (int i = 0; i < n; i++) {
                    double v = u[i];
                    double f = k * v * (1 - v) * (v - a);
                    double jac = k * ((-3 * v + 2 * ap1) * v - a);
                    double w = 1 / (1 - gt * jac);
                    double k1 = f * w;
                    double v2 = v + tau * k1;
                    double f2 = k * v2 * (1 - v2) * (v2 - a);
                    double k2 = (f2 - 2 * k1) * w;
                    u[i] = v + tau * (1.5 * k1 + 0.5 * k2);
                }
            }
            default -> throw new IllegalStateException();
        }
    }

    /**
     * ROS2 for f(u) = k u (1 - u)(u - a) with its derivatives along u, k and a:
     * W = 1 - gamma tau f_u(u), k1 = f(u) / W, k2 = (f(u + tau k1) - 2 k1) / W, u1 = u + tau (3 k1 + k2) / 2.
     */
    private void nagumoWithSens(double k, double a, double tau) {
        nagumoRos2WithSens(u, sens[0], sens[1], sens[2], n, k, a, tau, scratch);
    }

    /**
     * ROS2 with the derivatives along u, k and a (formulas in {@link #nagumoWithSens}'s comment), as a dozen short
     * loops through scratch arrays: the JIT vectorises only loops whose bodies are short (HotSpot's loop-unrolling
     * limit), and one loop over all of it ran four times slower than these.
     * Scratch rows: 0 W^-1, 1 k1, 2 v2, 3 k2, 4 k f_u(v2), 5 g(v2), 6 k g_a(v2), 7 dk1, 8 k2 dW, 9 r_u.
     */
    private static void nagumoRos2WithSens(double[] u, double[] sD, double[] sK, double[] sA, int n, double k,
            double a, double tau, double[][] scratch) {
        double gt = GAMMA * tau;
        double gtk = gt * k;
        double ap12 = 2 * (1 + a);
        double[] wInv = scratch[0];
        double[] k1s = scratch[1];
        double[] v2s = scratch[2];
        double[] k2s = scratch[3];
        double[] kgu2 = scratch[4];
        double[] g2s = scratch[5];
        double[] kga2 = scratch[6];
        double[] dk1s = scratch[7];
        double[] k2dW = scratch[8];
        double[] rus = scratch[9];
        for (int i = 0; i < n; i++) {
            double v = u[i];
            double w = 1 / (1 - gtk * ((ap12 - 3 * v) * v - a));
            wInv[i] = w;
            k1s[i] = k * v * (1 - v) * (v - a) * w;
        }
        for (int i = 0; i < n; i++) {
            double k1 = k1s[i];
            double v2 = u[i] + tau * k1;
            v2s[i] = v2;
            k2s[i] = (k * v2 * (1 - v2) * (v2 - a) - 2 * k1) * wInv[i];
        }
        for (int i = 0; i < n; i++) {
            double v2 = v2s[i];
            kgu2[i] = k * ((ap12 - 3 * v2) * v2 - a);
            g2s[i] = v2 * (1 - v2) * (v2 - a);
        }
        for (int i = 0; i < n; i++) {
            double v2 = v2s[i];
            kga2[i] = k * (v2 * v2 - v2);
        }
        // direction u (du = 1): dW = -gt k f_u'(v)
        for (int i = 0; i < n; i++) {
            double v = u[i];
            double dW = -gtk * (ap12 - 6 * v);
            dk1s[i] = (k * ((ap12 - 3 * v) * v - a) - k1s[i] * dW) * wInv[i];
            k2dW[i] = k2s[i] * dW;
        }
        for (int i = 0; i < n; i++) {
            double dk1 = dk1s[i];
            double dk2 = (kgu2[i] * (1 + tau * dk1) - 2 * dk1 - k2dW[i]) * wInv[i];
            double ru = 1 + tau * (1.5 * dk1 + 0.5 * dk2);
            rus[i] = ru;
            sD[i] *= ru;
        }
        // direction k: dW = -gt g_u(v)
        for (int i = 0; i < n; i++) {
            double v = u[i];
            double dW = -gt * ((ap12 - 3 * v) * v - a);
            dk1s[i] = (v * (1 - v) * (v - a) - k1s[i] * dW) * wInv[i];
            k2dW[i] = k2s[i] * dW;
        }
        for (int i = 0; i < n; i++) {
            double dk1 = dk1s[i];
            double dk2 = (kgu2[i] * tau * dk1 + g2s[i] - 2 * dk1 - k2dW[i]) * wInv[i];
            sK[i] = rus[i] * sK[i] + tau * (1.5 * dk1 + 0.5 * dk2);
        }
        // direction a: dW = -gt k g_ua(v)
        for (int i = 0; i < n; i++) {
            double v = u[i];
            double dW = -gtk * (2 * v - 1);
            dk1s[i] = (k * (v * v - v) - k1s[i] * dW) * wInv[i];
            k2dW[i] = k2s[i] * dW;
        }
        for (int i = 0; i < n; i++) {
            double dk1 = dk1s[i];
            double dk2 = (kgu2[i] * tau * dk1 + kga2[i] - 2 * dk1 - k2dW[i]) * wInv[i];
            sA[i] = rus[i] * sA[i] + tau * (1.5 * dk1 + 0.5 * dk2);
        }
        for (int i = 0; i < n; i++) {
            u[i] += tau * (1.5 * k1s[i] + 0.5 * k2s[i]);
        }
    }
}
