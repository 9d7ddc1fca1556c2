package org.dendrokin.core.fit;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.List;
import java.util.Random;

import org.apache.commons.math3.fitting.leastsquares.LeastSquaresBuilder;
import org.apache.commons.math3.fitting.leastsquares.LevenbergMarquardtOptimizer;
import org.apache.commons.math3.fitting.leastsquares.MultivariateJacobianFunction;
import org.apache.commons.math3.linear.Array2DRowRealMatrix;
import org.apache.commons.math3.linear.ArrayRealVector;
import org.apache.commons.math3.linear.RealVector;
import org.apache.commons.math3.util.Pair;
import org.dendrokin.core.Progress;
import org.dendrokin.core.units.Unit;
import org.junit.jupiter.api.Test;

/**
 * An input's uncertainty carried into a fit: the added standard error is the change of the estimate that a refit to
 * the shifted data makes, and the interval widens by it in quadrature.
 */
class InputUncertaintyTest {
    private static final int ROWS = 40;
    private static final int COLUMNS = 6;
    private static final double DT = 0.5;

    /** y = A exp(-k t) + c on every position of a frame, t = row * DT. */
    static final class Decay implements FitModel {
        @Override
        public String name() {
            return "decay";
        }

        @Override
        public List<ParameterSpec> parameters() {
            return List.of(ParameterSpec.positive("a", Unit.DIMENSIONLESS), ParameterSpec.positive("k", Unit.RATE),
                    ParameterSpec.linear("c", Unit.DIMENSIONLESS));
        }

        @Override
        public int size() {
            return ROWS * COLUMNS;
        }

        @Override
        public void evaluate(double[] p, double[] values, double[] jac) {
            for (int g = 0; g < size(); g++) {
                double t = (g / COLUMNS) * DT;
                double e = Math.exp(-p[1] * t);
                values[g] = p[0] * e + p[2];
                if (jac != null) {
                    jac[g * 3] = e;
                    jac[g * 3 + 1] = -p[0] * t * e;
                    jac[g * 3 + 2] = 1;
                }
            }
        }
    }

    @Test
    void theAddedErrorIsTheShiftARefitMakes() {
        Decay model = new Decay();
        double[] truth = {1.5, 0.12, 0.05};
        double[] y = new double[model.size()];
        model.evaluate(truth, y, null);
        Random random = new Random(20261204L);
        double sigma = 0.02;
        double[] sigmas = new double[y.length];
        for (int g = 0; g < y.length; g++) {
            y[g] += sigma * random.nextGaussian();
            sigmas[g] = sigma;
        }
        // a slow drift that grows over the movie, as a background error does after the bleaching correction
        double[] shift = new double[y.length];
        for (int g = 0; g < y.length; g++) {
            shift[g] = 0.004 * (g / COLUMNS) * DT / (ROWS * DT);
        }
        FitData plain = new FitData(y, sigmas, COLUMNS);
        FitData withInput = plain.withInputUncertainty(new InputUncertainty("drift", List.of(shift)));
        ModelFit.Options options = ModelFit.Options.defaults().withRobust(false);
        List<double[]> starts = List.of(new double[] {1, 0.1, 0});
        FitResult before = ModelFit.fit(model, plain, starts, options, Progress.NONE);
        FitResult after = ModelFit.fit(model, withInput, starts, options, Progress.NONE);

        // REF: Commons Math's Levenberg-Marquardt refit to the data and to the data plus the shift [general-purpose
        // reference library]; to first order the estimate moves by (J^T W J)^-1 J^T W shift
        double[] k = {refitK(y, null), refitK(y, shift)};
        double moved = Math.abs(k[1] - k[0]);
        ParameterEstimate k0 = before.estimate("k").orElseThrow();
        ParameterEstimate k1 = after.estimate("k").orElseThrow();
        double added = Math.sqrt(k1.standardError() * k1.standardError() - k0.standardError() * k0.standardError());
        assertTrue(moved > 0.2 * k0.standardError(), "the shift must matter for the check to mean anything");
        assertEquals(moved, added, 0.03 * moved, "added standard error of k against the refit's change");
        assertEquals(k0.value(), k1.value(), 1e-12, "the estimate itself is not moved");

        // the interval: each side's distance on the log scale grows in quadrature by t times the shift's
        Interval i0 = k0.ci95();
        Interval i1 = k1.ci95();
        assertEquals(i0.method() + "+drift", i1.method());
        assertTrue(i1.includesInput() && !i0.includesInput());
        double tq = WaldT.tQuantile(before.pointsUsed() - 3);
        double du = Math.abs(Math.log(k[1]) - Math.log(k[0]));
        double lower0 = Math.log(k0.value() / i0.lower());
        double lower1 = Math.log(k1.value() / i1.lower());
        assertEquals(Math.hypot(lower0, tq * du), lower1, 0.03 * tq * du, "lower side on the log scale");
        assertTrue(after.estimate("k").orElseThrow().otherIntervals().contains(i0), "the narrower one is kept");
    }

    @Test
    void dataWithoutAnInputUncertaintyHaveNone() {
        FitData d = new FitData(new double[] {1, 2, 3, 4}, new double[] {1, 1, 1, 1}, 2);
        assertNull(d.inputUncertainty());
        assertThrows(IllegalArgumentException.class,
                () -> d.withInputUncertainty(new InputUncertainty("x", List.of(new double[3]))));
        assertNull(d.withInputUncertainty(new InputUncertainty("x", List.of(new double[4]))).withValues(
                new double[] {1, 1, 1, 1}).inputUncertainty(), "bootstrap replicates carry no input uncertainty");
    }

    /** k fitted by Commons Math to y (+ shift), unweighted (every sigma is the same). */
    private static double refitK(double[] y, double[] shift) {
        double[] target = y.clone();
        if (shift != null) {
            for (int g = 0; g < y.length; g++) {
                target[g] += shift[g];
            }
        }
        MultivariateJacobianFunction f = point -> {
            double[] p = point.toArray();
            double[] v = new double[y.length];
            double[] j = new double[y.length * 3];
            new Decay().evaluate(p, v, j);
            double[][] jac = new double[y.length][3];
            for (int g = 0; g < y.length; g++) {
                System.arraycopy(j, g * 3, jac[g], 0, 3);
            }
            return new Pair<RealVector, org.apache.commons.math3.linear.RealMatrix>(new ArrayRealVector(v, false),
                    new Array2DRowRealMatrix(jac, false));
        };
        var problem = new LeastSquaresBuilder().start(new double[] {1, 0.1, 0}).model(f).target(target)
                .maxEvaluations(10000).maxIterations(10000).build();
        return new LevenbergMarquardtOptimizer().withCostRelativeTolerance(1e-14).withParameterRelativeTolerance(1e-14)
                .optimize(problem).getPoint().getEntry(1);
    }
}
