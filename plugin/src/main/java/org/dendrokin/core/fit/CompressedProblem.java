package org.dendrokin.core.fit;

import java.util.Arrays;

import org.apache.commons.math3.fitting.leastsquares.ValueAndJacobianFunction;
import org.apache.commons.math3.linear.Array2DRowRealMatrix;
import org.apache.commons.math3.linear.ArrayRealVector;
import org.apache.commons.math3.linear.CholeskyDecomposition;
import org.apache.commons.math3.linear.EigenDecomposition;
import org.apache.commons.math3.linear.MatrixUtils;
import org.apache.commons.math3.linear.NonPositiveDefiniteMatrixException;
import org.apache.commons.math3.linear.RealMatrix;
import org.apache.commons.math3.linear.RealVector;
import org.apache.commons.math3.util.Pair;

/**
 * The least-squares problem in compressed form, for a model with one-pass {@link FitModel#normalEquations}: at each
 * point A = J^T W J, g = J^T W r and chi^2 are summed in one pass over the data (J on the free coordinates of the
 * optimiser's scale), A = R^T R (Cholesky of the diagonally scaled A), z = R^-T g, rho = sqrt(chi^2 - |z|^2), and
 * the optimiser sees the q + 1 residuals (z, rho) with Jacobian (R; 0) against a zero target. Since
 * (R; 0)^T (R; 0) = J^T W J, (R; 0)^T (z, rho) = J^T W r and |(z, rho)|^2 = chi^2, every quantity the
 * Levenberg-Marquardt iteration uses (steps, predicted and actual reductions, column scaling, the orthogonality
 * test) is that of the full problem, while an iteration costs O(q^3) instead of O(n q^2). Forming J^T W J squares
 * the condition number: a point where the scaled A is worse conditioned than {@link #MAX_CONDITION}, or not positive
 * definite, throws {@link Breakdown}, and the start is redone on the {@link FullProblem}.
 *
 * <p>The optimiser asks for the value and the Jacobian of a point separately and sometimes twice; a few recent
 * points are kept so that each costs one pass. One instance per local minimisation; not thread-safe.
 */
final class CompressedProblem implements ValueAndJacobianFunction {
    /** Data points per parameter from which a model with one-pass normal equations is fitted in compressed form. */
    static final int POINTS_PER_PARAMETER = 50;
    /** Largest condition number of the scaled J^T W J for which the compressed form is trusted. */
    static final double MAX_CONDITION = 1e8;
    private static final int CACHE = 4;

    /** The compressed form cannot be trusted at some point; the start is redone on the full problem. */
    static final class Breakdown extends RuntimeException {
        private static final long serialVersionUID = 1L;

        Breakdown() {
            super(null, null, false, false);
        }
    }

    private final Minimiser minimiser;
    private final double[] base;
    private final int[] free;
    private final FitData target;
    private final NormalEquations normal;
    private final double[][] keys = new double[CACHE][];
    private final double[][] values = new double[CACHE][];
    private final double[][][] jacobians = new double[CACHE][][];
    private int next;
    /** True if the model's sums at the last point computed were not all finite numbers. */
    boolean nonFinite;

    /**
     * @param minimiser the model and its parameter scales
     * @param base      all coordinates on the optimiser's scale; the fixed ones keep these values. Not modified.
     * @param free      indices of the coordinates the optimiser moves. Not modified.
     * @param target    the observations and their sigmas
     */
    CompressedProblem(Minimiser minimiser, double[] base, int[] free, FitData target) {
        this.minimiser = minimiser;
        this.base = base.clone();
        this.free = free;
        this.target = target;
        this.normal = new NormalEquations(base.length);
    }

    private int slot(double[] uFree) {
        for (int i = 0; i < CACHE; i++) {
            if (keys[i] != null && Arrays.equals(keys[i], uFree)) {
                return i;
            }
        }
        int i = next;
        next = (next + 1) % CACHE;
        keys[i] = null;
        compute(uFree, i);
        keys[i] = uFree.clone();
        return i;
    }

    private void compute(double[] uFree, int i) {
        double[] u = base.clone();
        for (int f = 0; f < free.length; f++) {
            u[free[f]] = uFree[f];
        }
        minimiser.model().normalEquations(minimiser.natural(u), target, normal, null);
        minimiser.countEvaluation();
        int q = free.length;
        double[] value = new double[q + 1];
        values[i] = value;
        jacobians[i] = null;
        nonFinite = !normal.isFinite();
        if (nonFinite) {
            value[q] = -1e30 * Math.sqrt(target.usedCount());  // pushes the optimiser back, as on the full problem
            return;
        }
        double[] chain = new double[q];
        double[] root = new double[q];
        for (int a = 0; a < q; a++) {
            chain[a] = minimiser.spec(free[a]).derivative(u[free[a]]);
            double diag = normal.matrix(free[a], free[a]) * chain[a] * chain[a];
            if (!(diag > 0)) {
                throw new Breakdown();
            }
            root[a] = Math.sqrt(diag);
        }
        // scaled A (unit diagonal), so the condition test and the Cholesky thresholds are scale-free
        double[][] scaled = new double[q][q];
        for (int a = 0; a < q; a++) {
            for (int b = 0; b < q; b++) {
                scaled[a][b] = normal.matrix(free[a], free[b]) * chain[a] * chain[b] / (root[a] * root[b]);
            }
        }
        RealMatrix s = new Array2DRowRealMatrix(scaled, false);
        double[] eig = new EigenDecomposition(s).getRealEigenvalues();
        double lo = Double.POSITIVE_INFINITY;
        double hi = 0;
        for (double ev : eig) {
            lo = Math.min(lo, ev);
            hi = Math.max(hi, ev);
        }
        if (!(lo > 0) || hi / lo > MAX_CONDITION) {
            throw new Breakdown();
        }
        RealMatrix l;
        try {
            l = new CholeskyDecomposition(s, 1e-12, 0).getL();
        } catch (NonPositiveDefiniteMatrixException e) {
            throw new Breakdown();
        }
        // A = D S D, S = L L^T, so R = L^T D and z solves (D L) z = g, i.e. L z = g / D
        double[] z = new double[q];
        for (int a = 0; a < q; a++) {
            z[a] = normal.gradient(free[a]) * chain[a] / root[a];
        }
        RealVector zv = new ArrayRealVector(z, false);
        MatrixUtils.solveLowerTriangularSystem(l, zv);
        double zz = 0;
        for (int a = 0; a < q; a++) {
            zz += z[a] * z[a];
            value[a] = -z[a];
        }
        value[q] = -Math.sqrt(Math.max(0, normal.chiSquare() - zz));
        double[][] jac = new double[q + 1][q];
        for (int a = 0; a < q; a++) {
            for (int b = a; b < q; b++) {
                jac[a][b] = l.getEntry(b, a) * root[b];
            }
        }
        jacobians[i] = jac;
    }

    @Override
    public RealVector computeValue(double[] uFree) {
        return new ArrayRealVector(values[slot(uFree)], true);
    }

    @Override
    public RealMatrix computeJacobian(double[] uFree) {
        double[][] jac = jacobians[slot(uFree)];
        if (jac == null) {
            throw new Breakdown();   // the model broke down at an accepted point
        }
        return new Array2DRowRealMatrix(jac, true);
    }

    @Override
    public Pair<RealVector, RealMatrix> value(RealVector point) {
        double[] x = point.toArray();
        return new Pair<>(computeValue(x), computeJacobian(x));
    }
}
