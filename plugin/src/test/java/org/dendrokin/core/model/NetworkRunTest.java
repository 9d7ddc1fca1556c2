package org.dendrokin.core.model;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.List;

import org.apache.commons.math3.ode.FirstOrderDifferentialEquations;
import org.apache.commons.math3.ode.nonstiff.DormandPrince853Integrator;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.ValueSource;

class NetworkRunTest {
    private static double[] nodes(Domain d) {
        double[] x = new double[d.nodeCount()];
        for (int i = 0; i < x.length; i++) {
            x[i] = d.nodeUm(i);
        }
        return x;
    }

    /** A + B -> 2 B (k1 A B) and B -> nothing (k2 B): nonlinear, two diffusing species. */
    private static ReactionNetwork autocatalytic(double dA, double dB, double k1, double k2) {
        List<String> names = List.of("A", "B");
        return new ReactionNetwork(names, new double[] {dA, dB}, new double[] {1, 0}, List.of(
                new ReactionNetwork.Reaction("growth", ReactionNetwork.stoichiometry(names, "A", -1, "B", 1),
                        ReactionNetwork.massAction(new double[] {1, 1}, new double[] {0, 2}, k1, 0), k1),
                new ReactionNetwork.Reaction("loss", ReactionNetwork.stoichiometry(names, "B", -1),
                        ReactionNetwork.massAction(new double[] {0, 1}, new double[2], k2, 0), k2)));
    }

    @Test
    void nonlinearTwoSpeciesNetworkMatchesDormandPrinceOnTheSameLines() {
        double dA = 1.0;
        double dB = 0.2;
        double k1 = 3.0;
        double k2 = 0.7;
        Domain domain = new Domain(20, 0.5, Boundary.NO_FLUX);
        double[] x = nodes(domain);
        int n = x.length;
        double h = domain.spacingUm();
        double tEnd = 2.0;
        ReactionNetwork net = autocatalytic(dA, dB, k1, k2);
        Stimulus pulse = Stimulus.pulse(0, 8, 1.5, 0.5).onSpecies("B");
        NetworkRun run = NetworkRun.prepare(net, domain, new double[] {tEnd}, x, List.of(pulse),
                SolverSettings.DEFAULT.withFixedStepS(5e-4).withSmoothing(false).withSpatialOrder(2), "A");
        double[][] out = {new double[n], new double[n]};
        run.solve(out);

        // The same method-of-lines system, written out here: 3-point Laplacian with mirror (no-flux) ends.
        FirstOrderDifferentialEquations lines = new FirstOrderDifferentialEquations() {
            @Override
            public int getDimension() {
                return 2 * n;
            }

            @Override
            public void computeDerivatives(double t, double[] y, double[] dy) {
                for (int i = 0; i < n; i++) {
                    double a = y[i];
                    double b = y[n + i];
                    double lapA = (i == 0 ? 2 * (y[1] - a) : i == n - 1 ? 2 * (y[n - 2] - a)
                            : y[i - 1] - 2 * a + y[i + 1]) / (h * h);
                    double lapB = (i == 0 ? 2 * (y[n + 1] - b) : i == n - 1 ? 2 * (y[2 * n - 2] - b)
                            : y[n + i - 1] - 2 * b + y[n + i + 1]) / (h * h);
                    dy[i] = dA * lapA - k1 * a * b;
                    dy[n + i] = dB * lapB + k1 * a * b - k2 * b;
                }
            }
        };
        double[] y = new double[2 * n];
        for (int i = 0; i < n; i++) {
            y[i] = 1;
            y[n + i] = 0.5 * pulse.profile(x[i]);
        }
        new DormandPrince853Integrator(1e-10, 1, 1e-13, 1e-13).integrate(lines, 0, y, tEnd, y);
        double err = 0;
        for (int i = 0; i < n; i++) {
            err = Math.max(err, Math.abs(out[0][i] - y[i]));
            err = Math.max(err, Math.abs(out[1][i] - y[n + i]));
        }
        // REF: Apache Commons Math DormandPrince853Integrator on the same semi-discrete system [common practice]
        assertTrue(err < 1e-6, "largest difference from Dormand-Prince 8(5,3): " + err);
    }

    /**
     * m species in a ring, each diffusing with its own D: X_s + X_(s+1) -> 2 X_(s+1) (k1, for m of 2 or more),
     * X_s -> nothing (k2), and production of X_s by a Hill term of X_(s+1) (vmax, K, n = 2).
     */
    private static ReactionNetwork ring(int m, double[] d, double k1, double k2, double vmax, double kHalf) {
        List<String> names = new java.util.ArrayList<>();
        for (int s = 0; s < m; s++) {
            names.add("X" + s);
        }
        List<ReactionNetwork.Reaction> reactions = new java.util.ArrayList<>();
        for (int s = 0; s < m; s++) {
            int next = (s + 1) % m;
            if (m > 1) {
                double[] orders = new double[m];
                orders[s] = 1;
                orders[next] = 1;
                reactions.add(new ReactionNetwork.Reaction("conversion " + s,
                        ReactionNetwork.stoichiometry(names, names.get(s), -1, names.get(next), 1),
                        ReactionNetwork.massAction(orders, new double[m], k1, 0), k1));
            }
            double[] own = new double[m];
            own[s] = 1;
            reactions.add(new ReactionNetwork.Reaction("decay " + s, ReactionNetwork.stoichiometry(names, names.get(s), -1),
                    ReactionNetwork.massAction(own, new double[m], k2, 0), k2));
            reactions.add(new ReactionNetwork.Reaction("production " + s,
                    ReactionNetwork.stoichiometry(names, names.get(s), 1), ReactionNetwork.hill(next, vmax, kHalf, 2),
                    2 * vmax / kHalf));
        }
        double[] init = new double[m];
        java.util.Arrays.fill(init, 0.5);
        return new ReactionNetwork(names, d, init, reactions);
    }

    @ParameterizedTest
    @ValueSource(ints = {1, 3, 4, 5})
    void ringNetworksOfEverySizeMatchDormandPrinceOnTheSameLines(int m) {
        double k1 = 2.0;
        double k2 = 0.3;
        double vmax = 0.8;
        double kHalf = 0.6;
        double[] d = new double[m];
        for (int s = 0; s < m; s++) {
            d[s] = 0.3 + 0.2 * s;
        }
        Domain domain = new Domain(20, 0.5, Boundary.NO_FLUX);
        double[] x = nodes(domain);
        int n = x.length;
        double h = domain.spacingUm();
        double tEnd = 2.0;
        Stimulus pulse = Stimulus.pulse(0, 8, 1.5, 0.5).onSpecies("X0");
        NetworkRun run = NetworkRun.prepare(ring(m, d, k1, k2, vmax, kHalf), domain, new double[] {tEnd}, x,
                List.of(pulse), SolverSettings.DEFAULT.withFixedStepS(5e-4).withSmoothing(false).withSpatialOrder(2),
                "X0");
        double[][] out = new double[m][n];
        run.solve(out);

        // The same method-of-lines system, written out here: 3-point Laplacian with mirror (no-flux) ends.
        FirstOrderDifferentialEquations lines = new FirstOrderDifferentialEquations() {
            @Override
            public int getDimension() {
                return m * n;
            }

            @Override
            public void computeDerivatives(double t, double[] y, double[] dy) {
                for (int s = 0; s < m; s++) {
                    int next = (s + 1) % m;
                    for (int i = 0; i < n; i++) {
                        int o = s * n;
                        double u = y[o + i];
                        double lap = (i == 0 ? 2 * (y[o + 1] - u) : i == n - 1 ? 2 * (y[o + n - 2] - u)
                                : y[o + i - 1] - 2 * u + y[o + i + 1]) / (h * h);
                        double v = y[next * n + i];
                        double rate = d[s] * lap - k2 * u + vmax * v * v / (kHalf * kHalf + v * v);
                        if (m > 1) {
                            double prev = y[((s + m - 1) % m) * n + i];
                            rate += k1 * prev * u - k1 * u * v;
                        }
                        dy[o + i] = rate;
                    }
                }
            }
        };
        double[] y = new double[m * n];
        java.util.Arrays.fill(y, 0.5);
        for (int i = 0; i < n; i++) {
            y[i] += 0.5 * pulse.profile(x[i]);
        }
        new DormandPrince853Integrator(1e-10, 1, 1e-13, 1e-13).integrate(lines, 0, y, tEnd, y);
        double err = 0;
        for (int s = 0; s < m; s++) {
            for (int i = 0; i < n; i++) {
                err = Math.max(err, Math.abs(out[s][i] - y[s * n + i]));
            }
        }
        // REF: Apache Commons Math DormandPrince853Integrator on the same semi-discrete system [common practice]
        assertTrue(err < 1e-6, m + " species: largest difference from Dormand-Prince 8(5,3): " + err);
    }

    @Test
    void rapidBufferApproximationAgreesWithTheExactBufferedModelWhenBindingIsFast() {
        double dCa = 220;
        double dB = 20;
        double bTotal = 100;
        double kd = 1;
        double k = 50;
        Domain domain = new Domain(40, 0.2, Boundary.NO_FLUX);
        double[] x = nodes(domain);
        double[] times = {0.05, 0.2};
        List<Stimulus> pulse = List.of(Stimulus.pulse(0, 20, 1.0, 0.01));
        ReactionNetwork exact = ReactionNetwork.bufferedDiffusion(dCa, dB, bTotal, kd, 1e4, k);
        NetworkRun run = NetworkRun.prepare(exact, domain, times, x, pulse, SolverSettings.DEFAULT.withMaxStepS(1e-3),
                "Ca");
        double[][] out = new double[3][];
        out[0] = new double[times.length * x.length];
        run.solve(out);
        double kappa = bTotal / kd;
        // REF: Wagner & Keizer 1994 Biophys J 67:447, linearised rapid buffer: D_eff = (Dc + kappa Db)/(1 + kappa),
        // decay k/(1 + kappa), free share 1/(1 + kappa) [published, equation numbers not checked]; sheet s3.2
        double dEff = (dCa + kappa * dB) / (1 + kappa);
        double kEff = k / (1 + kappa);
        ScalarRun approx = ScalarRun.prepare("diffusion-decay", domain, times, x,
                List.of(Stimulus.pulse(0, 20, 1.0, 0.01 / (1 + kappa))), SolverSettings.DEFAULT.withMaxStepS(1e-3));
        double[] ref = new double[times.length * x.length];
        approx.solve(new double[] {dEff, kEff}, ref);
        double peak = 0;
        double err = 0;
        for (int i = x.length; i < 2 * x.length; i++) {
            peak = Math.max(peak, ref[i]);
            err = Math.max(err, Math.abs(out[0][i] - ref[i]));
        }
        // Binding at kon B = 1e6 /s is ~1e5 times faster than the spread; the approximation then holds to ~1%.
        assertTrue(err < 0.02 * peak, "free Ca at 0.2 s, exact vs rapid buffer: " + err + " of peak " + peak);
    }

    @Test
    void fitzHughNagumoPulseTravelsAndRecovers() {
        assertEquals(Math.sqrt(0.5) * (1 - 2 * 0.1), fhnSpeed(0.001, false), 0.02 * 0.5657,
                "FitzHugh-Nagumo pulse speed, eps = 0.001 (um/s)");
        fhnSpeed(0.01, true);
    }

    private static double fhnSpeed(double eps, boolean checkRecovery) {
        Domain domain = new Domain(100, 0.25, Boundary.NO_FLUX);
        double[] x = nodes(domain);
        double[] times = {0, 20, 40};
        ReactionNetwork fhn = ReactionNetwork.fitzHughNagumo(1, 0.1, eps, 1, 1);
        NetworkRun run = NetworkRun.prepare(fhn, domain, times, x, List.of(Stimulus.pulse(0, 10, 2, 1)),
                SolverSettings.DEFAULT, "v");
        double[][] out = {new double[3 * x.length], new double[3 * x.length]};
        run.solve(out);
        int n = x.length;
        double front20 = 0;
        double front40 = 0;
        for (int i = 0; i < n; i++) {
            if (out[0][n + i] > 0.5) {
                front20 = x[i];
            }
            if (out[0][2 * n + i] > 0.5) {
                front40 = x[i];
            }
        }
        if (checkRecovery) {
            assertTrue(out[0][2 * n + (int) (10 / 0.25)] < 0.5, "the stimulated site has recovered by 40 s");
        }
        // REF: Keener & Sneyd: for eps -> 0 the leading front moves at the Nagumo speed sqrt(A D / 2)(1 - 2 alpha)
        // [from memory: Keener & Sneyd; fairly sure]; sheet s5.3. The caller's 2% allows for eps = 0.001 and the
        // front located to the nearest node (0.25 um over 20 um of travel).
        return (front40 - front20) / 20;
    }
}
