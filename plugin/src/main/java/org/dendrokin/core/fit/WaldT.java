package org.dendrokin.core.fit;

import java.util.List;

import org.apache.commons.math3.distribution.TDistribution;
import org.apache.commons.math3.linear.Array2DRowRealMatrix;
import org.apache.commons.math3.linear.SingularValueDecomposition;

/**
 * Linearised (Wald) intervals with the Student t quantile (sheet s8.2), computed here rather than taken from Commons
 * Math, whose reduced chi-square divides by n - p + 1 and whose sigma is not scaled: s^2 = chi^2 / (n - p),
 * C = s^2 (J^T J)^-1 with J the weighted Jacobian on the optimiser's scale, and the 95% interval
 * u_j +- t(0.975, n - p) sqrt(C_jj) mapped back to natural units (so a log-scale parameter gets a positive,
 * asymmetric interval).
 */
final class WaldT {
    /** Condition number of the scaled J^T J beyond which it counts as singular. */
    static final double SINGULAR_CONDITION = 1e13;

    private WaldT() {
    }

    /**
     * s^2 (J^T J)^-1, or null if J^T J is singular (condition number of its scaled form above 1e13).
     *
     * @param jac weighted Jacobian, n x q. Not modified.
     * @param s2  the residual variance factor s^2 (1 for known sigmas)
     */
    static double[][] covariance(double[][] jac, double s2) {
        int n = jac.length;
        int q = n == 0 ? 0 : jac[0].length;
        double[][] jtj = new double[q][q];
        for (double[] row : jac) {
            for (int a = 0; a < q; a++) {
                double ra = row[a];
                if (ra != 0) {
                    for (int b = a; b < q; b++) {
                        jtj[a][b] += ra * row[b];
                    }
                }
            }
        }
        for (int a = 0; a < q; a++) {
            for (int b = 0; b < a; b++) {
                jtj[a][b] = jtj[b][a];
            }
        }
        return covarianceOfNormal(jtj, s2);
    }

    /**
     * s^2 A^-1 for A = J^T J, or null if A is singular as for {@link #covariance}. The inverse is taken by SVD of
     * the unit-diagonal scaling of A, so the singularity test does not depend on the parameters' units.
     *
     * @param jtj A, symmetric q x q. Not modified.
     * @param s2  the residual variance factor
     */
    static double[][] covarianceOfNormal(double[][] jtj, double s2) {
        int q = jtj.length;
        double[] scale = new double[q];
        for (int a = 0; a < q; a++) {
            if (!(jtj[a][a] > 0) || !Double.isFinite(jtj[a][a])) {
                return null;
            }
            scale[a] = 1 / Math.sqrt(jtj[a][a]);
        }
        double[][] scaled = new double[q][q];
        for (int a = 0; a < q; a++) {
            for (int b = 0; b < q; b++) {
                scaled[a][b] = jtj[a][b] * scale[a] * scale[b];
            }
        }
        SingularValueDecomposition svd = new SingularValueDecomposition(new Array2DRowRealMatrix(scaled, false));
        if (!(svd.getConditionNumber() < SINGULAR_CONDITION)) {
            return null;
        }
        double[][] inv = svd.getSolver().getInverse().getData();
        double[][] cov = new double[q][q];
        for (int a = 0; a < q; a++) {
            for (int b = 0; b < q; b++) {
                cov[a][b] = s2 * inv[a][b] * scale[a] * scale[b];
            }
        }
        return cov;
    }

    /** A^-1 of a symmetric positive semi-definite A (not modified), or null if it is singular. */
    static double[][] inverse(double[][] jtj) {
        return covarianceOfNormal(jtj, 1);
    }

    /** t(0.975, dof), the two-sided 95% Student t quantile. */
    static double tQuantile(int dof) {
        return new TDistribution(null, dof).inverseCumulativeProbability(0.975);
    }

    /**
     * The Wald-t interval of every parameter: u_j +- tq sqrt(C_jj) on the optimiser's scale, mapped back.
     *
     * @param specs the parameters' scales
     * @param u     estimates on the optimiser's scale. Not modified.
     * @param cov   covariance on the optimiser's scale. Not modified.
     * @param tq    the t quantile
     */
    static Interval[] intervals(List<ParameterSpec> specs, double[] u, double[][] cov, double tq) {
        Interval[] out = new Interval[u.length];
        for (int j = 0; j < u.length; j++) {
            double half = tq * Math.sqrt(cov[j][j]);
            ParameterSpec s = specs.get(j);
            out[j] = new Interval(s.toNatural(u[j] - half), s.toNatural(u[j] + half), Interval.WALD_T);
        }
        return out;
    }

    /** The correlation matrix of a covariance (not modified). */
    static double[][] correlation(double[][] cov) {
        int q = cov.length;
        double[][] corr = new double[q][q];
        for (int i = 0; i < q; i++) {
            for (int j = 0; j < q; j++) {
                corr[i][j] = cov[i][j] / Math.sqrt(cov[i][i] * cov[j][j]);
            }
        }
        return corr;
    }
}
