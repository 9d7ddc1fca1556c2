package org.dendrokin.core.model;

import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.Objects;
import java.util.function.Function;

import org.dendrokin.core.Checks;
import org.dendrokin.core.Progress;
import org.dendrokin.core.kymo.Kymograph;

/**
 * One model run as the {@code simulate} command describes it: a built-in model or a network, on a domain,
 * sampled every output interval from 0 to the duration, deterministic or stochastic. Pure: no files.
 */
public final class Simulation {
    /** The model name of a user's own reaction network (not a catalogue entry). */
    public static final String NETWORK = "network";

    private Simulation() {
    }

    /**
     * What to run.
     *
     * @param model             a {@link ModelCatalogue} name or {@value #NETWORK} (then {@code network} is given)
     * @param parameters        model parameters by name (built-in models)
     * @param network           the reaction network, or null for a built-in model
     * @param observed          species shown in the kymograph (networks); null for the model's default
     * @param domain            the cable
     * @param durationS         simulated time, s
     * @param outputIntervalS   time between frames, s
     * @param outputPositionsUm kymograph columns, um
     * @param stimuli           protocol
     * @param settings          time-step rule
     * @param stochastic        settings of the stochastic mode, or null for deterministic
     */
    public record Spec(String model, Map<String, Double> parameters, ReactionNetwork network, String observed,
            Domain domain, double durationS, double outputIntervalS, double[] outputPositionsUm,
            List<Stimulus> stimuli, SolverSettings settings, StochasticSettings stochastic) {
        public Spec {
            Objects.requireNonNull(model, "model");
            parameters = Map.copyOf(parameters);
            Objects.requireNonNull(domain, "domain");
            Checks.positiveFinite(durationS, "duration_s");
            Checks.positiveFinite(outputIntervalS, "output_interval_s");
            Checks.require(outputIntervalS <= durationS, "the output interval must not exceed the duration");
            outputPositionsUm = outputPositionsUm.clone();
            stimuli = List.copyOf(stimuli);
            Objects.requireNonNull(settings, "settings");
        }

        /** Frame times 0, dt, 2 dt, ... up to the duration. */
        public double[] outputTimesS() {
            return outputTimes(durationS, outputIntervalS);
        }
    }

    /** Output frame times 0, dt, 2 dt, ... up to the duration (a path or a tree). */
    static double[] outputTimes(double durationS, double outputIntervalS) {
        int count = (int) Math.floor(durationS / outputIntervalS + 1e-9) + 1;
        double[] t = new double[count];
        for (int i = 0; i < count; i++) {
            t[i] = i * outputIntervalS;
        }
        return t;
    }

    /**
     * What a run gives.
     *
     * @param kymograph  the observed species (the ensemble mean in stochastic mode)
     * @param spread     standard deviation over the ensemble (stochastic mode), else null
     * @param species    the species shown
     * @param steps      time steps taken (deterministic) or events simulated (stochastic, all runs)
     * @param frontSpeedUmPerS measured front speed, NaN when nothing travels
     * @param solverInfo settings and figures for the summary, by name
     * @param warnings   plain sentences about numerical trouble (the result is still given)
     */
    public record Result(Kymograph kymograph, Kymograph spread, String species, long steps, double frontSpeedUmPerS,
            Map<String, Object> solverInfo, List<String> warnings) {
        public Result {
            warnings = List.copyOf(warnings);
        }
    }

    /**
     * The most time steps, and grid-node steps, one deterministic run may take. Beyond them a run takes minutes to
     * hours (about 1e8 node-steps per second on one core, see docs/benchmarks.md), which is a value of D, a rate or
     * a step setting far from what was meant rather than a simulation anyone waits for.
     */
    public static final long MAX_STEPS = 100_000_000L;
    public static final double MAX_NODE_STEPS = 1e10;

    /**
     * Bytes a deterministic run holds per grid node and species, an upper estimate: the Crank-Nicolson factor cache
     * (4 slots of up to 15 rows), the state, the stimulus profiles and the stepper's work rows, 8 bytes each.
     */
    static final long BYTES_PER_NODE = 80 * 8;

    /**
     * The heap a deterministic run of the spec needs, bytes, an upper estimate from its grid and species (the
     * sampled output, frames x positions, is counted too), so that a caller can refuse a run that cannot fit before
     * it allocates. 0 for a stochastic run, whose memory is the runs' and is bounded elsewhere.
     */
    public static long estimatedBytes(Spec spec) {
        if (spec.stochastic() != null) {
            return 0;
        }
        int fields = 1;
        if (spec.model().equals(NETWORK)) {
            fields = spec.network().speciesCount();
        } else {
            BuiltInModel entry = ModelCatalogue.get(spec.model());
            if (entry.engine() != BuiltInModel.Engine.SCALAR
                    && entry.realise(entry.values(spec.parameters()), spec.stimuli())
                    instanceof Realisation.Network n) {
                fields = n.network().speciesCount();
            }
        }
        double grid = (double) spec.domain().nodeCount() * fields * BYTES_PER_NODE;
        double output = 8.0 * spec.outputTimesS().length * spec.outputPositionsUm().length;
        return (long) Math.min(Long.MAX_VALUE, grid + output);
    }

    /** Step halvings the time-error control makes at most (the last run costs 2^6 plain runs). */
    public static final int MAX_HALVINGS = 6;

    /** Runs the spec. */
    public static Result run(Spec spec, Progress progress) {
        return run(spec, progress, MAX_HALVINGS);
    }

    /** Runs the spec with at most the given number of step halvings for the time tolerance. */
    static Result run(Spec spec, Progress progress, int maxHalvings) {
        double[] times = spec.outputTimesS();
        double[] x = spec.outputPositionsUm();
        double spanS = times[times.length - 1];
        List<String> warnings = new ArrayList<>();
        Map<String, Object> info = new LinkedHashMap<>();
        info.put("grid_nodes", spec.domain().nodeCount());
        info.put("dx_um", spec.domain().spacingUm());
        if (spec.stochastic() == null) {
            info.put("scheme", "Strang splitting: Crank-Nicolson diffusion, Rosenbrock (ROS2) or exact reactions");
            info.put("step_factor", spec.settings().stepFactor());
            info.put("smoothing", spec.settings().smoothing());
            if (spec.settings().fixedStepS() > 0) {
                info.put("fixed_step_s", spec.settings().fixedStepS());
            }
        }
        double origin = spec.stimuli().isEmpty() ? 0 : spec.stimuli().get(0).positionUm();
        ReactionNetwork network;
        String defaultObserved;
        if (spec.model().equals(NETWORK)) {
            network = Objects.requireNonNull(spec.network(), "network");
            defaultObserved = network.species().get(0);
        } else {
            BuiltInModel entry = ModelCatalogue.get(spec.model());
            if (entry.engine() == BuiltInModel.Engine.SCALAR) {
                Checks.require(spec.stochastic() == null, "the stochastic mode needs a network or a multi-species"
                        + " model; give the model as a network to simulate it stochastically");
            }
            Realisation realisation = entry.realise(entry.values(spec.parameters()), spec.stimuli());
            if (realisation instanceof Realisation.Scalar scalar) {
                info.putAll(scalar.figures());
                Solved solved = controlled(spec.settings(), spanS, maxHalvings, info, warnings, progress, settings -> {
                    ScalarRun run = ScalarRun.prepare(scalar.model(), spec.domain(), times, x, scalar.stimuli(),
                            settings);
                    requireFeasible(run.plannedSteps(scalar.parameters()), spec.domain().nodeCount(), spanS);
                    double[] out = new double[times.length * x.length];
                    run.solve(scalar.parameters(), out);
                    return new Solved(out, run.lastStepCount(), run.spatialOrder());
                });
                Kymograph k = new Kymograph(x, times, solved.out(), "model units");
                return new Result(k, null, scalar.species(), solved.steps(), FrontSpeed.measure(k, origin), info,
                        warnings);
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
            StochasticEnsemble.Summary summary = StochasticEnsemble.run(network, spec.domain(), times, x,
                    spec.stimuli(), observed, spec.stochastic(), progress);
            info.put("method", "next-subvolume (spatial Gillespie)");
            info.put("runs", spec.stochastic().runs());
            info.put("seed", spec.stochastic().seed());
            info.put("events", summary.events());
            Kymograph mean = new Kymograph(x, times, summary.mean(), "model units");
            Kymograph sd = new Kymograph(x, times, summary.sd(), "model units");
            return new Result(mean, sd, observed, summary.events(), FrontSpeed.measure(mean, origin), info,
                    warnings);
        }
        int shown = network.indexOf(observed);
        Solved solved = controlled(spec.settings(), spanS, maxHalvings, info, warnings, progress, settings -> {
            NetworkRun run = NetworkRun.prepare(network, spec.domain(), times, x, spec.stimuli(), settings, observed);
            requireFeasible(run.plannedSteps(), spec.domain().nodeCount(), spanS);
            double[][] out = new double[network.speciesCount()][];
            out[shown] = new double[times.length * x.length];
            run.solve(out);
            return new Solved(out[shown], run.lastStepCount(), run.spatialOrder());
        });
        Kymograph k = new Kymograph(x, times, solved.out(), "model units");
        return new Result(k, null, observed, solved.steps(), FrontSpeed.measure(k, origin), info, warnings);
    }

    /**
     * Refuses a run of more than {@link #MAX_STEPS} steps or {@link #MAX_NODE_STEPS} node-steps before it starts,
     * in words for the model file's author (an IllegalArgumentException, which the file readers report as bad input).
     */
    private static void requireFeasible(long steps, int nodes, double spanS) {
        Checks.require(steps <= MAX_STEPS && (double) steps * nodes <= MAX_NODE_STEPS, String.format(Locale.ROOT,
                "the run would take %.3g time steps of %.3g s on %d grid nodes, more than Dendrokin takes (%.0e steps,"
                + " %.0e node-steps); a smaller diffusion coefficient or rate, a wider stimulus, a larger"
                + " solver.step_factor or a shorter time.duration_s shortens it", (double) steps, spanS / steps,
                nodes, (double) MAX_STEPS, MAX_NODE_STEPS));
    }

    /** One deterministic run: the observed output, the steps taken and the spatial order used. */
    record Solved(double[] out, long steps, int spatialOrder) {
    }

    /**
     * Runs once with the given settings, or, when they ask for a time tolerance, halves the step until the
     * Richardson estimate of the time error of the finer of the last two runs meets it (or the halvings run
     * out). Both runs of a pair use the same grid, so their difference is time error alone. Returns the finest
     * plain run (not the extrapolated one, which may lose positivity) and records the figures in {@code info}.
     */
    static Solved controlled(SolverSettings settings, double spanS, int maxHalvings, Map<String, Object> info,
            List<String> warnings, Progress progress, Function<SolverSettings, Solved> solver) {
        double tolerance = settings.timeTolerance();
        Solved coarse = solver.apply(settings);
        info.put("spatial_order", coarse.spatialOrder());
        if (tolerance == 0) {
            progress.report("simulation", 1, 1);
            info.put("time_steps", coarse.steps());
            return coarse;
        }
        Solved fine = coarse;
        double error = Double.NaN;
        double scale = 1;
        long allSteps = coarse.steps();
        int halvings = 0;
        while (halvings < maxHalvings) {
            halvings++;
            progress.report("time-step halving", halvings, maxHalvings);
            fine = solver.apply(settings.halved(halvings));
            allSteps += fine.steps();
            error = richardsonError(coarse, fine);
            scale = 1;
            for (double v : fine.out()) {
                scale = Math.max(scale, Math.abs(v));
            }
            if (error <= tolerance * scale || Double.isNaN(error)) {
                break; // met, or not finite (a smaller step will not repair the model)
            }
            coarse = fine;
        }
        progress.report("simulation", 1, 1);
        double meanStepS = spanS / fine.steps();
        info.put("time_steps", fine.steps());
        info.put("time_tolerance", tolerance);
        boolean finite = Double.isFinite(error) && Double.isFinite(scale);
        info.put("time_error_estimate", finite ? error : null);
        info.put("time_error_allowed", finite ? tolerance * scale : null);
        info.put("time_step_halvings", halvings);
        info.put("step_factor_used", settings.halved(halvings).stepFactor());
        info.put("mean_time_step_s", meanStepS);
        info.put("time_steps_all_runs", allSteps);
        if (!finite) {
            warnings.add("The time error could not be estimated because the run gave values that are not finite"
                    + " numbers, so solver.time_tolerance was not checked.");
        } else if (!(error <= tolerance * scale)) {
            warnings.add(String.format(Locale.ROOT, "The estimated time error (%.3g, signal units) is still above"
                    + " the allowed %.3g after %d halvings of the time step (mean step %.3g s), so the result is the"
                    + " finest run and may be less accurate in time than solver.time_tolerance asks.", error,
                    tolerance * scale, halvings, meanStepS));
        }
        return fine;
    }

    /**
     * Richardson estimate of the time error of the finer run, for a scheme of order 2:
     * max |u_fine - u_coarse| / (r^2 - 1), r the ratio of the step counts (2 when every gap between events
     * halves its step; 3 in the denominator). A gap too short to be split again keeps its step, so r may fall
     * below 2; it is then bounded below by 1.5 (denominator 1.25), which errs on the safe side.
     */
    private static double richardsonError(Solved coarse, Solved fine) {
        double diff = 0;
        double[] a = coarse.out();
        double[] b = fine.out();
        for (int i = 0; i < a.length; i++) {
            double d = Math.abs(b[i] - a[i]);
            if (Double.isNaN(d)) {
                return Double.NaN;
            }
            diff = Math.max(diff, d);
        }
        double r = Math.min(2.0, Math.max(1.5, fine.steps() / (double) coarse.steps()));
        return diff / (r * r - 1);
    }
}
