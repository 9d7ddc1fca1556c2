package org.dendrokin.cli;

import java.io.IOException;
import java.io.InputStream;
import java.io.PrintWriter;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Locale;
import java.util.Set;
import java.util.concurrent.Callable;

import org.dendrokin.core.analysis.AnalysisResult;
import org.dendrokin.core.analysis.Headline;
import org.dendrokin.core.fit.FitResult;
import org.dendrokin.core.fit.Interval;
import org.dendrokin.core.fit.ParameterEstimate;
import org.dendrokin.core.spread.Estimate;
import org.dendrokin.io.AtomicFiles;
import org.dendrokin.io.InputException;
import org.dendrokin.io.SessionRunner;
import org.dendrokin.io.session.SessionOverrides;
import org.dendrokin.io.text.Numbers;

import picocli.CommandLine.Command;
import picocli.CommandLine.Option;
import picocli.CommandLine.Spec;
import picocli.CommandLine.Model.CommandSpec;

/**
 * {@code demo [--out OUT_DIR]}: analyses the demo session shipped in {@code test-images/demo-session} (looked for
 * under the working directory, else the copy inside the jar, unpacked into {@code OUT_DIR/demo-session}) and
 * prints where the report is.
 */
@Command(name = "demo", mixinStandardHelpOptions = true,
        description = "Analyse the demo session shipped with Dendrokin and print where the report is.")
final class DemoCommand implements Callable<Integer> {
    /** Fitted quantities the terminal summary shows; the report and results.json hold all of them. */
    private static final Set<String> HEADLINE = Set.of("D", "k", "a", "r", "front_speed", "front_width");

    static final String DEMO_DIR = "test-images/demo-session";
    static final String DEMO_RESOURCE = "/org/dendrokin/demo-session/";
    static final String[] DEMO_FILES = {"session.json", "dendrite.tif", "dendrite.roi"};

    @Option(names = "--out", paramLabel = "OUT_DIR", defaultValue = "dendrokin-demo",
            description = "Output folder (default: ${DEFAULT-VALUE}), created if missing.")
    Path outDir;

    @Spec
    CommandSpec spec;

    @Override
    public Integer call() throws IOException {
        Path local = Path.of(DEMO_DIR);
        Path session = local;
        if (!Files.isRegularFile(local.resolve("session.json"))) {
            // Away from the repository: unpack the copy inside the jar into the output folder, so that nothing is
            // written outside it and the analysed inputs stay beside the report.
            session = outDir.resolve("demo-session");
            unpack(session);
        }
        SessionRunner.Result result = run(session, outDir, spec.commandLine().getErr());
        spec.commandLine().getOut().println(summary(result));
        return Main.OK;
    }

    /** Runs one analysis with a progress line on {@code err}. */
    static SessionRunner.Result run(Path session, Path out, PrintWriter err) {
        return run(session, out, SessionOverrides.NONE, err);
    }

    /** Runs one analysis with settings given over session.json, with a progress line on {@code err}. */
    static SessionRunner.Result run(Path session, Path out, SessionOverrides overrides, PrintWriter err) {
        TerminalProgress progress = new TerminalProgress(err);
        try {
            return SessionRunner.analyze(session, out, overrides, progress);
        } finally {
            progress.finish();
        }
    }

    /** What the terminal shows after an analysis. */
    static String summary(SessionRunner.Result r) {
        StringBuilder b = new StringBuilder();
        b.append("Analysed session ").append(r.session()).append('\n');
        Headline headline = r.analysis().headline();
        b.append(line("front speed", headline.frontSpeed(), r.spread() == null ? "no stimulus is known"
                : r.spread().front().verdict().phrase()));
        b.append(line("peak decay length", r.spread() == null ? null : r.spread().peakDecayLength()));
        if (headline.lengthConstant() != null) {
            b.append(line("length constant", headline.lengthConstantEstimate()));
        }
        b.append(line("decay time", r.spread() == null ? null : r.spread().decayTime()));
        b.append(line("apparent D", r.spread() == null ? null : r.spread().apparentD()));
        b.append(bestFit(r));
        if (!r.warnings().isEmpty()) {
            b.append(String.format(Locale.ROOT, "  %d warning(s); see the report.%n", r.warnings().size()));
        }
        b.append("Report: ").append(r.report().toAbsolutePath().normalize());
        return b.toString();
    }

    /** The preferred model and its rate and diffusion constants, as results.json holds them. */
    private static String bestFit(SessionRunner.Result r) {
        AnalysisResult a = r.analysis();
        if (a.bestModel() == null) {
            return a.fitResults().isEmpty() ? "" : "  best model        none: no model fit converged\n";
        }
        StringBuilder b = new StringBuilder(String.format(Locale.ROOT, "  best model        %s%n", a.bestModel()));
        FitResult best = a.bestFit().orElseThrow();
        for (ParameterEstimate p : best.parameters()) {
            if (!HEADLINE.contains(p.name())) {
                continue;
            }
            Interval ci = p.ci95();
            String interval = ci != null && ci.isFinite()
                    ? String.format(Locale.ROOT, " (95%% interval %s to %s)", Numbers.forPeople(ci.lower()),
                            Numbers.forPeople(ci.upper()))
                    : " (interval not determined by these data)";
            b.append(String.format(Locale.ROOT, "    %-15s %s %s%s%n", p.name(), Numbers.forPeople(p.value()),
                    p.unit().symbol(), interval));
        }
        return b.toString();
    }

    private static String line(String name, Estimate e) {
        return line(name, e, "");
    }

    private static String line(String name, Estimate e, String why) {
        if (e == null) {
            return String.format(Locale.ROOT, "  %-17s not available%s%n", name, why.isEmpty() ? "" : " (" + why + ")");
        }
        return String.format(Locale.ROOT, "  %-17s %s %s (95%% interval %s to %s)%n", name,
                Numbers.forPeople(e.value()), e.unit(), Numbers.forPeople(e.lo95()), Numbers.forPeople(e.hi95()));
    }

    private static void unpack(Path dir) throws IOException {
        Files.createDirectories(dir);
        for (String name : DEMO_FILES) {
            try (InputStream in = DemoCommand.class.getResourceAsStream(DEMO_RESOURCE + name)) {
                if (in == null) {
                    throw new InputException(null, "the demo session is missing from this build (" + name
                            + "); run the command from the repository's root folder");
                }
                byte[] bytes = in.readAllBytes();
                AtomicFiles.write(dir.resolve(name), o -> o.write(bytes));
            }
        }
    }

}
