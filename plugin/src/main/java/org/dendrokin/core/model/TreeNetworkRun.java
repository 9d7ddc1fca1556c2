package org.dendrokin.core.model;

import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;

import org.dendrokin.core.Checks;

/**
 * A reaction network on a branched tree, deterministic: every species diffuses with its own D on every branch (one
 * concentration per junction, flux conserved there, {@link TreeGrid}) and reacts at every node; the tree counterpart
 * of {@link NetworkRun}, with the same Strang-split scheme ({@link NetworkStepper} on a tree). Output layout as
 * {@link TreeRun}: {@code out[s][frame * positionCount() + offset(branch) + position]}.
 * <p>
 * Not thread-safe; {@code solve} allocates nothing.
 */
public final class TreeNetworkRun {
    private final ReactionNetwork network;
    private final TreeGrid grid;
    private final double[] outputTimesS;
    private final List<String> sampled;
    private final Map<String, double[]> positionsUm;
    private final int[] offsets;
    private final double minWidthUm;
    private final SolverSettings settings;
    private final NetworkStepper stepper;
    private final TimeMarcher marcher;
    private long lastStepCount;

    private TreeNetworkRun(ReactionNetwork network, TreeDomain domain, double[] outputTimesS,
            LinkedHashMap<String, double[]> positionsUm, List<TreeStimulus> stimuli, SolverSettings settings,
            String observed) {
        this.network = network.forThread();
        this.grid = new TreeGrid(domain, settings.spatialOrder());
        this.settings = settings;
        this.outputTimesS = outputTimesS;
        this.positionsUm = positionsUm;
        this.sampled = List.copyOf(positionsUm.keySet());
        this.offsets = new int[sampled.size() + 1];
        OutputSampler sampler = TreeRun.sampler(grid, positionsUm, offsets);
        int[] stimulusSpecies = new int[stimuli.size()];
        for (int s = 0; s < stimuli.size(); s++) {
            Stimulus st = stimuli.get(s).stimulus();
            String name = st.species() == null ? observed : st.species();
            stimulusSpecies[s] = network.indexOf(name);
            Checks.require(stimulusSpecies[s] >= 0, "a stimulus names species '" + name
                    + "', which the network does not have " + network.species());
        }
        StimulusLayout layout = new StimulusLayout(grid, stimuli);
        minWidthUm = layout.minWidthUm;
        stepper = new NetworkStepper(this.network, grid);
        marcher = new TimeMarcher(outputTimesS, stimuli.stream().map(TreeStimulus::stimulus).toList(), layout,
                stimulusSpecies, network.speciesCount(), sampler, settings);
    }

    /**
     * @param network           the reactions and species
     * @param domain            the tree and its grid spacing
     * @param outputTimesS      sampling times, s
     * @param outputPositionsUm for each branch to sample, in order, its positions along it, um
     * @param stimuli           protocol, each on a branch; a stimulus without a species acts on {@code observed}
     * @param settings          time-step rule
     * @param observed          the species stimuli default to
     */
    public static TreeNetworkRun prepare(ReactionNetwork network, TreeDomain domain, double[] outputTimesS,
            Map<String, double[]> outputPositionsUm, List<TreeStimulus> stimuli, SolverSettings settings,
            String observed) {
        Checks.require(network.indexOf(observed) >= 0, "species '" + observed + "' is not in the network");
        Checks.require(!outputPositionsUm.isEmpty(), "at least one branch must be sampled");
        LinkedHashMap<String, double[]> copy = new LinkedHashMap<>();
        outputPositionsUm.forEach((k, v) -> copy.put(k, v.clone()));
        return new TreeNetworkRun(network, domain, outputTimesS.clone(), copy, List.copyOf(stimuli), settings,
                observed);
    }

    public ReactionNetwork network() {
        return network;
    }

    public int frameCount() {
        return outputTimesS.length;
    }

    /** Output columns over all sampled branches. */
    public int positionCount() {
        return offsets[sampled.size()];
    }

    /** The sampled branches, in output order. */
    public List<String> sampledBranches() {
        return sampled;
    }

    /** First output column of the k-th sampled branch. */
    public int offset(int k) {
        return offsets[k];
    }

    /** The spatial order used. */
    public int spatialOrder() {
        return grid.compact ? 4 : 2;
    }

    public long lastStepCount() {
        return lastStepCount;
    }

    /**
     * Solves the network and samples every species.
     *
     * @param out one row per species (null to skip one), each frames x {@link #positionCount()}. Modified.
     */
    public void solve(double[][] out) {
        Checks.require(out.length == network.speciesCount(), "need one output row per species");
        stepper.reset();
        double dtMax = settings.maxStep(network.rateScalePerS(), grid.domain.smallestSpacingUm(),
                stepper.maxDiffusionUm2PerS(), minWidthUm);
        lastStepCount = marcher.run(stepper, dtMax, out);
    }

    /** Splits one output row into one kymograph per sampled branch. */
    public Map<String, org.dendrokin.core.kymo.Kymograph> kymographs(double[] row, String signalUnit) {
        return TreeRun.split(row, outputTimesS, sampled, positionsUm, offsets, signalUnit);
    }
}
