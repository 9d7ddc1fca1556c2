package org.dendrokin.core.model;

import java.util.ArrayList;
import java.util.List;
import java.util.Optional;

import org.dendrokin.core.units.Unit;

/**
 * {@code diffusion-decay}: u_t = D u_xx - k u, passive spread with first-order removal; parameters D (um^2/s)
 * and k (1/s). The reaction sub-step is exact, u(tau) = u(0) exp(-k tau), and linear decay commutes with
 * diffusion, so it sets no limit on the step. A steady source gives a profile with length constant sqrt(D / k)
 * (Crank 1975).
 */
final class DiffusionDecay extends ScalarModel {
    private static final List<ModelParameter> PARAMETERS = List.of(
            ModelParameter.diffusion("D", "diffusion coefficient"),
            ModelParameter.rate("k", "decay rate"));
    // REF for the formula: Crank 1975 (steady source); sheet s2.3: lambda = sqrt(D / k)
    private static final ClosedForm LENGTH_CONSTANT = new ClosedForm("length_constant",
            "length constant sqrt(D / k)", Unit.MICROMETRE, true, p -> Math.sqrt(p[0] / p[1]));

    @Override
    public String name() {
        return "diffusion-decay";
    }

    @Override
    public List<ModelParameter> parameters() {
        return PARAMETERS;
    }

    /** 0: the decay is integrated exactly. */
    @Override
    public double stiffnessPerS(double[] p) {
        return 0;
    }

    @Override
    public List<ClosedForm> closedForms() {
        return List.of(LENGTH_CONSTANT);
    }

    @Override
    public Optional<ClosedForm> gridScale() {
        return Optional.of(LENGTH_CONSTANT);
    }

    @Override
    public double rate(double u, double[] p) {
        return -p[1] * u;
    }

    @Override
    public double rateDu(double u, double[] p) {
        return -p[1];
    }

    @Override
    public double rateDp(double u, double[] p, int j) {
        return j == 1 ? -u : 0;
    }

    @Override
    void react(double[] p, double tau, double[] from, double[] to, int n) {
        double e = Math.exp(-p[1] * tau);
        for (int i = 0; i < n; i++) {
            to[i] = from[i] * e;
        }
    }

    /** u1 = e u0 with e = exp(-k tau): du1/du0 = e and du1/dk = -tau e u0 = -tau u1. */
    @Override
    void reactWithSensitivities(double[] p, double tau, double[] u, double[][] sens, int n, double[][] scratch) {
        double e = Math.exp(-p[1] * tau);
        double[] sD = sens[0];
        double[] sK = sens[1];
        for (int i = 0; i < n; i++) {
            u[i] *= e;
        }
        for (int i = 0; i < n; i++) {
            sD[i] *= e;
            sK[i] = e * sK[i] - tau * u[i];
        }
    }

    /**
     * The apparent D and decay rate of the data, with D scaled up for the wider trial front (a wider start widens
     * the same way a larger D does); the narrowest feature is the stimulus itself.
     */
    @Override
    public StartPoints startPoints(DataGuesses g) {
        double[] widths = g.trialFrontWidthsUm();
        List<double[]> points = new ArrayList<>();
        for (double w : widths) {
            points.add(new double[] {g.dUm2PerS() * w / widths[0], g.kPerS()});
        }
        return new StartPoints(points, g.stimulusWidthUm());
    }
}
