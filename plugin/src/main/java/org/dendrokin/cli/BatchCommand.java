package org.dendrokin.cli;

import java.io.PrintWriter;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.concurrent.Callable;

import org.dendrokin.core.Progress;
import org.dendrokin.io.InputException;
import org.dendrokin.io.batch.BatchOptions;
import org.dendrokin.io.batch.BatchOutcome;
import org.dendrokin.io.batch.BatchRunner;
import org.dendrokin.io.batch.BatchStatus;
import org.dendrokin.io.batch.GlobalFitStudy;
import org.dendrokin.io.batch.SessionAnalyzer;
import org.dendrokin.io.batch.SessionAnalyzers;
import org.dendrokin.io.batch.Shard;
import org.dendrokin.io.batch.SlurmPlan;

import picocli.CommandLine.Command;
import picocli.CommandLine.Model.CommandSpec;
import picocli.CommandLine.Option;
import picocli.CommandLine.Parameters;
import picocli.CommandLine.Spec;

/**
 * The {@code batch} command: every session folder under a root, in parallel and resumable; or, for a
 * cluster, a SLURM job-array plan, one shard of it, and the merge of the shards' results.
 */
@Command(name = "batch", mixinStandardHelpOptions = true, sortOptions = false,
        description = {"Analyse every folder under ROOT that holds a session.json, several at once, and write "
                + "summary.csv and index.html into OUT. Sessions whose inputs have not changed since the last run "
                + "are not analysed again.",
            "For a SLURM cluster: --plan-slurm N writes a job-array script of N shards; each array task runs "
                + "--shard i/N; --merge OUT joins their results.",
            "--global-fit diffusion-decay then fits one D and one k per group (the group key of session.json) to all "
                + "sessions of the group at once, writes global-fit.json and adds a section to index.html; with "
                + "--plan-slurm the merge job does it."})
final class BatchCommand implements Callable<Integer> {
    @Parameters(index = "0", arity = "0..1", paramLabel = "ROOT", description = "Folder holding session folders.")
    Path root;

    @Option(names = "--out", paramLabel = "OUT", description = "Output folder (created if missing).")
    Path out;

    @Option(names = "--threads", paramLabel = "N", description = "Sessions analysed at once (default: cores).")
    Integer threads;

    @Option(names = "--movies-at-once", paramLabel = "M",
            description = "At most M sessions read their movie at the same time (default: threads, fewer when "
                    + "the Java heap is small).")
    Integer moviesAtOnce;

    @Option(names = "--force", description = "Analyse every session again, even those whose results are current.")
    boolean force;

    @Option(names = "--shard", paramLabel = "i/N", description = "Do only shard i of N (1 <= i <= N).")
    String shard;

    @Option(names = "--merge", paramLabel = "OUT",
            description = "Join the results of the shards in OUT into one summary.csv and index.html.")
    Path merge;

    @Option(names = "--plan-slurm", paramLabel = "N",
            description = "Write OUT/slurm/batch.sbatch, a SLURM job array of N shards, instead of running.")
    Integer planSlurm;

    @Option(names = "--slurm-cpus", paramLabel = "C", description = "CPUs per array task (default 2).")
    int slurmCpus;

    @Option(names = "--slurm-mem-mb", paramLabel = "MB",
            description = "Memory per array task, MB (default: from the largest session folder).")
    int slurmMemMb;

    @Option(names = "--slurm-time-min", paramLabel = "MIN",
            description = "Time limit per array task, minutes (default: from the busiest shard's data).")
    int slurmTimeMin;

    @Option(names = "--slurm-partition", paramLabel = "NAME", description = "SLURM partition.")
    String slurmPartition;

    @Option(names = "--slurm-account", paramLabel = "NAME", description = "SLURM account.")
    String slurmAccount;

    @Option(names = "--slurm-option", paramLabel = "TEXT",
            description = "Another #SBATCH line, e.g. --slurm-option=--qos=short (repeatable).")
    List<String> slurmOptions = new ArrayList<>();

    @Option(names = "--global-fit", paramLabel = "MODEL",
            description = "After the sessions, fit shared constants to all sessions of each group at once (MODEL: "
                    + "diffusion-decay).")
    String globalFit;

    @Option(names = "--global-bootstrap", paramLabel = "N",
            description = "Resamples of the sessions for the joint fit's bootstrap intervals (default 200; 0: none).")
    int globalBootstrap = 200;

    @Option(names = "--global-seed", paramLabel = "S", description = "Seed of those resamples (default 1).")
    long globalSeed = 1;

    @Option(names = "--jar", paramLabel = "FILE",
            description = "The dendrokin-cli.jar the array tasks run (default: this one).")
    Path jar;

    @Option(names = "--java", paramLabel = "CMD", description = "The java command on the nodes (default: java).")
    String java = "java";

    /** The analysis each session gets; tests replace it. */
    SessionAnalyzer analyzer = SessionAnalyzers.standard();

    /** Where the progress line and messages go: the command line's error stream unless a test sets it. */
    PrintWriter err;

    @Spec
    CommandSpec spec;

    @Override
    public Integer call() {
        if (err == null) {
            err = spec.commandLine().getErr();
        }
        GlobalFitStudy.Request global = globalRequest();
        if (merge != null) {
            if (root != null || out != null || planSlurm != null || shard != null) {
                throw new InputException(null, "--merge OUT takes no ROOT, --out, --shard or --plan-slurm");
            }
            BatchOutcome o = BatchRunner.merge(merge, global, Progress.NONE);
            err.println("Merged " + o.total() + " sessions (" + o.failed() + " failed or missing): " + o.index());
            if (o.globalFit() != null) {
                err.println("Global fit: " + o.globalFit());
            }
            return o.allFailed() ? Main.ALL_FAILED : Main.OK;
        }
        if (root == null || out == null) {
            throw new InputException(null, "batch needs a ROOT folder and --out OUT (or --merge OUT)");
        }
        int n = threads != null ? threads : Runtime.getRuntime().availableProcessors();
        if (n < 1) {
            throw new InputException(null, "--threads must be at least 1");
        }
        if (planSlurm != null) {
            return plan();
        }
        BatchOptions options = BatchOptions.of(root, out, n).withForce(force);
        if (moviesAtOnce != null) {
            if (moviesAtOnce < 1) {
                throw new InputException(null, "--movies-at-once must be at least 1");
            }
            options = options.withMoviesAtOnce(moviesAtOnce);
        }
        if (shard != null) {
            if (global != null) {
                throw new InputException(null, "--global-fit is made by the merge of the shards (batch --merge OUT "
                        + "--global-fit MODEL), not by one shard");
            }
            options = options.withShard(Shard.parse(shard));
        }
        options = options.withGlobalFit(global);
        ProgressLine line = new ProgressLine(err);
        BatchOutcome o = BatchRunner.run(options, analyzer, Progress.NONE, line::show);
        line.finish();
        if (o.index() != null) {
            err.println("Report: " + o.index());
        }
        if (o.globalFit() != null) {
            err.println("Global fit: " + o.globalFit());
        }
        return o.allFailed() ? Main.ALL_FAILED : Main.OK;
    }

    /** The joint fit asked for, or null; refuses a model no joint fit is made for. */
    private GlobalFitStudy.Request globalRequest() {
        if (globalFit == null) {
            return null;
        }
        GlobalFitStudy.checkModel(globalFit);
        if (globalBootstrap < 0) {
            throw new InputException(null, "--global-bootstrap must be 0 or more");
        }
        return new GlobalFitStudy.Request(globalFit, globalBootstrap, globalSeed);
    }

    private int plan() {
        if (planSlurm < 1) {
            throw new InputException(null, "--plan-slurm needs at least 1 shard");
        }
        if (shard != null || force) {
            throw new InputException(null, "--plan-slurm writes a plan; --shard and --force belong to the array tasks");
        }
        Path jarFile = jar != null ? jar : runningJar();
        if (jarFile == null) {
            throw new InputException(null, "give --jar with the path of dendrokin-cli.jar for the array tasks");
        }
        SlurmPlan.Planned p = SlurmPlan.write(root, out, planSlurm, new SlurmPlan.Resources(slurmCpus, slurmMemMb,
                slurmTimeMin, slurmPartition, slurmAccount, slurmOptions), jarFile, java, globalRequest());
        err.println("Wrote " + p.script() + ": " + p.shards() + " array tasks, each " + p.cpus() + " CPUs, "
                + p.memMb() + " MB, " + p.timeMinutes() + " min. Submit it with sbatch, then run " + p.merge()
                + " (or batch --merge " + out + ") when all tasks have finished.");
        return Main.OK;
    }

    private static Path runningJar() {
        try {
            Path p = Path.of(BatchCommand.class.getProtectionDomain().getCodeSource().getLocation().toURI());
            return Files.isRegularFile(p) && p.toString().endsWith(".jar") ? p : null;
        } catch (Exception e) {
            return null;
        }
    }

    /** The progress line on stderr: rewritten in place on a terminal, else at most one line every 2 s. */
    static final class ProgressLine {
        private final PrintWriter err;
        private final boolean terminal = System.console() != null;
        private long lastNanos;
        private BatchStatus last;
        private boolean pending;

        ProgressLine(PrintWriter err) {
            this.err = err;
        }

        synchronized void show(BatchStatus s) {
            last = s;
            long now = System.nanoTime();
            if (terminal) {
                err.print("\r" + s.line() + "   ");
                err.flush();
            } else if (now - lastNanos > 2_000_000_000L || s.done() == s.total()) {
                err.println(s.line());
                lastNanos = now;
                pending = false;
                return;
            }
            pending = true;
        }

        synchronized void finish() {
            if (last == null) {
                return;
            }
            if (terminal) {
                err.println();
            } else if (pending) {
                err.println(last.line());
            }
        }
    }
}
