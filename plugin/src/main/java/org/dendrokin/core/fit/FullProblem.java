package org.dendrokin.core.fit;

import java.util.Arrays;

import org.apache.commons.math3.fitting.leastsquares.ValueAndJacobianFunction;
import org.apache.commons.math3.linear.Array2DRowRealMatrix;
import org.apache.commons.math3.linear.ArrayRealVector;
import org.apache.commons.math3.linear.RealMatrix;
import org.apache.commons.math3.linear.RealVector;
import org.apache.commons.math3.util.Pair;

/**
 * The least-squares problem as Commons Math sees it in full: the n weighted predictions f_i(u) / sigma_i of the used
 * points (the target is y_i / sigma_i) and their n x q Jacobian on the free coordinates u of the optimiser's scale.
 * A prediction that is not a finite number is replaced by 1e30, which pushes the optimiser back from the region where
 * the model breaks down, and is flagged in {@link #nonFinite}. One instance per local minimisation; not thread-safe.
 */
final class FullProblem implements ValueAndJacobianFunction {
    private final Minimiser minimiser;
    private final double[] base;
    private final int[] free;
    private final FitData target;
    private double[] lastPoint;
    private double[] lastValue;
    private boolean lastNonFinite;
    /** True if the last value asked for had a prediction that was not a finite number. */
    boolean nonFinite;

    /**
     * @param minimiser the model and its parameter scales
     * @param base      all coordinates on the optimiser's scale; the fixed ones keep these values. Not modified.
     * @param free      indices of the coordinates the optimiser moves. Not modified.
     * @param target    the observations and their sigmas
     */
    FullProblem(Minimiser minimiser, double[] base, int[] free, FitData target) {
        this.minimiser = minimiser;
        this.base = base.clone();
        this.free = free;
        this.target = target;
    }

    /** The target vector y_i / sigma_i of the used points. */
    static double[] weightedObservations(FitData target) {
        double[] y = new double[target.usedCount()];
        for (int i = 0; i < y.length; i++) {
            int g = target.usedIndex(i);
            y[i] = target.value(g) / target.sigma(g);
        }
        return y;
    }

    private double[] full(double[] uFree) {
        double[] u = base.clone();
        for (int f = 0; f < free.length; f++) {
            u[free[f]] = uFree[f];
        }
        return u;
    }

    @Override
    public RealVector computeValue(double[] uFree) {
        // The optimiser asks twice for the value of each trial point (residuals, then cost): compute it once.
        if (lastPoint != null && Arrays.equals(lastPoint, uFree)) {
            nonFinite = lastNonFinite;
            return new ArrayRealVector(lastValue, true);
        }
        FitModel model = minimiser.model();
        double[] values = new double[model.size()];
        model.evaluate(minimiser.natural(full(uFree)), values, null);
        minimiser.countEvaluation();
        double[] v = gather(values);
        lastPoint = uFree.clone();
        lastValue = v;
        lastNonFinite = nonFinite;
        return new ArrayRealVector(v, true);
    }

    private double[] gather(double[] values) {
        double[] v = new double[target.usedCount()];
        nonFinite = false;
        for (int i = 0; i < v.length; i++) {
            int g = target.usedIndex(i);
            double f = values[g];
            if (!Double.isFinite(f)) {
                nonFinite = true;
                f = 1e30;
            }
            v[i] = f / target.sigma(g);
        }
        return v;
    }

    @Override
    public RealMatrix computeJacobian(double[] uFree) {
        double[][] all = minimiser.weightedJacobian(full(uFree), minimiser.fixedMask(free), target);
        double[][] j = new double[all.length][free.length];
        for (int i = 0; i < all.length; i++) {
            for (int f = 0; f < free.length; f++) {
                j[i][f] = all[i][free[f]];
            }
        }
        return new Array2DRowRealMatrix(j, false);
    }

    @Override
    public Pair<RealVector, RealMatrix> value(RealVector point) {
        double[] x = point.toArray();
        return new Pair<>(computeValue(x), computeJacobian(x));
    }
}
