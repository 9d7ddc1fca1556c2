package org.dendrokin.cli;

import java.io.PrintStream;
import java.io.PrintWriter;
import java.io.UncheckedIOException;

import org.dendrokin.io.InputException;

import picocli.CommandLine;
import picocli.CommandLine.Command;
import picocli.CommandLine.Option;

/**
 * The command line: {@code analyze}, {@code batch}, {@code global-fit}, {@code simulate} and {@code demo}. Exit
 * status 0 on success, 2 on bad input or usage (one sentence on stderr naming the file and the problem; a stack trace
 * only with {@code --debug}), 3 when a batch finished but every session failed.
 */
@Command(name = "dendrokin", mixinStandardHelpOptions = true, versionProvider = Version.Provider.class,
        description = "Spread of signals along dendrites: kymographs, calibration, reaction-diffusion models and fits.",
        subcommands = {AnalyzeCommand.class, BatchCommand.class, SimulateCommand.class, DemoCommand.class,
            CalibrateCommand.class, CompareCommand.class, GlobalFitCommand.class})
public final class Main implements Runnable {
    public static final int OK = 0;
    public static final int BAD_INPUT = 2;
    public static final int ALL_FAILED = 3;

    @Option(names = "--debug", scope = CommandLine.ScopeType.INHERIT,
            description = "Print stack traces with error messages.")
    boolean debug;

    @CommandLine.Spec
    CommandLine.Model.CommandSpec spec;

    public static void main(String[] args) {
        System.exit(run(args, System.out, System.err));
    }

    /** Runs the command line with the given streams and returns the exit status; tests call this. */
    public static int run(String[] args, PrintStream out, PrintStream err) {
        quietLibraries();
        CommandLine cl = new CommandLine(new Main());
        cl.setOut(new PrintWriter(out, true));
        cl.setErr(new PrintWriter(err, true));
        cl.setExecutionExceptionHandler((ex, line, parseResult) -> {
            boolean debugOn = parseResult.hasMatchedOption("--debug")
                    || parseResult.subcommands().stream().anyMatch(p -> p.hasMatchedOption("--debug"));
            return report(ex, err, debugOn);
        });
        cl.setParameterExceptionHandler((ex, argsGiven) -> {
            err.println(ex.getMessage());
            ex.getCommandLine().usage(err);
            return BAD_INPUT;
        });
        return cl.execute(args);
    }

    static int report(Exception ex, PrintStream err, boolean debug) {
        if (ex instanceof InputException) {
            err.println(ex.getMessage());
        } else if (ex instanceof UncheckedIOException) {
            err.println(ex.getMessage());
        } else {
            err.println("Internal error: " + ex + " (please report it with the --debug output).");
        }
        if (debug) {
            ex.printStackTrace(err);
        }
        return ex instanceof InputException || ex instanceof UncheckedIOException ? BAD_INPUT : 1;
    }

    /** SciJava logs [INFO] lines on stdout unless told otherwise; JSBML's logging goes to our config. */
    static void quietLibraries() {
        System.setProperty("scijava.log.level", System.getProperty("scijava.log.level", "warn"));
        System.setProperty("java.awt.headless", System.getProperty("java.awt.headless", "true"));
    }

    @Override
    public void run() {
        spec.commandLine().usage(spec.commandLine().getOut());
    }
}
