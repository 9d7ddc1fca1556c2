package org.dendrokin.io.batch;

import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.stream.Collectors;

import org.dendrokin.core.Checks;
import org.dendrokin.io.AtomicFiles;
import org.dendrokin.io.OutputFolder;

/**
 * Plans a batch as a SLURM job array: {@code OUT/slurm/plan.json} (which session goes to which shard),
 * {@code OUT/slurm/batch.sbatch} (array task i runs {@code batch ROOT --out OUT --shard i/N}) and
 * {@code OUT/slurm/merge.sbatch} (joins the shards once they are done). Every shard writes into the same
 * output folder, which must therefore be on a file system that all nodes share.
 */
public final class SlurmPlan {
    private static final long MB = 1L << 20;

    private SlurmPlan() {
    }

    /**
     * What each array task asks SLURM for. A value of 0 (or null) means "derive it from the movie sizes".
     *
     * @param cpus        CPUs per task, also the shard's {@code --threads}
     * @param memMb       memory per task, MB
     * @param timeMinutes wall-time limit per task, minutes
     * @param partition   partition name, or null for the cluster's default
     * @param account     account name, or null
     * @param extra       further {@code #SBATCH} options, each as written after {@code #SBATCH }
     */
    public record Resources(int cpus, int memMb, int timeMinutes, String partition, String account,
                            List<String> extra) {
        public Resources {
            Checks.require(cpus >= 0 && memMb >= 0 && timeMinutes >= 0, "SLURM resources cannot be negative");
            extra = extra == null ? List.of() : List.copyOf(extra);
        }
    }

    /**
     * What the plan asks for, with the figures it derived.
     *
     * @param script    the array script
     * @param merge     the merge script
     * @param shards    number of array tasks
     * @param cpus      CPUs per task
     * @param memMb     memory per task, MB
     * @param heapMb    the Java heap limit given to each task, MB
     * @param timeMinutes time limit per task, minutes
     */
    public record Planned(Path script, Path merge, int shards, int cpus, int memMb, int heapMb, int timeMinutes) {
    }

    /**
     * Writes the plan and both scripts.
     *
     * @param root      session root (absolute paths are written into the scripts)
     * @param out       shared output folder
     * @param shards    number of array tasks, at least 1; more tasks than sessions leaves some tasks empty
     * @param requested resources; zeros are derived (see {@link #derive})
     * @param jar       the dendrokin-cli.jar the tasks run
     * @param javaCommand the java command on the nodes (e.g. {@code java} or a module's full path)
     */
    public static Planned write(Path root, Path out, int shards, Resources requested, Path jar, String javaCommand) {
        return write(root, out, shards, requested, jar, javaCommand, null);
    }

    /**
     * As {@link #write(Path, Path, int, Resources, Path, String)}, with the joint fit of the sessions done by the merge
     * job when {@code globalFit} is not null.
     */
    public static Planned write(Path root, Path out, int shards, Resources requested, Path jar, String javaCommand,
                                GlobalFitStudy.Request globalFit) {
        Checks.positive(shards, "shards");
        OutputFolder.check(out);
        Path r = root.toAbsolutePath().normalize();
        Path o = out.toAbsolutePath().normalize();
        List<SessionFolder> found = SessionFolder.discover(r, o);
        ShardPlan plan = ShardPlan.split(r, found, shards);
        Map<String, Long> movieBytes = found.stream().collect(Collectors.toMap(SessionFolder::id,
                s -> ShardPlan.folderBytes(s.dir())));
        long largest = movieBytes.values().stream().mapToLong(Long::longValue).max().orElse(0);
        long busiest = 0;
        int mostSessions = 0;
        for (List<String> ids : plan.sessions()) {
            busiest = Math.max(busiest, ids.stream().mapToLong(movieBytes::get).sum());
            mostSessions = Math.max(mostSessions, ids.size());
        }
        Planned p = derive(requested, shards, largest, busiest, mostSessions);
        plan.write(o);
        Path dir = o.resolve("slurm");
        Path script = dir.resolve("batch.sbatch");
        Path merge = dir.resolve("merge.sbatch");
        String jarText = jar.toAbsolutePath().normalize().toString();
        StringBuilder s = new StringBuilder();
        s.append("#!/bin/bash\n");
        s.append("# Dendrokin batch as a SLURM job array: ").append(shards).append(" shards of the ")
                .append(found.size()).append(" session folders under ").append(r).append(".\n");
        s.append("# Submit:  jid=$(sbatch --parsable ").append(script).append(")\n");
        s.append("# then:    sbatch --dependency=afterany:$jid ").append(merge).append("\n");
        s.append("# Resources: largest session folder ").append(mb(largest)).append(" MB, busiest shard ")
                .append(mb(busiest)).append(" MB in ").append(mostSessions).append(" sessions.\n");
        s.append("#SBATCH --job-name=dendrokin-batch\n");
        s.append("#SBATCH --array=1-").append(shards).append('\n');
        resources(s, requested, p);
        s.append("#SBATCH --output=").append(dir.resolve("logs")).append("/shard-%a.log\n");
        s.append("set -euo pipefail\n");
        s.append("exec ").append(quote(javaCommand)).append(" -Xmx").append(p.heapMb()).append("m -jar ").append(quote(jarText))
                .append(" batch ").append(quote(r.toString())).append(" --out ").append(quote(o.toString()))
                .append(" --threads ").append(p.cpus()).append(" --shard \"${SLURM_ARRAY_TASK_ID}/").append(shards)
                .append("\"\n");
        // A joint fit holds every session's kymograph and weights at once: about 6 MB for a 200 x 400 kymograph.
        int mergeHeapMb = globalFit == null ? 768 : Math.max(768, 256 + 8 * found.size());
        int mergeCpus = globalFit == null ? 1 : p.cpus();
        StringBuilder m = new StringBuilder();
        m.append("#!/bin/bash\n");
        m.append("# Joins the shards of ").append(o).append(" into one summary.csv and index.html")
                .append(globalFit == null ? "" : ", after a joint fit of all sessions").append(".\n");
        m.append("#SBATCH --job-name=dendrokin-merge\n");
        m.append("#SBATCH --cpus-per-task=").append(mergeCpus).append("\n#SBATCH --mem=").append(mergeHeapMb + 256)
                .append("M\n#SBATCH --time=00:30:00\n");
        if (requested.partition() != null && !requested.partition().isBlank()) {
            m.append("#SBATCH --partition=").append(requested.partition()).append('\n');
        }
        if (requested.account() != null && !requested.account().isBlank()) {
            m.append("#SBATCH --account=").append(requested.account()).append('\n');
        }
        m.append("#SBATCH --output=").append(dir.resolve("logs")).append("/merge.log\n");
        m.append("set -euo pipefail\n");
        m.append("exec ").append(quote(javaCommand)).append(" -Xmx").append(mergeHeapMb).append("m -jar ")
                .append(quote(jarText)).append(" batch --merge ").append(quote(o.toString()));
        if (globalFit != null) {
            m.append(" --global-fit ").append(quote(globalFit.model())).append(" --global-bootstrap ")
                    .append(globalFit.bootstrapReplicates()).append(" --global-seed ").append(globalFit.seed());
        }
        m.append('\n');
        try {
            java.nio.file.Files.createDirectories(dir.resolve("logs"));
        } catch (java.io.IOException e) {
            throw new java.io.UncheckedIOException("could not create " + dir.resolve("logs") + ": " + e.getMessage(), e);
        }
        AtomicFiles.writeString(script, s.toString());
        AtomicFiles.writeString(merge, m.toString());
        return new Planned(script, merge, shards, p.cpus(), p.memMb(), p.heapMb(), p.timeMinutes());
    }

    /**
     * Fills in the resources not requested. CPUs: 2. Java heap: 768 MB plus, for each movie read at once
     * (one per CPU), half the largest session folder, at least 256 MB and at most 2 GB (movies are read
     * frame by frame, so a session needs far less than its movie's size). Memory: heap plus 512 MB for the
     * JVM itself, rounded up to 256 MB. Time: the busiest shard's data at 60 s per GB plus 30 s per
     * session, shared by its CPUs, times 3 for safety, plus 10 minutes.
     */
    static Planned derive(Resources requested, int shards, long largestBytes, long busiestBytes, int mostSessions) {
        int cpus = requested.cpus() > 0 ? requested.cpus() : 2;
        long perMovieMb = Math.min(2048, Math.max(256, largestBytes / MB / 2));
        int heap;
        int mem;
        if (requested.memMb() > 0) {
            mem = requested.memMb();
            heap = Math.max(256, mem - 512);
        } else {
            heap = (int) (768 + cpus * perMovieMb);
            mem = (int) (Math.ceil((heap + 512) / 256.0) * 256);
        }
        int time;
        if (requested.timeMinutes() > 0) {
            time = requested.timeMinutes();
        } else {
            double seconds = (busiestBytes / (double) (1L << 30) * 60 + mostSessions * 30.0) / cpus;
            time = (int) Math.ceil(seconds * 3 / 60.0) + 10;
        }
        return new Planned(null, null, shards, cpus, mem, heap, time);
    }

    private static void resources(StringBuilder s, Resources requested, Planned p) {
        s.append("#SBATCH --cpus-per-task=").append(p.cpus()).append('\n');
        s.append("#SBATCH --mem=").append(p.memMb()).append("M\n");
        s.append(String.format(Locale.ROOT, "#SBATCH --time=%d-%02d:%02d:00%n", p.timeMinutes() / 1440,
                p.timeMinutes() % 1440 / 60, p.timeMinutes() % 60));
        if (requested.partition() != null && !requested.partition().isBlank()) {
            s.append("#SBATCH --partition=").append(requested.partition()).append('\n');
        }
        if (requested.account() != null && !requested.account().isBlank()) {
            s.append("#SBATCH --account=").append(requested.account()).append('\n');
        }
        for (String x : requested.extra()) {
            s.append("#SBATCH ").append(x.trim()).append('\n');
        }
    }

    private static long mb(long bytes) {
        return (bytes + MB - 1) / MB;
    }

    /** Quotes a word for bash: single quotes, with any single quote inside closed, escaped and reopened. */
    static String quote(String word) {
        if (word.matches("[A-Za-z0-9_./=:+-]+")) {
            return word;
        }
        return "'" + word.replace("'", "'\\''") + "'";
    }

    /** Every shard's sessions, for tests and the merge. */
    static List<List<String>> shards(Path out) {
        ShardPlan p = ShardPlan.read(out.toAbsolutePath().normalize());
        return p == null ? List.of() : new ArrayList<>(p.sessions());
    }
}
