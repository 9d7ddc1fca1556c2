package org.dendrokin.bench;

import java.io.IOException;
import java.io.PrintStream;
import java.io.Writer;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Comparator;
import java.util.List;
import java.util.Locale;
import java.util.concurrent.Callable;
import java.util.stream.Stream;

import org.apache.commons.csv.CSVFormat;
import org.apache.commons.csv.CSVPrinter;
import org.dendrokin.synth.CoverageHarness;

import picocli.CommandLine;
import picocli.CommandLine.Command;
import picocli.CommandLine.Option;

/**
 * Interval coverage of the diffusion-decay fit on realistic synthetic sessions (not a test; run by
 * bench/coverage/run-coverage-study.sh): for each scenario, seeds first .. first + n - 1 are generated, analysed by
 * the full pipeline and compared with the truth. Prints a markdown table; optionally a CSV with one line per
 * session.
 */
@Command(name = "coverage-study", mixinStandardHelpOptions = true,
        description = "Coverage of the 95% intervals of D and k on synthetic sessions.")
public final class CoverageStudy implements Callable<Integer> {
    @Option(names = "--seeds", description = "sessions per scenario (default ${DEFAULT-VALUE})")
    int seeds = 30;

    @Option(names = "--first-seed", description = "first seed (default ${DEFAULT-VALUE})")
    long firstSeed = 1;

    @Option(names = "--scenarios", split = ",", description = "scenarios, from: clean, realistic, drift, "
            + "two-channel, two-phase-bleaching, spine-entering, freehand (default: the first five)")
    List<String> scenarios = List.of("clean", "realistic", "drift", "two-channel", "two-phase-bleaching");

    @Option(names = "--threads", description = "sessions analysed at once (default ${DEFAULT-VALUE})")
    int threads = 1;

    @Option(names = "--models", description = "\"diffusion-decay\" (default) or \"all\" (every built-in model, "
            + "slower; the best-model column then means something)")
    String models = "diffusion-decay";

    @Option(names = "--work", description = "folder for sessions and results (default: a temporary folder)")
    Path work;

    @Option(names = "--keep", description = "keep every session and result folder")
    boolean keep;

    @Option(names = "--csv", description = "also write one line per session to this CSV file")
    Path csv;

    private final PrintStream out;
    private final PrintStream err;

    CoverageStudy(PrintStream out, PrintStream err) {
        this.out = out;
        this.err = err;
    }

    public static void main(String[] args) {
        System.exit(new CommandLine(new CoverageStudy(System.out, System.err)).execute(args));
    }

    @Override
    public Integer call() throws IOException {
        var known = CoverageHarness.scenarios();
        for (String s : scenarios) {
            if (!known.containsKey(s)) {
                err.println("unknown scenario " + s + "; known: " + String.join(", ", known.keySet()));
                return 2;
            }
        }
        boolean temporary = work == null;
        Path dir = temporary ? Files.createTempDirectory("dendrokin-coverage") : work;
        Files.createDirectories(dir);
        List<String> modelList = "all".equals(models) ? List.of() : List.of(models);
        List<CoverageHarness.Summary> summaries = new ArrayList<>();
        List<CoverageHarness.Outcome> all = new ArrayList<>();
        try {
            for (String name : scenarios) {
                CoverageHarness.Scenario scenario = known.get(name);
                long start = System.nanoTime();
                List<CoverageHarness.Outcome> outcomes = CoverageHarness.run(scenario, firstSeed, seeds, dir, keep,
                        threads, modelList);
                all.addAll(outcomes);
                summaries.add(CoverageHarness.summarise(name, outcomes));
                err.printf(Locale.ROOT, "%s: %d sessions in %.0f s%n", name, seeds, (System.nanoTime() - start) / 1e9);
                outcomes.stream().filter(o -> !o.fitted()).forEach(o -> err.println("  seed " + o.seed() + ": "
                        + o.failure()));
            }
        } finally {
            if (temporary && !keep) {
                try (Stream<Path> walk = Files.walk(dir)) {
                    for (Path p : walk.sorted(Comparator.reverseOrder()).toList()) {
                        Files.deleteIfExists(p);
                    }
                }
            }
        }
        out.printf(Locale.ROOT, "Seeds %d to %d per scenario; models: %s; %d thread(s).%n%n", firstSeed,
                firstSeed + seeds - 1, models, threads);
        for (String name : scenarios) {
            out.println("- " + name + ": " + known.get(name).description());
        }
        out.println();
        out.print(CoverageHarness.markdown(summaries));
        if (csv != null) {
            writeCsv(all);
        }
        return 0;
    }

    private void writeCsv(List<CoverageHarness.Outcome> outcomes) throws IOException {
        try (Writer w = Files.newBufferedWriter(csv, StandardCharsets.UTF_8);
                CSVPrinter p = new CSVPrinter(w, CSVFormat.DEFAULT.builder().setHeader("scenario", "seed",
                        "true_d_um2_per_s", "d_um2_per_s", "d_lower", "d_upper", "d_method", "d_wald_lower",
                        "d_wald_upper", "true_k_per_s", "k_per_s", "k_lower", "k_upper", "k_method", "k_wald_lower",
                        "k_wald_upper", "best_model", "failure", "seconds").get())) {
            for (CoverageHarness.Outcome o : outcomes) {
                var d = o.d();
                var k = o.k();
                p.printRecord(o.scenario(), o.seed(), num(d.truth()), num(d.value()), num(d.lower()),
                        num(d.upper()), d.method(), num(d.waldLower()), num(d.waldUpper()), num(k.truth()),
                        num(k.value()), num(k.lower()), num(k.upper()), k.method(), num(k.waldLower()),
                        num(k.waldUpper()), o.bestModel(), o.failure(), num(o.seconds()));
            }
        }
    }

    private static String num(double v) {
        return Double.isFinite(v) ? String.format(Locale.ROOT, "%.6g", v) : "";
    }
}
