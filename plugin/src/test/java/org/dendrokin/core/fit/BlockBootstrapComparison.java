package org.dendrokin.core.fit;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Locale;
import java.util.Random;
import java.util.stream.IntStream;

import org.dendrokin.core.Progress;
import org.dendrokin.core.kymo.Kymograph;
import org.dendrokin.core.units.Unit;

/**
 * The evidence behind the robust interval's method (not a test; docs/decisions.md, docs/benchmarks.md): on the
 * seeded kymographs of {@link RobustIntervalSlowTest}, coverage, width and time of the default interval (sandwich)
 * against a moving-block bootstrap of the fit's standardized residuals (2D blocks of ceil(1.3 sqrt(size)) positions
 * by frames, tiled over the grid from uniformly drawn block origins, refits from the estimate, 2.5th and 97.5th
 * percentiles).
 *
 * <p>Usage (after {@code mvn -B -q test-compile}): {@code java -cp plugin/target/test-classes:plugin/target/classes:CP
 * org.dendrokin.core.fit.BlockBootstrapComparison [replicates] [bootstrap refits]}, CP the test class path.
 */
public final class BlockBootstrapComparison {
    private BlockBootstrapComparison() {
    }

    public static void main(String[] args) {
        int replicates = args.length > 0 ? Integer.parseInt(args[0]) : 40;
        int refits = args.length > 1 ? Integer.parseInt(args[1]) : 200;
        System.out.println("scenario | fits | sandwich covers D, k | width D / Wald-t | s per fit | "
                + "block bootstrap covers D, k | width D / Wald-t | s per bootstrap");
        for (String scenario : List.of("white", "correlated noise", "noise growing with signal", "top-hat release",
                "two-rate decay", "drifting baseline")) {
            int n = 0;
            int[] cover = new int[4];
            List<Double> widthSandwich = new ArrayList<>();
            List<Double> widthBootstrap = new ArrayList<>();
            double fitSeconds = 0;
            double bootSeconds = 0;
            for (int r = 0; r < replicates; r++) {
                Kymograph k = RobustIntervalSlowTest.make(scenario, r);
                long a = System.nanoTime();
                KymographFits.Outcome o = KymographFits.fit(k, KymographFits.Setup.of(RobustIntervalSlowTest.T0,
                        RobustIntervalSlowTest.X0).withModels(List.of(DiffusionDecayPulse.NAME))
                        .withOptions(ModelFit.Options.defaults().withProfiles(false)), Progress.NONE);
                long b = System.nanoTime();
                FitResult f = o.fits().get(0);
                if (!f.converged()) {
                    continue;
                }
                Interval[] boot = blockBootstrap(k, o, refits, 31L * r);
                long c = System.nanoTime();
                fitSeconds += (b - a) / 1e9;
                bootSeconds += (c - b) / 1e9;
                n++;
                ParameterEstimate d = f.estimate("D").orElseThrow();
                ParameterEstimate kk = f.estimate("k").orElseThrow();
                cover[0] += d.ci95().contains(RobustIntervalSlowTest.D) ? 1 : 0;
                cover[1] += kk.ci95().contains(RobustIntervalSlowTest.K) ? 1 : 0;
                cover[2] += boot[0].contains(RobustIntervalSlowTest.D) ? 1 : 0;
                cover[3] += boot[1].contains(RobustIntervalSlowTest.K) ? 1 : 0;
                double wald = RobustIntervalSlowTest.logWidth(RobustIntervalSlowTest.wald(d));
                widthSandwich.add(RobustIntervalSlowTest.logWidth(d.ci95()) / wald);
                widthBootstrap.add(RobustIntervalSlowTest.logWidth(boot[0]) / wald);
            }
            System.out.println(String.format(Locale.ROOT, "%s | %d | %.2f, %.2f | %.2f | %.3f | %.2f, %.2f | %.2f | %.2f",
                    scenario, n, cover[0] / (double) n, cover[1] / (double) n,
                    RobustIntervalSlowTest.median(widthSandwich), fitSeconds / n, cover[2] / (double) n,
                    cover[3] / (double) n, RobustIntervalSlowTest.median(widthBootstrap), bootSeconds / n));
        }
    }

    /** Percentile intervals of D and k from refits to the fit plus block-resampled standardized residuals. */
    static Interval[] blockBootstrap(Kymograph k, KymographFits.Outcome o, int refits, long seed) {
        FitResult f = o.fits().get(0);
        FitData data = o.noiseModel().fitData(k);
        DiffusionDecayPulse model = new DiffusionDecayPulse(k.distancesUm(), k.timesS(), RobustIntervalSlowTest.T0,
                RobustIntervalSlowTest.X0, null, Unit.DF_F0);
        double[] fitted = f.fitted();
        int nx = k.positionCount();
        int nt = k.frameCount();
        double[] e = new double[nx * nt];
        for (int i = 0; i < e.length; i++) {
            e[i] = (data.value(i) - fitted[i]) / data.sigma(i);
        }
        int bx = (int) Math.ceil(1.3 * Math.sqrt(nx));
        int bt = (int) Math.ceil(1.3 * Math.sqrt(nt));
        ModelFit.Options options = ModelFit.Options.defaults().withProfiles(false).withRobust(false);
        double[][] estimates = new double[refits][];
        IntStream.range(0, refits).parallel().forEach(r -> {
            Random random = new Random(seed + 7919L * r);
            double[] y = new double[nx * nt];
            for (int t0 = 0; t0 < nt; t0 += bt) {
                for (int x0 = 0; x0 < nx; x0 += bx) {
                    int sx = random.nextInt(nx - bx + 1);
                    int st = random.nextInt(nt - bt + 1);
                    for (int dt = 0; dt < bt && t0 + dt < nt; dt++) {
                        for (int dx = 0; dx < bx && x0 + dx < nx; dx++) {
                            int i = (t0 + dt) * nx + x0 + dx;
                            y[i] = fitted[i] + data.sigma(i) * e[(st + dt) * nx + sx + dx];
                        }
                    }
                }
            }
            FitResult g = ModelFit.fit(model, data.withValues(y), List.of(f.values()), options, Progress.NONE);
            if (g.converged()) {
                estimates[r] = g.values();
            }
        });
        List<double[]> ok = Arrays.stream(estimates).filter(v -> v != null).toList();
        Interval[] out = new Interval[2];
        for (int j = 0; j < 2; j++) {
            final int c = j;
            double[] v = ok.stream().mapToDouble(x -> x[c]).sorted().toArray();
            out[j] = new Interval(ParametricBootstrap.quantile(v, 0.025), ParametricBootstrap.quantile(v, 0.975),
                    "moving-block-bootstrap");
        }
        return out;
    }
}
