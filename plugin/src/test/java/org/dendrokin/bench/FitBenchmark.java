package org.dendrokin.bench;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Locale;
import java.util.Random;

import org.dendrokin.core.Progress;
import org.dendrokin.core.fit.DiffusionDecayPulse;
import org.dendrokin.core.fit.EngineFitModel;
import org.dendrokin.core.fit.FitData;
import org.dendrokin.core.fit.FitResult;
import org.dendrokin.core.fit.ModelFit;
import org.dendrokin.core.fit.ParameterEstimate;
import org.dendrokin.core.kymo.Kymograph;
import org.dendrokin.core.model.Boundary;
import org.dendrokin.core.model.Domain;
import org.dendrokin.core.model.ScalarRun;
import org.dendrokin.core.model.SolverSettings;
import org.dendrokin.core.model.Stimulus;
import org.dendrokin.core.units.Unit;
import org.dendrokin.io.AtomicFiles;
import org.dendrokin.io.KymographCsv;

/**
 * Fitting benchmark (not a test): makes seeded synthetic kymographs at three sizes, writes them (with the truth,
 * the common starting point and the model settings) to a folder for the SciPy script bench/fit_scipy.py, and
 * times the Java fits after a warm-up. Diffusion-decay: D, k, amplitude, position, width, baseline free (closed
 * form, analytic Jacobian, one-pass normal equations). Nagumo: D, k, a, amplitude, baseline free (engine on a grid
 * of h = 0.5 um at a fixed time step, forward-difference Jacobian, one-pass normal equations, fitted over a
 * growing window of frames: {@link EngineFitModel#fitInStages}). Both with Student t intervals from the Jacobian;
 * profile-likelihood intervals, and the fit with its robust-interval assessment (the default), are timed
 * separately. Each case is warmed up by repeated fits for 2 s (at least one
 * fit) before the best of the timed repeats is taken; the first, cold fit of each case is printed too.
 *
 * <p>Usage: {@code java -cp "$(bench/test-classpath.sh)" org.dendrokin.bench.FitBenchmark OUT_DIR [repeats] [cases]},
 * cases {@code all} (the default), {@code diffusion-decay} or {@code nagumo}; or {@code bench/fit-benchmark.sh}, which
 * runs the SciPy side too. A main beside the tests: it is not shipped.
 */
public final class FitBenchmark {
    static final int[][] SIZES = {{60, 150}, {200, 400}, {400, 1500}};
    static final double DX_UM = 0.5;
    static final double TOLERANCE = 1e-8;
    static final long WARM_UP_NS = 2_000_000_000L;

    private FitBenchmark() {
    }

    public static void main(String[] args) throws IOException {
        Path out = Path.of(args.length > 0 ? args[0] : "bench/out");
        int repeats = args.length > 1 ? Integer.parseInt(args[1]) : 3;
        String cases = args.length > 2 ? args[2] : "all";
        if (!List.of("all", "diffusion-decay", "nagumo").contains(cases)) {
            System.err.println("cases must be all, diffusion-decay or nagumo, not " + cases);
            System.exit(2);
        }
        Files.createDirectories(out);
        System.out.println("case,positions,frames,java_fit_s,java_profile_s,evaluations,rel_err_D,rel_err_k,"
                + "rel_err_third,ci_D_lo,ci_D_hi,java_first_fit_s,java_robust_s");
        if (!cases.equals("nagumo")) {
            for (int[] size : SIZES) {
                diffusionDecay(out, size[0], size[1], repeats);
            }
        }
        if (!cases.equals("diffusion-decay")) {
            for (int[] size : SIZES) {
                nagumo(out, size[0], size[1], repeats);
            }
        }
    }

    private static void diffusionDecay(Path out, int nx, int nt, int repeats) {
        double d = 0.5;
        double k = 0.01;
        double amp = 2;
        double x0 = nx * DX_UM / 2;
        double s0 = 1.0;
        double base = 0.1;
        double t0 = 2;
        double dt = 0.25;
        double sigma = 0.05;
        double[] x = grid(DX_UM, nx);
        double[] t = grid(dt, nt);
        DiffusionDecayPulse truthModel = new DiffusionDecayPulse(x, t, t0, x0, null, Unit.DF_F0);
        double[] v = new double[truthModel.size()];
        truthModel.evaluate(truthModel.pack(d, k, amp, x0, s0, base, t0), v, null);
        noise(v, sigma, 1000 + nx);
        Kymograph kymo = new Kymograph(x, t, v, "dF/F0");
        String name = "diffusion-decay-" + nx + "x" + nt;
        double[] start = {d * 1.5, k * 0.6, amp * 0.8, x0 + 0.4, s0 * 1.3, base + 0.02};
        write(out, name, kymo, String.format(Locale.ROOT, "{\"model\": \"diffusion-decay\", \"truth\": [%s], "
                + "\"start\": [%s], \"stimulus_time_s\": %s, \"sigma\": %s, \"tolerance\": %s}", join(d, k, amp, x0, s0,
                base), join(start), t0, sigma, TOLERANCE));
        DiffusionDecayPulse model = new DiffusionDecayPulse(x, t, t0, Double.NaN, null, Unit.DF_F0);
        double[] sig = new double[nx];
        Arrays.fill(sig, sigma);
        FitData data = FitData.of(kymo, sig);
        time(name, nx, nt, (starts, options) -> ModelFit.fit(model, data, starts, options, Progress.NONE), start,
                repeats, new double[] {d, k, amp});
    }

    private static void nagumo(Path out, int nx, int nt, int repeats) {
        double d = 1.0;
        double k = 0.5;
        double a = 0.2;
        double amp = 1.5;
        double base = 0.2;
        double t0 = 2;
        double xs = 5;
        double width = 2;
        double dt = 0.5;
        double sigma = 0.05;
        double[] x = grid(DX_UM, nx);
        double[] t = grid(dt, nt);
        double length = x[nx - 1];
        ScalarRun truth = ScalarRun.prepare("nagumo", new Domain(length, DX_UM / 4, Boundary.NO_FLUX), t, x,
                List.of(Stimulus.pulse(t0, xs, width, 1.0)), SolverSettings.DEFAULT.withStepFactor(0.1));
        double[] u = new double[nx * nt];
        truth.solve(new double[] {d, k, a}, u);
        for (int i = 0; i < u.length; i++) {
            u[i] = base + amp * u[i];
        }
        noise(u, sigma, 2000 + nx);
        Kymograph kymo = new Kymograph(x, t, u, "dF/F0");
        String name = "nagumo-" + nx + "x" + nt;
        double[] start = {d * 1.4, k * 0.7, 0.3, amp * 0.9, base + 0.05};
        // the engine's own step rule at the starting values, at most half a frame (0.25 s here); at a fixed step
        // the objective is smooth. Halving it moved D, k and a by about 0.1%, far inside their intervals.
        double step = SolverSettings.DEFAULT.maxStep(start[1], DX_UM, start[0], width);
        step = Math.min(step, dt / 2);
        write(out, name, kymo, String.format(Locale.ROOT, "{\"model\": \"nagumo\", \"truth\": [%s], \"start\": [%s], "
                + "\"stimulus\": {\"time_s\": %s, \"position_um\": %s, \"width_um\": %s, \"amount\": 1}, "
                + "\"dx_um\": %s, \"sigma\": %s, \"tolerance\": %s}", join(d, k, a, amp, base), join(start), t0, xs,
                width, DX_UM, sigma, TOLERANCE));
        EngineFitModel model = new EngineFitModel("nagumo", new Domain(length, DX_UM, Boundary.NO_FLUX), t, x,
                List.of(Stimulus.pulse(t0, xs, width, 1.0)), step, Unit.DF_F0);
        double[] sig = new double[nx];
        Arrays.fill(sig, sigma);
        FitData data = FitData.of(kymo, sig);
        time(name, nx, nt, (starts, options) -> model.fitInStages(data, starts, options, Progress.NONE), start,
                repeats, new double[] {d, k, a});
    }

    /** One way of fitting a case from given starts. */
    private interface Fitter {
        FitResult fit(List<double[]> starts, ModelFit.Options options);
    }

    private static void time(String name, int nx, int nt, Fitter fitter, double[] start, int repeats,
                             double[] truth) {
        // the fit itself with its Wald-t intervals; the robust intervals and the profiles are timed separately
        ModelFit.Options plain = ModelFit.Options.defaults().withProfiles(false).withRobust(false)
                .withTolerance(TOLERANCE);
        // Warm-up, so that the timed fits run compiled code: repeated fits for 2 s (at least one fit).
        long warmStart = System.nanoTime();
        FitResult r = fitter.fit(List.of(start), plain);
        double cold = (System.nanoTime() - warmStart) / 1e9;
        while (System.nanoTime() - warmStart < WARM_UP_NS) {
            r = fitter.fit(List.of(start), plain);
        }
        double best = Double.POSITIVE_INFINITY;
        for (int i = 0; i < repeats; i++) {
            long t = System.nanoTime();
            r = fitter.fit(List.of(start), plain);
            best = Math.min(best, (System.nanoTime() - t) / 1e9);
        }
        double robust = Double.POSITIVE_INFINITY;
        for (int i = 0; i < repeats; i++) {
            long t = System.nanoTime();
            fitter.fit(List.of(start), plain.withRobust(true));
            robust = Math.min(robust, (System.nanoTime() - t) / 1e9);
        }
        long tp = System.nanoTime();
        FitResult withProfiles = fitter.fit(List.of(start), plain.withProfiles(true));
        double profile = (System.nanoTime() - tp) / 1e9;
        List<ParameterEstimate> p = r.parameters();
        ParameterEstimate pd = withProfiles.parameters().get(0);
        System.out.println(String.format(Locale.ROOT, "%s,%d,%d,%.4f,%.4f,%d,%.4f,%.4f,%.4f,%.5g,%.5g,%.4f,%.4f", name,
                nx, nt, best, profile, r.evaluations(), rel(p.get(0).value(), truth[0]), rel(p.get(1).value(), truth[1]),
                rel(p.get(2).value(), truth[2]), pd.ci95().lower(), pd.ci95().upper(), cold, robust));
    }

    private static double rel(double v, double truth) {
        return (v - truth) / truth;
    }

    private static void write(Path out, String name, Kymograph k, String json) {
        KymographCsv.write(k, out.resolve(name + ".csv"));
        AtomicFiles.writeString(out.resolve(name + ".json"), json + "\n");
    }

    private static String join(double... v) {
        List<String> s = new ArrayList<>();
        for (double x : v) {
            s.add(String.format(Locale.ROOT, "%.17g", x));
        }
        return String.join(", ", s);
    }

    private static double[] grid(double step, int n) {
        double[] g = new double[n];
        for (int i = 0; i < n; i++) {
            g[i] = i * step;
        }
        return g;
    }

    private static void noise(double[] v, double sigma, long seed) {
        Random r = new Random(seed);
        for (int i = 0; i < v.length; i++) {
            v[i] += sigma * r.nextGaussian();
        }
    }
}
