package org.dendrokin.core.model;

import java.util.List;

import org.dendrokin.core.units.Unit;

/**
 * {@code buffered-diffusion}: free calcium Ca and a buffer B, Ca + B &lt;-&gt; CaB with kon and koff = kon Kd,
 * extrusion of free Ca at rate k; all three species simulated exactly as a reaction network
 * ({@link ReactionNetwork#bufferedDiffusion}). Parameters D_ca, D_buffer (um^2/s), B_total, Kd (uM),
 * kon (1/(uM s)), k (1/s); the kymograph shows free Ca in uM.
 */
final class BufferedDiffusion implements BuiltInModel {
    /** The parameters of both buffered models, in order. */
    static final List<ModelParameter> PARAMETERS = List.of(
            ModelParameter.diffusion("D_ca", "diffusion coefficient of free calcium"),
            ModelParameter.diffusion("D_buffer", "diffusion coefficient of the buffer"),
            ModelParameter.nonNegative("B_total", Unit.MICROMOLAR, "total buffer", false),
            ModelParameter.nonNegative("Kd", Unit.MICROMOLAR, "dissociation constant", true),
            ModelParameter.nonNegative("kon", Unit.PER_MICROMOLAR_SECOND, "binding rate", true),
            ModelParameter.rate("k", "extrusion rate"));

    @Override
    public String name() {
        return "buffered-diffusion";
    }

    @Override
    public List<ModelParameter> parameters() {
        return PARAMETERS;
    }

    @Override
    public String observedSpecies() {
        return "Ca";
    }

    @Override
    public String signalUnit() {
        return "uM";
    }

    @Override
    public Engine engine() {
        return Engine.NETWORK;
    }

    /** 0: binding and extrusion are left to the L-stable Rosenbrock step. */
    @Override
    public double stiffnessPerS(double[] p) {
        return 0;
    }

    @Override
    public Realisation realise(double[] p, List<Stimulus> stimuli) {
        return new Realisation.Network(ReactionNetwork.bufferedDiffusion(p[0], p[1], p[2], p[3], p[4], p[5]));
    }
}
