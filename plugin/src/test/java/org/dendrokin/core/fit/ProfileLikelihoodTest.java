package org.dendrokin.core.fit;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.ArrayList;
import java.util.List;
import java.util.Random;

import org.apache.commons.math3.analysis.solvers.BrentSolver;
import org.dendrokin.core.Progress;
import org.dendrokin.core.units.Unit;
import org.junit.jupiter.api.Test;

/** Profile-likelihood intervals against the exact answer of a linear model and a brute-force profile. */
class ProfileLikelihoodTest {
    /** y = b1 + b2 x on given x, every parameter linear, both headline. */
    static final class Line implements FitModel {
        private final double[] x;

        Line(double[] x) {
            this.x = x;
        }

        @Override
        public String name() {
            return "line";
        }

        @Override
        public List<ParameterSpec> parameters() {
            return List.of(ParameterSpec.linear("b1", Unit.DIMENSIONLESS), ParameterSpec.linear("b2",
                    Unit.DIMENSIONLESS));
        }

        @Override
        public int size() {
            return x.length;
        }

        @Override
        public List<String> headlineParameters() {
            return List.of("b1", "b2");
        }

        @Override
        public void evaluate(double[] b, double[] values, double[] jac) {
            for (int i = 0; i < x.length; i++) {
                values[i] = b[0] + b[1] * x[i];
                if (jac != null) {
                    jac[2 * i] = 1;
                    jac[2 * i + 1] = x[i];
                }
            }
        }
    }

    /** y = A exp(-k x), k on the log scale (headline), A linear. */
    static final class Decay implements FitModel {
        private final double[] x;

        Decay(double[] x) {
            this.x = x;
        }

        @Override
        public String name() {
            return "decay";
        }

        @Override
        public List<ParameterSpec> parameters() {
            return List.of(ParameterSpec.linear("A", Unit.DIMENSIONLESS), ParameterSpec.positive("k", Unit.RATE));
        }

        @Override
        public int size() {
            return x.length;
        }

        @Override
        public List<String> headlineParameters() {
            return List.of("k");
        }

        @Override
        public void evaluate(double[] b, double[] values, double[] jac) {
            for (int i = 0; i < x.length; i++) {
                double e = Math.exp(-b[1] * x[i]);
                values[i] = b[0] * e;
                if (jac != null) {
                    jac[2 * i] = e;
                    jac[2 * i + 1] = -x[i] * b[0] * e;
                }
            }
        }
    }

    private static FitResult fit(FitModel model, double[] y, double[] start) {
        ModelFit.Options options = ModelFit.Options.defaults().withTolerance(1e-13);
        return ModelFit.fit(model, FitData.unweighted(y), List.of(start), options, Progress.NONE);
    }

    @Test
    void linearModelProfileIsTheWaldIntervalOfTheWorkedExample() {
        double[] x = {0, 1, 2, 3, 4, 5, 6, 7, 8, 9};
        double[] y = {1.2, 2.9, 5.1, 7.2, 8.8, 11.1, 13.0, 14.8, 17.2, 19.1};
        FitResult f = fit(new Line(x), y, new double[] {0, 1});
        assertTrue(f.converged(), f.reason());
        ParameterEstimate slope = f.estimate("b2").orElseThrow();
        ParameterEstimate intercept = f.estimate("b1").orElseThrow();
        assertEquals(Interval.PROFILE, slope.ci95().method());
        // chi^2 is exactly quadratic in a linear model's parameters, so the profile crosses s^2 t^2 at +- t SE
        // REF: line worked example, coefficients (1.056364, 1.996364), SE (0.09811024, 0.01837773) [common practice]; sheet s8.3
        // REF: t(0.975, 8) = 2.306004 [published: standard tables]; sheet s8.2
        assertEquals(1.996364 - 2.306004 * 0.01837773, slope.ci95().lower(), 2e-6, "slope, lower end");
        assertEquals(1.996364 + 2.306004 * 0.01837773, slope.ci95().upper(), 2e-6, "slope, upper end");
        assertEquals(1.056364 - 2.306004 * 0.09811024, intercept.ci95().lower(), 2e-6, "intercept, lower end");
        assertEquals(1.056364 + 2.306004 * 0.09811024, intercept.ci95().upper(), 2e-6, "intercept, upper end");
    }

    @Test
    void nonlinearProfileMatchesABruteForceProfile() {
        int n = 25;
        double[] x = new double[n];
        double[] y = new double[n];
        Random random = new Random(20261203L);
        for (int i = 0; i < n; i++) {
            x[i] = 0.25 * i;
            y[i] = 3 * Math.exp(-0.7 * x[i]) + 0.05 * random.nextGaussian();
        }
        FitResult f = fit(new Decay(x), y, new double[] {2, 0.5});
        assertTrue(f.converged(), f.reason());
        double kHat = f.estimate("k").orElseThrow().value();
        double chiMin = profiledRss(x, y, kHat);
        double t = WaldT.tQuantile(n - 2);
        double threshold = chiMin / (n - 2) * t * t;
        // For fixed k the best A is linear least squares in closed form, so the profile needs no optimiser; the
        // crossings are found by Brent's method on each side.
        BrentSolver brent = new BrentSolver(1e-12);
        double lower = brent.solve(200, k -> profiledRss(x, y, k) - chiMin - threshold, kHat / 2, kHat);
        double upper = brent.solve(200, k -> profiledRss(x, y, k) - chiMin - threshold, kHat, kHat * 2);
        Interval ci = f.estimate("k").orElseThrow().ci95();
        assertEquals(Interval.PROFILE, ci.method());
        // REF: profile t interval of Bates & Watts 1988 ch. 6, by closed-form profiling and Commons Math BrentSolver [from memory: Bates & Watts 1988; sure]; sheet s8.2
        // 1e-3 of the half width: the profile search stops within 1e-3 of its step
        assertEquals(lower, ci.lower(), 1e-3 * (kHat - lower), "k, lower end");
        assertEquals(upper, ci.upper(), 1e-3 * (upper - kHat), "k, upper end");
        assertTrue(upper - kHat != kHat - lower, "the profile interval of a nonlinear parameter is asymmetric");
    }

    /** min over A of sum (y - A e^(-k x))^2. */
    private static double profiledRss(double[] x, double[] y, double k) {
        double sey = 0;
        double see = 0;
        List<Double> e = new ArrayList<>();
        for (int i = 0; i < x.length; i++) {
            double v = Math.exp(-k * x[i]);
            e.add(v);
            sey += v * y[i];
            see += v * v;
        }
        double a = sey / see;
        double rss = 0;
        for (int i = 0; i < x.length; i++) {
            double r = y[i] - a * e.get(i);
            rss += r * r;
        }
        return rss;
    }
}
