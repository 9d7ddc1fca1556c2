package org.dendrokin.core.fit;

import java.util.List;
import java.util.function.Function;

/**
 * Intervals of quantities computed from the parameters ({@link DerivedQuantity}) by the delta method: with q(u) the
 * quantity as a function of the coordinates on the optimiser's scale (its logarithm when the quantity is positive)
 * and grad its gradient by central differences (step 1e-6 max(1, |u_j|)), var q = grad^T C grad, and the 95%
 * interval is q +- t sqrt(var q) (exp of that for a positive quantity, so the interval stays positive).
 */
final class DeltaMethod {
    private DeltaMethod() {
    }

    /**
     * @param q       the quantity
     * @param u       the estimates on the optimiser's scale. Not modified.
     * @param natural maps u to natural parameter values
     * @param cov     covariance of u. Not modified.
     * @param tq      the t quantile
     * @param method  the method name written with the interval (e.g. {@link Interval#DELTA})
     * @return the estimate with its standard error (natural scale) and interval
     */
    static ParameterEstimate estimate(DerivedQuantity q, double[] u, Function<double[], double[]> natural,
                                      double[][] cov, double tq, String method) {
        double value = q.value(natural.apply(u));
        double se = Math.sqrt(quadraticForm(gradient(q, u, natural), cov));
        Interval ci = interval(q, value, se, tq, method, "");
        double seNatural = q.positive() && value > 0 ? value * se : se;
        return new ParameterEstimate(q.name(), q.unit(), value, seNatural, ci, List.of(), false, true);
    }

    /**
     * The interval value +- tq se (value exp(+- tq se) for a positive quantity, se then being the standard error
     * of ln q).
     */
    static Interval interval(DerivedQuantity q, double value, double se, double tq, String method, String note) {
        if (q.positive() && value > 0) {
            return new Interval(value * Math.exp(-tq * se), value * Math.exp(tq * se), method, note);
        }
        return new Interval(value - tq * se, value + tq * se, method, note);
    }

    /** d q / d u by central differences (of ln q for a positive quantity). */
    static double[] gradient(DerivedQuantity q, double[] u, Function<double[], double[]> natural) {
        int p = u.length;
        double[] grad = new double[p];
        for (int j = 0; j < p; j++) {
            double h = 1e-6 * Math.max(1, Math.abs(u[j]));
            double[] up = u.clone();
            double[] dn = u.clone();
            up[j] += h;
            dn[j] -= h;
            double a = q.value(natural.apply(up));
            double b = q.value(natural.apply(dn));
            if (q.positive()) {
                a = Math.log(a);
                b = Math.log(b);
            }
            grad[j] = (a - b) / (2 * h);
        }
        return grad;
    }

    /** g^T C g. */
    static double quadraticForm(double[] g, double[][] cov) {
        double var = 0;
        for (int a = 0; a < g.length; a++) {
            for (int b = 0; b < g.length; b++) {
                var += g[a] * cov[a][b] * g[b];
            }
        }
        return var;
    }
}
