package org.dendrokin.core.preprocess;

import org.apache.commons.math3.distribution.TDistribution;
import org.apache.commons.math3.exception.ConvergenceException;
import org.apache.commons.math3.exception.TooManyEvaluationsException;
import org.apache.commons.math3.exception.TooManyIterationsException;
import org.apache.commons.math3.fitting.leastsquares.LeastSquaresBuilder;
import org.apache.commons.math3.fitting.leastsquares.LeastSquaresOptimizer;
import org.apache.commons.math3.fitting.leastsquares.LevenbergMarquardtOptimizer;
import org.apache.commons.math3.linear.Array2DRowRealMatrix;
import org.apache.commons.math3.linear.ArrayRealVector;
import org.apache.commons.math3.linear.LUDecomposition;
import org.apache.commons.math3.linear.RealMatrix;
import org.apache.commons.math3.linear.SingularMatrixException;
import org.apache.commons.math3.util.Pair;
import org.dendrokin.core.Checks;

/**
 * Least-squares fit of a single exponential y(t) = A exp(-r (t - tRef)) by Levenberg-Marquardt (Commons
 * Math) with the analytic Jacobian, started from a log-linear regression on the positive points. The rate r
 * may come out zero or negative (no decay, or growth); the caller decides what that means.
 *
 * <p>Standard errors are s^2 (J^T J)^-1 with s^2 = chi^2 / (m - 2), and the 95% intervals use Student's t
 * with m - 2 degrees of freedom (sheet s8.2). Points with a NaN are skipped.
 */
public final class ExponentialFit {
    private ExponentialFit() {
    }

    /**
     * A fitted exponential.
     *
     * @param amplitude value A at t = tRef, units of y
     * @param rate      r, per unit of t (1/s for t in s)
     * @param amplitudeSe standard error of A
     * @param rateSe    standard error of r
     * @param tQuantile Student t(0.975, m - 2), to turn a standard error into a 95% half-width
     * @param rmse      root mean square residual, units of y
     * @param points    number of points used
     * @param converged false when the optimiser stopped without converging or J^T J was singular
     */
    public record Result(double amplitude, double rate, double amplitudeSe, double rateSe, double tQuantile,
            double rmse, int points, boolean converged) {
        /** 95% interval of the rate, [lo, hi]. */
        public double[] rateCi95() {
            return new double[] {rate - tQuantile * rateSe, rate + tQuantile * rateSe};
        }

        /** Value of the fitted curve at time t. */
        public double valueAt(double t, double tRef) {
            return amplitude * Math.exp(-rate * (t - tRef));
        }
    }

    /**
     * Fits y = A exp(-r (t - tRef)).
     *
     * @param t    sample times (any unit). Not modified.
     * @param y    sample values, same length. Not modified.
     * @param tRef reference time where A applies, same unit as t
     * @throws IllegalArgumentException with fewer than 3 finite points
     */
    public static Result fit(double[] t, double[] y, double tRef) {
        double[][] points = finitePoints(t, y, tRef, 3, "an exponential fit");
        double[] ts = points[0];
        double[] ys = points[1];
        int m = ts.length;
        double[] start = logLinearStart(ts, ys);
        LeastSquaresOptimizer.Optimum optimum;
        boolean converged = true;
        double[] p;
        try {
            optimum = new LevenbergMarquardtOptimizer().optimize(new LeastSquaresBuilder()
                    .start(start)
                    .target(ys)
                    .model(point -> model(point, ts))
                    .maxEvaluations(2000)
                    .maxIterations(2000)
                    .build());
            p = optimum.getPoint().toArray();
        } catch (TooManyEvaluationsException | TooManyIterationsException | ConvergenceException e) {
            converged = false;
            p = start;
        }
        RealMatrix j = model(new ArrayRealVector(p), ts).getSecond();
        double chi2 = 0;
        for (int i = 0; i < m; i++) {
            double r = ys[i] - p[0] * Math.exp(-p[1] * ts[i]);
            chi2 += r * r;
        }
        int dof = m - 2;
        double s2 = dof > 0 ? chi2 / dof : Double.NaN;
        double seA = Double.NaN;
        double seR = Double.NaN;
        try {
            RealMatrix cov = new LUDecomposition(j.transpose().multiply(j)).getSolver().getInverse();
            seA = Math.sqrt(s2 * cov.getEntry(0, 0));
            seR = Math.sqrt(s2 * cov.getEntry(1, 1));
        } catch (SingularMatrixException e) {
            converged = false;
        }
        double tq = dof > 0 ? new TDistribution(dof).inverseCumulativeProbability(0.975) : Double.NaN;
        return new Result(p[0], p[1], seA, seR, tq, Math.sqrt(chi2 / m), m, converged && Double.isFinite(seR));
    }

    /**
     * A fitted sum of two exponentials y(t) = A (f exp(-r1 (t - tRef)) + (1 - f) exp(-r2 (t - tRef))), r1 > r2.
     *
     * @param amplitude A, units of y
     * @param fastFraction f, the share of the fast phase (dimensionless)
     * @param fastRate  r1, per unit of t
     * @param slowRate  r2, per unit of t
     * @param fastRateSe standard error of r1
     * @param slowRateSe standard error of r2
     * @param tQuantile Student t(0.975, m - 4)
     * @param rmse      root mean square residual, units of y
     * @param converged false when the optimiser stopped without converging, J^T J was singular, or the fit is not
     *                  two decaying phases (a rate not positive, f outside (0, 1))
     */
    public record TwoPhases(double amplitude, double fastFraction, double fastRate, double slowRate, double fastRateSe,
                            double slowRateSe, double tQuantile, double rmse, boolean converged) {
        /** Value of the fitted curve at time t. */
        public double valueAt(double t, double tRef) {
            double u = t - tRef;
            return amplitude * (fastFraction * Math.exp(-fastRate * u) + (1 - fastFraction) * Math.exp(-slowRate * u));
        }
    }

    /**
     * Fits y = A (f exp(-r1 (t - tRef)) + (1 - f) exp(-r2 (t - tRef))) by Levenberg-Marquardt with the analytic
     * Jacobian, from the single exponential's fit: r1 = 5 r, r2 = r / 2, f = 0.3. Standard errors as for
     * {@link #fit}, with m - 4 degrees of freedom.
     *
     * @throws IllegalArgumentException with fewer than 6 finite points
     */
    public static TwoPhases fitTwo(double[] t, double[] y, double tRef) {
        double[][] points = finitePoints(t, y, tRef, 6, "a two-exponential fit");
        double[] ts = points[0];
        double[] ys = points[1];
        int m = ts.length;
        Result one = fit(t, y, tRef);
        double r = one.rate() > 0 ? one.rate() : 1.0 / Math.max(1e-9, ts[m - 1] - ts[0]);
        double[] start = {one.amplitude(), 0.3, 5 * r, 0.5 * r};
        boolean converged = true;
        double[] p;
        try {
            p = new LevenbergMarquardtOptimizer().optimize(new LeastSquaresBuilder()
                    .start(start)
                    .target(ys)
                    .model(point -> twoModel(point, ts))
                    .maxEvaluations(4000)
                    .maxIterations(4000)
                    .build()).getPoint().toArray();
        } catch (TooManyEvaluationsException | TooManyIterationsException | ConvergenceException e) {
            converged = false;
            p = start;
        }
        if (p[2] < p[3]) {
            // name the faster phase first
            p = new double[] {p[0], 1 - p[1], p[3], p[2]};
        }
        RealMatrix j = twoModel(new ArrayRealVector(p), ts).getSecond();
        double chi2 = 0;
        for (int i = 0; i < m; i++) {
            double res = ys[i] - p[0] * (p[1] * Math.exp(-p[2] * ts[i]) + (1 - p[1]) * Math.exp(-p[3] * ts[i]));
            chi2 += res * res;
        }
        int dof = m - 4;
        double s2 = dof > 0 ? chi2 / dof : Double.NaN;
        double se1 = Double.NaN;
        double se2 = Double.NaN;
        try {
            RealMatrix cov = new LUDecomposition(j.transpose().multiply(j)).getSolver().getInverse();
            se1 = Math.sqrt(s2 * cov.getEntry(2, 2));
            se2 = Math.sqrt(s2 * cov.getEntry(3, 3));
        } catch (SingularMatrixException e) {
            converged = false;
        }
        boolean phases = p[2] > 0 && p[3] > 0 && p[1] > 0 && p[1] < 1;
        double tq = dof > 0 ? new TDistribution(dof).inverseCumulativeProbability(0.975) : Double.NaN;
        return new TwoPhases(p[0], p[1], p[2], p[3], se1, se2, tq, Math.sqrt(chi2 / m),
                converged && phases && Double.isFinite(se1) && Double.isFinite(se2));
    }

    /**
     * The finite (t, y) pairs, times taken from tRef: {times, values}.
     *
     * @throws IllegalArgumentException with fewer than {@code least} such pairs
     */
    private static double[][] finitePoints(double[] t, double[] y, double tRef, int least, String what) {
        Checks.sameLength(t.length, y);
        int m = 0;
        for (int i = 0; i < t.length; i++) {
            if (Double.isFinite(t[i]) && Double.isFinite(y[i])) {
                m++;
            }
        }
        Checks.require(m >= least, what + " needs at least " + least + " points, got " + m);
        double[] ts = new double[m];
        double[] ys = new double[m];
        int k = 0;
        for (int i = 0; i < t.length; i++) {
            if (Double.isFinite(t[i]) && Double.isFinite(y[i])) {
                ts[k] = t[i] - tRef;
                ys[k] = y[i];
                k++;
            }
        }
        return new double[][] {ts, ys};
    }

    private static Pair<org.apache.commons.math3.linear.RealVector, RealMatrix> twoModel(
            org.apache.commons.math3.linear.RealVector point, double[] ts) {
        double a = point.getEntry(0);
        double f = point.getEntry(1);
        double r1 = point.getEntry(2);
        double r2 = point.getEntry(3);
        double[] v = new double[ts.length];
        double[][] jac = new double[ts.length][4];
        for (int i = 0; i < ts.length; i++) {
            double e1 = Math.exp(-r1 * ts[i]);
            double e2 = Math.exp(-r2 * ts[i]);
            v[i] = a * (f * e1 + (1 - f) * e2);
            jac[i][0] = f * e1 + (1 - f) * e2;
            jac[i][1] = a * (e1 - e2);
            jac[i][2] = -a * f * ts[i] * e1;
            jac[i][3] = -a * (1 - f) * ts[i] * e2;
        }
        return new Pair<>(new ArrayRealVector(v, false), new Array2DRowRealMatrix(jac, false));
    }

    private static Pair<org.apache.commons.math3.linear.RealVector, RealMatrix> model(
            org.apache.commons.math3.linear.RealVector point, double[] ts) {
        double a = point.getEntry(0);
        double r = point.getEntry(1);
        double[] v = new double[ts.length];
        double[][] jac = new double[ts.length][2];
        for (int i = 0; i < ts.length; i++) {
            double e = Math.exp(-r * ts[i]);
            v[i] = a * e;
            jac[i][0] = e;
            jac[i][1] = -a * ts[i] * e;
        }
        return new Pair<>(new ArrayRealVector(v, false), new Array2DRowRealMatrix(jac, false));
    }

    /** Start values from a straight line through (t, ln y) over the positive points; A = mean y, r = 0 otherwise. */
    private static double[] logLinearStart(double[] ts, double[] ys) {
        double sx = 0;
        double sy = 0;
        double sxx = 0;
        double sxy = 0;
        int n = 0;
        double mean = 0;
        for (int i = 0; i < ts.length; i++) {
            mean += ys[i] / ts.length;
            if (ys[i] > 0) {
                double ly = Math.log(ys[i]);
                sx += ts[i];
                sy += ly;
                sxx += ts[i] * ts[i];
                sxy += ts[i] * ly;
                n++;
            }
        }
        double den = n * sxx - sx * sx;
        if (n < 2 || !(Math.abs(den) > 0)) {
            return new double[] {mean, 0};
        }
        double slope = (n * sxy - sx * sy) / den;
        double intercept = (sy - slope * sx) / n;
        return new double[] {Math.exp(intercept), -slope};
    }
}
