package org.dendrokin.core.fit;

import java.util.ArrayList;
import java.util.List;

import org.dendrokin.core.units.Unit;

/**
 * A dF/F0 model with the bleaching the correction left over. The correction divides by a fitted exponential; when
 * its rate is off by epsilon, every sample is multiplied by exp(-epsilon (t - t_b)), t_b the middle of the baseline
 * frames (where F0 was taken), so the recorded dF/F0 is y = (1 + m) exp(-epsilon (t - t_b)) - 1 with m the inner
 * model's dF/F0. Far from the stimulus this is a slow baseline trend; where the response is, it scales the
 * response too. Fitting epsilon with the model's constants keeps a small error of the bleaching correction out of
 * the decay rate k, which would otherwise absorb it (on the project's realistic movies, bleaching was the largest
 * source of error in k). The extra parameter is {@code residual_bleaching} (1/s), positive when the correction was
 * too weak.
 *
 * <p>Jacobian: dy/dtheta = exp(-epsilon tau) dm/dtheta for the inner parameters and
 * dy/depsilon = -tau (1 + m) exp(-epsilon tau), tau = t - t_b. The inner model's range evaluation is used when it
 * has one, so robust intervals need no n x p array.
 */
public final class ResidualBleaching implements FitModel {
    /** Name of the extra parameter. */
    public static final String PARAMETER = "residual_bleaching";

    private final FitModel inner;
    private final double[] timesS;
    private final int positions;
    private final double baselineTimeS;
    private final List<ParameterSpec> specs;

    /**
     * @param inner         the dF/F0 model
     * @param timesS        frame times, s (the grid is {@code frame * positions + position}). Not modified.
     * @param positions     positions per frame
     * @param baselineTimeS the middle of the baseline frames, s
     */
    public ResidualBleaching(FitModel inner, double[] timesS, int positions, double baselineTimeS) {
        this.inner = inner;
        this.timesS = timesS.clone();
        this.positions = positions;
        this.baselineTimeS = baselineTimeS;
        List<ParameterSpec> s = new ArrayList<>(inner.parameters());
        s.add(ParameterSpec.linear(PARAMETER, Unit.RATE));
        this.specs = List.copyOf(s);
    }

    @Override
    public String name() {
        return inner.name();
    }

    @Override
    public List<ParameterSpec> parameters() {
        return specs;
    }

    @Override
    public int size() {
        return inner.size();
    }

    @Override
    public boolean hasJacobian() {
        return inner.hasJacobian();
    }

    @Override
    public void evaluate(double[] theta, double[] values, double[] jacobian) {
        evaluateRange(theta, 0, size(), values, jacobian);
    }

    @Override
    public boolean hasRangeEvaluation() {
        return true;
    }

    @Override
    public void evaluateRange(double[] theta, int from, int to, double[] values, double[] jacobian) {
        int q = theta.length - 1;
        double[] innerTheta = java.util.Arrays.copyOf(theta, q);
        double epsilon = theta[q];
        int n = to - from;
        double[] m = new double[n];
        double[] jm = jacobian == null ? null : new double[n * q];
        if (inner.hasRangeEvaluation() && (jm != null || from != 0 || to != size())) {
            inner.evaluateRange(innerTheta, from, to, m, jm == null ? new double[n * q] : jm);
        } else {
            double[] all = new double[size()];
            double[] allJ = jm == null ? null : new double[size() * q];
            inner.evaluate(innerTheta, all, allJ);
            System.arraycopy(all, from, m, 0, n);
            if (jm != null) {
                System.arraycopy(allJ, from * q, jm, 0, n * q);
            }
        }
        int p = q + 1;
        for (int i = 0; i < n; i++) {
            double tau = timesS[(from + i) / positions] - baselineTimeS;
            double e = Math.exp(-epsilon * tau);
            values[i] = (1 + m[i]) * e - 1;
            if (jacobian != null) {
                for (int c = 0; c < q; c++) {
                    jacobian[i * p + c] = e * jm[i * q + c];
                }
                jacobian[i * p + q] = -tau * (1 + m[i]) * e;
            }
        }
    }

    @Override
    public boolean hasNormalEquations() {
        return inner.hasRangeEvaluation();
    }

    /** One pass over the grid in blocks of the range evaluation, summing the weighted normal equations. */
    @Override
    public void normalEquations(double[] theta, FitData data, NormalEquations out, double[] fitted) {
        NormalEquations.sumByBlocks(this, theta, data, out, fitted, 4096);
    }

    @Override
    public List<String> headlineParameters() {
        return inner.headlineParameters();
    }

    @Override
    public List<DerivedQuantity> derivedQuantities() {
        List<DerivedQuantity> out = new ArrayList<>();
        for (DerivedQuantity d : inner.derivedQuantities()) {
            out.add(new DerivedQuantity(d.name(), d.unit(), d.positive(),
                    th -> d.value(java.util.Arrays.copyOf(th, th.length - 1))));
        }
        return out;
    }

    @Override
    public String poorlyDeterminedAdvice() {
        return inner.poorlyDeterminedAdvice();
    }

    /** A start of this model from a start of the inner one: no residual bleaching. */
    public static double[] start(double[] innerStart) {
        return java.util.Arrays.copyOf(innerStart, innerStart.length + 1);
    }
}
