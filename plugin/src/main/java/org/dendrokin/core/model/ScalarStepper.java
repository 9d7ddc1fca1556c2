package org.dendrokin.core.model;

import java.util.Arrays;

/**
 * The time step of a one-species model on a cable and, on request, of its forward sensitivities, as
 * {@link TimeMarcher} drives it. Field 0 is u; fields 1 .. p are du/d(parameter j - 1) when sensitivities are on.
 * <p>
 * One step of length dt is a Strang splitting (Strang 1968; sheet s6.4): a reaction half step (the model's own
 * sub-step, {@link ScalarModel#react}), a Crank-Nicolson diffusion step (Crank &amp; Nicolson 1947; sheet s6.2)
 * (B - c L) u1 = (B + c L) u0 + dt B q with c = dt D / 2 (B and L of {@link CableGrid}, q the injection source),
 * and another reaction half step; a damped step takes the diffusion part as two backward-Euler half steps
 * (B - c L) u' = B u + (dt/2) B q, which use the same matrix. The sensitivities follow the differentiated
 * sub-steps exactly, so they are the derivatives of the discrete solution; only D enters the diffusion part's
 * derivative, d/dD of the Crank-Nicolson step being (B - c L) s1 = (B + c L) s0 + (dt/2) L (u0 + u1).
 * <p>
 * Undamped steps on three or more nodes run as a few simple sweeps ({@link #fusedStep}); the rest take the plain
 * sub-steps. Allocation-free after construction; not thread-safe.
 */
final class ScalarStepper implements Stepper {
    private final ScalarModel model;
    private final CableGrid grid;
    private final int n;
    private final CrankNicolsonCache cache;

    private final double[] u;
    private final double[][] sens;
    private final double[] source;
    private final double[] rhs;
    private final double[] lapU0;
    private final double[] sensRhs;
    private final double[][] sensScaled;
    private final double[] stage;
    private final double[][] scratch;
    private double[] p;
    private double d;
    private boolean withSens;
    private boolean sourceActive;

    ScalarStepper(ScalarModel model, CableGrid grid) {
        this.model = model;
        this.grid = grid;
        this.n = grid.n;
        int np = model.parameters().size();
        cache = new CrankNicolsonCache(grid, true);
        u = new double[n];
        sens = new double[np][n];
        source = new double[n];
        rhs = new double[n];
        lapU0 = new double[n];
        sensRhs = new double[n];
        sensScaled = new double[np][n];
        stage = new double[n];
        scratch = new double[model.scratchRows()][n];
    }

    /**
     * Starts a run: the parameters (checked by the caller; kept, not copied, until the next reset), the initial
     * state (null for zero), no source, and zero sensitivities when they are asked for.
     */
    void reset(double[] parameters, double[] initial, boolean sensitivities) {
        p = parameters;
        d = parameters[0];
        withSens = sensitivities;
        if (initial != null) {
            System.arraycopy(initial, 0, u, 0, n);
        } else {
            Arrays.fill(u, 0);
        }
        Arrays.fill(source, 0);
        sourceActive = false;
        if (sensitivities) {
            for (double[] s : sens) {
                Arrays.fill(s, 0);
            }
        }
    }

    /** Number of fields: u and one sensitivity per parameter. */
    int fieldCount() {
        return 1 + sens.length;
    }

    @Override
    public int nodeCount() {
        return n;
    }

    @Override
    public double[] field(int f) {
        return f == 0 ? u : sens[f - 1];
    }

    /** The source enters as B q, like the time derivative (B = I unless compact). */
    @Override
    public void setSources(double[][] rates) {
        if (rates[0] == null) {
            Arrays.fill(source, 0);
            sourceActive = false;
        } else {
            grid.applyMass(rates[0], source);
            sourceActive = true;
        }
    }

    @Override
    public void hold(int f, boolean[] nodes, double value) {
        for (int i = 0; i < n; i++) {
            if (nodes[i]) {
                u[i] = value;
                if (withSens) {
                    for (double[] sv : sens) {
                        sv[i] = 0;
                    }
                }
            }
        }
    }

    @Override
    public void step(double dt, boolean damped) {
        CrankNicolsonCache.Factors f = cache.get(0.5 * dt * d);
        if (!damped && n >= 3) {
            if (withSens) {
                fusedSensitivityStep(f, dt);
            } else {
                fusedStep(f, dt);
            }
        } else {
            react(0.5 * dt);
            diffuse(f, dt, damped);
            react(0.5 * dt);
        }
    }

    private void react(double tau) {
        if (withSens) {
            model.reactWithSensitivities(p, tau, u, sens, n, scratch);
        } else {
            model.react(p, tau, u, u, n);
        }
    }

    /**
     * One diffusion step of length dt: Crank-Nicolson, or, when {@code damped}, two backward-Euler half steps.
     * Sensitivities follow the differentiated equations; only D appears in them.
     */
    private void diffuse(CrankNicolsonCache.Factors f, double dt, boolean damped) {
        double[] lower = f.lower;
        double[] cPrime = f.cPrime;
        double[] invPivot = f.invPivot;
        if (damped) {
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
        double[] pl = f.pLower;
        double[] pd = f.pDiag;
        double[] pu = f.pUpper;
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
     * up to rounding. The loops live in static methods of their own (or the model's): inlined into a long
     * method, the JIT did not vectorise them.
     */
    private void fusedStep(CrankNicolsonCache.Factors f, double dt) {
        double tau = 0.5 * dt;
        model.react(p, tau, u, stage, n);
        if (sourceActive) {
            scaledRightHandSide(stage, f.sLower, f.sDiag, f.sUpper, rhs, n);
            addScaledSource(source, f.twistedInvPivot, dt, rhs, n);
            TridiagonalSolver.solveTwisted(f.elim, f.subst, rhs, u);
        } else {
            solveProduct(stage, f.sLower, f.sDiag, f.sUpper, f.elim, f.subst, rhs, u, n);
        }
        model.react(p, tau, u, u, n);
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
    private void fusedSensitivityStep(CrankNicolsonCache.Factors f, double dt) {
        double tau = 0.5 * dt;
        model.reactWithSensitivities(p, tau, u, sens, n, scratch);
        double[] sl = f.sLower;
        double[] sd = f.sDiag;
        double[] su = f.sUpper;
        double[] elim = f.elim;
        double[] subst = f.subst;
        double half = 0.5 * dt;
        // the right-hand side of dD needs u before the step, so it is formed first
        scaledRightHandSide(sens[0], sl, sd, su, sensScaled[0], n);
        addScaledLaplacian(u, f.lapLower, f.lapDiag, f.lapUpper, half, sensScaled[0], n);
        if (sourceActive) {
            scaledRightHandSide(u, sl, sd, su, rhs, n);
            addScaledSource(source, f.twistedInvPivot, dt, rhs, n);
            TridiagonalSolver.solveTwisted(elim, subst, rhs, u);
        } else {
            solveProduct(u, sl, sd, su, elim, subst, rhs, u, n);
        }
        for (int q = 1; q < sens.length; q++) {
            solveProduct(sens[q], sl, sd, su, elim, subst, sensScaled[q], sens[q], n);
        }
        addScaledLaplacian(u, f.lapLower, f.lapDiag, f.lapUpper, half, sensScaled[0], n);
        TridiagonalSolver.solveTwisted(elim, subst, sensScaled[0], sens[0]);
        model.reactWithSensitivities(p, tau, u, sens, n, scratch);
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
}
