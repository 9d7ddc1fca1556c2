package org.dendrokin.core.model;

/**
 * A solver's state and its time step, as {@link TimeMarcher} drives it: the marcher owns the timeline (stimulus
 * pulses, the start and end of injections and clamps, output times), chooses the steps and samples the outputs;
 * the stepper holds the fields on its nodes and advances them by one step. Implemented by the scalar solver
 * ({@link ScalarStepper}: u and its parameter sensitivities) and the network solver ({@link NetworkStepper}: one
 * field per species); a solver on a branched tree implements it the same way, with its own node numbering and
 * its own {@link StimulusLayout} and {@link OutputSampler} built on it.
 * <p>
 * Calls come per breakpoint and per step, never per node, so the stepper's sweeps stay free of dispatch.
 */
interface Stepper {
    /** Nodes per field; every field array has this length. */
    int nodeCount();

    /**
     * The live values of field f at every node: what pulses add to, what outputs sample. Field 0 is the first
     * species; a stepper may expose derived fields after its species (the scalar solver's sensitivities).
     */
    double[] field(int f);

    /**
     * Sets the stimulus sources, constant until the next call: {@code rates[f]} holds the source of field f at
     * every node (amount per second, in the field's unit), or is null for none.
     *
     * @param rates one entry per stimulated field; rows are read during the call only. Not modified.
     */
    void setSources(double[][] rates);

    /**
     * Holds field f at the given value on the given nodes (a clamp), together with whatever follows from it (a
     * held value does not depend on the parameters, so its sensitivities are zero).
     */
    void hold(int f, boolean[] nodes, double value);

    /**
     * Advances every field by dt.
     *
     * @param dtS    the step, s
     * @param damped true right after a sharp change (pulse, clamp on or off): the diffusion part is then taken as
     *               two backward-Euler half steps instead of Crank-Nicolson, which damps grid-scale oscillations
     *               (Rannacher start-up)
     */
    void step(double dtS, boolean damped);
}
