package org.dendrokin.core.fit;

import java.util.ArrayList;
import java.util.List;

import org.dendrokin.core.Checks;
import org.dendrokin.core.units.Unit;

/**
 * Fronts of constant shape leaving a stimulus in both directions, in closed form: the signal is
 * B + A S(z_l) S(z_r), with S(z) = 1 / (1 + e^-z) the logistic function, z_l = (x - x_l(t)) / w and
 * z_r = (x_r(t) - x) / w, the fronts at x_l(t) = x0 - s_l - c_l (t - t0) and x_r(t) = x0 + s_r + c_r (t - t0).
 * For the bistable (Nagumo) reaction f = k u (1 - u)(u - a) the travelling front u = 1 / (1 + exp((x - c t) / w))
 * is exact, with w = sqrt(2 D / k) and c = sqrt(k D / 2)(1 - 2a) (McKean 1970; sheet s5.2), so once the fronts
 * have formed this model holds exactly with c and w the front's speed and width; D, k and a are not separately
 * fixed by a formed front. The offsets s_l and s_r take up how long the fronts took to form.
 *
 * <p>Parameters: the speed of each front (um/s, one shared speed or one per side), the width w (um), the two
 * offsets (um), the amplitude A and the baseline B (signal unit). A side whose front is not in view is left out:
 * its factor is 1 and it has no parameters. Grid points are {@code frame * positions + position}; the Jacobian is
 * analytic.
 */
public final class TravellingFronts implements FitModel {
    /** Name of the fit in results and messages. */
    public static final String NAME = "travelling-fronts";

    private final double[] positionsUm;
    private final double[] timesS;
    private final double[] delaysS;
    private final double x0;
    private final double t0;
    private final boolean left;
    private final boolean right;
    private final boolean sharedSpeed;
    private final List<ParameterSpec> specs;
    private final Unit unit;

    /**
     * @param positionsUm positions along the path, um. Not modified.
     * @param timesS      frame times, s. Not modified.
     * @param stimulusUm  x0, um
     * @param stimulusS   t0, s
     * @param left        a front runs towards smaller distances
     * @param right       a front runs towards larger distances
     * @param sharedSpeed one speed for both fronts (else one each)
     * @param unit        signal unit
     */
    public TravellingFronts(double[] positionsUm, double[] timesS, double stimulusUm, double stimulusS, boolean left,
                            boolean right, boolean sharedSpeed, Unit unit) {
        this(positionsUm, timesS, null, stimulusUm, stimulusS, left, right, sharedSpeed, unit);
    }

    /**
     * As above for a raster-scanned kymograph: the sample at frame f and position q was taken at
     * {@code timesS[f] + delaysS[q]}, and the fronts are evaluated exactly there.
     *
     * @param delaysS each position's delay after its frame's time, s, or null for none. Not modified.
     */
    public TravellingFronts(double[] positionsUm, double[] timesS, double[] delaysS, double stimulusUm,
                            double stimulusS, boolean left, boolean right, boolean sharedSpeed, Unit unit) {
        Checks.require(left || right, "a front on at least one side is needed");
        Checks.require(delaysS == null || delaysS.length == positionsUm.length, "one delay per position is needed");
        this.positionsUm = positionsUm.clone();
        this.timesS = timesS.clone();
        this.delaysS = delaysS == null ? new double[positionsUm.length] : delaysS.clone();
        this.x0 = stimulusUm;
        this.t0 = stimulusS;
        this.left = left;
        this.right = right;
        this.sharedSpeed = sharedSpeed && left && right;
        this.unit = unit;
        List<ParameterSpec> s = new ArrayList<>();
        if (this.sharedSpeed || !(left && right)) {
            s.add(ParameterSpec.positive("front_speed", Unit.SPEED));
        } else {
            if (left) {
                s.add(ParameterSpec.positive("front_speed_left", Unit.SPEED));
            }
            if (right) {
                s.add(ParameterSpec.positive("front_speed_right", Unit.SPEED));
            }
        }
        s.add(ParameterSpec.positive("front_width", Unit.MICROMETRE));
        if (left) {
            s.add(ParameterSpec.linear("offset_left", Unit.MICROMETRE));
        }
        if (right) {
            s.add(ParameterSpec.linear("offset_right", Unit.MICROMETRE));
        }
        s.add(ParameterSpec.linear("amplitude", unit));
        s.add(ParameterSpec.linear("baseline", unit));
        this.specs = List.copyOf(s);
    }

    @Override
    public String name() {
        return NAME;
    }

    @Override
    public List<ParameterSpec> parameters() {
        return specs;
    }

    @Override
    public int size() {
        return positionsUm.length * timesS.length;
    }

    /** True when both fronts share one speed. */
    public boolean sharedSpeed() {
        return sharedSpeed;
    }

    /**
     * Packs natural values into the parameter order.
     *
     * @param speedLeft  speed of the left front (the shared speed when shared), um/s
     * @param speedRight speed of the right front (ignored when shared), um/s
     * @param widthUm    front width w, um
     * @param offsetLeft offset of the left front, um
     * @param offsetRight offset of the right front, um
     * @param amplitude  A, signal unit
     * @param baseline   B, signal unit
     */
    public double[] pack(double speedLeft, double speedRight, double widthUm, double offsetLeft, double offsetRight,
                         double amplitude, double baseline) {
        List<Double> v = new ArrayList<>();
        if (sharedSpeed) {
            v.add(speedLeft);
        } else {
            if (left) {
                v.add(speedLeft);
            }
            if (right) {
                v.add(speedRight);
            }
        }
        v.add(widthUm);
        if (left) {
            v.add(offsetLeft);
        }
        if (right) {
            v.add(offsetRight);
        }
        v.add(amplitude);
        v.add(baseline);
        return v.stream().mapToDouble(Double::doubleValue).toArray();
    }

    @Override
    public void evaluate(double[] theta, double[] values, double[] jacobian) {
        int p = specs.size();
        int i = 0;
        double cl = 0;
        double cr = 0;
        if (sharedSpeed) {
            cl = theta[i];
            cr = theta[i++];
        } else {
            if (left) {
                cl = theta[i++];
            }
            if (right) {
                cr = theta[i++];
            }
        }
        int iWidth = i++;
        double w = theta[iWidth];
        int iSl = left ? i++ : -1;
        int iSr = right ? i++ : -1;
        double sl = left ? theta[iSl] : 0;
        double sr = right ? theta[iSr] : 0;
        int iA = i++;
        int iB = i;
        double a = theta[iA];
        double b = theta[iB];
        int iCl = sharedSpeed ? 0 : left ? 0 : -1;
        int iCr = sharedSpeed ? 0 : right ? (left ? 1 : 0) : -1;
        int nx = positionsUm.length;
        for (int f = 0; f < timesS.length; f++) {
            for (int q = 0; q < nx; q++) {
                double tau = timesS[f] + delaysS[q] - t0;
                double xl = x0 - sl - cl * tau;
                double xr = x0 + sr + cr * tau;
                double x = positionsUm[q];
                double zl = (x - xl) / w;
                double zr = (xr - x) / w;
                double gl = left ? logistic(zl) : 1;
                double gr = right ? logistic(zr) : 1;
                int g = f * nx + q;
                values[g] = b + a * gl * gr;
                if (jacobian != null) {
                    int row = g * p;
                    for (int c = 0; c < p; c++) {
                        jacobian[row + c] = 0;
                    }
                    double dl = left ? a * gr * gl * (1 - gl) / w : 0;
                    double dr = right ? a * gl * gr * (1 - gr) / w : 0;
                    if (left) {
                        jacobian[row + iCl] += dl * tau;
                        jacobian[row + iSl] = dl;
                    }
                    if (right) {
                        jacobian[row + iCr] += dr * tau;
                        jacobian[row + iSr] = dr;
                    }
                    jacobian[row + iWidth] = -dl * zl - dr * zr;
                    jacobian[row + iA] = gl * gr;
                    jacobian[row + iB] = 1;
                }
            }
        }
    }

    @Override
    public List<String> headlineParameters() {
        List<String> h = new ArrayList<>();
        for (ParameterSpec s : specs) {
            if (s.name().startsWith("front_")) {
                h.add(s.name());
            }
        }
        return h;
    }

    private static double logistic(double z) {
        return z >= 0 ? 1 / (1 + Math.exp(-z)) : Math.exp(z) / (1 + Math.exp(z));
    }

    /** Unit of the signal. */
    Unit unit() {
        return unit;
    }
}
