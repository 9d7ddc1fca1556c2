package org.dendrokin.synth;

import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Comparator;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.concurrent.ExecutionException;
import java.util.concurrent.ExecutorService;
import java.util.concurrent.Executors;
import java.util.concurrent.Future;
import java.util.function.LongFunction;
import java.util.stream.Stream;

import org.dendrokin.core.Progress;
import org.dendrokin.core.fit.Interval;
import org.dendrokin.io.SessionRunner;

import com.google.gson.JsonArray;
import com.google.gson.JsonElement;
import com.google.gson.JsonObject;

/**
 * How often the analysis's 95% intervals of D and k hold the truth on synthetic sessions: each seed of a scenario
 * is made into a session folder by {@link SessionGenerator}, analysed by the full pipeline
 * ({@link SessionRunner#analyze}), and the diffusion-decay fit's D and k compared with the true values.
 */
public final class CoverageHarness {
    private CoverageHarness() {
    }

    /**
     * A family of sessions, one per seed.
     *
     * @param name        short name, e.g. "realistic"
     * @param description one line
     * @param specs       seed to session
     */
    public record Scenario(String name, String description, LongFunction<SessionSpec> specs) {
    }

    /** The scenarios the study knows, by name, in the order of the table. */
    public static Map<String, Scenario> scenarios() {
        Map<String, Scenario> m = new LinkedHashMap<>();
        add(m, "clean", "the fit's own assumptions: straight even dendrite, path on the axis, white read noise",
                SessionSpec::clean);
        add(m, "realistic", "curved spiny dendrite, blur, uneven loading, Poisson-Gaussian noise, background, "
                + "bleaching, path off the axis", SessionSpec::realistic);
        add(m, "drift", "realistic with a slow 0.8 um drift over the movie and 0.02 um jitter",
                seed -> SessionSpec.realistic(seed).withMotion(SessionSpec.Motion.linear(0.8, 0.02)));
        add(m, "two-channel", "realistic with a structural channel first and the signal second (\"channel\": 2)",
                seed -> SessionSpec.realistic(seed).withChannels(SessionSpec.Channels.twoStructuralFirst()));
        add(m, "two-phase-bleaching", "realistic with bleaching of 30% in 25 s and 70% in 300 s",
                seed -> SessionSpec.realistic(seed).withBleaching(SessionSpec.Bleaching.twoPhase()));
        add(m, "spine-entering", "realistic with a bright spine moving into the band from 5 s to 60 s",
                seed -> SessionSpec.realistic(seed).withIntruder(SessionSpec.Intruder.entering(0.3, 5, 60)));
        add(m, "no-bleaching", "realistic without photobleaching (to see what bleaching and its correction cost)",
                seed -> SessionSpec.realistic(seed).withBleaching(SessionSpec.Bleaching.NONE));
        add(m, "no-background", "realistic without background structure (to see what the background costs)",
                seed -> SessionSpec.realistic(seed).withBackground(SessionSpec.Background.NONE));
        add(m, "freehand", "realistic with a freehand path",
                seed -> SessionSpec.realistic(seed).withPath(SessionSpec.DrawnPath.freehand()));
        return m;
    }

    private static void add(Map<String, Scenario> m, String name, String description, LongFunction<SessionSpec> f) {
        m.put(name, new Scenario(name, description, f));
    }

    /**
     * One fitted constant.
     *
     * @param truth     true value
     * @param value     estimate, or NaN when the fit gave none
     * @param lower     lower end of the reported 95% interval (NaN if none)
     * @param upper     upper end
     * @param method    the reported interval's method
     * @param waldLower lower end of the Wald-t interval, if reported beside it (else the reported one's)
     * @param waldUpper upper end of the Wald-t interval
     */
    public record Estimate(double truth, double value, double lower, double upper, String method, double waldLower,
            double waldUpper) {
        static Estimate none(double truth) {
            return new Estimate(truth, Double.NaN, Double.NaN, Double.NaN, "none", Double.NaN, Double.NaN);
        }

        public boolean covered() {
            return lower <= truth && truth <= upper;
        }

        public boolean waldCovered() {
            return waldLower <= truth && truth <= waldUpper;
        }

        /** estimate / truth - 1. */
        public double relativeError() {
            return value / truth - 1;
        }

        /** (upper - lower) / truth. */
        public double relativeWidth() {
            return (upper - lower) / truth;
        }
    }

    /**
     * One analysed session.
     *
     * @param scenario  scenario name
     * @param seed      seed
     * @param d         D, um^2/s
     * @param k         k, 1/s
     * @param bestModel the analysis's preferred model (or null)
     * @param failure   why there is no diffusion-decay estimate, or null
     * @param seconds   time for generation and analysis, s
     */
    public record Outcome(String scenario, long seed, Estimate d, Estimate k, String bestModel, String failure,
            double seconds) {
        public boolean fitted() {
            return failure == null;
        }
    }

    /**
     * Coverage and accuracy over the sessions of one scenario; a session without an estimate counts as not covered.
     *
     * @param scenario             name
     * @param sessions             sessions analysed
     * @param fitted               sessions with a diffusion-decay estimate of D and k
     * @param method               the reported interval's method (the most common one)
     * @param coverageD            share of sessions whose reported interval holds the true D
     * @param coverageK            same for k
     * @param waldCoverageD        same with the Wald-t interval
     * @param waldCoverageK        same for k
     * @param medianAbsErrorD      median |estimate / truth - 1| of D over fitted sessions
     * @param medianAbsErrorK      same for k
     * @param medianErrorD         median signed estimate / truth - 1 of D (bias)
     * @param medianErrorK         same for k
     * @param medianWidthD         median (upper - lower) / truth of the reported interval of D
     * @param medianWidthK         same for k
     * @param bestModels           how often each model was preferred
     * @param secondsPerSession    mean time per session (generation and analysis), s
     */
    public record Summary(String scenario, int sessions, int fitted, String method, double coverageD,
            double coverageK, double waldCoverageD, double waldCoverageK, double medianAbsErrorD,
            double medianAbsErrorK, double medianErrorD, double medianErrorK, double medianWidthD, double medianWidthK,
            Map<String, Integer> bestModels, double secondsPerSession) {
    }

    /**
     * Generates and analyses seeds firstSeed .. firstSeed + count - 1 of a scenario.
     *
     * @param scenario  the scenario
     * @param firstSeed first seed
     * @param count     number of sessions
     * @param work      folder for the sessions and results (one sub-folder each); made if missing
     * @param keep      keep each session's folders (else deleted after its analysis)
     * @param threads   sessions analysed at once
     * @param models    the models list written into session.json, or null for the scenario's own
     */
    public static List<Outcome> run(Scenario scenario, long firstSeed, int count, Path work, boolean keep,
            int threads, List<String> models) {
        ExecutorService pool = Executors.newFixedThreadPool(Math.max(1, threads));
        try {
            List<Future<Outcome>> futures = new ArrayList<>();
            for (int i = 0; i < count; i++) {
                long seed = firstSeed + i;
                futures.add(pool.submit(() -> one(scenario, seed, work, keep, models)));
            }
            List<Outcome> out = new ArrayList<>();
            for (Future<Outcome> f : futures) {
                out.add(f.get());
            }
            return out;
        } catch (InterruptedException e) {
            Thread.currentThread().interrupt();
            throw new IllegalStateException("interrupted", e);
        } catch (ExecutionException e) {
            throw new IllegalStateException("a session could not be made: " + e.getCause(), e.getCause());
        } finally {
            pool.shutdownNow();
        }
    }

    /** Generates and analyses one seed of a scenario. */
    public static Outcome one(Scenario scenario, long seed, Path work, boolean keep, List<String> models) {
        long start = System.nanoTime();
        SessionSpec spec = scenario.specs().apply(seed);
        if (models != null) {
            spec = spec.withSession(spec.session().withModels(models));
        }
        Path sessionDir = work.resolve(String.format(Locale.ROOT, "%s-%d", scenario.name(), seed));
        Path outDir = work.resolve(String.format(Locale.ROOT, "%s-%d-results", scenario.name(), seed));
        Truth truth = SessionGenerator.write(spec, sessionDir).truth();
        double trueD = truth.signal().dUm2PerS();
        double trueK = truth.signal().kPerS();
        Estimate d = Estimate.none(trueD);
        Estimate k = Estimate.none(trueK);
        String best = null;
        String failure = null;
        try {
            SessionRunner.Result result = SessionRunner.analyze(sessionDir, outDir, Progress.NONE);
            best = result.bestModel();
            JsonObject fit = null;
            for (JsonElement f : com.google.gson.JsonParser.parseString(java.nio.file.Files.readString(
                    outDir.resolve("results.json"))).getAsJsonObject().getAsJsonArray("fits")) {
                if ("diffusion-decay".equals(f.getAsJsonObject().get("model").getAsString())) {
                    fit = f.getAsJsonObject();
                }
            }
            if (fit == null) {
                failure = "no diffusion-decay fit";
            } else if (!fit.get("converged").getAsBoolean()) {
                failure = "not converged: " + (fit.has("reason") ? fit.get("reason").getAsString() : "");
            } else {
                JsonObject p = fit.getAsJsonObject("parameters");
                d = estimate(p, "D", trueD);
                k = estimate(p, "k", trueK);
                if (Double.isNaN(d.value()) || Double.isNaN(k.value())) {
                    failure = "no value for D or k";
                }
            }
        } catch (RuntimeException | java.io.IOException e) {
            failure = e.getClass().getSimpleName() + ": " + e.getMessage();
        } finally {
            if (!keep) {
                deleteTree(sessionDir);
                deleteTree(outDir);
            }
        }
        return new Outcome(scenario.name(), seed, d, k, best, failure, (System.nanoTime() - start) / 1e9);
    }

    private static Estimate estimate(JsonObject parameters, String name, double truth) {
        if (!parameters.has(name)) {
            return Estimate.none(truth);
        }
        JsonObject p = parameters.getAsJsonObject(name);
        double value = number(p.get("value"));
        double[] ci = interval(p.get("ci95"));
        String method = p.get("ci_method").isJsonNull() ? "none" : p.get("ci_method").getAsString();
        double[] wald = Interval.WALD_T.equals(method) ? ci : null;
        if (wald == null && p.has("other_intervals")) {
            for (JsonElement e : p.getAsJsonArray("other_intervals")) {
                JsonObject o = e.getAsJsonObject();
                if (Interval.WALD_T.equals(o.get("ci_method").getAsString())) {
                    wald = interval(o.get("ci95"));
                }
            }
        }
        if (wald == null) {
            wald = ci;
        }
        return new Estimate(truth, value, ci[0], ci[1], method, wald[0], wald[1]);
    }

    private static double number(JsonElement e) {
        return e == null || e.isJsonNull() ? Double.NaN : e.getAsDouble();
    }

    private static double[] interval(JsonElement e) {
        if (e == null || e.isJsonNull()) {
            return new double[] {Double.NaN, Double.NaN};
        }
        JsonArray a = e.getAsJsonArray();
        return new double[] {number(a.get(0)), number(a.get(1))};
    }

    /** Coverage and accuracy of a scenario's outcomes. */
    public static Summary summarise(String scenario, List<Outcome> outcomes) {
        int n = outcomes.size();
        List<Outcome> fitted = outcomes.stream().filter(Outcome::fitted).toList();
        Map<String, Integer> methods = new LinkedHashMap<>();
        Map<String, Integer> best = new LinkedHashMap<>();
        for (Outcome o : outcomes) {
            if (o.fitted()) {
                methods.merge(o.d().method(), 1, Integer::sum);
            }
            best.merge(o.bestModel() == null ? "none" : o.bestModel(), 1, Integer::sum);
        }
        String method = methods.entrySet().stream().max(Comparator.comparingInt(Map.Entry::getValue))
                .map(Map.Entry::getKey).orElse("none");
        return new Summary(scenario, n, fitted.size(), method,
                share(fitted, o -> o.d().covered(), n), share(fitted, o -> o.k().covered(), n),
                share(fitted, o -> o.d().waldCovered(), n), share(fitted, o -> o.k().waldCovered(), n),
                median(fitted.stream().mapToDouble(o -> Math.abs(o.d().relativeError()))),
                median(fitted.stream().mapToDouble(o -> Math.abs(o.k().relativeError()))),
                median(fitted.stream().mapToDouble(o -> o.d().relativeError())),
                median(fitted.stream().mapToDouble(o -> o.k().relativeError())),
                median(fitted.stream().mapToDouble(o -> o.d().relativeWidth())),
                median(fitted.stream().mapToDouble(o -> o.k().relativeWidth())),
                best, outcomes.stream().mapToDouble(Outcome::seconds).average().orElse(Double.NaN));
    }

    private static double share(List<Outcome> fitted, java.util.function.Predicate<Outcome> hit, int n) {
        return n == 0 ? Double.NaN : fitted.stream().filter(hit).count() / (double) n;
    }

    private static double median(java.util.stream.DoubleStream values) {
        double[] v = values.filter(Double::isFinite).sorted().toArray();
        if (v.length == 0) {
            return Double.NaN;
        }
        return v.length % 2 == 1 ? v[v.length / 2] : (v[v.length / 2 - 1] + v[v.length / 2]) / 2;
    }

    /** The summaries as a markdown table; percentages with no decimals, errors and widths in per cent. */
    public static String markdown(List<Summary> summaries) {
        StringBuilder b = new StringBuilder();
        b.append("| scenario | sessions | fitted | interval | D covered | k covered | D covered (wald-t) "
                + "| k covered (wald-t) | D median abs. error | k median abs. error | D median error | k median error "
                + "| D median width | k median width | best model | s per session |\n");
        b.append("|---|---:|---:|---|---:|---:|---:|---:|---:|---:|---:|---:|---:|---:|---|---:|\n");
        for (Summary s : summaries) {
            b.append(String.format(Locale.ROOT,
                    "| %s | %d | %d | %s | %s | %s | %s | %s | %s | %s | %s | %s | %s | %s | %s | %.1f |\n",
                    s.scenario(), s.sessions(), s.fitted(), s.method(), pct(s.coverageD()), pct(s.coverageK()),
                    pct(s.waldCoverageD()), pct(s.waldCoverageK()), pct1(s.medianAbsErrorD()),
                    pct1(s.medianAbsErrorK()), signed(s.medianErrorD()), signed(s.medianErrorK()),
                    pct1(s.medianWidthD()), pct1(s.medianWidthK()), models(s.bestModels()),
                    s.secondsPerSession()));
        }
        return b.toString();
    }

    private static String models(Map<String, Integer> m) {
        return String.join(", ", m.entrySet().stream().map(e -> e.getKey() + " " + e.getValue()).toList());
    }

    private static String pct(double v) {
        return Double.isNaN(v) ? "-" : String.format(Locale.ROOT, "%.0f%%", 100 * v);
    }

    private static String pct1(double v) {
        return Double.isNaN(v) ? "-" : String.format(Locale.ROOT, "%.1f%%", 100 * v);
    }

    private static String signed(double v) {
        return Double.isNaN(v) ? "-" : String.format(Locale.ROOT, "%+.1f%%", 100 * v);
    }

    private static void deleteTree(Path dir) {
        if (!Files.exists(dir)) {
            return;
        }
        try (Stream<Path> walk = Files.walk(dir)) {
            for (Path p : walk.sorted(Comparator.reverseOrder()).toList()) {
                Files.deleteIfExists(p);
            }
        } catch (IOException e) {
            throw new UncheckedIOException("could not delete " + dir, e);
        }
    }
}
