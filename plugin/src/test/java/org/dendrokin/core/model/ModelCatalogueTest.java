package org.dendrokin.core.model;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.HashSet;
import java.util.List;
import java.util.Map;
import java.util.Set;

import org.apache.commons.math3.ode.FirstOrderDifferentialEquations;
import org.apache.commons.math3.ode.nonstiff.DormandPrince853Integrator;
import org.junit.jupiter.api.Test;

/** The catalogue's entries: names, parameters, the reaction kernels and their derivatives, closed forms, starts. */
class ModelCatalogueTest {
    /** Parameters of each one-species model used below, in its order (values typical of the demo and the fits). */
    private static final Map<String, double[]> PARAMETERS = Map.of(
            "diffusion-decay", new double[] {0.8, 0.4},
            "nagumo", new double[] {1.2, 1.7, 0.2},
            "fisher-kpp", new double[] {0.7, 0.9});
    /** Values of u the kernels are checked at: rest, the switching range, above one, slightly negative. */
    private static final double[] U = {0, 0.05, 0.2, 0.5, 0.83, 1, 1.4, -0.1};

    @Test
    void namesAreTheKeysOfModelFilesAndResults() {
        // REF: docs/models.md "Built-in models" and the results.json contract [common practice: file keys never change]
        assertEquals(List.of("diffusion-decay", "nagumo", "fisher-kpp", "buffered-diffusion",
                "buffered-diffusion-rapid", "fitzhugh-nagumo"), ModelCatalogue.names());
        assertEquals(List.of("diffusion-decay", "nagumo", "fisher-kpp"), ModelCatalogue.scalarNames());
        for (BuiltInModel m : ModelCatalogue.all()) {
            Set<String> seen = new HashSet<>(m.parameterNames());
            assertEquals(m.parameters().size(), seen.size(), m.name() + ": parameter names are unique");
            assertEquals(m.name(), ModelCatalogue.get(m.name()).name());
        }
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class, () -> ModelCatalogue.get("cable"));
        assertTrue(e.getMessage().contains("nagumo"), "the message lists the models: " + e.getMessage());
        assertThrows(IllegalArgumentException.class, () -> ModelCatalogue.scalar("buffered-diffusion"));
    }

    @Test
    void valuesFollowTheParameterOrderAndMissingOnesAreNamed() {
        BuiltInModel m = ModelCatalogue.get("fitzhugh-nagumo");
        double[] v = m.values(Map.of("gamma", 5.0, "eps", 4.0, "alpha", 3.0, "k", 2.0, "D", 1.0));
        assertEquals(List.of("D", "k", "alpha", "eps", "gamma"), m.parameterNames());
        for (int i = 0; i < v.length; i++) {
            assertEquals(i + 1.0, v[i], 0, m.parameterNames().get(i));
        }
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class,
                () -> m.values(Map.of("D", 1.0, "k", 2.0)));
        assertTrue(e.getMessage().contains("alpha"), e.getMessage());
        IllegalArgumentException range = assertThrows(IllegalArgumentException.class,
                () -> ModelCatalogue.NAGUMO.check(new double[] {1, -2, 0.2}));
        assertTrue(range.getMessage().contains("rate k (1/s)"), range.getMessage());
    }

    @Test
    void rateDerivativesMatchCentralDifferences() {
        for (ScalarModel m : ModelCatalogue.scalarModels()) {
            double[] p = PARAMETERS.get(m.name());
            for (double u : U) {
                double h = 1e-6;
                double fd = (m.rate(u + h, p) - m.rate(u - h, p)) / (2 * h);
                // REF: central difference, error O(h^2) [common practice]
                assertEquals(fd, m.rateDu(u, p), 1e-8 * (1 + Math.abs(fd)), m.name() + " df/du at u = " + u);
                for (int j = 0; j < p.length; j++) {
                    double[] up = p.clone();
                    double[] down = p.clone();
                    up[j] += h;
                    down[j] -= h;
                    double fdp = (m.rate(u, up) - m.rate(u, down)) / (2 * h);
                    // REF: central difference, error O(h^2) [common practice]
                    assertEquals(fdp, m.rateDp(u, p, j), 1e-8 * (1 + Math.abs(fdp)),
                            m.name() + " df/d" + m.parameterNames().get(j) + " at u = " + u);
                }
            }
        }
    }

    /** u(tau) of du/dt = f(u; p) by an 8th-order Dormand-Prince integration at tight tolerance. */
    private static double reference(ScalarModel m, double[] p, double u0, double tau) {
        FirstOrderDifferentialEquations ode = new FirstOrderDifferentialEquations() {
            @Override
            public int getDimension() {
                return 1;
            }

            @Override
            public void computeDerivatives(double t, double[] y, double[] dy) {
                dy[0] = m.rate(y[0], p);
            }
        };
        double[] y = {u0};
        new DormandPrince853Integrator(1e-12, tau, 1e-14, 1e-13).integrate(ode, 0, y, tau, y);
        return y[0];
    }

    @Test
    void reactionSubStepsFollowTheReactionOde() {
        for (ScalarModel m : ModelCatalogue.scalarModels()) {
            double[] p = PARAMETERS.get(m.name());
            double rate = Math.max(p[1], 1e-9);
            for (double tau : new double[] {0.01 / rate, 0.02 / rate}) {
                double[] to = new double[U.length];
                m.react(p, tau, U, to, U.length);
                for (int i = 0; i < U.length; i++) {
                    double exact = reference(m, p, U[i], tau);
                    double err = Math.abs(to[i] - exact);
                    if (m == ModelCatalogue.NAGUMO) {
                        // ROS2 is second order: local error C (k tau)^3, C set by the cubic's derivatives on the
                        // range; 20 is a loose bound for |u| <= 1.4, and the order itself is checked below
                        // REF: Commons Math DormandPrince853Integrator [common practice, general-purpose library]
                        assertTrue(err < 20 * Math.pow(rate * tau, 3), m.name() + " ROS2 sub-step at u = " + U[i]
                                + ", k tau = " + rate * tau + ": error " + err);
                    } else {
                        // exact sub-steps (exponential decay, logistic solution)
                        // REF: Commons Math DormandPrince853Integrator [common practice, general-purpose library]
                        assertEquals(exact, to[i], 1e-11, m.name() + " exact sub-step at u = " + U[i]);
                    }
                }
            }
        }
        // ROS2's error falls as tau^3: halving tau divides it by about 8
        double[] p = PARAMETERS.get("nagumo");
        double[] from = {0.5};
        double[] coarse = new double[1];
        double[] fine = new double[1];
        ModelCatalogue.NAGUMO.react(p, 0.04, from, coarse, 1);
        ModelCatalogue.NAGUMO.react(p, 0.02, from, fine, 1);
        double ratio = Math.abs(coarse[0] - reference(ModelCatalogue.NAGUMO, p, 0.5, 0.04))
                / Math.abs(fine[0] - reference(ModelCatalogue.NAGUMO, p, 0.5, 0.02));
        // REF: Verwer, Spee, Blom & Hundsdorfer 1999, ROS2 is of order 2 (local error O(tau^3)) [published]
        assertEquals(8, ratio, 1.5, "ROS2 local error ratio for tau halved");
    }

    @Test
    void sensitivityUpdatesAreTheDerivativesOfTheSubStep() {
        double tau = 0.05;
        for (ScalarModel m : ModelCatalogue.scalarModels()) {
            double[] base = PARAMETERS.get(m.name());
            for (boolean zeroRate : new boolean[] {false, true}) {
                double[] p = base.clone();
                if (zeroRate) {
                    p[1] = 0;   // the derivative along the rate is not zero there
                }
                int n = U.length;
                double[][] sens = new double[p.length][n];
                for (int j = 0; j < p.length; j++) {
                    for (int i = 0; i < n; i++) {
                        sens[j][i] = 0.3 * j - 0.1 * i;   // incoming sensitivities, as after earlier steps
                    }
                }
                double[][] incoming = new double[p.length][];
                for (int j = 0; j < p.length; j++) {
                    incoming[j] = sens[j].clone();
                }
                double[] u = U.clone();
                m.reactWithSensitivities(p, tau, u, sens, n, new double[m.scratchRows()][n]);
                double[] plain = new double[n];
                m.react(p, tau, U, plain, n);
                double h = 1e-6;
                double[] uUp = new double[n];
                double[] uDown = new double[n];
                double[] shiftedUp = U.clone();
                double[] shiftedDown = U.clone();
                for (int i = 0; i < n; i++) {
                    shiftedUp[i] += h;
                    shiftedDown[i] -= h;
                }
                m.react(p, tau, shiftedUp, uUp, n);
                m.react(p, tau, shiftedDown, uDown, n);
                for (int i = 0; i < n; i++) {
                    assertEquals(plain[i], u[i], 1e-15 * (1 + Math.abs(plain[i])), m.name() + " same u");
                    double dRdu = (uUp[i] - uDown[i]) / (2 * h);
                    for (int j = 0; j < p.length; j++) {
                        double dRdp = 0;
                        if (j > 0) {
                            double[] up = p.clone();
                            double[] down = p.clone();
                            up[j] += h;
                            down[j] -= h;
                            double[] a = new double[1];
                            double[] b = new double[1];
                            m.react(up, tau, new double[] {U[i]}, a, 1);
                            m.react(down, tau, new double[] {U[i]}, b, 1);
                            dRdp = (a[0] - b[0]) / (2 * h);
                        }
                        double expected = dRdu * incoming[j][i] + dRdp;
                        // REF: chain rule with central differences, error O(h^2) [common practice]
                        assertEquals(expected, sens[j][i], 1e-7 * (1 + Math.abs(expected)), m.name() + " d/d"
                                + m.parameterNames().get(j) + " at u = " + U[i] + (zeroRate ? ", zero rate" : ""));
                    }
                }
            }
        }
    }

    @Test
    void closedFormsAreThePublishedOnes() {
        double[] nagumo = {1, 2, 0.2};
        // REF: McKean 1970, c = sqrt(D k / 2)(1 - 2a) = 0.6 um/s and width sqrt(2 D / k) = 1 um at D = 1, k = 2,
        // a = 0.2 [published formula]; sheet s5.2
        assertEquals(0.6, form(ModelCatalogue.NAGUMO, "front_speed").value(nagumo), 1e-15);
        assertEquals(1.0, form(ModelCatalogue.NAGUMO, "front_width").value(nagumo), 1e-15);
        // REF: Fisher 1937 / KPP 1937, c* = 2 sqrt(r D) = 2 um/s at r = D = 1 [published formula]; sheet s5.1
        assertEquals(2.0, form(ModelCatalogue.FISHER_KPP, "front_speed").value(new double[] {1, 1}), 1e-15);
        // REF: Crank 1975, length constant sqrt(D / k) = 2 um at D = 1, k = 0.25 [published formula]; sheet s2.3
        assertEquals(2.0, form(ModelCatalogue.DIFFUSION_DECAY, "length_constant").value(new double[] {1, 0.25}),
                1e-15);
        for (BuiltInModel m : ModelCatalogue.all()) {
            m.gridScale().ifPresent(s -> assertTrue(m.closedForms().contains(s), m.name()
                    + ": the grid scale is one of its closed forms"));
        }
    }

    @Test
    void nagumoClosedFormSpeedIsTheSimulatedOne() {
        Domain domain = new Domain(80, 0.1, Boundary.NO_FLUX);
        double[] x = new double[domain.nodeCount()];
        for (int i = 0; i < x.length; i++) {
            x[i] = domain.nodeUm(i);
        }
        double[] times = new double[121];
        for (int f = 0; f < times.length; f++) {
            times[f] = 0.25 * f;
        }
        double[] p = {1, 2, 0.2};
        ScalarRun run = ScalarRun.prepare(ModelCatalogue.NAGUMO, domain, times, x,
                List.of(Stimulus.pulse(0, 5, 2, 1)), SolverSettings.DEFAULT);
        double[] out = new double[times.length * x.length];
        run.solve(p, out);
        double measured = FrontSpeed.measure(new org.dendrokin.core.kymo.Kymograph(x, times, out, "u"), 5);
        // REF: McKean 1970 (the closed form the entry gives) [published formula]; sheet s5.2
        assertEquals(form(ModelCatalogue.NAGUMO, "front_speed").value(p), measured, 0.01 * measured,
                "simulated front speed (um/s)");
    }

    @Test
    void startPointsLieOnTheMeasuredFront() {
        DataGuesses g = new DataGuesses(0.8, 2.0, 1.5, 0.1, 0.25);
        double[] widths = g.trialFrontWidthsUm();
        for (ScalarModel m : List.of(ModelCatalogue.NAGUMO, ModelCatalogue.FISHER_KPP)) {
            StartPoints s = m.startPoints(g);
            assertEquals(Math.min(widths[0], widths[1]), s.narrowestFeatureUm(), 1e-12, m.name());
            for (double[] start : s.points()) {
                m.check(start);
                // each start has the measured speed and one of the trial widths, by the entry's own closed forms
                assertEquals(0.8, form(m, "front_speed").value(start), 1e-12, m.name() + " start speed (um/s)");
                double w = form(m, "front_width").value(start);
                assertTrue(Math.abs(w - widths[0]) < 1e-12 || Math.abs(w - widths[1]) < 1e-12,
                        m.name() + " start width " + w);
            }
        }
        StartPoints dd = ModelCatalogue.DIFFUSION_DECAY.startPoints(g);
        assertEquals(2.0, dd.narrowestFeatureUm(), 0, "the stimulus is the narrowest feature of a spreading pulse");
        assertEquals(1.5, dd.points().get(0)[0], 1e-12, "first start: the apparent D");
        assertEquals(0.1, dd.points().get(0)[1], 1e-12, "first start: the decay rate");
    }

    @Test
    void rapidBufferReducesToDiffusionDecayWithEffectiveConstants() {
        BuiltInModel rapid = ModelCatalogue.get("buffered-diffusion-rapid");
        double[] p = {220, 20, 100, 0.5, 0.1, 4};   // D_ca, D_buffer, B_total, Kd, kon, k
        Realisation.Scalar r = (Realisation.Scalar) rapid.realise(p, List.of(Stimulus.pulse(0, 5, 1, 3.0),
                Stimulus.clamp(1, 1, 5, 1, 0.2)));
        double kappa = 100 / 0.5;
        // REF: Wagner & Keizer 1994, rapid buffer approximation linearised at rest [published formula]; sheet s3.2
        assertEquals((220 + kappa * 20) / (1 + kappa), r.parameters()[0], 1e-12, "effective D (um^2/s)");
        assertEquals(4 / (1 + kappa), r.parameters()[1], 1e-15, "effective k (1/s)");
        assertEquals(3.0 / (1 + kappa), r.stimuli().get(0).amount(), 1e-15, "free share of a pulse");
        assertEquals(0.2, r.stimuli().get(1).amount(), 0, "a clamp holds free Ca at its value");
        assertEquals(ModelCatalogue.DIFFUSION_DECAY, r.model());
        assertEquals("Ca", r.species());
        assertEquals(List.of("buffer_capacity", "effective_D_um2_per_s", "effective_k_per_s"),
                List.copyOf(r.figures().keySet()));
    }

    private static ClosedForm form(BuiltInModel m, String name) {
        return m.closedForms().stream().filter(f -> f.name().equals(name)).findFirst().orElseThrow();
    }
}
