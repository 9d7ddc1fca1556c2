package org.dendrokin.core.fit;

import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.Random;
import java.util.function.IntFunction;

import org.apache.commons.math3.special.Erf;
import org.dendrokin.core.Progress;
import org.dendrokin.core.kymo.Kymograph;
import org.dendrokin.core.units.Unit;
import org.junit.jupiter.api.Tag;
import org.junit.jupiter.api.Test;

/**
 * The default interval of diffusion-decay fits over seeded replicates: as wide as Wald-t on data the model
 * describes, wider on data it describes only nearly (correlated noise, noise growing with the signal, a release that
 * is not Gaussian, a decay that is not one exponential, a drifting baseline). The coverages are printed.
 */
@Tag("slow")
class RobustIntervalSlowTest {
    static final int NX = 80;
    static final int NT = 200;
    static final double DX = 0.5;
    static final double DT = 0.25;
    static final double D = 0.5;
    static final double K = 0.05;
    static final double AMP = 2;
    static final double X0 = 20;
    static final double BASE = 0.1;
    static final double T0 = 5;

    static double[] pulse() {
        DiffusionDecayPulse m = new DiffusionDecayPulse(Synthetic.grid(DX, NX), Synthetic.grid(DT, NT), T0, X0, null,
                Unit.DF_F0);
        double[] v = new double[m.size()];
        m.evaluate(m.pack(D, K, AMP, X0, 1.0, BASE, T0), v, null);
        return v;
    }

    static Kymograph kymograph(double[] v) {
        return new Kymograph(Synthetic.grid(DX, NX), Synthetic.grid(DT, NT), v, "dF/F0");
    }

    static void white(double[] v, double sigma, Random random) {
        for (int i = 0; i < v.length; i++) {
            v[i] += sigma * random.nextGaussian();
        }
    }

    /** The data of one scenario and replicate. */
    static Kymograph make(String scenario, int replicate) {
        Random random = new Random(9100L * (scenario.hashCode() & 0xffff) + replicate);
        double[] v = pulse();
        switch (scenario) {
            case "white":
                white(v, 0.1, random);
                break;
            case "correlated noise":
                double[] e = SandwichTest.ar1Field(NX, NT, 0.6, 0.3, random);
                for (int i = 0; i < v.length; i++) {
                    v[i] += 0.05 * e[i];
                }
                break;
            case "noise growing with signal":
                for (int i = 0; i < v.length; i++) {
                    v[i] += Math.sqrt(1e-4 + 0.02 * (v[i] - BASE)) * random.nextGaussian();
                }
                break;
            case "top-hat release":
                // a box of half-width 1.5 um released at t0 spreads as a difference of error functions (Crank 1975)
                double[] x = Synthetic.grid(DX, NX);
                double[] t = Synthetic.grid(DT, NT);
                for (int f = 0; f < NT; f++) {
                    double tau = t[f] - T0;
                    for (int c = 0; c < NX; c++) {
                        double s = Math.sqrt(4 * D * Math.max(tau, 1e-9));
                        v[f * NX + c] = BASE + (tau <= 0 ? 0 : AMP / 2 * (Erf.erf((x[c] - X0 + 1.5) / s)
                                - Erf.erf((x[c] - X0 - 1.5) / s)) * Math.exp(-K * tau));
                    }
                }
                white(v, 0.02, random);
                break;
            case "two-rate decay":
                for (int f = 0; f < NT; f++) {
                    double tau = f * DT - T0;
                    double m = tau <= 0 ? 1 : 1 + 0.15 * (Math.exp(-tau / 3) - 1);
                    for (int c = 0; c < NX; c++) {
                        v[f * NX + c] = BASE + (v[f * NX + c] - BASE) * m;
                    }
                }
                white(v, 0.02, random);
                break;
            case "drifting baseline":
                // the baseline moves by 0.02 (one noise SD) over the movie, up or down
                double slope = (random.nextBoolean() ? 0.02 : -0.02) / (NT * DT);
                for (int f = 0; f < NT; f++) {
                    for (int c = 0; c < NX; c++) {
                        v[f * NX + c] += slope * f * DT;
                    }
                }
                white(v, 0.02, random);
                break;
            default:
                throw new IllegalArgumentException(scenario);
        }
        return kymograph(v);
    }

    /** Coverage and width ratio (default / Wald-t, on the log scale) of D and k over the replicates. */
    record Summary(String scenario, int fits, double coverD, double coverK, double waldCoverD, double waldCoverK,
                   double ratioD, double ratioK, int robustD, int robustK) {
        @Override
        public String toString() {
            return String.format(Locale.ROOT, "%-26s %3d fits | default covers D %.2f k %.2f | Wald-t covers D %.2f "
                    + "k %.2f | median width / Wald-t: D %.2f k %.2f | robust D %d k %d", scenario, fits, coverD,
                    coverK, waldCoverD, waldCoverK, ratioD, ratioK, robustD, robustK);
        }
    }

    static Summary run(String scenario, int replicates, IntFunction<Kymograph> maker) {
        int fits = 0;
        int[] cover = new int[4];
        int robustD = 0;
        int robustK = 0;
        List<Double> ratioD = new ArrayList<>();
        List<Double> ratioK = new ArrayList<>();
        for (int r = 0; r < replicates; r++) {
            FitResult f = KymographFits.fit(maker.apply(r), KymographFits.Setup.of(T0, X0)
                    .withModels(List.of(DiffusionDecayPulse.NAME)), Progress.NONE).fits().get(0);
            if (!f.converged()) {
                continue;
            }
            fits++;
            ParameterEstimate d = f.estimate("D").orElseThrow();
            ParameterEstimate k = f.estimate("k").orElseThrow();
            Interval wd = wald(d);
            Interval wk = wald(k);
            cover[0] += d.ci95().contains(D) ? 1 : 0;
            cover[1] += k.ci95().contains(K) ? 1 : 0;
            cover[2] += wd.contains(D) ? 1 : 0;
            cover[3] += wk.contains(K) ? 1 : 0;
            robustD += d.ci95().isRobust() ? 1 : 0;
            robustK += k.ci95().isRobust() ? 1 : 0;
            ratioD.add(logWidth(d.ci95()) / logWidth(wd));
            ratioK.add(logWidth(k.ci95()) / logWidth(wk));
        }
        double n = fits;
        return new Summary(scenario, fits, cover[0] / n, cover[1] / n, cover[2] / n, cover[3] / n, median(ratioD),
                median(ratioK), robustD, robustK);
    }

    static Interval wald(ParameterEstimate e) {
        if (e.ci95().method().equals(Interval.WALD_T)) {
            return e.ci95();
        }
        return e.otherIntervals().stream().filter(i -> i.method().equals(Interval.WALD_T)).findFirst().orElseThrow();
    }

    static double logWidth(Interval i) {
        return Math.log(i.upper() / i.lower());
    }

    static double median(List<Double> v) {
        double[] a = v.stream().mapToDouble(Double::doubleValue).sorted().toArray();
        return a.length % 2 == 1 ? a[a.length / 2] : (a[a.length / 2 - 1] + a[a.length / 2]) / 2;
    }

    @Test
    void onWhiteNoiseTheDefaultIntervalIsAsWideAsWaldT() {
        Summary s = run("white", 100, r -> make("white", r));
        System.out.println("ROBUST " + s);
        assertTrue(s.fits() >= 95, s.toString());
        // REF: requirement of the interval design: median width within 1.3 x Wald-t on data the model describes
        // [common practice: a robust interval should cost little when nothing is wrong]
        assertTrue(s.ratioD() <= 1.3 && s.ratioK() <= 1.3, s.toString());
        // REF: a 95% interval holds the truth in about 95% of replicates; 90% is about -2.3 binomial SD at n = 100 [common practice]; sheet s8.2
        assertTrue(s.coverD() >= 0.9 && s.coverK() >= 0.9, s.toString());
    }

    @Test
    void onMisfitDataTheDefaultIntervalWidens() {
        for (String scenario : List.of("correlated noise", "noise growing with signal", "top-hat release",
                "two-rate decay", "drifting baseline")) {
            Summary s = run(scenario, 30, r -> make(scenario, r));
            System.out.println("ROBUST " + s);
            // a drifting baseline leaves D's residuals nearly without structure (the drift is the same across the
            // pulse, which D's influence sums to nearly zero); it moves k
            boolean dWidens = !scenario.equals("drifting baseline");
            // REF: residuals correlated in space and time, or larger than the weights say, make intervals that assume
            // independent residuals too narrow (White 1980; Newey & West 1987) [published]
            assertTrue(s.ratioK() > 1.2 && (!dWidens || s.ratioD() > 1.2), "the interval widens: " + s);
            assertTrue(s.coverD() >= s.waldCoverD() && s.coverK() >= s.waldCoverK(), "coverage is not lost: " + s);
        }
    }
}
