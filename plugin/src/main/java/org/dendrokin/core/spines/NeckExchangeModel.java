package org.dendrokin.core.spines;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;

import org.dendrokin.core.Checks;
import org.dendrokin.core.fit.FitModel;
import org.dendrokin.core.fit.ParameterSpec;
import org.dendrokin.core.units.Unit;

/**
 * A spine head exchanging signal with the shaft through its neck, as one well-mixed compartment coupled to the
 * dendrite (the compartment picture of Svoboda, Tank &amp; Denk 1996, Science 272:716, who measured the coupling of
 * spine heads to their dendrites this way; Bloodgood &amp; Sabatini 2005, Science 310:866, measured the neck's
 * exchange time of single spines from the decay of photoactivated fluorescence in the head):
 * <pre>
 *   dc/dt = (u(s_b, t) - c) / tau_neck - k_head c,        c(t_0) = u(s_b, t_0) / (1 + k_head tau_neck)
 *   y(t_f) = baseline + amplitude c(t_f) + jump exp(-(1/tau_neck + k_head)(t_f - t_stim))   for t_f &gt;= t_stim
 * </pre>
 * with u the shaft's measured signal at the spine's base s_b ({@link ShaftDriver}), c the head's, k_head a
 * first-order loss inside the head (given, not fitted), and, for a stimulated spine, a jump of the head's own
 * signal at the stimulus time that then leaves through the neck. The head starts in equilibrium with the shaft.
 *
 * <p>Fitted: tau_neck (s, log scale); base_offset (um), where the neck meets the shaft relative to the head's
 * projection onto the path; amplitude (dimensionless: how the head's dF/F0 scales with the shaft's); baseline
 * (dF/F0); and, for a stimulated spine, the jump (dF/F0). The base is not where the head projects, because necks
 * leave the shaft at an angle, and away from the stimulus the shaft's signal arrives later with distance: a base
 * assumed in the wrong place shifts the shaft's time course by about as much as the neck delays it. The data alone
 * hardly tell the two apart there, so the offset carries a prior: one more residual, offset / {@code offsetSdUm},
 * as if the offset had been measured as 0 with that standard deviation (a neck leaving the shaft at a typical
 * angle). Its effect is that tau_neck's interval widens where the base matters, instead of the offset running off
 * to wherever it makes tau_neck fit best. The model's grid is the frames followed by that one prior point.
 *
 * <p>Discretisation: u is linear between frames, except around the stimulus, where it keeps the last frame's value
 * before the stimulus time and the first frame's value from it on (a stimulus makes the shaft jump, which a line
 * between frames would smear over a whole frame interval). On each piece of length h with u going from u0 to u1,
 * the equation is solved exactly: with L = 1/tau + k_head and x = L h,
 * <pre>
 *   c(h) = e^-x c(0) + (h / tau) [ u0 S(x) + u1 (T(x) - S(x)) ],   T(x) = (1 - e^-x) / x,
 *   S(x) = (1 - e^-x (1 + x)) / x^2
 * </pre>
 * (the variation-of-constants integral of a linear input). T and S and their derivatives are summed as power series
 * below x = 0.5, where the closed forms cancel. The Jacobian is exact: dc/dtau follows the same recursion
 * differentiated, and dc/ds_b is the same filter applied to du/ds. Safe to call from several threads (no state
 * changes after construction).
 */
final class NeckExchangeModel implements FitModel {
    static final String NAME = "neck-exchange";
    static final String TAU = "tau_neck";
    static final String OFFSET = "base_offset";
    static final String AMPLITUDE = "amplitude";
    static final String BASELINE = "baseline";
    static final String SHAFT_LIGHT = "shaft_light";
    static final String JUMP = "head_jump";
    /** Below this x the series replace the closed forms of T, S and their derivatives. */
    private static final double SERIES_BELOW = 0.5;
    private static final int SERIES_TERMS = 24;
    /**
     * sd of the prior on shaft_light, the fraction of the shaft's signal that the blur carries into the head's disc
     * (dimensionless): as if it had been measured as 0 with this sd, so that it takes up the shaft's light where the
     * data show it but cannot trade freely against the amplitude.
     */
    static final double LIGHT_SD = 0.1;

    private final double[] timesS;
    private final ShaftDriver shaft;
    private final double projectionUm;
    private final double kHeadPerS;
    private final boolean jump;
    private final double stimulusTimeS;
    /** Per piece of the input: its length (s), the frames whose values it starts and ends at, the frame it reaches. */
    private final double[] pieceLength;
    private final int[] pieceFrom;
    private final int[] pieceTo;
    /** Frame whose value is known at the end of a piece, or -1 for a piece ending between frames. */
    private final int[] pieceFrame;
    private final double offsetSdUm;
    private final List<ParameterSpec> specs;

    /**
     * @param timesS        frame times, s, increasing. Not modified.
     * @param shaft         the shaft's signal along the path
     * @param projectionUm  the head's projection onto the path, um
     * @param offsetSdUm    sd of the prior on the base's offset from the projection, um (positive)
     * @param stimulusTimeS stimulus time, s, or NaN when none is known (then u is linear between all frames)
     * @param kHeadPerS     loss inside the head, 1/s, zero or positive
     * @param jump          the head itself was stimulated: fit the jump of its signal at the stimulus time
     */
    NeckExchangeModel(double[] timesS, ShaftDriver shaft, double projectionUm, double offsetSdUm,
            double stimulusTimeS, double kHeadPerS, boolean jump) {
        Checks.require(timesS.length == shaft.frameCount() && timesS.length >= 2,
                "the neck exchange model needs the shaft's value at each of at least 2 frames");
        Checks.require(shaft.usable(), "the shaft has no values near the spine");
        Checks.positiveFinite(offsetSdUm, "sd of the base offset (um)");
        Checks.nonNegativeFinite(kHeadPerS, "loss rate inside the head");
        Checks.require(!jump || Double.isFinite(stimulusTimeS), "a stimulated head needs the stimulus time");
        this.timesS = timesS.clone();
        this.shaft = shaft;
        this.projectionUm = projectionUm;
        this.offsetSdUm = offsetSdUm;
        this.kHeadPerS = kHeadPerS;
        this.jump = jump;
        this.stimulusTimeS = stimulusTimeS;
        int n = timesS.length;
        int stimFrame = Double.isFinite(stimulusTimeS) ? firstFrameAtOrAfter(timesS, stimulusTimeS) : -1;
        List<double[]> pieces = new ArrayList<>();
        for (int f = 0; f + 1 < n; f++) {
            double h = timesS[f + 1] - timesS[f];
            Checks.require(h > 0, "frame times must increase");
            if (f + 1 == stimFrame) {
                double before = stimulusTimeS - timesS[f];
                if (before > 1e-9 * Math.max(1, Math.abs(stimulusTimeS))) {
                    pieces.add(new double[] {before, f, f, -1});
                    pieces.add(new double[] {timesS[f + 1] - stimulusTimeS, f + 1, f + 1, f + 1});
                } else {
                    pieces.add(new double[] {h, f, f, f + 1});
                }
            } else {
                pieces.add(new double[] {h, f, f + 1, f + 1});
            }
        }
        int m = pieces.size();
        this.pieceLength = new double[m];
        this.pieceFrom = new int[m];
        this.pieceTo = new int[m];
        this.pieceFrame = new int[m];
        for (int i = 0; i < m; i++) {
            double[] p = pieces.get(i);
            pieceLength[i] = p[0];
            pieceFrom[i] = (int) p[1];
            pieceTo[i] = (int) p[2];
            pieceFrame[i] = (int) p[3];
        }
        List<ParameterSpec> s = new ArrayList<>();
        s.add(ParameterSpec.positive(TAU, Unit.SECOND));
        s.add(ParameterSpec.linear(OFFSET, Unit.MICROMETRE));
        s.add(ParameterSpec.linear(AMPLITUDE, Unit.DIMENSIONLESS));
        s.add(ParameterSpec.linear(BASELINE, Unit.DF_F0));
        s.add(ParameterSpec.linear(SHAFT_LIGHT, Unit.DIMENSIONLESS));
        if (jump) {
            s.add(ParameterSpec.linear(JUMP, Unit.DF_F0));
        }
        this.specs = List.copyOf(s);
    }

    /** First index with times[f] at or after t (within 1e-9 relative), as {@code Kymograph.firstFrameAtOrAfter}. */
    static int firstFrameAtOrAfter(double[] times, double t) {
        double tolerance = 1e-9 * Math.max(1, Math.abs(t));
        int f = 0;
        while (f < times.length && times[f] < t - tolerance) {
            f++;
        }
        return f;
    }

    @Override
    public String name() {
        return NAME;
    }

    @Override
    public List<ParameterSpec> parameters() {
        return specs;
    }

    /** The frames and, last, the prior points of the base offset and the shaft light. */
    @Override
    public int size() {
        return timesS.length + 2;
    }

    /** Number of frames (the grid without the prior point). */
    int frameCount() {
        return timesS.length;
    }

    /** sd of the prior on the base offset, um: the sigma of the grid's last point, whose observed value is 0. */
    double offsetSdUm() {
        return offsetSdUm;
    }

    @Override
    public List<String> headlineParameters() {
        return List.of(TAU);
    }

    @Override
    public String poorlyDeterminedAdvice() {
        return "The neck time constant is not determined: the shaft's signal at this spine changes too little, or "
                + "too slowly, for the head's lag behind it to show.";
    }

    boolean hasJump() {
        return jump;
    }

    /** The shaft's signal at the base for an offset (um) from the head's projection, every frame. */
    double[] shaftAt(double offsetUm) {
        double[] u = new double[timesS.length];
        shaft.at(projectionUm + offsetUm, u, null);
        return u;
    }

    /**
     * The head's signal c at every frame for an input u, and its derivative by tau_neck.
     *
     * @param tauS   tau_neck, s
     * @param u      the input at every frame. Not modified.
     * @param c      receives c at each frame. Modified.
     * @param dcDtau receives dc/dtau at each frame, or null. Modified.
     */
    void filter(double tauS, double[] u, double[] c, double[] dcDtau) {
        double lambda = 1 / tauS + kHeadPerS;
        double dLambda = -1 / (tauS * tauS);
        double gain = 1 + kHeadPerS * tauS;
        double x = u[0] / gain;
        double dx = -u[0] * kHeadPerS / (gain * gain);
        c[0] = x;
        if (dcDtau != null) {
            dcDtau[0] = dx;
        }
        double[] ts = new double[4];
        for (int i = 0; i < pieceLength.length; i++) {
            double h = pieceLength[i];
            double z = lambda * h;
            seriesOrClosed(z, ts);
            double e = Math.exp(-z);
            double u0 = u[pieceFrom[i]];
            double u1 = u[pieceTo[i]];
            double input = h / tauS * (u0 * ts[1] + u1 * (ts[0] - ts[1]));
            if (dcDtau != null) {
                double dz = h * dLambda;
                double dInput = -input / tauS + h / tauS * (u0 * ts[3] + u1 * (ts[2] - ts[3])) * dz;
                dx = e * dx - e * dz * x + dInput;
            }
            x = e * x + input;
            if (pieceFrame[i] >= 0) {
                c[pieceFrame[i]] = x;
                if (dcDtau != null) {
                    dcDtau[pieceFrame[i]] = dx;
                }
            }
        }
    }

    /**
     * T(z), S(z), T'(z), S'(z) into out[0..3]. Series: T = sum_m (-z)^m / (m+1)!, S = sum_m (-1)^m (m+1) z^m /
     * (m+2)!; closed forms T = (1 - e^-z) / z, S = (1 - e^-z (1 + z)) / z^2, T' = (e^-z - T) / z,
     * S' = (e^-z - 2 S) / z.
     */
    static void seriesOrClosed(double z, double[] out) {
        if (z < SERIES_BELOW) {
            double t = 0;
            double s = 0;
            double dt = 0;
            double ds = 0;
            double power = 1;      // z^m
            double previous = 0;   // z^(m-1)
            double factorial = 1;  // (m+1)!
            for (int m = 0; m < SERIES_TERMS; m++) {
                double sign = (m % 2 == 0) ? 1 : -1;
                double invM1 = 1 / factorial;
                double invM2 = invM1 / (m + 2);
                t += sign * power * invM1;
                s += sign * (m + 1) * power * invM2;
                dt += sign * m * previous * invM1;
                ds += sign * m * (m + 1) * previous * invM2;
                previous = power;
                power *= z;
                factorial *= (m + 2);
            }
            out[0] = t;
            out[1] = s;
            out[2] = dt;
            out[3] = ds;
            return;
        }
        double e = Math.exp(-z);
        double t = -Math.expm1(-z) / z;
        double s = (-Math.expm1(-z) - z * e) / (z * z);
        out[0] = t;
        out[1] = s;
        out[2] = (e - t) / z;
        out[3] = (e - 2 * s) / z;
    }

    /** exp(-(1/tau + k_head)(t_f - t_stim)) from the stimulus on, 0 before it (or without a jump). */
    double kick(double tauS, int frame) {
        double since = timesS[frame] - stimulusTimeS;
        if (!jump || since < -1e-9 * Math.max(1, Math.abs(stimulusTimeS))) {
            return 0;
        }
        return Math.exp(-(1 / tauS + kHeadPerS) * Math.max(0, since));
    }

    @Override
    public void evaluate(double[] parameters, double[] values, double[] jacobian) {
        double tau = parameters[0];
        double offset = parameters[1];
        double amplitude = parameters[2];
        double baseline = parameters[3];
        int q = 5;
        double light = parameters[4];
        double jumpSize = jump ? parameters[q] : 0;
        int n = timesS.length;
        int p = specs.size();
        double[] u = new double[n];
        double[] du = jacobian != null ? new double[n] : null;
        shaft.at(projectionUm + offset, u, du);
        double[] c = new double[n];
        double[] dcTau = jacobian != null ? new double[n] : null;
        double[] dcOffset = jacobian != null ? new double[n] : null;
        filter(tau, u, c, dcTau);
        if (jacobian != null) {
            filter(tau, du, dcOffset, null);
        }
        for (int f = 0; f < n; f++) {
            double kick = kick(tau, f);
            values[f] = baseline + amplitude * c[f] + light * u[f] + jumpSize * kick;
            if (jacobian != null) {
                int row = f * p;
                double since = Math.max(0, timesS[f] - stimulusTimeS);
                jacobian[row] = amplitude * dcTau[f] + (kick > 0 ? jumpSize * kick * since / (tau * tau) : 0);
                jacobian[row + 1] = amplitude * dcOffset[f] + light * du[f];
                jacobian[row + 2] = c[f];
                jacobian[row + 3] = 1;
                jacobian[row + 4] = u[f];
                if (jump) {
                    jacobian[row + q] = kick;
                }
            }
        }
        values[n] = offset;
        if (jacobian != null) {
            int row = n * p;
            Arrays.fill(jacobian, row, row + p, 0);
            jacobian[row + 1] = 1;
        }
        values[n + 1] = light;
        if (jacobian != null) {
            int row = (n + 1) * p;
            Arrays.fill(jacobian, row, row + p, 0);
            jacobian[row + 4] = 1;
        }
    }
}
