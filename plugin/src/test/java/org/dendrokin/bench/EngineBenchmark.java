package org.dendrokin.bench;

import java.io.IOException;
import java.nio.ByteBuffer;
import java.nio.ByteOrder;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;

import org.dendrokin.core.model.Boundary;
import org.dendrokin.core.model.Domain;
import org.dendrokin.core.model.NetworkRun;
import org.dendrokin.core.model.ReactionNetwork;
import org.dendrokin.core.model.ScalarRun;
import org.dendrokin.core.model.SolverSettings;
import org.dendrokin.core.model.Stimulus;

/**
 * Java side of the reaction-diffusion engine benchmark (run by bench/engine_bench.sh, not a test): the same
 * problems as bench/engine/engine_scipy.py, timed on one thread after warm-up, with the largest error against the
 * fine-grid references that the SciPy script wrote. Prints one line per problem.
 * <p>
 * Usage: EngineBenchmark REFERENCE_DIR
 */
public final class EngineBenchmark {
    private EngineBenchmark() {
    }

    private record Problem(String name, boolean network, double lengthUm, int nodes, double durationS,
            double intervalS) {
    }

    private static final List<Problem> PROBLEMS = List.of(
            new Problem("nagumo-60x150", false, 30, 60, 15, 0.1),
            new Problem("nagumo-200x400", false, 100, 200, 40, 0.1),
            new Problem("nagumo-400x1500", false, 200, 400, 150, 0.1),
            new Problem("network3-200x400", true, 100, 200, 40, 0.1));

    public static void main(String[] args) throws IOException {
        Path refDir = Path.of(args[0]);
        double stepFactor = args.length > 1 ? Double.parseDouble(args[1]) : SolverSettings.DEFAULT.stepFactor();
        for (Problem p : PROBLEMS) {
            run(p, refDir, SolverSettings.DEFAULT.withStepFactor(stepFactor));
        }
    }

    static ReactionNetwork network() {
        List<String> names = List.of("A", "B", "C");
        double k1 = 2;
        double k2 = 0.5;
        double k3 = 0.3;
        List<ReactionNetwork.Reaction> reactions = new ArrayList<>();
        reactions.add(new ReactionNetwork.Reaction("bind",
                ReactionNetwork.stoichiometry(names, "A", -1, "B", -1, "C", 1),
                ReactionNetwork.massAction(new double[] {1, 1, 0}, new double[3], k1, 0), k1));
        reactions.add(new ReactionNetwork.Reaction("unbind",
                ReactionNetwork.stoichiometry(names, "A", 1, "B", 1, "C", -1),
                ReactionNetwork.massAction(new double[] {0, 0, 1}, new double[3], k2, 0), k2));
        reactions.add(new ReactionNetwork.Reaction("loss", ReactionNetwork.stoichiometry(names, "A", -1),
                ReactionNetwork.massAction(new double[] {1, 0, 0}, new double[3], k3, 0), k3));
        reactions.add(new ReactionNetwork.Reaction("self-activation", ReactionNetwork.stoichiometry(names, "A", 1),
                ReactionNetwork.hill(0, 1.0, 0.5, 2), 4));
        return new ReactionNetwork(names, new double[] {1, 0.1, 0.1}, new double[] {0, 1, 0}, reactions);
    }

    private static void run(Problem p, Path refDir, SolverSettings settings) throws IOException {
        Domain domain = new Domain(p.lengthUm(), p.lengthUm() / (p.nodes() - 1), Boundary.NO_FLUX);
        int frames = (int) Math.floor(p.durationS() / p.intervalS() + 1e-9) + 1;
        double[] times = new double[frames];
        for (int f = 0; f < frames; f++) {
            times[f] = f * p.intervalS();
        }
        double[] x = new double[p.nodes()];
        for (int i = 0; i < x.length; i++) {
            x[i] = domain.nodeUm(i);
        }
        List<Stimulus> pulse = List.of(Stimulus.pulse(0, 5, 2, 1));
        double[] out = new double[frames * x.length];
        Runnable solve;
        long[] steps = new long[1];
        if (p.network()) {
            NetworkRun run = NetworkRun.prepare(network(), domain, times, x, pulse, settings, "A");
            double[][] rows = {out, null, null};
            solve = () -> {
                run.solve(rows);
                steps[0] = run.lastStepCount();
            };
        } else {
            ScalarRun run = ScalarRun.prepare("nagumo", domain, times, x, pulse, settings);
            double[] params = {1, 2, 0.2};
            solve = () -> {
                run.solve(params, out);
                steps[0] = run.lastStepCount();
            };
        }
        long warmUntil = System.nanoTime() + 3_000_000_000L;
        int warm = 0;
        while (System.nanoTime() < warmUntil || warm < 20) {
            solve.run();
            warm++;
        }
        int repeats = 30;
        long[] ns = new long[repeats];
        for (int r = 0; r < repeats; r++) {
            long t0 = System.nanoTime();
            solve.run();
            ns[r] = System.nanoTime() - t0;
        }
        java.util.Arrays.sort(ns);
        double best = ns[0] / 1e6;
        double median = ns[repeats / 2] / 1e6;
        double[] ref = read(refDir.resolve(p.name() + ".ref.f64"), out.length);
        double err = 0;
        for (int i = 0; i < out.length; i++) {
            err = Math.max(err, Math.abs(out[i] - ref[i]));
        }
        double pointSteps = (double) x.length * steps[0];
        System.out.println(String.format(Locale.ROOT,
                "{\"name\": \"%s\", \"best_ms\": %.3f, \"median_ms\": %.3f, \"steps\": %d,"
                        + " \"grid_point_steps_per_s\": %.3e,"
                        + " \"max_error\": %.3e}",
                p.name(), best, median, steps[0], pointSteps / (best / 1e3), err));
    }

    private static double[] read(Path file, int count) throws IOException {
        byte[] bytes = Files.readAllBytes(file);
        if (bytes.length != 8 * count) {
            throw new IOException(file + " holds " + bytes.length / 8 + " values, expected " + count);
        }
        double[] v = new double[count];
        ByteBuffer.wrap(bytes).order(ByteOrder.LITTLE_ENDIAN).asDoubleBuffer().get(v);
        return v;
    }
}
