package org.dendrokin.core.model;

import java.util.ArrayList;
import java.util.List;
import java.util.Optional;

import org.dendrokin.core.units.Unit;

/**
 * {@code nagumo}: u_t = D u_xx + k u (1 - u)(u - a), a bistable switch; parameters D (um^2/s), k (1/s) and the
 * threshold a (dimensionless). A stimulus above threshold sets off a front of speed sqrt(k D / 2)(1 - 2a) and
 * width sqrt(2 D / k) (McKean 1970; sheet s5.2). The reaction sub-step is ROS2 (Verwer, Spee, Blom &amp;
 * Hundsdorfer 1999): W = 1 - gamma tau f_u(u), k1 = f(u) / W, k2 = (f(u + tau k1) - 2 k1) / W,
 * u1 = u + tau (3 k1 + k2) / 2, second order and L-stable, so a stiff cubic (k tau large) stays stable.
 */
final class Nagumo extends ScalarModel {
    private static final List<ModelParameter> PARAMETERS = List.of(
            ModelParameter.diffusion("D", "diffusion coefficient"),
            ModelParameter.rate("k", "rate"),
            // the front invades the resting state for 0 < a < 1/2, so a fit keeps a there
            ModelParameter.signed("a", "threshold", 0, 0.5));
    // REF for the formulas: McKean 1970; sheet s5.2: c = sqrt(k D / 2)(1 - 2a), w = sqrt(2 D / k)
    private static final ClosedForm FRONT_SPEED = new ClosedForm("front_speed", "front speed sqrt(k D / 2)(1 - 2a)",
            Unit.SPEED, true, p -> Math.sqrt(p[1] * p[0] / 2) * (1 - 2 * p[2]));
    private static final ClosedForm FRONT_WIDTH = new ClosedForm("front_width", "front width sqrt(2 D / k)",
            Unit.MICROMETRE, true, p -> Math.sqrt(2 * p[0] / p[1]));
    /** Thresholds the fit starts from: one near each end of the range where a front invades. */
    private static final double[] START_THRESHOLDS = {0.15, 0.3};

    @Override
    public String name() {
        return "nagumo";
    }

    @Override
    public List<ModelParameter> parameters() {
        return PARAMETERS;
    }

    @Override
    public double stiffnessPerS(double[] p) {
        return p[1];
    }

    @Override
    public List<ClosedForm> closedForms() {
        return List.of(FRONT_SPEED, FRONT_WIDTH);
    }

    @Override
    public Optional<ClosedForm> gridScale() {
        return Optional.of(FRONT_WIDTH);
    }

    @Override
    public double rate(double u, double[] p) {
        return p[1] * u * (1 - u) * (u - p[2]);
    }

    @Override
    public double rateDu(double u, double[] p) {
        return p[1] * ((-3 * u + 2 * (1 + p[2])) * u - p[2]);
    }

    @Override
    public double rateDp(double u, double[] p, int j) {
        return switch (j) {
            case 1 -> u * (1 - u) * (u - p[2]);
            case 2 -> p[1] * (u * u - u);
            default -> 0;
        };
    }

    /** ROS2 at every node (formulas in the class comment). */
    @Override
    void react(double[] p, double tau, double[] from, double[] to, int n) {
        double k = p[1];
        double a = p[2];
        double gtk = ROS2_GAMMA * tau * k;
        double ap1 = 1 + a;
        for (int i = 0; i < n; i++) {
            double v = from[i];
            double f = k * v * (1 - v) * (v - a);
            double w = 1 / (1 - gtk * ((-3 * v + 2 * ap1) * v - a));
            double k1 = f * w;
            double v2 = v + tau * k1;
            double f2 = k * v2 * (1 - v2) * (v2 - a);
            double k2 = (f2 - 2 * k1) * w;
            to[i] = v + tau * (1.5 * k1 + 0.5 * k2);
        }
    }

    @Override
    int scratchRows() {
        return 10;
    }

    /**
     * ROS2 with the derivatives of u1 along u, k and a, each the derivative of the formulas in the class comment
     * (dW = -gamma tau d(k g_u), g = u (1 - u)(u - a)), as a dozen short loops through scratch arrays: the JIT
     * vectorises only loops whose bodies are short (HotSpot's loop-unrolling limit), and one loop over all of it
     * ran four times slower than these. Scratch rows: 0 W^-1, 1 k1, 2 v2, 3 k2, 4 k f_u(v2), 5 g(v2),
     * 6 k g_a(v2), 7 dk1, 8 k2 dW, 9 r_u.
     */
    @Override
    void reactWithSensitivities(double[] p, double tau, double[] u, double[][] sens, int n, double[][] scratch) {
        double k = p[1];
        double a = p[2];
        double[] sD = sens[0];
        double[] sK = sens[1];
        double[] sA = sens[2];
        double gt = ROS2_GAMMA * tau;
        double gtk = gt * k;
        double ap12 = 2 * (1 + a);
        double[] wInv = scratch[0];
        double[] k1s = scratch[1];
        double[] v2s = scratch[2];
        double[] k2s = scratch[3];
        double[] kgu2 = scratch[4];
        double[] g2s = scratch[5];
        double[] kga2 = scratch[6];
        double[] dk1s = scratch[7];
        double[] k2dW = scratch[8];
        double[] rus = scratch[9];
        for (int i = 0; i < n; i++) {
            double v = u[i];
            double w = 1 / (1 - gtk * ((ap12 - 3 * v) * v - a));
            wInv[i] = w;
            k1s[i] = k * v * (1 - v) * (v - a) * w;
        }
        for (int i = 0; i < n; i++) {
            double k1 = k1s[i];
            double v2 = u[i] + tau * k1;
            v2s[i] = v2;
            k2s[i] = (k * v2 * (1 - v2) * (v2 - a) - 2 * k1) * wInv[i];
        }
        for (int i = 0; i < n; i++) {
            double v2 = v2s[i];
            kgu2[i] = k * ((ap12 - 3 * v2) * v2 - a);
            g2s[i] = v2 * (1 - v2) * (v2 - a);
        }
        for (int i = 0; i < n; i++) {
            double v2 = v2s[i];
            kga2[i] = k * (v2 * v2 - v2);
        }
        // direction u (du = 1): dW = -gt k f_u'(v)
        for (int i = 0; i < n; i++) {
            double v = u[i];
            double dW = -gtk * (ap12 - 6 * v);
            dk1s[i] = (k * ((ap12 - 3 * v) * v - a) - k1s[i] * dW) * wInv[i];
            k2dW[i] = k2s[i] * dW;
        }
        for (int i = 0; i < n; i++) {
            double dk1 = dk1s[i];
            double dk2 = (kgu2[i] * (1 + tau * dk1) - 2 * dk1 - k2dW[i]) * wInv[i];
            double ru = 1 + tau * (1.5 * dk1 + 0.5 * dk2);
            rus[i] = ru;
            sD[i] *= ru;
        }
        // direction k: dW = -gt g_u(v)
        for (int i = 0; i < n; i++) {
            double v = u[i];
            double dW = -gt * ((ap12 - 3 * v) * v - a);
            dk1s[i] = (v * (1 - v) * (v - a) - k1s[i] * dW) * wInv[i];
            k2dW[i] = k2s[i] * dW;
        }
        for (int i = 0; i < n; i++) {
            double dk1 = dk1s[i];
            double dk2 = (kgu2[i] * tau * dk1 + g2s[i] - 2 * dk1 - k2dW[i]) * wInv[i];
            sK[i] = rus[i] * sK[i] + tau * (1.5 * dk1 + 0.5 * dk2);
        }
        // direction a: dW = -gt k g_ua(v)
        for (int i = 0; i < n; i++) {
            double v = u[i];
            double dW = -gtk * (2 * v - 1);
            dk1s[i] = (k * (v * v - v) - k1s[i] * dW) * wInv[i];
            k2dW[i] = k2s[i] * dW;
        }
        for (int i = 0; i < n; i++) {
            double dk1 = dk1s[i];
            double dk2 = (kgu2[i] * tau * dk1 + kga2[i] - 2 * dk1 - k2dW[i]) * wInv[i];
            sA[i] = rus[i] * sA[i] + tau * (1.5 * dk1 + 0.5 * dk2);
        }
        for (int i = 0; i < n; i++) {
            u[i] += tau * (1.5 * k1s[i] + 0.5 * k2s[i]);
        }
    }

    /**
     * For each trial front width w and threshold a: D and k from the measured speed c = sqrt(k D / 2)(1 - 2a) and
     * the width w = sqrt(2 D / k), i.e. D = c w / (1 - 2a), k = 2 D / w^2.
     */
    @Override
    public StartPoints startPoints(DataGuesses g) {
        double c = g.frontSpeedUmPerS();
        List<double[]> points = new ArrayList<>();
        double narrowest = Double.POSITIVE_INFINITY;
        for (double w : g.trialFrontWidthsUm()) {
            for (double a : START_THRESHOLDS) {
                double d = c * w / (1 - 2 * a);
                points.add(new double[] {d, 2 * d / (w * w), a});
                narrowest = Math.min(narrowest, w);
            }
        }
        return new StartPoints(points, narrowest);
    }

    @Override
    public String fitAdvice() {
        return "A steadily travelling bistable front shows only its speed and its width, so D, k and a of the "
                + "nagumo fit are not separately determined by these data: report front_speed and front_width "
                + "(with their intervals) instead of D, k and a. The three separate only when the movie shows the "
                + "front forming at a stimulus of known width.";
    }
}
