package org.dendrokin.cli;

import java.io.IOException;
import java.io.InputStream;
import java.io.PrintWriter;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Locale;
import java.util.Map;
import java.util.Set;
import java.util.concurrent.Callable;

import com.google.gson.JsonElement;
import com.google.gson.JsonObject;

import org.dendrokin.core.spread.Estimate;
import org.dendrokin.io.AtomicFiles;
import org.dendrokin.io.InputException;
import org.dendrokin.io.SessionRunner;
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
        TerminalProgress progress = new TerminalProgress(err);
        try {
            return SessionRunner.analyze(session, out, progress);
        } finally {
            progress.finish();
        }
    }

    /** What the terminal shows after an analysis. */
    static String summary(SessionRunner.Result r) {
        StringBuilder b = new StringBuilder();
        b.append("Analysed session ").append(r.session()).append('\n');
        b.append(line("front speed", r.spread() == null ? null : r.spread().frontSpeed()));
        b.append(line("length constant", r.spread() == null ? null : r.spread().lengthConstant()));
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
        if (r.bestModel() == null) {
            return r.fits().isEmpty() ? "" : "  best model       none: no model fit converged\n";
        }
        StringBuilder b = new StringBuilder(String.format(Locale.ROOT, "  best model       %s%n", r.bestModel()));
        for (JsonObject fit : r.fits()) {
            if (!r.bestModel().equals(fit.get("model").getAsString()) || !fit.has("parameters")) {
                continue;
            }
            for (Map.Entry<String, JsonElement> p : fit.getAsJsonObject("parameters").entrySet()) {
                if (!HEADLINE.contains(p.getKey()) || !p.getValue().isJsonObject()) {
                    continue;
                }
                JsonObject q = p.getValue().getAsJsonObject();
                JsonElement ci = q.get("ci95");
                String interval = ci != null && ci.isJsonArray() && ci.getAsJsonArray().size() == 2
                        && !ci.getAsJsonArray().get(0).isJsonNull() && !ci.getAsJsonArray().get(1).isJsonNull()
                        ? String.format(Locale.ROOT, " (95%% interval %s to %s)",
                                Numbers.forPeople(ci.getAsJsonArray().get(0).getAsDouble()),
                                Numbers.forPeople(ci.getAsJsonArray().get(1).getAsDouble()))
                        : " (interval not determined by these data)";
                b.append(String.format(Locale.ROOT, "    %-14s %s %s%s%n", p.getKey(),
                        Numbers.forPeople(q.get("value").getAsDouble()),
                        q.has("unit") ? q.get("unit").getAsString() : "", interval));
            }
        }
        return b.toString();
    }

    private static String line(String name, Estimate e) {
        if (e == null) {
            return String.format(Locale.ROOT, "  %-16s not available%n", name);
        }
        return String.format(Locale.ROOT, "  %-16s %s %s (95%% interval %s to %s)%n", name,
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
