package org.dendrokin.synth;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.apache.commons.math3.stat.regression.SimpleRegression;
import org.junit.jupiter.api.Test;

/** The method-of-lines integration of the bistable equation against McKean's exact front. */
class NagumoLineTest {
    private static double mcKean(double x, double t, double d, double k, double a) {
        double c = Math.sqrt(2 * d * k) * (0.5 - a);
        double w = Math.sqrt(2 * d / k);
        return 1 / (1 + Math.exp((x - c * t) / w));
    }

    @Test
    void exactFrontStaysExact() {
        double d = 1;
        double k = 1;
        double a = 0.25;
        double w = Math.sqrt(2 * d / k);
        double h = 0.0707 * w;
        double lo = -30;
        int n = (int) Math.round(70 / h) + 1;
        double[] u0 = new double[n];
        for (int i = 0; i < n; i++) {
            u0[i] = mcKean(lo + i * h, 0, d, k, a);
        }
        NagumoLine.Solution s = new NagumoLine(d, k, a, h, n).solve(lo, u0, 0, new double[] {10, 40});
        double[] u = s.state(2);
        double c = Math.sqrt(2 * d * k) * (0.5 - a);
        double position = crossing(s, u, true);
        // REF: McKean 1970 Adv Math 4:209 exact front [published formula]; at h / w = 0.0707 the 3-point method of
        // lines is 1.04e-4 slow (sheet s5.4), 1.5e-3 um behind after 40 s
        assertEquals(c * 40, position, 5e-4 * c * 40, "front position at t = 40 (um)");
        double worst = 0;
        for (int i = 0; i < n; i++) {
            worst = Math.max(worst, Math.abs(u[i] - mcKean(lo + i * h - position + c * 40, 40, d, k, a)));
        }
        // REF: the profile's shape, placed at the computed front, within 1e-4 [published formula; sheet s5.4]
        assertEquals(0, worst, 1e-4, "largest error of the profile's shape at t = 40");
    }

    @Test
    void kickStartsTwoFrontsAtMcKeansSpeed() {
        SessionSpec.NagumoKick kick = new SessionSpec.NagumoKick(0.5, 1, 0.2, 1, 0, 0.5, 1.5, 14.3);
        double[] times = new double[81];
        for (int j = 0; j < times.length; j++) {
            times[j] = j;
        }
        SignalField.Kick field = new SignalField.Kick(kick, 0, -5, 5, times);
        NagumoLine.Solution s = field.solution();
        SimpleRegression left = new SimpleRegression();
        SimpleRegression right = new SimpleRegression();
        for (int j = 1; j < s.timeCount(); j++) {
            double t = s.time(j);
            if (t < 30) {
                continue;
            }
            double[] u = s.state(j);
            right.addData(t, crossing(s, u, true));
            left.addData(t, crossing(s, u, false));
        }
        double c = Math.sqrt(2 * 0.5 * 1) * (0.5 - 0.2);
        // REF: McKean 1970 front speed c = sqrt(2 D k)(1/2 - a) [published formula]; sheet s5.2; at h / w = 0.07 the
        // grid slows a front by about 1e-4 relative (sheet s5.4)
        assertEquals(c, right.getSlope(), 5e-4 * c, "right front speed (um/s)");
        assertEquals(-c, left.getSlope(), 5e-4 * c, "left front speed (um/s)");
        assertTrue(right.getRSquare() > 0.999999, "the right front moves at a constant speed");
    }

    /** Where u crosses 1/2 on the right (or left) flank, by linear interpolation between nodes. */
    private static double crossing(NagumoLine.Solution s, double[] u, boolean rightFlank) {
        if (rightFlank) {
            for (int i = u.length - 2; i >= 0; i--) {
                if (u[i] >= 0.5 && u[i + 1] < 0.5) {
                    return s.nodePosition(i) + (u[i] - 0.5) / (u[i] - u[i + 1]) * (s.nodePosition(i + 1)
                            - s.nodePosition(i));
                }
            }
        } else {
            for (int i = 1; i < u.length; i++) {
                if (u[i] >= 0.5 && u[i - 1] < 0.5) {
                    return s.nodePosition(i - 1) + (0.5 - u[i - 1]) / (u[i] - u[i - 1]) * (s.nodePosition(i)
                            - s.nodePosition(i - 1));
                }
            }
        }
        throw new AssertionError("no front");
    }
}
