package org.dendrokin.bench;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.Random;

import org.dendrokin.core.Progress;
import org.dendrokin.core.fit.DiffusionDecayPulse;
import org.dendrokin.core.fit.FitData;
import org.dendrokin.core.fit.FitResult;
import org.dendrokin.core.fit.GlobalFit;
import org.dendrokin.core.fit.ModelFit;
import org.dendrokin.core.fit.NoiseEstimate;
import org.dendrokin.core.fit.ParameterEstimate;
import org.dendrokin.core.kymo.Kymograph;
import org.dendrokin.core.units.Unit;
import org.dendrokin.io.AtomicFiles;
import org.dendrokin.io.KymographCsv;

/**
 * Global-fit benchmark (not a test): N seeded diffusion-decay sessions (closed form plus noise, a shared D and k,
 * each session its own amplitude, width, baseline and noise level), fitted (a) one by one by the per-session fitter
 * ({@link ModelFit} on {@link DiffusionDecayPulse}, stimulus held, the tolerance and start rule of the session
 * analysis) and (b) jointly by {@link GlobalFit}, from the same starting values, side by side in one run after a
 * warm-up. Writes the data (kymograph CSVs, the noise SD per position and the starts) for bench/global/global_scipy.py.
 *
 * <p>Usage: {@code java -cp "$(bench/test-classpath.sh)" org.dendrokin.bench.GlobalFitBenchmark OUT_DIR [sessions]
 * [positions] [frames] [repeats]} (defaults 100, 200, 400, 3); or {@code bench/global/run-global-benchmark.sh}.
 */
public final class GlobalFitBenchmark {
    static final double D = 0.5;
    static final double K = 0.01;
    static final double DX_UM = 0.5;
    static final double DT_S = 0.25;
    static final double T0_S = 1.875;

    private GlobalFitBenchmark() {
    }

    /** One session with its noise and start. */
    record Case(String id, Kymograph kymograph, double[] sigma, double[] start) {
    }

    public static void main(String[] args) throws IOException {
        Path out = Path.of(args.length > 0 ? args[0] : "bench/out/global");
        int n = args.length > 1 ? Integer.parseInt(args[1]) : 100;
        int nx = args.length > 2 ? Integer.parseInt(args[2]) : 200;
        int nt = args.length > 3 ? Integer.parseInt(args[3]) : 400;
        int repeats = args.length > 4 ? Integer.parseInt(args[4]) : 3;
        Files.createDirectories(out);
        List<Case> cases = make(n, nx, nt, 20261203L);
        write(out, cases, nx, nt);
        ModelFit.Options perSession = ModelFit.Options.defaults().withProfiles(false);
        GlobalFit.Options joint = GlobalFit.Options.defaults().withProfiles(false).withBootstrap(0, 1);
        List<GlobalFit.Session> all = sessions(cases);
        // warm-up: every path, at least 2 s and 5 rounds (on a loaded machine 2 s may be one round, before the JIT
        // has compiled the inner loops)
        long warm = System.nanoTime();
        for (int round = 0; round < 5 || System.nanoTime() - warm < 2_000_000_000L; round++) {
            separate(cases.subList(0, Math.min(10, n)), perSession);
            GlobalFit.fitGroup("all", all.subList(0, Math.min(10, n)), joint, Progress.NONE);
            alone(all.subList(0, Math.min(5, n)), joint);
        }
        double[] best = {Double.POSITIVE_INFINITY, Double.POSITIVE_INFINITY, Double.POSITIVE_INFINITY};
        double[] cpu = {Double.POSITIVE_INFINITY, Double.POSITIVE_INFINITY, Double.POSITIVE_INFINITY};
        List<FitResult> fits = null;
        GlobalFit.GroupResult g = null;
        long alonePasses = 0;
        for (int r = 0; r < repeats; r++) {
            long[] t = start();
            fits = separate(cases, perSession);
            record(t, best, cpu, 0);
            t = start();
            g = GlobalFit.fitGroup("all", all, joint, Progress.NONE);
            record(t, best, cpu, 1);
            t = start();
            alonePasses = alone(all, joint);
            record(t, best, cpu, 2);
        }
        long evaluations = fits.stream().mapToLong(FitResult::evaluations).sum();
        double meanD = fits.stream().filter(FitResult::converged).mapToDouble(f -> f.values()[0]).average().orElse(
                Double.NaN);
        double meanK = fits.stream().filter(FitResult::converged).mapToDouble(f -> f.values()[1]).average().orElse(
                Double.NaN);
        ParameterEstimate jd = g.estimate("D").orElseThrow();
        ParameterEstimate jk = g.estimate("k").orElseThrow();
        List<String> table = List.of("what,sessions,positions,frames,wall_s,cpu_s,evaluations,ratio_wall,ratio_cpu,D,k",
                String.format(Locale.ROOT, "separate per-session fits,%d,%d,%d,%.4f,%.4f,%d,1,1,%.8f,%.8f", n, nx, nt,
                        best[0], cpu[0], evaluations, meanD, meanK),
                String.format(Locale.ROOT, "global fit,%d,%d,%d,%.4f,%.4f,%d,%.3f,%.3f,%.8f,%.8f", n, nx, nt, best[1],
                        cpu[1], g.passes(), best[1] / best[0], cpu[1] / cpu[0], jd.value(), jk.value()),
                String.format(Locale.ROOT, "global fitter on each session alone,%d,%d,%d,%.4f,%.4f,%d,%.3f,%.3f,,",
                        n, nx, nt, best[2], cpu[2], alonePasses, best[2] / best[0], cpu[2] / cpu[0]));
        table.forEach(System.out::println);
        // the Java figures beside the data, for the SciPy script to print its own next to them
        AtomicFiles.writeString(out.resolve("java.csv"), String.join("\n", table) + "\n");
        System.out.println(String.format(Locale.ROOT, "joint D %.6f (Wald-t [%.6f, %.6f]), k %.6f; mean of separate "
                + "fits D %.6f, k %.6f; truth D %s, k %s", jd.value(), jd.ci95().lower(), jd.ci95().upper(), jk.value(),
                meanD, meanK, D, K));
        long[] t = start();
        GlobalFit.GroupResult full = GlobalFit.fitGroup("all", all, GlobalFit.Options.defaults(), Progress.NONE);
        double[] w = {Double.POSITIVE_INFINITY};
        double[] c = {Double.POSITIVE_INFINITY};
        record(t, w, c, 0);
        ParameterEstimate fd = full.estimate("D").orElseThrow();
        System.out.println(String.format(Locale.ROOT, "global fit with profile intervals and 200 resamples: wall %.3f s,"
                + " cpu %.3f s, %d passes; D %.6f %s %s", w[0], c[0], full.passes(), fd.value(), fd.ci95(),
                fd.otherIntervals()));
        t = start();
        separate(cases, ModelFit.Options.defaults());
        w[0] = Double.POSITIVE_INFINITY;
        c[0] = Double.POSITIVE_INFINITY;
        record(t, w, c, 0);
        System.out.println(String.format(Locale.ROOT, "separate fits with profile intervals: wall %.3f s, cpu %.3f s",
                w[0], c[0]));
    }

    private static final com.sun.management.OperatingSystemMXBean OS =
            (com.sun.management.OperatingSystemMXBean) java.lang.management.ManagementFactory.getOperatingSystemMXBean();

    private static long[] start() {
        return new long[] {System.nanoTime(), OS.getProcessCpuTime()};
    }

    private static void record(long[] t, double[] bestWall, double[] bestCpu, int i) {
        bestWall[i] = Math.min(bestWall[i], (System.nanoTime() - t[0]) / 1e9);
        bestCpu[i] = Math.min(bestCpu[i], (OS.getProcessCpuTime() - t[1]) / 1e9);
    }

    /** The global fitter on each session as a group of its own; the passes it made. */
    static long alone(List<GlobalFit.Session> sessions, GlobalFit.Options options) {
        long passes = 0;
        for (GlobalFit.Session s : sessions) {
            passes += GlobalFit.fitGroup(s.id(), List.of(s), options, Progress.NONE).passes();
        }
        return passes;
    }

    static List<FitResult> separate(List<Case> cases, ModelFit.Options options) {
        List<FitResult> fits = new ArrayList<>();
        for (Case c : cases) {
            Kymograph k = c.kymograph();
            DiffusionDecayPulse model = new DiffusionDecayPulse(k.distancesUm(), k.timesS(), T0_S, k.distanceUm(0)
                    + (k.positionCount() - 1) * DX_UM / 2, null, Unit.DF_F0);
            fits.add(ModelFit.fit(model, FitData.of(k, c.sigma()), List.of(c.start()), options, Progress.NONE));
        }
        return fits;
    }

    static List<GlobalFit.Session> sessions(List<Case> cases) {
        List<GlobalFit.Session> s = new ArrayList<>();
        for (Case c : cases) {
            Kymograph k = c.kymograph();
            double[] v = c.start();
            Map<String, Double> start = new LinkedHashMap<>();
            start.put("D", v[0]);
            start.put("k", v[1]);
            start.put("amplitude", v[2]);
            start.put("width", v[3]);
            start.put("baseline", v[4]);
            s.add(new GlobalFit.Session(c.id(), k, T0_S, (k.positionCount() - 1) * DX_UM / 2, null, false, false,
                    start));
        }
        return s;
    }

    static List<Case> make(int n, int nx, int nt, long seed) {
        Random r = new Random(seed);
        double[] x = new double[nx];
        double[] t = new double[nt];
        for (int i = 0; i < nx; i++) {
            x[i] = i * DX_UM;
        }
        for (int i = 0; i < nt; i++) {
            t[i] = i * DT_S;
        }
        double x0 = (nx - 1) * DX_UM / 2;
        DiffusionDecayPulse truth = new DiffusionDecayPulse(x, t, T0_S, x0, null, Unit.DF_F0);
        List<Case> cases = new ArrayList<>();
        for (int i = 0; i < n; i++) {
            double noise = 0.05 * Math.exp(0.4 * r.nextGaussian());
            double amplitude = noise * 5 * Math.exp(r.nextDouble() * Math.log(8));    // SNR 5 to 40
            double width = 1 + 0.4 * r.nextDouble();
            double baseline = 0.1 * r.nextGaussian();
            double[] v = new double[truth.size()];
            truth.evaluate(truth.pack(D, K, amplitude, x0, width, baseline, T0_S), v, null);
            for (int j = 0; j < v.length; j++) {
                v[j] += noise * r.nextGaussian();
            }
            Kymograph k = new Kymograph(x, t, v, "dF/F0");
            double[] sigma = NoiseEstimate.perPosition(k, 0, k.firstFrameAtOrAfter(T0_S) - 1, new ArrayList<>());
            // the start rule of the fitting benchmark (docs/benchmarks.md, "Fitting"): D and k 50% and 40% off
            double[] start = {D * 1.5, K * 0.6, amplitude * 0.8, width * 1.3, baseline + 0.02};
            cases.add(new Case(String.format(Locale.ROOT, "s%03d", i), k, sigma, start));
        }
        return cases;
    }

    /** The data for the SciPy script: one CSV per session and one JSON with noise, starts and settings. */
    static void write(Path out, List<Case> cases, int nx, int nt) {
        StringBuilder json = new StringBuilder("{\"model\": \"diffusion-decay\", \"stimulus_time_s\": ")
                .append(T0_S).append(", \"stimulus_position_um\": ").append((nx - 1) * DX_UM / 2)
                .append(String.format(Locale.ROOT, ", \"truth\": {\"D\": %s, \"k\": %s}", D, K))
                .append(", \"sessions\": [\n");
        for (int i = 0; i < cases.size(); i++) {
            Case c = cases.get(i);
            KymographCsv.write(c.kymograph(), out.resolve(c.id() + ".csv"));
            json.append("  {\"id\": \"").append(c.id()).append("\", \"sigma\": ").append(array(c.sigma()))
                    .append(", \"start\": ").append(array(c.start())).append("}")
                    .append(i + 1 < cases.size() ? ",\n" : "\n");
        }
        json.append("]}\n");
        AtomicFiles.writeString(out.resolve("study.json"), json.toString());
    }

    private static String array(double[] v) {
        List<String> s = new ArrayList<>();
        for (double x : v) {
            s.add(String.format(Locale.ROOT, "%.17g", x));
        }
        return "[" + String.join(", ", s) + "]";
    }
}
