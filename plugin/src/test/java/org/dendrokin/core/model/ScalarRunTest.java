package org.dendrokin.core.model;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.List;

import org.junit.jupiter.api.Test;

class ScalarRunTest {
    private static double[] range(double start, double step, int count) {
        double[] v = new double[count];
        for (int i = 0; i < count; i++) {
            v[i] = start + i * step;
        }
        return v;
    }

    private static double[] nodes(Domain d) {
        return range(0, d.spacingUm(), d.nodeCount());
    }

    /** Gaussian pulse of peak amount and sd s0 after time t: Crank 1975 (2.2) times exp(-k t). */
    private static double gaussian(double amount, double s0, double d, double k, double x, double t) {
        double var = s0 * s0 + 2 * d * t;
        double mass = amount * s0 * Math.sqrt(2 * Math.PI);
        return mass / Math.sqrt(2 * Math.PI * var) * Math.exp(-x * x / (2 * var)) * Math.exp(-k * t);
    }

    private static double maxErrorVsGaussian(int order, double dx, double dtS, double k, double tEnd, double[] relOut) {
        Domain domain = new Domain(60, dx, Boundary.NO_FLUX);
        double[] x = nodes(domain);
        double[] times = {tEnd};
        SolverSettings base = SolverSettings.DEFAULT.withSpatialOrder(order);
        SolverSettings settings = dtS > 0 ? base.withFixedStepS(dtS).withSmoothing(false) : base;
        ScalarRun run = ScalarRun.prepare("diffusion-decay", domain, times, x, List.of(Stimulus.pulse(0, 30, 1.0, 2.0)),
                settings);
        double[] out = new double[x.length];
        run.solve(new double[] {1.0, k}, out);
        double err = 0;
        double peak = 0;
        for (int i = 0; i < x.length; i++) {
            double exact = gaussian(2.0, 1.0, 1.0, k, x[i] - 30, tEnd);
            err = Math.max(err, Math.abs(out[i] - exact));
            peak = Math.max(peak, exact);
        }
        if (relOut != null) {
            relOut[0] = err / peak;
        }
        return err;
    }

    @Test
    void gaussianPulseMatchesClosedFormWithAndWithoutDecay() {
        double[] rel = new double[1];
        maxErrorVsGaussian(2, 0.05, 0, 0, 5, rel);
        // REF: Crank 1975 ch. 2, Gaussian pulse (2.2) [published formula]; sheet s2.2
        assertTrue(rel[0] < 1e-3, "max error relative to the peak, pure diffusion: " + rel[0]);
        maxErrorVsGaussian(2, 0.05, 0, 0.4, 5, rel);
        // REF: Crank 1975, the same times exp(-k t) [published: standard]; sheet s2.3
        assertTrue(rel[0] < 1e-3, "max error relative to the peak, with decay: " + rel[0]);
    }

    @Test
    void secondOrderInSpaceAndTime() {
        double e1 = maxErrorVsGaussian(2, 0.2, 0.04, 0.5, 2, null);
        double e2 = maxErrorVsGaussian(2, 0.1, 0.02, 0.5, 2, null);
        double e3 = maxErrorVsGaussian(2, 0.05, 0.01, 0.5, 2, null);
        // REF: Crank 1975 (2.2) x exp(-kt) [published formula]; CN + 3-point Laplacian order 2; sheet s2.1-2.3, s6.2
        assertEquals(2.0, Math.log(e1 / e2) / Math.log(2), 0.1, "observed order, first refinement");
        assertEquals(2.0, Math.log(e2 / e3) / Math.log(2), 0.1, "observed order, second refinement");
    }

    @Test
    void compactSchemeIsFourthOrderInSpaceAndMatchesTheClosedForm() {
        double[] rel = new double[1];
        maxErrorVsGaussian(4, 0.1, 0, 0.4, 5, rel);
        // REF: Crank 1975 (2.2) x exp(-kt) [published formula]; sheet s2.2, s2.3; default (compact) settings
        assertTrue(rel[0] < 1e-3, "max error relative to the peak, compact scheme, dx = 0.1 um: " + rel[0]);
        // space alone: dt small enough that the time error is far below the spatial one
        double e1 = maxErrorVsGaussian(4, 0.4, 0.002, 0.5, 2, null);
        double e2 = maxErrorVsGaussian(4, 0.2, 0.002, 0.5, 2, null);
        // REF: compact fourth-order (Numerov-type) difference, truncation O(h^4) [published: standard, e.g.
        // Lele 1992 J Comput Phys 103:16; from memory, fairly sure]; 3.6-4.4 allows the pre-asymptotic range
        assertEquals(4.0, Math.log(e1 / e2) / Math.log(2), 0.4, "observed order in space, compact scheme");
    }

    @Test
    void strangSplittingOfNagumoIsSecondOrderInTime() {
        Domain domain = new Domain(40, 0.2, Boundary.NO_FLUX);
        double[] x = nodes(domain);
        double[] times = {8};
        List<Stimulus> pulse = List.of(Stimulus.pulse(0, 5, 2.0, 1.0));
        double[] ref = new double[x.length];
        double[][] sol = new double[3][x.length];
        double[] steps = {0.2, 0.1, 0.05};
        ScalarRun.prepare("nagumo", domain, times, x, pulse, SolverSettings.DEFAULT.withFixedStepS(0.002))
                .solve(new double[] {1, 2, 0.2}, ref);
        for (int s = 0; s < 3; s++) {
            ScalarRun.prepare("nagumo", domain, times, x, pulse, SolverSettings.DEFAULT.withFixedStepS(steps[s]))
                    .solve(new double[] {1, 2, 0.2}, sol[s]);
        }
        double[] err = new double[3];
        for (int s = 0; s < 3; s++) {
            for (int i = 0; i < x.length; i++) {
                err[s] = Math.max(err[s], Math.abs(sol[s][i] - ref[i]));
            }
        }
        // REF: Strang 1968, splitting is second order [from memory: citation sure]; sheet s6.4
        assertEquals(2.0, Math.log(err[0] / err[1]) / Math.log(2), 0.1, "observed order in time, first halving");
        assertEquals(2.0, Math.log(err[1] / err[2]) / Math.log(2), 0.1, "observed order in time, second halving");
    }

    @Test
    void oneFourierModeDecaysByTheExactCrankNicolsonFactor() {
        Domain domain = new Domain(1, 0.02, Boundary.FIXED);
        double[] x = nodes(domain);
        double[] init = new double[x.length];
        for (int i = 0; i < x.length; i++) {
            init[i] = Math.sin(3 * Math.PI * x[i]);
        }
        double[] times = range(0, 1e-3, 101);
        for (double k : new double[] {0, 10}) {
            ScalarRun run = ScalarRun.prepare("diffusion-decay", domain, times, x, List.of(),
                    SolverSettings.DEFAULT.withFixedStepS(1e-3).withSmoothing(false).withSpatialOrder(2));
            run.setInitialState(init);
            double[] out = new double[times.length * x.length];
            run.solve(new double[] {1, k}, out);
            // REF: G_CN = 0.9151917230096005; with Strang decay (k dt = 0.01) exp(-k dt) G_CN = 0.9060854132142697
            // [published: derived exact discrete factor]; sheet s6.2
            double g = k == 0 ? 0.9151917230096005 : 0.9060854132142697;
            for (int f = 1; f < times.length; f++) {
                for (int i = 1; i < x.length - 1; i++) {
                    if (Math.abs(init[i]) < 0.5) {
                        continue;   // near a zero of the mode the ratio is dominated by rounding
                    }
                    double ratio = out[f * x.length + i] / out[(f - 1) * x.length + i];
                    assertEquals(g, ratio, 1e-12 * g, "amplification factor, step " + f + ", node " + i);
                }
            }
            // REF: G_CN^100 = 1.416473229117e-4 (k = 0) [published: derived]; sheet s6.2
            if (k == 0) {
                assertEquals(1.416473229117e-4, out[100 * x.length + 10] / init[10], 1e-12 * 1.4165e-4 * 10,
                        "u/u0 after 100 steps");
            }
        }
    }

    @Test
    void noFluxEndsConserveTheAmountWithVaryingCrossSection() {
        CrossSection cs = CrossSection.of(new double[] {0, 10, 20, 30}, new double[] {0.5, 2.0, 0.3, 1.0});
        Domain domain = new Domain(30, 0.1, Boundary.NO_FLUX, cs);
        double[] x = nodes(domain);
        double h = domain.spacingUm();
        double[] times = range(0, 2, 11);
        ScalarRun run = ScalarRun.prepare("diffusion-decay", domain, times, x,
                List.of(Stimulus.pulse(0, 4, 1.5, 3.0), Stimulus.pulse(3, 25, 0.7, 1.0),
                        Stimulus.injection(5, 4, 12, 2.0, 1.0)));
        double[] out = new double[times.length * x.length];
        run.solve(new double[] {2.0, 0}, out);
        // Amounts by the trapezoid rule with the area at each node: the finite-volume weights, derived in the test.
        double[] amount = new double[times.length];
        for (int f = 0; f < times.length; f++) {
            for (int i = 0; i < x.length; i++) {
                double share = (i == 0 || i == x.length - 1) ? 0.5 : 1;
                amount[f] += out[f * x.length + i] * cs.areaUm2(x[i]) * h * share;
            }
        }
        double added = 0;
        for (int i = 0; i < x.length; i++) {
            double share = (i == 0 || i == x.length - 1) ? 0.5 : 1;
            added += 1.0 * Math.exp(-0.5 * Math.pow((x[i] - 12) / 2.0, 2)) * cs.areaUm2(x[i]) * h * share;
        }
        // Identity derived here: diffusion with no-flux ends moves substance but does not create it.
        assertEquals(amount[1], amount[0], 1e-12 * amount[0], "amount between the first two frames");
        assertEquals(amount[2] + added, amount[5], 1e-12 * amount[5], "amount after the injection (4 s at 5 s)");
        assertEquals(amount[5], amount[10], 1e-12 * amount[5], "amount at the end");
    }

    @Test
    void compactSchemeAlsoConservesTheAmountOnAUniformCable() {
        Domain domain = new Domain(30, 0.2, Boundary.NO_FLUX);
        double[] x = nodes(domain);
        double h = domain.spacingUm();
        double[] times = {0, 3, 9};
        ScalarRun run = ScalarRun.prepare("diffusion-decay", domain, times, x,
                List.of(Stimulus.pulse(0, 2, 1.0, 3.0), Stimulus.pulse(0, 27, 0.5, 1.0)));
        assertEquals(4, run.spatialOrder(), "compact scheme in use");
        double[] out = new double[times.length * x.length];
        run.solve(new double[] {1.5, 0}, out);
        double[] amount = new double[times.length];
        for (int f = 0; f < times.length; f++) {
            for (int i = 0; i < x.length; i++) {
                amount[f] += out[f * x.length + i] * h * ((i == 0 || i == x.length - 1) ? 0.5 : 1);
            }
        }
        // Identity derived here (B^T w = w for the trapezoid weights w): the amount stays what the pulses added.
        assertEquals(amount[0], amount[1], 1e-12 * amount[0], "amount at 3 s");
        assertEquals(amount[0], amount[2], 1e-12 * amount[0], "amount at 9 s");
    }

    private static double frontPosition(double[] profile, double[] x) {
        for (int i = 0; i < profile.length - 1; i++) {
            if (profile[i] >= 0.5 && profile[i + 1] < 0.5) {
                return x[i] + (profile[i] - 0.5) / (profile[i] - profile[i + 1]) * (x[i + 1] - x[i]);
            }
        }
        return Double.NaN;
    }

    @Test
    void fisherKppFrontTravelsAtTwoRootDr() {
        Domain domain = new Domain(300, 0.1, Boundary.NO_FLUX);
        double[] x = nodes(domain);
        double[] init = new double[x.length];
        for (int i = 0; i < x.length; i++) {
            init[i] = x[i] < 10 ? 1 : 0;
        }
        double[] times = {60, 120};
        ScalarRun run = ScalarRun.prepare("fisher-kpp", domain, times, x, List.of());
        run.setInitialState(init);
        double[] out = new double[2 * x.length];
        run.solve(new double[] {1, 1}, out);
        double x1 = frontPosition(java.util.Arrays.copyOfRange(out, 0, x.length), x);
        double x2 = frontPosition(java.util.Arrays.copyOfRange(out, x.length, 2 * x.length), x);
        double speed = (x2 - x1) / 60;
        // REF: Fisher 1937; Kolmogorov, Petrovsky & Piskunov 1937: c* = 2 sqrt(D r) [published formula]; sheet s5.1
        assertEquals(2.0, speed, 0.02 * 2.0, "Fisher-KPP front speed (um/s)");
        // REF: sheet s5.4, BDF reference run, h = 0.1, window [60, 120]: 1.98437 [published: numerical check]
        assertEquals(1.98437, speed, 2e-3 * 1.98437, "Fisher-KPP mean speed against the sheet's fine reference");
    }

    @Test
    void nagumoFrontTravelsAtTheExactSpeed() {
        double d = 1;
        double k = 1;
        double a = 0.25;
        double w = Math.sqrt(2 * d / k);
        Domain domain = new Domain(60, 0.1, Boundary.NO_FLUX);
        double[] x = nodes(domain);
        double[] init = new double[x.length];
        for (int i = 0; i < x.length; i++) {
            init[i] = 1 / (1 + Math.exp((x[i] - 10) / w));
        }
        double[] times = {10, 40};
        ScalarRun run = ScalarRun.prepare("nagumo", domain, times, x, List.of());
        run.setInitialState(init);
        double[] out = new double[2 * x.length];
        run.solve(new double[] {d, k, a}, out);
        double x1 = frontPosition(java.util.Arrays.copyOfRange(out, 0, x.length), x);
        double x2 = frontPosition(java.util.Arrays.copyOfRange(out, x.length, 2 * x.length), x);
        double speed = (x2 - x1) / 30;
        double exact = Math.sqrt(d * k / 2) * (1 - 2 * a);
        // REF: McKean 1970; Keener & Sneyd: c = sqrt(D k / 2)(1 - 2a) [published formula]; sheet s5.2
        assertEquals(exact, speed, 0.01 * exact, "Nagumo front speed (um/s)");
        // REF: sheet s5.4 suggests 5e-4 relative at h/w <= 0.07 [published: numerical check]; allow 1e-3 for the step
        assertEquals(exact, speed, 1e-3 * exact, "Nagumo front speed, tight (um/s)");
        // REF: exact travelling profile 1 / (1 + exp((x - x0 - c t)/w)) [published formula]; sheet s5.2
        double maxProfile = 0;
        for (int i = 0; i < x.length; i++) {
            double exactU = 1 / (1 + Math.exp((x[i] - x2) / w));
            maxProfile = Math.max(maxProfile, Math.abs(out[x.length + i] - exactU));
        }
        assertTrue(maxProfile < 1e-3, "profile shape error around the measured front: " + maxProfile);
    }

    @Test
    void sensitivitiesMatchCentralDifferencesOfSolve() {
        Domain domain = new Domain(30, 0.25, Boundary.NO_FLUX);
        double[] pos = range(0.3, 1.7, 17);
        double[] times = range(0, 0.5, 13);
        List<Stimulus> protocol = List.of(Stimulus.pulse(0, 6, 1.5, 1.0), Stimulus.injection(1.2, 2, 20, 1.0, 0.6),
                Stimulus.clamp(3.1, 1.0, 26, 1.0, 0.8));
        String[] models = {"diffusion-decay", "nagumo", "fisher-kpp"};
        double[][] params = {{0.8, 0.3}, {1.2, 2.0, 0.2}, {0.7, 0.9}};
        for (int m = 0; m < models.length; m++) {
            ScalarRun run = ScalarRun.prepare(models[m], domain, times, pos, protocol,
                    SolverSettings.DEFAULT.withFixedStepS(0.05));
            int size = times.length * pos.length;
            double[] out = new double[size];
            double[][] sens = new double[params[m].length][size];
            run.solveWithSensitivities(params[m], out, sens);
            double[] plain = new double[size];
            run.solve(params[m], plain);
            for (int q = 0; q < params[m].length; q++) {
                double step = 1e-5 * params[m][q];
                double[] up = params[m].clone();
                double[] down = params[m].clone();
                up[q] += step;
                down[q] -= step;
                double[] fUp = new double[size];
                double[] fDown = new double[size];
                run.solve(up, fUp);
                run.solve(down, fDown);
                double scale = 0;
                double err = 0;
                for (int i = 0; i < size; i++) {
                    double fd = (fUp[i] - fDown[i]) / (2 * step);
                    scale = Math.max(scale, Math.abs(fd));
                    err = Math.max(err, Math.abs(fd - sens[q][i]));
                }
                // Self-consistency: central differences have error O(step^2) plus rounding ~1e-16/step.
                assertTrue(scale > 0, models[m] + ": parameter " + q + " has an effect");
                assertTrue(err < 1e-6 * scale, models[m] + " d/d" + run.parameterNames().get(q) + ": " + err
                        + " vs scale " + scale);
            }
        }
    }

    @Test
    void sensitivitiesAtAZeroRateMatchOneSidedDifferences() {
        Domain domain = new Domain(30, 0.25, Boundary.NO_FLUX);
        double[] pos = range(0.3, 1.7, 17);
        double[] times = range(0, 0.5, 13);
        List<Stimulus> protocol = List.of(Stimulus.pulse(0, 6, 1.5, 0.8), Stimulus.injection(1.2, 2, 20, 1.0, 0.6));
        String[] models = {"diffusion-decay", "nagumo", "fisher-kpp"};
        double[][] params = {{0.8, 0}, {1.2, 0, 0.2}, {0.7, 0}};
        for (int m = 0; m < models.length; m++) {
            ScalarRun run = ScalarRun.prepare(models[m], domain, times, pos, protocol,
                    SolverSettings.DEFAULT.withFixedStepS(0.05));
            int size = times.length * pos.length;
            double[] out = new double[size];
            double[][] sens = new double[params[m].length][size];
            run.solveWithSensitivities(params[m], out, sens);
            double h = 1e-4;
            double[][] f = new double[3][size];
            for (int s = 0; s < 3; s++) {
                double[] p = params[m].clone();
                p[1] = s * h;   // a rate cannot be negative, so the difference is one-sided
                run.solve(p, f[s]);
            }
            double scale = 0;
            double err = 0;
            for (int i = 0; i < size; i++) {
                double fd = (-3 * f[0][i] + 4 * f[1][i] - f[2][i]) / (2 * h);
                scale = Math.max(scale, Math.abs(fd));
                err = Math.max(err, Math.abs(fd - sens[1][i]));
            }
            // REF: second-order one-sided difference, error O(h^2) [common practice]
            assertTrue(scale > 0.1, models[m] + ": the rate has an effect at zero");
            assertTrue(err < 1e-6 * scale, models[m] + " d/d" + run.parameterNames().get(1) + " at zero: " + err
                    + " vs scale " + scale);
        }
    }

    @Test
    void diffusionDecaySensitivitiesMatchTheDerivativeOfTheClosedForm() {
        Domain domain = new Domain(60, 0.05, Boundary.NO_FLUX);
        double[] x = nodes(domain);
        double t = 4;
        double d = 1.0;
        double k = 0.3;
        ScalarRun run = ScalarRun.prepare("diffusion-decay", domain, new double[] {t}, x,
                List.of(Stimulus.pulse(0, 30, 1.0, 2.0)), SolverSettings.DEFAULT.withFixedStepS(0.02));
        double[] out = new double[x.length];
        double[][] sens = new double[2][x.length];
        run.solveWithSensitivities(new double[] {d, k}, out, sens);
        double errD = 0;
        double errK = 0;
        double scaleD = 0;
        double scaleK = 0;
        for (int i = 0; i < x.length; i++) {
            double xi = x[i] - 30;
            double c = gaussian(2.0, 1.0, d, k, xi, t);
            double var = 1 + 2 * d * t;
            double dcdD = c * (-t / var + xi * xi * t / (var * var));
            double dcdk = -t * c;
            errD = Math.max(errD, Math.abs(sens[0][i] - dcdD));
            errK = Math.max(errK, Math.abs(sens[1][i] - dcdk));
            scaleD = Math.max(scaleD, Math.abs(dcdD));
            scaleK = Math.max(scaleK, Math.abs(dcdk));
        }
        // REF: d/dD of Crank 1975 (2.2) x exp(-kt) [published formula, derivative derived here]; sheet s2.2
        assertTrue(errD < 1e-3 * scaleD, "dc/dD error " + errD + " vs scale " + scaleD);
        // REF: derivative of Crank 1975 (2.2) x exp(-kt) with respect to k [published formula, derived]; sheet s2.3
        assertTrue(errK < 1e-3 * scaleK, "dc/dk error " + errK + " vs scale " + scaleK);
    }

    @Test
    void badParametersAndNamesAreRefused() {
        Domain domain = new Domain(10, 0.5, Boundary.NO_FLUX);
        assertThrows(IllegalArgumentException.class, () -> ScalarRun.prepare("logistic", domain, new double[] {1},
                new double[] {1}, List.of()));
        ScalarRun run = ScalarRun.prepare("nagumo", domain, new double[] {1}, new double[] {1}, List.of());
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class,
                () -> run.solve(new double[] {-1, 1, 0.2}, new double[1]));
        assertTrue(e.getMessage().contains("diffusion coefficient"), e.getMessage());
        assertThrows(IllegalArgumentException.class, () -> ScalarRun.prepare("nagumo", domain, new double[] {1},
                new double[] {11}, List.of()));
    }
}
