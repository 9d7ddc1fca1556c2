package org.dendrokin.core.model;

import java.util.List;

import org.dendrokin.core.Checks;

/**
 * A reaction network on a cable, deterministic: every species diffuses with its own D and reacts at every
 * node, dc_s/dt = D_s (L c_s) + sum_r N[s][r] v_r(c). Prepared once per grid, stimuli and sampling.
 * <p>
 * Scheme: Strang splitting, as {@link ScalarRun}: a reaction half step at every node by the two-stage
 * L-stable Rosenbrock method ROS2 (Verwer et al. 1999) with the exact Jacobian of the rate expressions
 * (an m x m solve per stage, m = number of species, so stiff reactions such as fast buffering stay stable),
 * one Crank-Nicolson diffusion step per species (Thomas algorithm), and another reaction half step
 * ({@link NetworkStepper}). Second order in dt and h. At fixed ends every species is held at its resting value
 * and does not react. Events, clamps, sources and output sampling are those of {@link TimeMarcher}. Time step
 * rule: {@link SolverSettings} with the network's rate scale and its largest D.
 * <p>
 * Not thread-safe; {@code solve} allocates nothing.
 */
public final class NetworkRun {
    private final ReactionNetwork network;
    private final CableGrid grid;
    private final int frames;
    private final int positions;
    private final double minWidthUm;
    private final SolverSettings settings;
    private final NetworkStepper stepper;
    private final TimeMarcher marcher;
    private long lastStepCount;

    private NetworkRun(ReactionNetwork network, Domain domain, double[] outputTimesS, double[] outputPositionsUm,
            List<Stimulus> stimuli, SolverSettings settings, String observedDefault) {
        this.network = network.forThread();
        this.grid = new CableGrid(domain, settings.spatialOrder());
        this.settings = settings;
        this.frames = outputTimesS.length;
        this.positions = outputPositionsUm.length;
        OutputSampler sampler = new OutputSampler(outputPositionsUm, domain.lengthUm(), grid.h, grid.n);
        int[] stimulusSpecies = new int[stimuli.size()];
        for (int s = 0; s < stimuli.size(); s++) {
            Stimulus st = stimuli.get(s);
            String name = st.species() == null ? observedDefault : st.species();
            stimulusSpecies[s] = network.indexOf(name);
            Checks.require(stimulusSpecies[s] >= 0, "a stimulus names species '" + name
                    + "', which the network does not have " + network.species());
        }
        StimulusLayout layout = new StimulusLayout(grid, stimuli);
        minWidthUm = layout.minWidthUm;
        stepper = new NetworkStepper(this.network, grid);
        marcher = new TimeMarcher(outputTimesS, stimuli, layout, stimulusSpecies, network.speciesCount(), sampler,
                settings);
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

    /** The time steps {@link #solve} takes (see {@link TimeMarcher#plannedSteps}). */
    public long plannedSteps() {
        return marcher.plannedSteps(settings.maxStep(network.rateScalePerS(), grid.h, stepper.maxDiffusionUm2PerS(),
                minWidthUm));
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
        Checks.require(out.length == network.speciesCount(), "need one output row per species");
        stepper.reset();
        double dtMax = settings.maxStep(network.rateScalePerS(), grid.h, stepper.maxDiffusionUm2PerS(), minWidthUm);
        lastStepCount = marcher.run(stepper, dtMax, out);
    }
}
