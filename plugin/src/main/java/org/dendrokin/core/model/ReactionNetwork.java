package org.dendrokin.core.model;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.Collections;
import java.util.List;

import org.dendrokin.core.Checks;

/**
 * A reaction network on the cable: species with their own diffusion coefficients and resting (initial)
 * concentrations, and reactions, each with a stoichiometry and a rate expression v(c). At every node
 * <pre>
 *   dc_s/dt = D_s d2c_s/dx2 + sum_r N[s][r] v_r(c)
 * </pre>
 * Concentrations are in the model's unit (uM by convention), D in um^2/s, rates in concentration per s.
 * Built from our JSON network format or from SBML (io layer), or by the built-in multi-species models.
 * The rate laws of the JSON format are built by {@link #massAction}, {@link #michaelisMenten} and
 * {@link #hill}. The definition is immutable; {@link #rates} and {@link #jacobian} evaluate compiled rate
 * programs with their own scratch stacks, so they are not thread-safe: the solvers each take a private copy.
 */
public final class ReactionNetwork {
    /** One reaction: its net stoichiometry (products minus reactants, per species) and its rate. */
    public record Reaction(String name, double[] netStoichiometry, Expression rate, double rateScalePerS) {
        public Reaction {
            Checks.nonNegativeFinite(rateScalePerS, "rate scale of reaction " + name);
            netStoichiometry = netStoichiometry.clone();
        }

        @Override
        public double[] netStoichiometry() {
            return netStoichiometry.clone();
        }
    }

    private final List<String> species;
    private final double[] diffusionUm2PerS;
    private final double[] initial;
    private final List<Reaction> reactions;
    private final double[][] stoich;
    private final Expression[] rates;
    private final Program[] ratePrograms;
    /** For each reaction, the species its rate depends on and the programs of those derivatives. */
    private final int[][] derivativeSpecies;
    private final Program[][] derivativePrograms;
    private final double rateScalePerS;
    /** For each reaction, the species it changes and by how much (the non-zero net stoichiometry). */
    private final int[][] stoichSpecies;
    private final double[][] stoichValues;
    /** For each reaction, its mass-action law when the stochastic mode counts combinations, else null. */
    private final Expression.MassAction[] combinatorial;
    private double[][] lanes;
    private double[][] refs;
    private double[] scalars;

    /**
     * @param species          species names, unique
     * @param diffusionUm2PerS diffusion coefficient of each species, um^2/s, zero or positive
     * @param initial          resting concentration of each species (the initial state and fixed-end value)
     * @param reactions        the reactions; stoichiometry vectors must have one entry per species
     */
    public ReactionNetwork(List<String> species, double[] diffusionUm2PerS, double[] initial,
            List<Reaction> reactions) {
        int m = species.size();
        Checks.require(m > 0, "a network needs at least one species");
        Checks.require(diffusionUm2PerS.length == m && initial.length == m,
                "a network needs one diffusion coefficient and one initial value per species");
        Checks.require(species.stream().distinct().count() == m, "species names must be unique");
        for (int s = 0; s < m; s++) {
            Checks.nonNegativeFinite(diffusionUm2PerS[s], "diffusion coefficient of species " + species.get(s));
            Checks.finite(initial[s], "initial value of species " + species.get(s));
        }
        this.species = List.copyOf(species);
        this.diffusionUm2PerS = diffusionUm2PerS.clone();
        this.initial = initial.clone();
        this.reactions = List.copyOf(reactions);
        stoich = new double[reactions.size()][];
        rates = new Expression[reactions.size()];
        ratePrograms = new Program[reactions.size()];
        derivativeSpecies = new int[reactions.size()][];
        derivativePrograms = new Program[reactions.size()][];
        double scale = 0;
        for (int r = 0; r < reactions.size(); r++) {
            Reaction reaction = reactions.get(r);
            Checks.require(reaction.netStoichiometry.length == m, "reaction " + reaction.name()
                    + " needs one stoichiometry entry per species");
            stoich[r] = reaction.netStoichiometry;
            rates[r] = reaction.rate();
            ratePrograms[r] = reaction.rate().compile();
            List<Integer> depends = new ArrayList<>();
            List<Program> programs = new ArrayList<>();
            for (int s = 0; s < m; s++) {
                Expression d = reaction.rate().derivative(s);
                if (!d.isZero()) {
                    depends.add(s);
                    programs.add(d.compile());
                }
            }
            derivativeSpecies[r] = depends.stream().mapToInt(Integer::intValue).toArray();
            derivativePrograms[r] = programs.toArray(new Program[0]);
            scale = Math.max(scale, reaction.rateScalePerS());
        }
        rateScalePerS = scale;
        stoichSpecies = new int[stoich.length][];
        stoichValues = new double[stoich.length][];
        combinatorial = new Expression.MassAction[stoich.length];
        for (int r = 0; r < stoich.length; r++) {
            if (rates[r] instanceof Expression.MassAction law && law.wholeOrders()) {
                combinatorial[r] = law;
            }
            int count = 0;
            for (double v : stoich[r]) {
                count += v != 0 ? 1 : 0;
            }
            stoichSpecies[r] = new int[count];
            stoichValues[r] = new double[count];
            for (int s = 0, k = 0; s < m; s++) {
                if (stoich[r][s] != 0) {
                    stoichSpecies[r][k] = s;
                    stoichValues[r][k++] = stoich[r][s];
                }
            }
        }
    }

    public List<String> species() {
        return species;
    }

    public int speciesCount() {
        return species.size();
    }

    public int indexOf(String name) {
        return species.indexOf(name);
    }

    public double[] diffusionUm2PerS() {
        return diffusionUm2PerS.clone();
    }

    public double[] initial() {
        return initial.clone();
    }

    public List<Reaction> reactions() {
        return Collections.unmodifiableList(reactions);
    }

    /** The fastest first-order rate in the network, 1/s, for the step rule of {@link SolverSettings}. */
    public double rateScalePerS() {
        return rateScalePerS;
    }

    /** out[s] = sum_r N[s][r] v_r(c): the reaction part of dc/dt at one node. Allocation-free; not thread-safe. */
    public void rates(double[] c, double[] out) {
        java.util.Arrays.fill(out, 0);
        for (int r = 0; r < ratePrograms.length; r++) {
            double v = ratePrograms[r].value(c);
            double[] n = stoich[r];
            for (int s = 0; s < n.length; s++) {
                if (n[s] != 0) {
                    out[s] += n[s] * v;
                }
            }
        }
    }

    /** jac[s * m + q] = d(rate of change of species s)/d c_q at one node. Allocation-free; not thread-safe. */
    public void jacobian(double[] c, double[] jac) {
        int m = species.size();
        java.util.Arrays.fill(jac, 0);
        for (int r = 0; r < ratePrograms.length; r++) {
            double[] n = stoich[r];
            int[] depends = derivativeSpecies[r];
            Program[] programs = derivativePrograms[r];
            for (int j = 0; j < depends.length; j++) {
                int q = depends[j];
                double dv = programs[j].value(c);
                for (int s = 0; s < m; s++) {
                    if (n[s] != 0) {
                        jac[s * m + q] += n[s] * dv;
                    }
                }
            }
        }
    }

    /** Largest stack depth over the rate and derivative programs (rows of scratch the batch evaluation needs). */
    private int maxDepth() {
        int depth = 1;
        for (int r = 0; r < ratePrograms.length; r++) {
            depth = Math.max(depth, ratePrograms[r].depth());
            for (Program p : derivativePrograms[r]) {
                depth = Math.max(depth, p.depth());
            }
        }
        return depth;
    }

    /** Scratch of the batch evaluations below, for grids of up to {@code nodes} nodes; allocates. */
    void reserveBatch(int nodes) {
        if (lanes != null && lanes[0].length >= nodes) {
            return;
        }
        int depth = maxDepth();
        lanes = new double[depth][nodes];
        refs = new double[depth][];
        scalars = new double[depth];
    }

    /**
     * The reaction part of dc/dt at nodes [from, to) at once: {@code out[s][i] = sum_r N[s][r] v_r(c[.][i])}.
     * Needs {@link #reserveBatch}; allocation-free; not thread-safe.
     */
    void ratesBatch(double[][] c, int from, int to, double[][] out) {
        for (double[] row : out) {
            Arrays.fill(row, from, to, 0);
        }
        for (int r = 0; r < ratePrograms.length; r++) {
            double[] v = ratePrograms[r].values(c, from, to, lanes, refs, scalars);
            int[] targets = stoichSpecies[r];
            double[] coefficients = stoichValues[r];
            for (int k = 0; k < targets.length; k++) {
                accumulate(out[targets[k]], coefficients[k], v, scalars[0], from, to);
            }
        }
    }

    /**
     * The Rosenbrock step matrix at nodes [from, to) at once: {@code w[s * m + q][i] = delta_sq + factor J_sq}
     * with J the exact Jacobian of {@link #jacobian} at node i. Needs {@link #reserveBatch}; allocation-free.
     */
    void stepMatrixBatch(double[][] c, int from, int to, double factor, double[][] w) {
        int m = species.size();
        for (int a = 0; a < m * m; a++) {
            Arrays.fill(w[a], from, to, a % (m + 1) == 0 ? 1 : 0);
        }
        for (int r = 0; r < ratePrograms.length; r++) {
            int[] depends = derivativeSpecies[r];
            Program[] programs = derivativePrograms[r];
            int[] targets = stoichSpecies[r];
            double[] coefficients = stoichValues[r];
            for (int j = 0; j < depends.length; j++) {
                int q = depends[j];
                double[] dv = programs[j].values(c, from, to, lanes, refs, scalars);
                for (int k = 0; k < targets.length; k++) {
                    accumulate(w[targets[k] * m + q], factor * coefficients[k], dv, scalars[0], from, to);
                }
            }
        }
    }

    /** row += a v over [from, to), where a null v stands for the constant {@code constant}. */
    private static void accumulate(double[] row, double a, double[] v, double constant, int from, int to) {
        if (v == null) {
            double add = a * constant;
            for (int i = from; i < to; i++) {
                row[i] += add;
            }
        } else {
            for (int i = from; i < to; i++) {
                row[i] += a * v[i];
            }
        }
    }

    /** A copy with its own evaluation stacks, for use on another thread. */
    ReactionNetwork forThread() {
        return new ReactionNetwork(this);
    }

    private ReactionNetwork(ReactionNetwork other) {
        species = other.species;
        diffusionUm2PerS = other.diffusionUm2PerS;
        initial = other.initial;
        reactions = other.reactions;
        stoich = other.stoich;
        rates = other.rates;
        ratePrograms = new Program[other.ratePrograms.length];
        derivativeSpecies = other.derivativeSpecies;
        derivativePrograms = new Program[other.derivativePrograms.length][];
        for (int r = 0; r < ratePrograms.length; r++) {
            ratePrograms[r] = other.ratePrograms[r].copy();
            derivativePrograms[r] = new Program[other.derivativePrograms[r].length];
            for (int j = 0; j < derivativePrograms[r].length; j++) {
                derivativePrograms[r][j] = other.derivativePrograms[r][j].copy();
            }
        }
        rateScalePerS = other.rateScalePerS;
        stoichSpecies = other.stoichSpecies;
        stoichValues = other.stoichValues;
        combinatorial = other.combinatorial;
    }

    /**
     * Propensity of reaction r in a voxel of the stochastic mode, divided by omega (molecules per concentration
     * unit in the voxel), so in concentration per second; c holds the counts divided by omega. A mass-action
     * reaction with whole orders counts molecule combinations: 2A fires at kf n (n - 1) / omega, not
     * kf n^2 / omega (Gillespie 1977); any other law is its deterministic rate at c.
     */
    double propensityOf(int r, double[] c, double omega) {
        Expression.MassAction law = combinatorial[r];
        if (law != null) {
            return law.combinatorial(c, omega);
        }
        return ratePrograms[r].value(c);
    }

    double[][] stoichiometry() {
        return stoich;
    }

    // ---- rate laws of the JSON network format ----

    /**
     * Mass action: v = kf prod_i c_i^(n_i) - kr prod_j c_j^(m_j) over reactants i and products j.
     *
     * @param reactantOrders order of each species as a reactant (stoichiometric coefficient; 0 if absent)
     * @param productOrders  the same for the products (used by the reverse term)
     * @param kf             forward constant, (conc)^(1 - order) / s, zero or positive
     * @param kr             reverse constant, zero for an irreversible reaction
     */
    public static Expression massAction(double[] reactantOrders, double[] productOrders, double kf, double kr) {
        Checks.nonNegativeFinite(kf, "forward rate constant");
        Checks.nonNegativeFinite(kr, "reverse rate constant");
        Expression forward = monomial(kf, reactantOrders);
        Expression reverse = kr == 0 ? Expression.constant(0) : monomial(kr, productOrders);
        Expression plain = Expression.subtract(forward, reverse);
        return plain.isConst() ? plain
                : new Expression.MassAction(plain, kf, kr, reactantOrders, kr == 0 ? new double[0] : productOrders);
    }

    private static Expression monomial(double k, double[] orders) {
        Expression e = Expression.constant(k);
        for (int s = 0; s < orders.length; s++) {
            if (orders[s] != 0) {
                e = Expression.multiply(e, Expression.power(Expression.species(s), Expression.constant(orders[s])));
            }
        }
        return e;
    }

    /**
     * Michaelis-Menten: v = vmax S / (Km + S), or with an enzyme species E, v = kcat E S / (Km + S).
     *
     * @param substrate index of S
     * @param enzyme    index of E, or -1 to use {@code vmaxOrKcat} as vmax (conc/s)
     */
    public static Expression michaelisMenten(int substrate, int enzyme, double vmaxOrKcat, double km) {
        Checks.nonNegativeFinite(vmaxOrKcat, "vmax (or kcat)");
        Checks.positiveFinite(km, "Km");
        Expression s = Expression.species(substrate);
        Expression top = Expression.multiply(Expression.constant(vmaxOrKcat), s);
        if (enzyme >= 0) {
            top = Expression.multiply(top, Expression.species(enzyme));
        }
        return Expression.divide(top, Expression.add(Expression.constant(km), s));
    }

    /**
     * Hill: v = vmax A^n / (K^n + A^n) for an activating species A.
     */
    public static Expression hill(int activator, double vmax, double k, double n) {
        Checks.nonNegativeFinite(vmax, "vmax");
        Checks.positiveFinite(k, "Hill constant K");
        Checks.positiveFinite(n, "Hill coefficient n");
        Expression an = Expression.power(Expression.species(activator), Expression.constant(n));
        return Expression.divide(Expression.multiply(Expression.constant(vmax), an),
                Expression.add(Expression.constant(Math.pow(k, n)), an));
    }

    /** A convenience for building: a stoichiometry vector from (species, coefficient) pairs. */
    public static double[] stoichiometry(List<String> species, Object... pairs) {
        double[] n = new double[species.size()];
        for (int i = 0; i < pairs.length; i += 2) {
            int s = species.indexOf((String) pairs[i]);
            Checks.require(s >= 0, "unknown species " + pairs[i]);
            n[s] += ((Number) pairs[i + 1]).doubleValue();
        }
        return n;
    }

    /**
     * Built-in FitzHugh-Nagumo (Keener-Sneyd form, sheet s5.3), with time scale k (1/s):
     * v_t = D v_xx + k (v (1 - v)(v - alpha) - w), w_t = k eps (v - gamma w).
     */
    public static ReactionNetwork fitzHughNagumo(double dUm2PerS, double alpha, double eps, double gamma,
            double timeScalePerS) {
        Checks.nonNegativeFinite(dUm2PerS, "D");
        Checks.finite(alpha, "alpha");
        Checks.nonNegativeFinite(eps, "eps");
        Checks.nonNegativeFinite(gamma, "gamma");
        Checks.positiveFinite(timeScalePerS, "k");
        List<String> names = List.of("v", "w");
        Expression v = Expression.species(0);
        Expression w = Expression.species(1);
        Expression k = Expression.constant(timeScalePerS);
        Expression cubic = Expression.multiply(Expression.multiply(v, Expression.subtract(Expression.constant(1), v)),
                Expression.subtract(v, Expression.constant(alpha)));
        Expression fv = Expression.multiply(k, Expression.subtract(cubic, w));
        Expression fw = Expression.multiply(Expression.constant(timeScalePerS * eps),
                Expression.subtract(v, Expression.multiply(Expression.constant(gamma), w)));
        List<Reaction> reactions = new ArrayList<>();
        reactions.add(new Reaction("excitation", new double[] {1, 0}, fv, timeScalePerS));
        reactions.add(new Reaction("recovery", new double[] {0, 1}, fw, timeScalePerS * eps * Math.max(1, gamma)));
        return new ReactionNetwork(names, new double[] {dUm2PerS, 0}, new double[] {0, 0}, reactions);
    }

    /**
     * Built-in buffered diffusion, exact form: Ca + B &lt;-&gt; CaB with kon (1/(uM s)) and koff = kon Kd (1/s),
     * extrusion of free Ca at rate k (1/s); total buffer bTotal (uM) uniform at rest, Ca at rest 0.
     */
    public static ReactionNetwork bufferedDiffusion(double dCa, double dBuffer, double bTotalMicromolar,
            double kdMicromolar, double konPerMicromolarS, double kPerS) {
        Checks.nonNegativeFinite(dCa, "D_ca");
        Checks.nonNegativeFinite(dBuffer, "D_buffer");
        Checks.nonNegativeFinite(bTotalMicromolar, "B_total");
        Checks.positiveFinite(kdMicromolar, "Kd");
        Checks.positiveFinite(konPerMicromolarS, "kon");
        Checks.nonNegativeFinite(kPerS, "k");
        List<String> names = List.of("Ca", "B", "CaB");
        double koff = konPerMicromolarS * kdMicromolar;
        List<Reaction> reactions = new ArrayList<>();
        // Binding is usually far faster than everything else; it is left to the L-stable Rosenbrock step
        // (which relaxes it to equilibrium correctly) rather than forcing the step down to 1/(kon B + koff).
        // Each direction is its own reaction, so rates stay non-negative for the stochastic mode.
        reactions.add(new Reaction("binding", stoichiometry(names, "Ca", -1, "B", -1, "CaB", 1),
                massAction(new double[] {1, 1, 0}, new double[3], konPerMicromolarS, 0), 0));
        reactions.add(new Reaction("unbinding", stoichiometry(names, "Ca", 1, "B", 1, "CaB", -1),
                massAction(new double[] {0, 0, 1}, new double[3], koff, 0), 0));
        reactions.add(new Reaction("extrusion", stoichiometry(names, "Ca", -1),
                massAction(new double[] {1, 0, 0}, new double[3], kPerS, 0), kPerS));
        return new ReactionNetwork(names, new double[] {dCa, dBuffer, dBuffer},
                new double[] {0, bTotalMicromolar, 0}, reactions);
    }
}
