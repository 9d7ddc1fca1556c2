package org.dendrokin.io.batch;

import java.io.IOException;
import java.io.OutputStream;
import java.net.InetAddress;
import java.nio.charset.StandardCharsets;
import java.nio.file.DirectoryStream;
import java.nio.file.FileAlreadyExistsException;
import java.nio.file.Files;
import java.nio.file.NoSuchFileException;
import java.nio.file.Path;
import java.nio.file.StandardOpenOption;
import java.nio.file.attribute.FileTime;
import java.time.Duration;
import java.time.Instant;
import java.time.temporal.ChronoUnit;
import java.util.concurrent.Executors;
import java.util.concurrent.ScheduledExecutorService;
import java.util.concurrent.TimeUnit;

import com.google.gson.JsonObject;

import org.dendrokin.io.AtomicFiles;
import org.dendrokin.io.InputException;
import org.dendrokin.io.json.JsonFiles;

/**
 * Keeps two batches from writing into one output folder at once. A running batch holds a lock file in the output
 * folder ({@code batch.lock}, or {@code batch-shard-i-of-N.lock} for one shard of a cluster run, so that the shards
 * of one plan run side by side) naming its process, host and start time; it touches the file every
 * {@value #HEARTBEAT_S} s and deletes it when it ends. A whole run waits for no lock of any kind, a shard for no
 * whole-run lock and none of its own shard.
 *
 * <p>A lock is stale, and is taken over, when its process is gone (known only on the same host) or when it has not
 * been touched for {@link #STALE_AFTER} (a batch killed on another node of a cluster). The check and the creation are
 * not one atomic step for a stale lock: two batches that find the same stale lock at the same moment could both take
 * it over. A fresh lock is created with {@code CREATE_NEW}, which is atomic.
 */
final class BatchLock implements AutoCloseable {
    /** A lock not touched for this long belongs to a batch that was killed. */
    static final Duration STALE_AFTER = Duration.ofMinutes(10);
    private static final long HEARTBEAT_S = 60;
    private static final String WHOLE = "batch.lock";
    private static final String PREFIX = "batch";
    private static final String SUFFIX = ".lock";

    private final Path file;
    private final String content;
    private final ScheduledExecutorService heartbeat;
    /** Removes the lock when the JVM is stopped (SIGTERM, as SLURM sends at a time limit) before {@link #close}. */
    private final Thread onExit;

    private BatchLock(Path file, String content) {
        this.file = file;
        this.content = content;
        this.onExit = new Thread(this::release, "dendrokin-batch-lock-release");
        Runtime.getRuntime().addShutdownHook(onExit);
        this.heartbeat = Executors.newSingleThreadScheduledExecutor(r -> {
            Thread t = new Thread(r, "dendrokin-batch-lock");
            t.setDaemon(true);
            return t;
        });
        heartbeat.scheduleAtFixedRate(this::touch, HEARTBEAT_S, HEARTBEAT_S, TimeUnit.SECONDS);
    }

    /** The lock file's name for a whole run ({@code shard} null) or for one shard. */
    static String fileName(Shard shard) {
        return shard == null ? WHOLE : PREFIX + "-shard-" + shard.index() + "-of-" + shard.count() + SUFFIX;
    }

    /**
     * Takes the lock of {@code out} (an existing folder) for a whole run or one shard.
     *
     * @throws InputException naming the lock file of a batch that is still running
     */
    static BatchLock acquire(Path out, Shard shard) {
        Path mine = out.resolve(fileName(shard));
        for (int attempt = 0; attempt < 3; attempt++) {
            Path held = liveConflict(out, shard);
            if (held != null) {
                throw new InputException(held, "another batch is writing into this output folder (" + owner(held)
                        + "); wait for it to end or give another --out (the lock of a batch that was killed is taken "
                        + "over once its process is gone, or " + STALE_AFTER.toMinutes()
                        + " minutes after its last sign of life)");
            }
            String content = content(shard);
            try {
                Files.deleteIfExists(mine);  // stale: liveConflict found no live lock of this name
                try (OutputStream o = Files.newOutputStream(mine, StandardOpenOption.CREATE_NEW,
                        StandardOpenOption.WRITE)) {
                    o.write(content.getBytes(StandardCharsets.UTF_8));
                }
                return new BatchLock(mine, content);
            } catch (FileAlreadyExistsException e) {
                // another batch created it between the check and here: check again, and refuse if it lives
            } catch (IOException e) {
                throw new InputException(out, "the batch's lock file cannot be written here ("
                        + AtomicFiles.reason(e) + ")", e);
            }
        }
        throw new InputException(mine, "other batches keep taking this output folder's lock; give another --out");
    }

    /** A live lock that keeps a run of {@code shard} out, or null. */
    private static Path liveConflict(Path out, Shard shard) {
        try (DirectoryStream<Path> locks = Files.newDirectoryStream(out, PREFIX + "*" + SUFFIX)) {
            for (Path lock : locks) {
                String name = lock.getFileName().toString();
                boolean conflicts = shard == null || name.equals(WHOLE) || name.equals(fileName(shard));
                if (conflicts && live(lock)) {
                    return lock;
                }
            }
        } catch (IOException e) {
            throw new InputException(out, "the output folder cannot be listed (" + AtomicFiles.reason(e) + ")", e);
        }
        return null;
    }

    /** True unless the lock's process is known to be gone or the lock was not touched for {@link #STALE_AFTER}. */
    static boolean live(Path lock) {
        FileTime touched;
        JsonObject o;
        try {
            touched = Files.getLastModifiedTime(lock);
            o = JsonFiles.parseObject(lock, Files.readString(lock, StandardCharsets.UTF_8), "the batch lock");
        } catch (NoSuchFileException e) {
            return false;
        } catch (IOException | InputException e) {
            // Being written this very moment, or damaged: only its age tells.
            return isRecent(lock);
        }
        if (touched.toInstant().isBefore(Instant.now().minus(STALE_AFTER))) {
            return false;
        }
        if (o.has("host") && o.has("pid") && host().equals(o.get("host").getAsString())) {
            return ProcessHandle.of(o.get("pid").getAsLong()).map(ProcessHandle::isAlive).orElse(false);
        }
        return true;
    }

    private static boolean isRecent(Path lock) {
        try {
            return Files.getLastModifiedTime(lock).toInstant().isAfter(Instant.now().minus(STALE_AFTER));
        } catch (IOException e) {
            return false;
        }
    }

    /** "process 1234 on host node7, started 2026-12-04T10:00:00Z", or what is known of it. */
    private static String owner(Path lock) {
        try {
            JsonObject o = JsonFiles.parseObject(lock, Files.readString(lock, StandardCharsets.UTF_8), "the batch lock");
            return "process " + o.get("pid").getAsString() + " on host " + o.get("host").getAsString() + ", started "
                    + o.get("started").getAsString();
        } catch (IOException | RuntimeException e) {
            return "its owner is not recorded yet";
        }
    }

    private static String content(Shard shard) {
        JsonObject o = new JsonObject();
        o.addProperty("pid", ProcessHandle.current().pid());
        o.addProperty("host", host());
        o.addProperty("started", Instant.now().truncatedTo(ChronoUnit.SECONDS).toString());
        if (shard != null) {
            o.addProperty("shard", shard.toString());
        }
        return o + "\n";
    }

    /** This machine's name as the lock records it. */
    static String host() {
        return Host.NAME;
    }

    /** Looked up once: the look-up may ask a name server. */
    private static final class Host {
        static final String NAME = lookUp();

        private static String lookUp() {
            try {
                return InetAddress.getLocalHost().getHostName();
            } catch (IOException e) {
                String env = System.getenv("HOSTNAME");
                return env != null ? env : "unknown";
            }
        }
    }

    /** The lock's file. */
    Path file() {
        return file;
    }

    private void touch() {
        try {
            Files.setLastModifiedTime(file, FileTime.from(Instant.now()));
        } catch (IOException e) {
            // the folder went away: the batch itself will report that
        }
    }

    /** Stops the heartbeat and deletes the lock file if it is still this batch's. */
    @Override
    public void close() {
        try {
            Runtime.getRuntime().removeShutdownHook(onExit);
        } catch (IllegalStateException e) {
            // the JVM is already stopping: the hook does the work
        }
        release();
    }

    private void release() {
        heartbeat.shutdownNow();
        try {
            if (content.equals(Files.readString(file, StandardCharsets.UTF_8))) {
                Files.delete(file);
            }
        } catch (NoSuchFileException e) {
            // taken over as stale and removed by another batch
        } catch (IOException e) {
            // Left behind, it is taken over as stale by the next batch once this process is gone.
        }
    }
}
