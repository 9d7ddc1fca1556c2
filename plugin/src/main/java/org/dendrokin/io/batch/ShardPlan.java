package org.dendrokin.io.batch;

import java.io.IOException;
import java.nio.file.DirectoryStream;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Comparator;
import java.util.List;
import java.util.Map;
import java.util.function.Function;
import java.util.stream.Collectors;

import com.google.gson.Gson;
import com.google.gson.GsonBuilder;
import com.google.gson.JsonObject;

import org.dendrokin.io.AtomicFiles;
import org.dendrokin.io.InputException;
import org.dendrokin.io.json.JsonFiles;

/**
 * Splits a batch's sessions into N shards of about equal work: sessions are taken largest first (bytes of
 * the files in the session folder) and each goes to the shard with the least work so far (longest
 * processing time first; Graham 1969), ties to the lower shard. Every session lands in exactly one shard.
 * The split is saved as {@code OUT/slurm/plan.json} when the job is planned, so that shards started later
 * agree on it even if files changed meanwhile.
 *
 * @param root     absolute session root
 * @param sessions the ids of each shard's sessions; element 0 is shard 1
 */
public record ShardPlan(String root, List<List<String>> sessions) {
    static final String FILE = "plan.json";
    private static final Gson GSON = new GsonBuilder().setPrettyPrinting().disableHtmlEscaping().create();

    public ShardPlan {
        sessions = sessions.stream().map(List::copyOf).toList();
    }

    public int count() {
        return sessions.size();
    }

    /** The ids of every session in the plan, in id order. */
    public List<String> allIds() {
        return sessions.stream().flatMap(List::stream).sorted(SessionFolder.ORDER).toList();
    }

    /** Splits {@code found} into {@code count} shards by the size of each session folder's files. */
    public static ShardPlan split(Path root, List<SessionFolder> found, int count) {
        Map<String, Long> sizes = found.stream().collect(Collectors.toMap(SessionFolder::id, s -> folderBytes(s.dir())));
        return split(root, found, count, s -> sizes.get(s.id()));
    }

    /** Splits {@code found} into {@code count} shards, weighing each session by {@code weight}. */
    static ShardPlan split(Path root, List<SessionFolder> found, int count, Function<SessionFolder, Long> weight) {
        if (count < 1) {
            throw new IllegalArgumentException("a batch is split into at least one shard");
        }
        List<SessionFolder> order = new ArrayList<>(found);
        order.sort(Comparator.comparing((SessionFolder s) -> -weight.apply(s)).thenComparing(SessionFolder::id));
        List<List<String>> shards = new ArrayList<>();
        long[] load = new long[count];
        for (int i = 0; i < count; i++) {
            shards.add(new ArrayList<>());
        }
        for (SessionFolder s : order) {
            int best = 0;
            for (int i = 1; i < count; i++) {
                if (load[i] < load[best]) {
                    best = i;
                }
            }
            shards.get(best).add(s.id());
            load[best] += weight.apply(s) + 1;
        }
        shards.forEach(ids -> ids.sort(SessionFolder.ORDER));
        return new ShardPlan(root.toAbsolutePath().normalize().toString(), shards);
    }

    /** The sessions of one shard, in id order. */
    public List<SessionFolder> select(List<SessionFolder> found, Shard shard) {
        if (shard.count() != count()) {
            throw new InputException(null, "--shard " + shard + " does not match the plan of " + count() + " shards");
        }
        java.util.Set<String> mine = new java.util.HashSet<>(sessions.get(shard.index() - 1));
        return found.stream().filter(s -> mine.contains(s.id())).toList();
    }

    public void write(Path out) {
        AtomicFiles.writeString(out.resolve("slurm").resolve(FILE), GSON.toJson(this) + "\n");
    }

    /** The plan saved in {@code OUT/slurm}, or null if there is none. */
    public static ShardPlan read(Path out) {
        Path f = out.resolve("slurm").resolve(FILE);
        if (!Files.isRegularFile(f)) {
            return null;
        }
        JsonObject json = JsonFiles.readObject(f, "the shard plan written by --plan-slurm");
        ShardPlan p;
        try {
            p = GSON.fromJson(json, ShardPlan.class);
        } catch (RuntimeException e) {
            // Gson reports a wrong type as JsonParseException and a record constructor refusing its values as
            // a bare RuntimeException; both mean the plan was edited or damaged.
            throw new InputException(f, "this shard plan does not have the form --plan-slurm writes; plan the job "
                    + "again", e);
        }
        if (p == null || p.sessions() == null || p.root() == null) {
            throw new InputException(f, "this shard plan has no root or no sessions");
        }
        return p;
    }

    /** Bytes of the regular files directly inside {@code dir}. */
    static long folderBytes(Path dir) {
        long total = 0;
        try (DirectoryStream<Path> files = Files.newDirectoryStream(dir)) {
            for (Path f : files) {
                if (Files.isRegularFile(f)) {
                    total += Files.size(f);
                }
            }
        } catch (IOException e) {
            return total;
        }
        return total;
    }
}
