package org.dendrokin.core.model;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;

import org.dendrokin.core.Checks;
import org.dendrokin.core.kymo.Kymograph;

/**
 * A one-species reaction-diffusion model ({@link ScalarModel}, u_t = D (1/A) d/dx(A du/dx) + f(u; p) on every branch)
 * on a branched tree ({@link TreeDomain}), prepared once per grid, stimuli and output sampling, then run many times
 * with different parameters (what a fit does): the tree counterpart of {@link ScalarRun}. Branches meet at junctions
 * with one shared concentration and conserved flux ({@link TreeGrid}); free ends are sealed or open.
 * <p>
 * Scheme ({@link TreeStepper}): the cable's Strang splitting, with the Crank-Nicolson system of the tree solved by
 * Hines' method ({@link TreeSolver}; no fill-in, O(nodes)); second order in dt, fourth order in h with the default
 * compact scheme (second with {@code spatial_order} 2). Events and output sampling are those of {@link TimeMarcher};
 * the step rule is {@link SolverSettings} with the smallest branch spacing.
 * <p>
 * Output: each sampled branch's kymograph, frame-major over all sampled positions, branches in the order given:
 * {@code out[frame * positionCount() + offset(branch) + position]}. {@link #kymographs} splits it.
 * <p>
 * Not thread-safe: one instance per thread. {@code solve} allocates nothing.
 */
public final class TreeRun {
    private final ScalarModel model;
    private final TreeGrid grid;
    private final double[] outputTimesS;
    private final List<String> sampled;
    private final Map<String, double[]> positionsUm;
    private final int[] offsets;
    private final int positions;
    private final double minWidthUm;
    private final SolverSettings settings;
    private final TreeStepper stepper;
    private final TimeMarcher marcher;
    private final double[][] rows;
    private long lastStepCount;
    private double[] initial;

    private TreeRun(ScalarModel model, TreeDomain domain, double[] outputTimesS,
            LinkedHashMap<String, double[]> outputPositionsUm, List<TreeStimulus> stimuli, SolverSettings settings) {
        this.model = model;
        this.grid = new TreeGrid(domain, settings.spatialOrder());
        this.settings = settings;
        this.outputTimesS = outputTimesS;
        this.positionsUm = outputPositionsUm;
        this.sampled = List.copyOf(outputPositionsUm.keySet());
        this.offsets = new int[sampled.size() + 1];
        OutputSampler sampler = sampler(grid, outputPositionsUm, offsets);
        this.positions = offsets[sampled.size()];
        StimulusLayout layout = new StimulusLayout(grid, stimuli);
        minWidthUm = layout.minWidthUm;
        stepper = new TreeStepper(model, grid);
        List<Stimulus> timeline = stimuli.stream().map(TreeStimulus::stimulus).toList();
        marcher = new TimeMarcher(outputTimesS, timeline, layout, new int[stimuli.size()], stepper.fieldCount(),
                sampler, settings);
        rows = new double[stepper.fieldCount()][];
    }

    /**
     * Samples each branch at its positions: linear between the two nodes around a position along the branch.
     *
     * @param offsets receives each branch's first column and, last, the total. Modified.
     */
    static OutputSampler sampler(TreeGrid grid, Map<String, double[]> positionsUm, int[] offsets) {
        int[][] nodes = new int[2][];
        double[] weight = sampling(grid, positionsUm, offsets, nodes);
        return new OutputSampler(nodes[0], nodes[1], weight);
    }

    /**
     * The two nodes and the weight of the second for every output position, branches in the map's order.
     *
     * @param offsets receives each branch's first column and, last, the total. Modified.
     * @param nodes   receives the first nodes (row 0) and the second nodes (row 1). Modified.
     * @return the weights
     */
    static double[] sampling(TreeGrid grid, Map<String, double[]> positionsUm, int[] offsets, int[][] nodes) {
        TreeGeometry tree = grid.domain.tree();
        int total = 0;
        int k = 0;
        for (Map.Entry<String, double[]> e : positionsUm.entrySet()) {
            offsets[k++] = total;
            total += e.getValue().length;
        }
        offsets[k] = total;
        int[] from = new int[total];
        int[] to = new int[total];
        double[] weight = new double[total];
        int q = 0;
        for (Map.Entry<String, double[]> e : positionsUm.entrySet()) {
            int b = tree.indexOf(e.getKey());
            Checks.require(b >= 0, "output positions are given for branch " + e.getKey() + ", which is not in the"
                    + " tree " + tree.branchNames());
            double length = tree.branches().get(b).lengthUm();
            double h = grid.domain.spacingUm(b);
            int nb = grid.domain.nodeCount(b);
            for (double x : e.getValue()) {
                Checks.require(x >= -1e-9 * length && x <= length * (1 + 1e-9), "output position " + x + " um lies"
                        + " outside branch " + e.getKey() + " (0 to " + length + " um)");
                double s = Math.min(Math.max(x / h, 0), nb - 1);
                int i = Math.min((int) Math.floor(s), nb - 2);
                from[q] = grid.node(b, i);
                to[q] = grid.node(b, i + 1);
                weight[q] = s - i;
                q++;
            }
        }
        nodes[0] = from;
        nodes[1] = to;
        return weight;
    }

    /**
     * Prepares a run.
     *
     * @param model             a one-species model of the {@link ModelCatalogue}
     * @param domain            the tree and its grid spacing
     * @param outputTimesS      sampling times, s, zero or positive, any order
     * @param outputPositionsUm for each branch to sample, in order, its positions along it, um, within [0, length];
     *                          branches left out are simulated but not sampled
     * @param stimuli           the protocol, each on a branch; stimuli after the last output time are ignored
     * @param settings          time-step rule and spatial order
     * @throws IllegalArgumentException for an unknown branch, a position outside its branch, or a stimulus on
     *                                  another species
     */
    public static TreeRun prepare(ScalarModel model, TreeDomain domain, double[] outputTimesS,
            Map<String, double[]> outputPositionsUm, List<TreeStimulus> stimuli, SolverSettings settings) {
        Checks.require(!outputPositionsUm.isEmpty(), "at least one branch must be sampled");
        LinkedHashMap<String, double[]> copy = new LinkedHashMap<>();
        outputPositionsUm.forEach((k, v) -> copy.put(k, v.clone()));
        for (TreeStimulus s : stimuli) {
            Checks.require(s.stimulus().species() == null || s.stimulus().species().equals("u"), "the "
                    + model.name() + " model has one species, u; a stimulus names '" + s.stimulus().species() + "'");
            double length = domain.tree().branch(s.branch()).lengthUm();
            Checks.require(s.stimulus().positionUm() <= length * (1 + 1e-9), "the stimulus at "
                    + s.stimulus().positionUm() + " um lies beyond the end of branch " + s.branch() + " (" + length
                    + " um)");
        }
        return new TreeRun(model, domain, outputTimesS.clone(), copy, List.copyOf(stimuli), settings);
    }

    /** As {@link #prepare(ScalarModel, TreeDomain, double[], Map, List, SolverSettings)}, by model name. */
    public static TreeRun prepare(String model, TreeDomain domain, double[] outputTimesS,
            Map<String, double[]> outputPositionsUm, List<TreeStimulus> stimuli, SolverSettings settings) {
        return prepare(ModelCatalogue.scalar(model), domain, outputTimesS, outputPositionsUm, stimuli, settings);
    }

    /** Every node of every branch as output positions, branches in the tree's order. */
    public static Map<String, double[]> nodePositions(TreeDomain domain) {
        Map<String, double[]> out = new LinkedHashMap<>();
        for (String b : domain.tree().branchNames()) {
            out.put(b, domain.nodesUm(b));
        }
        return out;
    }

    public ScalarModel model() {
        return model;
    }

    public List<String> parameterNames() {
        return model.parameterNames();
    }

    public int frameCount() {
        return outputTimesS.length;
    }

    /** Output columns over all sampled branches. */
    public int positionCount() {
        return positions;
    }

    /** The sampled branches, in output order. */
    public List<String> sampledBranches() {
        return sampled;
    }

    /** First output column of the k-th sampled branch. */
    public int offset(int k) {
        return offsets[k];
    }

    /** Grid nodes of the whole tree. */
    public int nodeCount() {
        return grid.n;
    }

    /** The spatial order used (4 for the compact scheme, 2 for the three-point form). */
    public int spatialOrder() {
        return grid.compact ? 4 : 2;
    }

    /** Number of time steps the last solve took. */
    public long lastStepCount() {
        return lastStepCount;
    }

    /**
     * Replaces the zero initial state by values given at every position of every branch (for checks against
     * closed forms that start from a profile). Not part of the model JSON.
     *
     * @param valueAt the initial value at (branch index, position um)
     */
    void setInitialState(java.util.function.BiFunction<Integer, Double, Double> valueAt) {
        if (valueAt == null) {
            initial = null;
            return;
        }
        initial = new double[grid.n];
        for (int i = 0; i < grid.n; i++) {
            initial[i] = valueAt.apply(grid.nodeBranch[i], grid.nodeUm[i]);
        }
    }

    /** Amount of the last solve's final state: sum of volume x u over the nodes, um^3 x u. */
    double finalAmount() {
        return grid.amount(stepper.field(0));
    }

    /**
     * Solves the model and samples it.
     *
     * @param parameters values in the order of {@link #parameterNames()}. Not modified.
     * @param out        receives u, frames x {@link #positionCount()} (see the class comment). Modified.
     * @throws IllegalArgumentException for a parameter out of range
     */
    public void solve(double[] parameters, double[] out) {
        run(parameters, out, null);
    }

    /**
     * Solves the model and its forward sensitivities.
     *
     * @param sensOut one row per parameter, du/dp at each output point, laid out as {@code out}. Modified.
     */
    public void solveWithSensitivities(double[] parameters, double[] out, double[][] sensOut) {
        int count = model.parameters().size();
        Checks.require(sensOut.length == count, "need one sensitivity row per parameter (" + count + ")");
        for (double[] row : sensOut) {
            Checks.require(row.length == frameCount() * positions, "each sensitivity row needs frames x positions"
                    + " values");
        }
        run(parameters, out, sensOut);
    }

    private void run(double[] p, double[] out, double[][] sensOut) {
        model.check(p);
        Checks.require(out.length == frameCount() * positions, "output needs frames x positions values");
        boolean withSens = sensOut != null;
        stepper.reset(p, initial, withSens);
        double dtMax = settings.maxStep(model.stiffnessPerS(p), grid.domain.smallestSpacingUm(), p[0], minWidthUm);
        rows[0] = out;
        for (int q = 1; q < rows.length; q++) {
            rows[q] = withSens ? sensOut[q - 1] : null;
        }
        try {
            lastStepCount = marcher.run(stepper, dtMax, rows);
        } finally {
            Arrays.fill(rows, null);
        }
    }

    /**
     * Splits an output of {@link #solve} into one kymograph per sampled branch.
     *
     * @param out        frames x {@link #positionCount()} values. Not modified.
     * @param signalUnit unit of the values
     */
    public Map<String, Kymograph> kymographs(double[] out, String signalUnit) {
        return split(out, outputTimesS, sampled, positionsUm, offsets, signalUnit);
    }

    /** One kymograph per branch from a frame-major block over all branches' columns. */
    static Map<String, Kymograph> split(double[] out, double[] timesS, List<String> branches,
            Map<String, double[]> positionsUm, int[] offsets, String signalUnit) {
        int frames = timesS.length;
        int total = offsets[branches.size()];
        Map<String, Kymograph> result = new LinkedHashMap<>();
        for (int k = 0; k < branches.size(); k++) {
            double[] x = positionsUm.get(branches.get(k));
            double[] values = new double[frames * x.length];
            for (int f = 0; f < frames; f++) {
                System.arraycopy(out, f * total + offsets[k], values, f * x.length, x.length);
            }
            result.put(branches.get(k), new Kymograph(x, timesS, values, signalUnit));
        }
        return result;
    }

    /** The sampled branches' positions, in output order. Copies. */
    public List<double[]> positionsUm() {
        List<double[]> out = new ArrayList<>();
        for (String b : sampled) {
            out.add(positionsUm.get(b).clone());
        }
        return out;
    }
}
