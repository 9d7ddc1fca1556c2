package org.dendrokin.core.calib;

import java.util.ArrayList;
import java.util.List;
import java.util.Locale;

import org.apache.commons.math3.distribution.TDistribution;
import org.apache.commons.math3.exception.MathIllegalStateException;
import org.apache.commons.math3.fitting.leastsquares.LeastSquaresBuilder;
import org.apache.commons.math3.fitting.leastsquares.LeastSquaresOptimizer;
import org.apache.commons.math3.fitting.leastsquares.LeastSquaresProblem;
import org.apache.commons.math3.fitting.leastsquares.LevenbergMarquardtOptimizer;
import org.apache.commons.math3.linear.Array2DRowRealMatrix;
import org.apache.commons.math3.linear.ArrayRealVector;
import org.apache.commons.math3.linear.LUDecomposition;
import org.apache.commons.math3.linear.RealMatrix;
import org.apache.commons.math3.linear.RealVector;
import org.apache.commons.math3.linear.SingularMatrixException;
import org.apache.commons.math3.util.Pair;
import org.dendrokin.core.Checks;

/**
 * Fits the Hill form F = Fmin + (Fmax - Fmin) c^n / (c^n + K^n) to a table of standards by unweighted
 * least squares with Commons Math's Levenberg-Marquardt optimiser (reference sheet s1.7, s8.1). K and n are
 * fitted as logarithms so that they stay positive; Fmin and Fmax are free. Covariance as in sheet s8.2:
 * s^2 = RSS / (m - 4), C = s^2 (J^T J)^-1 on the fitted scale; 95% intervals are estimate +- t(0.975, m - 4)
 * SE for Fmin and Fmax, and exp(ln estimate +- t SE) for K and n (asymmetric, always positive). Several
 * starting points are tried and the lowest residual sum of squares kept. A fit that does not converge or has
 * a singular J^T J is reported as a result with {@code converged == false} and a warning, not an exception.
 */
public final class StandardsFit {
    /** Number of fitted parameters: Fmin, Fmax, K, n. */
    public static final int PARAMETERS = 4;

    private StandardsFit() {
    }

    /** One fitted parameter with its 95% confidence interval. */
    public record Estimate(String name, double value, double ci95Low, double ci95High, String unit) {
    }

    /**
     * The outcome of a fit.
     *
     * @param calibration the fitted calibration, or null when no starting point converged
     * @param converged   true when the optimiser converged and J^T J could be inverted
     * @param estimates   f_min, f_max, k_half_uM, n, in that order (empty when calibration is null)
     * @param rss         residual sum of squares (intensity units squared)
     * @param dof         degrees of freedom, m - 4
     * @param residualSd  s = sqrt(rss / dof), intensity units
     * @param tQuantile   t(0.975, dof) used for the intervals
     * @param warnings    plain sentences
     */
    public record Result(FittedHill calibration, boolean converged, List<Estimate> estimates, double rss, int dof,
                         double residualSd, double tQuantile, List<String> warnings) {
        public Result {
            estimates = List.copyOf(estimates);
            warnings = List.copyOf(warnings);
        }
    }

    /**
     * Checks that a table can carry a Hill fit: at least {@code PARAMETERS + 1} rows and at least 4 different
     * concentrations. Throws IllegalArgumentException with a sentence a user can read.
     */
    public static void requireEnough(Standards standards) {
        int levels = standards.distinctConcentrations().length;
        Checks.require(standards.size() > PARAMETERS && levels >= PARAMETERS, String.format(Locale.ROOT,
                "the table has %d standards at %d different concentrations, but a Hill fit has %d parameters "
                        + "(f_min, f_max, k_half_uM, n) and needs at least %d standards at %d or more different "
                        + "concentrations", standards.size(), levels, PARAMETERS, PARAMETERS + 1, PARAMETERS));
    }

    /** Fits the Hill form to the standards. */
    public static Result fit(Standards standards) {
        requireEnough(standards);
        int m = standards.size();
        double[] c = standards.concentrationsMicromolar();
        double[] f = standards.intensities();
        double[] levels = standards.distinctConcentrations();
        double[] means = standards.meanIntensities();
        double a0 = means[0];
        double b0 = means[means.length - 1];
        double k0 = midpointConcentration(levels, means);

        LeastSquaresOptimizer.Optimum best = null;
        for (double n0 : new double[] {1.0, 2.5, 0.6}) {
            for (double kScale : new double[] {1.0, 0.3, 3.0}) {
                double[] start = {a0, b0, Math.log(k0 * kScale), Math.log(n0)};
                try {
                    LeastSquaresOptimizer.Optimum o = new LevenbergMarquardtOptimizer()
                            .withCostRelativeTolerance(1e-14).withParameterRelativeTolerance(1e-14)
                            .withOrthoTolerance(1e-14)
                            .optimize(problem(c, f, start));
                    if (Double.isFinite(o.getCost()) && (best == null || o.getCost() < best.getCost())) {
                        best = o;
                    }
                } catch (MathIllegalStateException e) {
                    // this start did not converge within the evaluation budget; try the next one
                }
            }
        }
        List<String> warnings = new ArrayList<>();
        int dof = m - PARAMETERS;
        double t = new TDistribution(dof).inverseCumulativeProbability(0.975);
        if (best == null) {
            warnings.add("The Hill fit to the standards did not converge from any starting point.");
            return new Result(null, false, List.of(), Double.NaN, dof, Double.NaN, t, warnings);
        }
        double[] p = best.getPoint().toArray();
        double rss = best.getCost() * best.getCost();
        double s2 = rss / dof;
        HillCurve curve;
        try {
            curve = new HillCurve(p[0], p[1], Math.exp(p[2]), Math.exp(p[3]));
        } catch (IllegalArgumentException e) {
            warnings.add("The Hill fit to the standards ended at unusable parameters (" + e.getMessage() + ").");
            return new Result(null, false, List.of(), rss, dof, Math.sqrt(s2), t, warnings);
        }
        double[][] cov = null;
        boolean converged = true;
        try {
            RealMatrix j = jacobian(c, p);
            RealMatrix inv = new LUDecomposition(j.transpose().multiply(j), 1e-14).getSolver().getInverse();
            cov = inv.scalarMultiply(s2).getData();
        } catch (SingularMatrixException e) {
            converged = false;
            warnings.add("The standards do not determine all four Hill parameters (J^T J is singular); "
                    + "add standards between zero and saturation, or use the monotone method.");
        }
        List<Estimate> estimates = new ArrayList<>();
        double[] se = new double[PARAMETERS];
        for (int i = 0; i < PARAMETERS; i++) {
            se[i] = cov == null ? Double.NaN : Math.sqrt(Math.max(0, cov[i][i]));
        }
        estimates.add(new Estimate("f_min", p[0], p[0] - t * se[0], p[0] + t * se[0], ""));
        estimates.add(new Estimate("f_max", p[1], p[1] - t * se[1], p[1] + t * se[1], ""));
        estimates.add(new Estimate("k_half_uM", Math.exp(p[2]), Math.exp(p[2] - t * se[2]),
                Math.exp(p[2] + t * se[2]), "uM"));
        estimates.add(new Estimate("n", Math.exp(p[3]), Math.exp(p[3] - t * se[3]), Math.exp(p[3] + t * se[3]), ""));
        double topFraction = curve.bound(levels[levels.length - 1]);
        if (topFraction < 0.9) {
            warnings.add(String.format(Locale.ROOT, "The highest standard (%s uM) reaches only %.0f%% of the "
                    + "fitted saturation, so Fmax is extrapolated and its interval is wide; add a saturating "
                    + "standard.", Format.number(levels[levels.length - 1]), 100 * topFraction));
        }
        double bottomFraction = curve.bound(levels[0]);
        if (bottomFraction > 0.1) {
            warnings.add(String.format(Locale.ROOT, "The lowest standard (%s uM) is already %.0f%% of the way to "
                    + "saturation, so Fmin is extrapolated; add a zero-calcium standard.",
                    Format.number(levels[0]), 100 * bottomFraction));
        }
        return new Result(new FittedHill(curve, cov), converged, estimates, rss, dof, Math.sqrt(s2), t, warnings);
    }

    private static LeastSquaresProblem problem(double[] c, double[] f, double[] start) {
        return new LeastSquaresBuilder()
                .start(start)
                .target(f)
                .model(point -> {
                    double[] p = point.toArray();
                    double[] value = new double[c.length];
                    for (int i = 0; i < c.length; i++) {
                        value[i] = model(c[i], p);
                    }
                    return new Pair<RealVector, RealMatrix>(new ArrayRealVector(value, false), jacobian(c, p));
                })
                .maxEvaluations(2000)
                .maxIterations(2000)
                .build();
    }

    /** F(c) for parameters (a, b, ln K, ln n), without validation (the optimiser may wander). */
    private static double model(double c, double[] p) {
        if (c == 0) {
            return p[0];
        }
        double q = Math.exp(Math.exp(p[3]) * (p[2] - Math.log(c)));
        return p[0] + (p[1] - p[0]) / (1 + q);
    }

    /** Rows dF/d(a, b, ln K, ln n) = (1 - s, s, -(b - a) n s (1 - s), (b - a) n s (1 - s) ln(c / K)). */
    private static RealMatrix jacobian(double[] c, double[] p) {
        double n = Math.exp(p[3]);
        double[][] j = new double[c.length][PARAMETERS];
        for (int i = 0; i < c.length; i++) {
            double s = 0;
            double logRatio = 0;
            if (c[i] > 0) {
                logRatio = Math.log(c[i]) - p[2];
                s = 1 / (1 + Math.exp(-n * logRatio));
            }
            double w = (p[1] - p[0]) * n * s * (1 - s);
            j[i][0] = 1 - s;
            j[i][1] = s;
            j[i][2] = -w;
            j[i][3] = w * logRatio;
        }
        return new Array2DRowRealMatrix(j, false);
    }

    /** Starting K: where the mean intensities cross half-way, interpolated on log concentration. */
    private static double midpointConcentration(double[] levels, double[] means) {
        double half = 0.5 * (means[0] + means[means.length - 1]);
        for (int i = 1; i < levels.length; i++) {
            double lo = means[i - 1];
            double hi = means[i];
            if ((lo - half) * (hi - half) <= 0 && lo != hi) {
                double w = (half - lo) / (hi - lo);
                if (levels[i - 1] > 0) {
                    return Math.exp(Math.log(levels[i - 1]) + w * (Math.log(levels[i]) - Math.log(levels[i - 1])));
                }
                return Math.max(levels[i] * Math.max(w, 0.1), 1e-9);
            }
        }
        double positive = levels[levels.length - 1] > 0 ? levels[levels.length - 1] : 1;
        return Math.sqrt(positive * Math.max(levels[0] > 0 ? levels[0] : positive * 1e-3, 1e-12));
    }
}
