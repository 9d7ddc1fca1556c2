package org.dendrokin.core.model;

import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Objects;

import org.dendrokin.core.Checks;
import org.dendrokin.core.Progress;
import org.dendrokin.core.kymo.Kymograph;

/**
 * One model run on a branched tree as the {@code simulate} command describes it: the tree counterpart of
 * {@link Simulation}. A one-species catalogue model runs on {@link TreeRun}, a reaction network (a multi-species
 * entry or the user's own) on {@link TreeNetworkRun}, and the stochastic mode on {@link StochasticEnsemble#runOnTree};
 * the time tolerance is applied as in {@link Simulation}. Gives one kymograph per sampled branch. Pure: no files.
 */
public final class TreeSimulation {
    private TreeSimulation() {
    }

    /**
     * What to run.
     *
     * @param model             a {@link ModelCatalogue} name or {@value Simulation#NETWORK}
     * @param parameters        model parameters by name (built-in models)
     * @param network           the reaction network, or null for a built-in model
     * @param observed          species shown (networks); null for the model's default
     * @param domain            the tree and its grid spacing
     * @param durationS         simulated time, s
     * @param outputIntervalS   time between frames, s
     * @param outputPositionsUm for each branch to show, in order, its kymograph's positions along it, um
     * @param stimuli           protocol, each stimulus on a branch
     * @param settings          time-step rule
     * @param stochastic        settings of the stochastic mode, or null for deterministic
     */
    public record Spec(String model, Map<String, Double> parameters, ReactionNetwork network, String observed,
            TreeDomain domain, double durationS, double outputIntervalS, Map<String, double[]> outputPositionsUm,
            List<TreeStimulus> stimuli, SolverSettings settings, StochasticSettings stochastic) {
        public Spec {
            Objects.requireNonNull(model, "model");
            parameters = Map.copyOf(parameters);
            Objects.requireNonNull(domain, "domain");
            Checks.positiveFinite(durationS, "duration_s");
            Checks.positiveFinite(outputIntervalS, "output_interval_s");
            Checks.require(outputIntervalS <= durationS, "the output interval must not exceed the duration");
            Checks.require(!outputPositionsUm.isEmpty(), "at least one branch must be shown");
            LinkedHashMap<String, double[]> copy = new LinkedHashMap<>();
            outputPositionsUm.forEach((b, x) -> copy.put(b, x.clone()));
            outputPositionsUm = java.util.Collections.unmodifiableMap(copy);
            stimuli = List.copyOf(stimuli);
            Objects.requireNonNull(settings, "settings");
        }

        /** Frame times 0, dt, 2 dt, ... up to the duration. */
        public double[] outputTimesS() {
            return Simulation.outputTimes(durationS, outputIntervalS);
        }
    }

    /**
     * What a run gives.
     *
     * @param kymographs one per shown branch, in order (the ensemble mean in stochastic mode)
     * @param spreads    the ensemble's standard deviation per branch (stochastic mode), else null
     * @param species    the species shown
     * @param steps      time steps taken (deterministic) or events simulated (stochastic, all runs)
     * @param solverInfo settings and figures for the summary, by name
     * @param warnings   plain sentences about numerical trouble
     */
    public record Result(Map<String, Kymograph> kymographs, Map<String, Kymograph> spreads, String species, long steps,
            Map<String, Object> solverInfo, List<String> warnings) {
        public Result {
            warnings = List.copyOf(warnings);
        }
    }

    /** Runs the spec. */
    public static Result run(Spec spec, Progress progress) {
        double[] times = spec.outputTimesS();
        double spanS = times[times.length - 1];
        List<String> warnings = new ArrayList<>();
        Map<String, Object> info = new LinkedHashMap<>();
        TreeDomain domain = spec.domain();
        info.put("grid_nodes", domain.totalNodeCount());
        info.put("dx_um", domain.dxUm());
        info.put("branches", domain.tree().branchCount());
        info.put("junctions", domain.tree().junctions().size());
        if (spec.stochastic() == null) {
            info.put("scheme", "Strang splitting: Crank-Nicolson diffusion on the tree (each branch by two-ended"
                    + " elimination, the junctions by Hines' method), Rosenbrock (ROS2) or exact reactions");
            info.put("step_factor", spec.settings().stepFactor());
            info.put("smoothing", spec.settings().smoothing());
            if (spec.settings().fixedStepS() > 0) {
                info.put("fixed_step_s", spec.settings().fixedStepS());
            }
        }
        Map<String, double[]> x = spec.outputPositionsUm();
        List<String> shown = List.copyOf(x.keySet());
        int[] offsets = offsets(x);
        ReactionNetwork network;
        String defaultObserved;
        if (spec.model().equals(Simulation.NETWORK)) {
            network = Objects.requireNonNull(spec.network(), "network");
            defaultObserved = network.species().get(0);
        } else {
            BuiltInModel entry = ModelCatalogue.get(spec.model());
            if (entry.engine() == BuiltInModel.Engine.SCALAR) {
                Checks.require(spec.stochastic() == null, "the stochastic mode needs a network or a multi-species"
                        + " model; give the model as a network to simulate it stochastically");
            }
            List<Stimulus> plain = spec.stimuli().stream().map(TreeStimulus::stimulus).toList();
            Realisation realisation = entry.realise(entry.values(spec.parameters()), plain);
            if (realisation instanceof Realisation.Scalar scalar) {
                info.putAll(scalar.figures());
                List<TreeStimulus> stimuli = onBranches(spec.stimuli(), scalar.stimuli());
                Simulation.Solved solved = Simulation.controlled(spec.settings(), spanS, Simulation.MAX_HALVINGS,
                        info, warnings, progress, settings -> {
                            TreeRun run = TreeRun.prepare(scalar.model(), domain, times, x, stimuli, settings);
                            double[] out = new double[times.length * run.positionCount()];
                            run.solve(scalar.parameters(), out);
                            return new Simulation.Solved(out, run.lastStepCount(), run.spatialOrder());
                        });
                return new Result(TreeRun.split(solved.out(), times, shown, x, offsets, "model units"), null,
                        scalar.species(), solved.steps(), info, warnings);
            }
            network = ((Realisation.Network) realisation).network();
            defaultObserved = entry.observedSpecies();
        }
        String observed = spec.observed() != null ? spec.observed() : defaultObserved;
        Checks.require(network.indexOf(observed) >= 0, "the observed species '" + observed
                + "' is not in the model " + network.species());
        if (spec.stochastic() != null) {
            Checks.require(spec.settings().timeTolerance() == 0, "the time tolerance applies to deterministic runs"
                    + " only; the stochastic mode has no time step to control");
            StochasticEnsemble.Summary summary = StochasticEnsemble.runOnTree(network, domain, times, x,
                    spec.stimuli(), observed, spec.stochastic(), progress);
            info.put("method", "next-subvolume (spatial Gillespie) on the tree's voxels");
            info.put("runs", spec.stochastic().runs());
            info.put("seed", spec.stochastic().seed());
            info.put("events", summary.events());
            return new Result(TreeRun.split(summary.mean(), times, shown, x, offsets, "model units"),
                    TreeRun.split(summary.sd(), times, shown, x, offsets, "model units"), observed, summary.events(),
                    info, warnings);
        }
        int species = network.indexOf(observed);
        Simulation.Solved solved = Simulation.controlled(spec.settings(), spanS, Simulation.MAX_HALVINGS, info,
                warnings, progress, settings -> {
                    TreeNetworkRun run = TreeNetworkRun.prepare(network, domain, times, x, spec.stimuli(), settings,
                            observed);
                    double[][] out = new double[network.speciesCount()][];
                    out[species] = new double[times.length * run.positionCount()];
                    run.solve(out);
                    return new Simulation.Solved(out[species], run.lastStepCount(), run.spatialOrder());
                });
        return new Result(TreeRun.split(solved.out(), times, shown, x, offsets, "model units"), null, observed,
                solved.steps(), info, warnings);
    }

    /**
     * The stimuli as a realisation runs them (a model that reduces to another, as the rapid buffer approximation
     * does, rescales its stimuli), each on the branch of the stimulus it came from: realisations keep the order.
     */
    private static List<TreeStimulus> onBranches(List<TreeStimulus> given, List<Stimulus> realised) {
        Checks.require(given.size() == realised.size(), "a realisation changed the number of stimuli");
        List<TreeStimulus> out = new ArrayList<>();
        for (int s = 0; s < given.size(); s++) {
            out.add(new TreeStimulus(given.get(s).branch(), realised.get(s)));
        }
        return out;
    }

    private static int[] offsets(Map<String, double[]> positions) {
        int[] offsets = new int[positions.size() + 1];
        int k = 0;
        for (double[] v : positions.values()) {
            offsets[k + 1] = offsets[k] + v.length;
            k++;
        }
        return offsets;
    }
}
