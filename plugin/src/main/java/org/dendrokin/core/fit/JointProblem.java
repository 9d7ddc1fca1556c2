package org.dendrokin.core.fit;

import java.util.Arrays;
import java.util.List;
import java.util.concurrent.atomic.AtomicLong;
import java.util.stream.IntStream;

import org.dendrokin.core.Checks;
import org.dendrokin.core.Progress;

/**
 * Nonlinear least squares over many sessions at once: a few global coordinates gamma (the constants the sessions
 * share, e.g. ln D and ln k of a group) and, for each session i, local coordinates u_i (its amplitude, width,
 * baseline: nuisance parameters that touch only its own data). Each session is a {@link FitModel} with one-pass
 * normal equations on its own {@link FitData}; a {@link Link} says which of its parameters follow from gamma.
 *
 * <p>Objective: F = sum_i m_i n_i ln chi2_i, where chi2_i is session i's weighted residual sum of squares (weights
 * 1 / sigma^2 from its own baseline noise), n_i its number of points and m_i its multiplicity (1, or the count
 * of a bootstrap resample). F is -2 ln L up to a constant for Gaussian errors of SD s_i sigma with each session's
 * noise scale s_i profiled out (s_i^2 = chi2_i / n_i), so a session whose residuals exceed its baseline noise
 * (a poorer model of that cell, motion) weighs less instead of pulling the shared constants, and differences of F
 * are likelihood-ratio statistics (Wilks 1938): chi-square with one degree of freedom per constraint.
 *
 * <p>Iteration: Levenberg-Marquardt on the Gauss-Newton model of F. With w_i = m_i n_i / chi2_i (held at the
 * current point) and each session's normal equations A_i = J_i^T W_i J_i, g_i = J_i^T W_i r_i on the optimiser's
 * coordinates, F(x + d) ~ F(x) - 2 d^T b + d^T H d with H = sum w_i A_i and b = sum w_i g_i (the neglected term is
 * of relative order 1 / n_i). H is block-arrow shaped: the local blocks of different sessions do not touch. The
 * step solves (H + lambda diag H) d = b by eliminating each session's local block (Schur complement,
 * {@link BlockArrowSystem}), so an iteration costs one pass over every session's data plus O(N (q^3 + q^2 G)) for
 * N sessions with q local and G global coordinates, linear in N where a dense solve would be O((N q)^3). Damping
 * follows Nielsen's rule
 * (Madsen, Nielsen and Tingleff 2004, Methods for non-linear least squares problems, DTU, eq. 3.16: lambda times
 * max(1/3, 1 - (2 rho - 1)^3) after a step with gain ratio rho > 0, else times nu, nu doubling), with Marquardt's
 * diagonal scaling. It stops when the relative offset of Bates and Watts (1981, Technometrics 23:179) falls
 * below the tolerance: sqrt(b^T H^-1 b / P) &lt; tol with P free coordinates, i.e. the remaining Gauss-Newton
 * step is below tol standard errors (F is in units where a standard error moves it by 1).
 *
 * <p>{@link #solve} may be called from several threads at once, each call owning its own state; the models must be
 * thread-safe, as {@link FitModel} requires.
 */
final class JointProblem {
    /**
     * Relative offset below which the iteration stops: the step left is below 1/500 of the standard errors. Bates and
     * Watts (1981) suggest 0.001; the session fitter's cost tolerance (1e-10 relative) stops a 200 x 400 kymograph
     * at about 0.0013, and two sessions' worth of passes buy nothing a user could see.
     */
    static final double TOLERANCE = 2e-3;
    /** Initial damping from a rough start, and from a start near the answer (Madsen, Nielsen and Tingleff 2004). */
    static final double LAMBDA_COLD = 1e-3;
    static final double LAMBDA_WARM = 1e-10;
    private static final double LAMBDA_MAX = 1e16;

    /** A global coordinate: its name and the scale it is moved on (log for a positive constant). */
    record Coordinate(String name, ParameterSpec spec) {
    }

    /**
     * How one parameter of a session's model follows from the global coordinates:
     * theta[slot] = spec(scaled).toNatural(gamma[scaled]) + (offset &gt;= 0 ? gamma[offset] : 0). The offset, on a
     * linear coordinate, makes a difference between groups a coordinate of its own.
     */
    record Link(int slot, int scaled, int offset) {
    }

    /** One session: its model, data, which of its parameters are linked and which are local. */
    static final class Block {
        final String id;
        final FitModel model;
        final FitData data;
        final List<Link> links;
        final int[] local;
        final List<ParameterSpec> specs;
        final int n;

        Block(String id, FitModel model, FitData data, List<Link> links) {
            Checks.require(model.hasNormalEquations(), "model " + model.name() + " has no one-pass normal equations");
            Checks.require(model.size() == data.size(), "session " + id + ": the data do not lie on the model's grid");
            this.id = id;
            this.model = model;
            this.data = data;
            this.links = List.copyOf(links);
            this.specs = model.parameters();
            boolean[] linked = new boolean[specs.size()];
            for (Link l : links) {
                linked[l.slot()] = true;
            }
            this.local = IntStream.range(0, specs.size()).filter(j -> !linked[j]).toArray();
            this.n = data.usedCount();
        }
    }

    /** A point: the global coordinates and every session's local coordinates, in the optimiser's scale. */
    static final class State {
        final double[] gamma;
        final double[][] u;

        State(double[] gamma, double[][] u) {
            this.gamma = gamma;
            this.u = u;
        }

        State copy() {
            double[][] uc = new double[u.length][];
            for (int i = 0; i < u.length; i++) {
                uc[i] = u[i].clone();
            }
            return new State(gamma.clone(), uc);
        }
    }

    /**
     * The end of an iteration.
     *
     * @param state      where it ended
     * @param chiSquare  chi2_i per session at that point (NaN for sessions left out)
     * @param objective  F
     * @param converged  true if the relative offset fell below the tolerance
     * @param reason     why not, in a plain sentence ("" when converged)
     * @param passes     passes over the data
     */
    record Solution(State state, double[] chiSquare, double objective, boolean converged, String reason,
                    long passes, Evaluation evaluation) {
    }

    private final List<Coordinate> coordinates;
    private final List<Block> blocks;
    private final int g;
    private final AtomicLong passes = new AtomicLong();

    JointProblem(List<Coordinate> coordinates, List<Block> blocks) {
        Checks.require(!blocks.isEmpty(), "a joint fit needs at least one session");
        this.coordinates = List.copyOf(coordinates);
        this.blocks = List.copyOf(blocks);
        this.g = coordinates.size();
        for (Block b : blocks) {
            for (Link l : b.links) {
                Checks.require(l.scaled() >= 0 && l.scaled() < g && l.offset() < g,
                        "session " + b.id + ": a link names a global coordinate that does not exist");
            }
        }
    }

    List<Block> blocks() {
        return blocks;
    }

    List<Coordinate> coordinates() {
        return coordinates;
    }

    /** Passes over session data so far (one per session evaluated). */
    long passes() {
        return passes.get();
    }

    /** Every session once: the multiplicities of a plain fit. */
    double[] ones() {
        double[] m = new double[blocks.size()];
        Arrays.fill(m, 1);
        return m;
    }

    /** The state for natural starting values: theta0[i] in session i's model order, gamma0 natural. */
    State start(double[] gammaNatural, List<double[]> theta0) {
        double[] gamma = new double[g];
        for (int a = 0; a < g; a++) {
            gamma[a] = coordinates.get(a).spec().toInternal(gammaNatural[a]);
        }
        double[][] u = new double[blocks.size()][];
        for (int i = 0; i < blocks.size(); i++) {
            Block b = blocks.get(i);
            u[i] = new double[b.local.length];
            for (int a = 0; a < b.local.length; a++) {
                u[i][a] = b.specs.get(b.local[a]).toInternal(theta0.get(i)[b.local[a]]);
            }
        }
        return new State(gamma, u);
    }

    /** Session i's natural parameters at a state, or null if a linked value falls outside its model's range. */
    double[] theta(int i, State s) {
        Block b = blocks.get(i);
        double[] theta = new double[b.specs.size()];
        for (int a = 0; a < b.local.length; a++) {
            theta[b.local[a]] = b.specs.get(b.local[a]).toNatural(s.u[i][a]);
        }
        for (Link l : b.links) {
            double v = coordinates.get(l.scaled()).spec().toNatural(s.gamma[l.scaled()])
                    + (l.offset() >= 0 ? s.gamma[l.offset()] : 0);
            double[] range = b.specs.get(l.slot()).naturalRange();
            if (!(v > range[0] && v < range[1])) {
                return null;
            }
            theta[l.slot()] = v;
        }
        return theta;
    }

    /** Natural value of global coordinate a. */
    double natural(int a, double internal) {
        return coordinates.get(a).spec().toNatural(internal);
    }

    // ---- evaluation ------------------------------------------------------------------------------------------

    /** Every active session's normal equations at a point; null entries for inactive sessions. */
    final class Evaluation {
        final NormalEquations[] normal;
        final double[] chi;
        final double objective;

        Evaluation(State s, double[] m) {
            int nb = blocks.size();
            normal = new NormalEquations[nb];
            chi = new double[nb];
            Arrays.fill(chi, Double.NaN);
            boolean[] bad = new boolean[nb];
            IntStream range = IntStream.range(0, nb).filter(i -> m[i] > 0);
            range.parallel().forEach(i -> {
                double[] theta = theta(i, s);
                if (theta == null) {
                    bad[i] = true;
                    return;
                }
                Block b = blocks.get(i);
                NormalEquations ne = new NormalEquations(b.specs.size());
                b.model.normalEquations(theta, b.data, ne, null);
                passes.incrementAndGet();
                if (!ne.isFinite() || !(ne.chiSquare() > 0)) {
                    bad[i] = true;
                    return;
                }
                normal[i] = ne;
                chi[i] = ne.chiSquare();
            });
            double f = 0;
            for (int i = 0; i < nb; i++) {
                if (bad[i]) {
                    f = Double.POSITIVE_INFINITY;
                } else if (m[i] > 0) {
                    f += m[i] * blocks.get(i).n * Math.log(chi[i]);
                }
            }
            objective = f;
        }
    }

    /**
     * H = sum w_i T_i^T A_i T_i and b = sum w_i T_i^T g_i on the optimiser's coordinates, by blocks, with w_i =
     * m_i n_i / chi2_i and T_i = d theta_i / d (gamma, u_i) the chain rule from the optimiser's coordinates to session
     * i's natural parameters (the scales of its parameters and its links).
     */
    BlockArrowSystem assemble(State s, Evaluation e, double[] m) {
        BlockArrowSystem h = new BlockArrowSystem(g, blocks.size());
        for (int i = 0; i < blocks.size(); i++) {
            if (m[i] <= 0) {
                continue;
            }
            Block b = blocks.get(i);
            NormalEquations ne = e.normal[i];
            double w = m[i] * b.n / e.chi[i];
            int p = b.specs.size();
            int q = b.local.length;
            double[][] t = new double[p][g + q];
            for (int a = 0; a < q; a++) {
                t[b.local[a]][g + a] = b.specs.get(b.local[a]).derivative(s.u[i][a]);
            }
            for (Link l : b.links) {
                t[l.slot()][l.scaled()] += coordinates.get(l.scaled()).spec().derivative(s.gamma[l.scaled()]);
                if (l.offset() >= 0) {
                    t[l.slot()][l.offset()] += 1;
                }
            }
            int c = g + q;
            double[][] at = new double[p][c];    // A T
            for (int r = 0; r < p; r++) {
                for (int k = 0; k < p; k++) {
                    double ark = 0.5 * (ne.matrix(r, k) + ne.matrix(k, r));
                    if (ark != 0) {
                        for (int j = 0; j < c; j++) {
                            at[r][j] += ark * t[k][j];
                        }
                    }
                }
            }
            double[][] hi = new double[c][c];      // w T^T A T
            double[] vi = new double[c];           // w T^T g
            for (int r = 0; r < p; r++) {
                for (int x = 0; x < c; x++) {
                    double trx = t[r][x];
                    if (trx != 0) {
                        for (int y = 0; y < c; y++) {
                            hi[x][y] += w * trx * at[r][y];
                        }
                        vi[x] += w * trx * ne.gradient(r);
                    }
                }
            }
            h.add(i, hi, vi);
        }
        return h;
    }

    private State moved(State s, BlockArrowSystem.Step d, double[] m) {
        State t = s.copy();
        for (int a = 0; a < g; a++) {
            t.gamma[a] += d.dg()[a];
        }
        for (int i = 0; i < blocks.size(); i++) {
            if (m[i] > 0) {
                for (int x = 0; x < t.u[i].length; x++) {
                    t.u[i][x] += d.dL()[i][x];
                }
            }
        }
        return t;
    }

    private int freeCount(boolean[] fixed, double[] m) {
        int count = 0;
        for (boolean f : fixed) {
            count += f ? 0 : 1;
        }
        for (int i = 0; i < blocks.size(); i++) {
            if (m[i] > 0) {
                count += blocks.get(i).local.length;
            }
        }
        return count;
    }

    // ---- iteration -------------------------------------------------------------------------------------------

    /**
     * Minimises F over the free coordinates from a start (fixed global coordinates keep their start value).
     *
     * @param start    where to start; not modified
     * @param fixed    global coordinates held, length G
     * @param m        multiplicity of each session (0 leaves it out)
     * @param maxPasses most iterations (each one pass over the active sessions)
     * @param progress checked for cancellation between iterations
     */
    Solution solve(State start, boolean[] fixed, double[] m, int maxPasses, Progress progress) {
        return solve(start, fixed, m, maxPasses, TOLERANCE, LAMBDA_WARM, progress);
    }

    /**
     * As {@link #solve(State, boolean[], double[], int, Progress)} with another relative-offset tolerance and initial
     * damping ({@link #LAMBDA_COLD} from rough starting values, {@link #LAMBDA_WARM} from a start near the answer).
     */
    Solution solve(State start, boolean[] fixed, double[] m, int maxPasses, double tolerance, double lambda0,
                   Progress progress) {
        long before = passes.get();
        State x = start.copy();
        Evaluation e = new Evaluation(x, m);
        if (!Double.isFinite(e.objective)) {
            return new Solution(x, e.chi, e.objective, false, "the model gave no finite prediction at the starting "
                    + "values", passes.get() - before, e);
        }
        double target = tolerance * tolerance * freeCount(fixed, m);
        double lambda = lambda0;
        double nu = 2;
        int trials = 0;
        while (true) {
            progress.checkCancelled();
            BlockArrowSystem h = assemble(x, e, m);
            // The Gauss-Newton decrement b^T H^-1 b decides convergence. Near the answer the damping is small and the
            // step about to be tried gives it to within a factor 1 + lambda kappa (kappa: how much larger diag H is
            // than H's smallest eigenvalue, at most 1e2 or so in these fits), so one solve serves both.
            boolean light = lambda <= LAMBDA_WARM;
            BlockArrowSystem.Step newton = h.solve(light ? lambda : 1e-12, fixed);
            if (newton != null && newton.dot(h.bg, h.bL) < target) {
                return new Solution(x, e.chi, e.objective, true, "", passes.get() - before, e);
            }
            BlockArrowSystem.Step ready = light ? newton : null;
            while (true) {
                if (lambda > LAMBDA_MAX) {
                    return new Solution(x, e.chi, e.objective, false, "the joint fit stopped making progress before "
                            + "it converged", passes.get() - before, e);
                }
                if (trials >= maxPasses) {
                    return new Solution(x, e.chi, e.objective, false, "the joint fit did not converge within "
                            + maxPasses + " passes over the data", passes.get() - before, e);
                }
                BlockArrowSystem.Step d = ready != null ? ready : h.solve(lambda, fixed);
                ready = null;
                if (d == null) {
                    lambda *= nu;
                    nu *= 2;
                    continue;
                }
                double predicted = d.dot(h.bg, h.bL) + lambda * h.dampingNorm(d);
                State trial = moved(x, d, m);
                Evaluation et = new Evaluation(trial, m);
                trials++;
                double rho = (e.objective - et.objective) / predicted;
                if (Double.isFinite(et.objective) && rho > 0) {
                    x = trial;
                    e = et;
                    lambda *= Math.max(1.0 / 3, 1 - Math.pow(2 * rho - 1, 3));
                    nu = 2;
                    break;
                }
                lambda *= nu;
                nu *= 2;
            }
        }
    }

    // ---- uncertainty and warm starts -------------------------------------------------------------------------

    /** H^-1 at a solution (fixed global coordinates held); null if H is singular there. */
    BlockArrowSystem.Covariance covariance(Solution sol, boolean[] fixed, double[] m) {
        if (!Double.isFinite(sol.objective())) {
            return null;
        }
        return assemble(sol.state(), sol.evaluation(), m).covariance(fixed);
    }

    /**
     * Where the other coordinates go, to first order, when global coordinate j is moved by delta from a minimum:
     * d = -H_ff^-1 H_fj delta on the free coordinates f (fixed ones and j itself stay). Used to start the refits of
     * a profile near their answer. Returns the moved state, or the state with only j moved if H is singular.
     */
    State response(Solution sol, int j, double delta, boolean[] fixed, double[] m) {
        State moved = sol.state().copy();
        moved.gamma[j] += delta;
        if (!Double.isFinite(sol.objective())) {
            return moved;
        }
        BlockArrowSystem h = assemble(sol.state(), sol.evaluation(), m);
        boolean[] held = fixed.clone();
        held[j] = true;
        double[] rg = new double[g];
        for (int a = 0; a < g; a++) {
            rg[a] = -h.hgg[a][j] * delta;
        }
        double[][] rl = new double[blocks.size()][];
        for (int i = 0; i < blocks.size(); i++) {
            if (m[i] > 0) {
                int q = blocks.get(i).local.length;
                rl[i] = new double[q];
                for (int x = 0; x < q; x++) {
                    rl[i][x] = -h.hLg[i][x][j] * delta;
                }
            }
        }
        BlockArrowSystem.Step d = h.solve(0, held, rg, rl);
        if (d == null) {
            return moved;
        }
        return moved(moved, d, m);
    }

    /**
     * Refits to resampled sessions by one Gauss-Newton step from a solution (the k-step bootstrap of Andrews 2002,
     * Econometrica 70:119, with k = 1). A session's local block is eliminated once: its contribution to the reduced
     * system of the global coordinates is S_i = H_gg,i - H_gL,i H_LL,i^-1 H_Lg,i and r_i = b_g,i - H_gL,i H_LL,i^-1
     * b_L,i, both at the solution, and a session drawn m_i times scales both by m_i (its local elimination does not
     * change). A resample's global coordinates are then gamma_hat + (sum m_i S_i)^-1 sum m_i r_i, with no further pass
     * over the data; the step differs from a converged refit in second order only.
     *
     * @param sol          a converged solution of every session (multiplicities 1), all global coordinates free
     * @param multiplicity per resample, how often each session was drawn
     * @return per resample its global coordinates (optimiser's scale), null where the reduced system was singular
     */
    double[][] resampleSteps(Solution sol, List<double[]> multiplicity) {
        double[][][] reduced = assemble(sol.state(), sol.evaluation(), ones()).reduced();
        double[][] out = new double[multiplicity.size()][];
        if (reduced == null) {
            return out;
        }
        for (int r = 0; r < out.length; r++) {
            double[] m = multiplicity.get(r);
            double[][] sm = new double[g][g];
            double[][] rm = new double[g][1];
            for (int i = 0; i < reduced.length; i++) {
                if (m[i] > 0) {
                    for (int a = 0; a < g; a++) {
                        rm[a][0] += m[i] * reduced[i][a][g];
                        for (int c = 0; c < g; c++) {
                            sm[a][c] += m[i] * reduced[i][a][c];
                        }
                    }
                }
            }
            double[][] step = BlockArrowSystem.choleskySolve(sm, rm);
            if (step != null) {
                out[r] = sol.state().gamma.clone();
                for (int a = 0; a < g; a++) {
                    out[r][a] += step[a][0];
                }
            }
        }
        return out;
    }
}
