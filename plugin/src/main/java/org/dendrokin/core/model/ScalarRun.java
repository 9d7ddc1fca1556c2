package org.dendrokin.core.model;

import java.util.Arrays;
import java.util.List;

import org.dendrokin.core.Checks;

/**
 * A one-species reaction-diffusion model on a cable ({@link ScalarModel}, u_t = D u_xx + f(u; p)), prepared once
 * per grid, stimuli and output sampling, then run many times with different parameters (what a fit does). With a
 * varying cross-section the diffusion term is the flux-conservative (1/A) d/dx(A D du/dx) of {@link CableGrid}.
 * The initial state is zero; the stimuli (pulses, injections, clamps) act on u.
 * <p>
 * Scheme ({@link ScalarStepper}): Strang splitting (Strang 1968; sheet s6.4) of each step dt into a reaction half
 * step, a Crank-Nicolson diffusion step (Crank &amp; Nicolson 1947; sheet s6.2; tridiagonal) and another reaction
 * half step. Reaction half steps are the model's own: exact for decay and for the logistic term of Fisher-KPP,
 * the L-stable two-stage Rosenbrock method ROS2 (Verwer, Spee, Blom &amp; Hundsdorfer 1999) for Nagumo's cubic,
 * so stiff reactions (k dt large) stay stable. Every part is second order, so the whole step is second order in
 * dt and, through the 3-point Laplacian, in h. Injections enter the Crank-Nicolson step as a constant source over
 * the step. Events and output sampling are those of {@link TimeMarcher}; the time step follows
 * {@link SolverSettings} with the model's {@link ScalarModel#stiffnessPerS stiffness}.
 * <p>
 * Sensitivities: {@link #solveWithSensitivities} differentiates every sub-step of the same scheme
 * (forward sensitivity equations discretised exactly as u is), so they are the exact derivatives of
 * {@link #solve}'s output as long as the number of steps does not change.
 * <p>
 * Not thread-safe: one instance per thread. {@code solve} allocates nothing.
 */
public final class ScalarRun {
    private final ScalarModel model;
    private final CableGrid grid;
    private final int frames;
    private final int positions;
    private final double minWidthUm;
    private final SolverSettings settings;
    private final ScalarStepper stepper;
    private final TimeMarcher marcher;
    /** u's output row and one per sensitivity, handed to the marcher (reused; emptied after each run). */
    private final double[][] rows;
    private long lastStepCount;
    private double[] initial;

    private ScalarRun(ScalarModel model, Domain domain, double[] outputTimesS, double[] outputPositionsUm,
            List<Stimulus> stimuli, SolverSettings settings) {
        this.model = model;
        this.grid = new CableGrid(domain, settings.spatialOrder());
        this.settings = settings;
        this.frames = outputTimesS.length;
        this.positions = outputPositionsUm.length;
        OutputSampler sampler = new OutputSampler(outputPositionsUm, domain.lengthUm(), grid.h, grid.n);
        StimulusLayout layout = new StimulusLayout(grid, stimuli);
        minWidthUm = layout.minWidthUm;
        stepper = new ScalarStepper(model, grid);
        marcher = new TimeMarcher(outputTimesS, stimuli, layout, new int[stimuli.size()], stepper.fieldCount(),
                sampler, settings);
        rows = new double[stepper.fieldCount()][];
    }

    /**
     * Prepares a run with the default {@link SolverSettings}.
     *
     * @param model             a one-species model of the {@link ModelCatalogue} by name: "diffusion-decay" (D, k),
     *                          "nagumo" (D, k, a) or "fisher-kpp" (D, r)
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
        return prepare(ModelCatalogue.scalar(model), domain, outputTimesS, outputPositionsUm, stimuli, settings);
    }

    /** As {@link #prepare(String, Domain, double[], double[], List, SolverSettings)}, for a catalogue entry. */
    public static ScalarRun prepare(ScalarModel model, Domain domain, double[] outputTimesS,
            double[] outputPositionsUm, List<Stimulus> stimuli, SolverSettings settings) {
        for (Stimulus s : stimuli) {
            Checks.require(s.species() == null || s.species().equals("u"), "the " + model.name()
                    + " model has one species, u; a stimulus names '" + s.species() + "'");
        }
        return new ScalarRun(model, domain, outputTimesS.clone(), outputPositionsUm.clone(), List.copyOf(stimuli),
                settings);
    }

    /** Parameter names in the order {@link #solve} expects them. */
    public List<String> parameterNames() {
        return model.parameterNames();
    }

    /** The model name. */
    public String modelName() {
        return model.name();
    }

    /** The model. */
    public ScalarModel model() {
        return model;
    }

    public int frameCount() {
        return frames;
    }

    public int positionCount() {
        return positions;
    }

    public int nodeCount() {
        return grid.n;
    }

    /**
     * Replaces the zero initial state by the given node values (for checks against closed forms that start
     * from a profile rather than from a stimulus). Not part of the model JSON.
     *
     * @param values one value per grid node, or null for zero. Copied.
     */
    void setInitialState(double[] values) {
        Checks.require(values == null || values.length == grid.n,
                "initial state needs one value per node (" + grid.n + ")");
        initial = values == null ? null : values.clone();
    }

    /** The spatial order actually used (4 only on a uniform cross-section). */
    public int spatialOrder() {
        return grid.compact ? 4 : 2;
    }

    /** Number of time steps the last solve took. */
    /** The time steps a run with these parameters takes (see {@link TimeMarcher#plannedSteps}). */
    public long plannedSteps(double[] parameters) {
        return marcher.plannedSteps(settings.maxStep(model.stiffnessPerS(parameters), grid.h, parameters[0],
                minWidthUm));
    }

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
        int count = model.parameters().size();
        Checks.require(sensOut.length == count, "need one sensitivity row per parameter (" + count + ")");
        for (double[] row : sensOut) {
            Checks.require(row.length == frames * positions, "each sensitivity row needs frames x positions values");
        }
        run(parameters, out, sensOut);
    }

    private void run(double[] p, double[] out, double[][] sensOut) {
        model.check(p);
        Checks.require(out.length == frames * positions, "output needs frames x positions values");
        boolean withSens = sensOut != null;
        stepper.reset(p, initial, withSens);
        double dtMax = settings.maxStep(model.stiffnessPerS(p), grid.h, p[0], minWidthUm);
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
}
