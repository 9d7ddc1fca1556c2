package org.dendrokin.core.model;

import java.util.List;
import java.util.Optional;

import org.dendrokin.core.units.Unit;

/**
 * {@code fitzhugh-nagumo}: v_t = D v_xx + k (v (1 - v)(v - alpha) - w), w_t = k eps (v - gamma w), the
 * Keener-Sneyd form of FitzHugh (1961) and Nagumo, Arimoto &amp; Yoshizawa (1962), run as a two-species network
 * ({@link ReactionNetwork#fitzHughNagumo}). Parameters D (um^2/s), k (1/s), alpha (any sign), eps and gamma
 * (dimensionless); the kymograph shows v. Its excitation front has the Nagumo width sqrt(2 D / k).
 */
final class FitzHughNagumo implements BuiltInModel {
    private static final List<ModelParameter> PARAMETERS = List.of(
            ModelParameter.diffusion("D", "diffusion coefficient"),
            ModelParameter.rate("k", "time scale"),
            ModelParameter.signed("alpha", "threshold", Double.NEGATIVE_INFINITY, Double.POSITIVE_INFINITY),
            ModelParameter.nonNegative("eps", Unit.DIMENSIONLESS, "recovery rate", false),
            ModelParameter.nonNegative("gamma", Unit.DIMENSIONLESS, "recovery balance", false));
    // REF for the formula: McKean 1970 (the Nagumo front the excitation follows for small eps); sheet s5.2
    private static final ClosedForm FRONT_WIDTH = new ClosedForm("front_width", "front width sqrt(2 D / k)",
            Unit.MICROMETRE, true, p -> Math.sqrt(2 * p[0] / p[1]));

    @Override
    public String name() {
        return "fitzhugh-nagumo";
    }

    @Override
    public List<ModelParameter> parameters() {
        return PARAMETERS;
    }

    @Override
    public String observedSpecies() {
        return "v";
    }

    @Override
    public String signalUnit() {
        return "u";
    }

    @Override
    public Engine engine() {
        return Engine.NETWORK;
    }

    /** k: the excitation's time scale. */
    @Override
    public double stiffnessPerS(double[] p) {
        return p[1];
    }

    @Override
    public List<ClosedForm> closedForms() {
        return List.of(FRONT_WIDTH);
    }

    @Override
    public Optional<ClosedForm> gridScale() {
        return Optional.of(FRONT_WIDTH);
    }

    @Override
    public Realisation realise(double[] p, List<Stimulus> stimuli) {
        return new Realisation.Network(ReactionNetwork.fitzHughNagumo(p[0], p[2], p[3], p[4], p[1]));
    }

    @Override
    public String stochasticRefusal() {
        return "whose rates change sign; write it as a network of one-way reactions";
    }
}
