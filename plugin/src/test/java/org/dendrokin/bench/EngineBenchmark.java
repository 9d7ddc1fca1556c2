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
import org.dendrokin.core.model.TreeDomain;
import org.dendrokin.core.model.TreeGeometry;
import org.dendrokin.core.model.TreeRun;
import org.dendrokin.core.model.TreeStimulus;

/**
 * Java side of the reaction-diffusion engine benchmark (run by bench/engine/run-engine-benchmark.sh, not a test): the
 * same problems as bench/engine/engine_scipy.py, timed on one thread after warm-up, with the largest error against the
 * fine-grid references that the SciPy script wrote. Prints one line per problem. Then the tree engine: Nagumo on a
 * tree of five branches (two branch points) against one unbranched cable with the same number of grid points, the same
 * spacing and so the same steps, each timed the same way, with the ratio of their times per grid-point-step.
 * <p>
 * Usage: EngineBenchmark REFERENCE_DIR [STEP_FACTOR], or EngineBenchmark --tree for the tree part alone
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
        if (args[0].equals("--tree")) {
            trees();
            return;
        }
        Path refDir = Path.of(args[0]);
        double stepFactor = args.length > 1 ? Double.parseDouble(args[1]) : SolverSettings.DEFAULT.stepFactor();
        for (Problem p : PROBLEMS) {
            run(p, refDir, SolverSettings.DEFAULT.withStepFactor(stepFactor));
        }
        trees();
    }

    /**
     * A trunk of 30 um splitting into a (25 um) and b (20 um), b splitting into c (15 um) and d (10 um), radii 0.6 to
     * 0.3 um, at two spacings, against a cable of the same node count and spacing.
     */
    private static void trees() {
        for (double dx : new double[] {0.25, 0.05}) {
            TreeGeometry tree = TreeGeometry.of(List.of(new TreeGeometry.Branch("trunk", 30, 0.6),
                    new TreeGeometry.Branch("a", 25, 0.4), new TreeGeometry.Branch("b", 20, 0.5),
                    new TreeGeometry.Branch("c", 15, 0.3), new TreeGeometry.Branch("d", 10, 0.35)),
                    List.of(TreeGeometry.Junction.of(end("trunk", TreeGeometry.End.END),
                            end("a", TreeGeometry.End.START), end("b", TreeGeometry.End.START)),
                            TreeGeometry.Junction.of(end("b", TreeGeometry.End.END), end("c", TreeGeometry.End.START),
                                    end("d", TreeGeometry.End.START))));
            TreeDomain domain = new TreeDomain(tree, dx);
            int nodes = domain.totalNodeCount();
            double[] times = new double[401];
            for (int f = 0; f < times.length; f++) {
                times[f] = f * 0.1;
            }
            double[] params = {1, 2, 0.2};
            TreeRun treeRun = TreeRun.prepare("nagumo", domain, times, TreeRun.nodePositions(domain),
                    List.of(new TreeStimulus("trunk", Stimulus.pulse(0, 5, 2, 1))), SolverSettings.DEFAULT);
            double[] treeOut = new double[times.length * treeRun.positionCount()];
            Domain cable = new Domain((nodes - 1) * dx, dx, Boundary.NO_FLUX);
            double[] x = new double[nodes];
            for (int i = 0; i < nodes; i++) {
                x[i] = cable.nodeUm(i);
            }
            ScalarRun cableRun = ScalarRun.prepare("nagumo", cable, times, x, List.of(Stimulus.pulse(0, 5, 2, 1)),
                    SolverSettings.DEFAULT);
            double[] cableOut = new double[times.length * nodes];
            double[][] t = timeAlternately(() -> treeRun.solve(params, treeOut), () -> cableRun.solve(params, cableOut));
            double[] treeTimes = t[0];
            double[] cableTimes = t[1];
            double treeRate = (double) nodes * treeRun.lastStepCount() / (treeTimes[0] / 1e3);
            double cableRate = (double) nodes * cableRun.lastStepCount() / (cableTimes[0] / 1e3);
            double perStep = (treeTimes[0] / treeRun.lastStepCount()) / (cableTimes[0] / cableRun.lastStepCount());
            System.out.println(String.format(Locale.ROOT,
                    "{\"name\": \"nagumo-tree5-%dx%d\", \"best_ms\": %.3f, \"median_ms\": %.3f, \"steps\": %d,"
                            + " \"grid_point_steps_per_s\": %.3e, \"cable_best_ms\": %.3f, \"cable_median_ms\": %.3f,"
                            + " \"cable_steps\": %d, \"cable_grid_point_steps_per_s\": %.3e,"
                            + " \"tree_over_cable_per_point_step_best\": %.3f, \"median_of_paired_ratios\": %.3f}",
                    nodes, times.length, treeTimes[0], treeTimes[1], treeRun.lastStepCount(), treeRate, cableTimes[0],
                    cableTimes[1], cableRun.lastStepCount(), cableRate, perStep,
                    t[2][0] * cableRun.lastStepCount() / treeRun.lastStepCount()));
        }
    }

    private static TreeGeometry.BranchEnd end(String branch, TreeGeometry.End end) {
        return new TreeGeometry.BranchEnd(branch, end);
    }

    /**
     * Best and median (ms) of 30 timed runs of each of two solves, taken in turn after 3 s of warm-up of each, so that
     * both see the same load on a shared machine; and the median of the 30 paired ratios first / second.
     */
    private static double[][] timeAlternately(Runnable first, Runnable second) {
        for (Runnable solve : new Runnable[] {first, second}) {
            long warmUntil = System.nanoTime() + 3_000_000_000L;
            int warm = 0;
            while (System.nanoTime() < warmUntil || warm < 20) {
                solve.run();
                warm++;
            }
        }
        int repeats = 30;
        long[] a = new long[repeats];
        long[] b = new long[repeats];
        double[] ratio = new double[repeats];
        for (int r = 0; r < repeats; r++) {
            long t0 = System.nanoTime();
            first.run();
            long t1 = System.nanoTime();
            second.run();
            long t2 = System.nanoTime();
            a[r] = t1 - t0;
            b[r] = t2 - t1;
            ratio[r] = (double) a[r] / b[r];
        }
        java.util.Arrays.sort(a);
        java.util.Arrays.sort(b);
        java.util.Arrays.sort(ratio);
        return new double[][] {{a[0] / 1e6, a[repeats / 2] / 1e6}, {b[0] / 1e6, b[repeats / 2] / 1e6},
            {ratio[repeats / 2]}};
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
