package org.dendrokin.io;

import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.file.AtomicMoveNotSupportedException;
import java.nio.file.DirectoryStream;
import java.nio.file.Files;
import java.nio.file.LinkOption;
import java.nio.file.Path;
import java.nio.file.StandardCopyOption;
import java.nio.file.attribute.FileTime;
import java.security.SecureRandom;
import java.time.Duration;
import java.time.Instant;
import java.util.ArrayList;
import java.util.Comparator;
import java.util.List;
import java.util.function.Consumer;
import java.util.stream.Stream;

/**
 * The output folder of an analysis ({@code --out}): checked before any input is read, and filled so that a run
 * that fails leaves it as it was.
 *
 * <p>{@link #check} refuses, each with one sentence naming the folder: an output folder that is a file or lies below
 * one; one that is a session folder or lies inside one (the folder given, or any folder holding a session.json,
 * symbolic links followed), since session folders are never written; and one whose nearest existing folder this user
 * cannot write.
 *
 * <p>{@link #fill} lets the writer put every output into a hidden folder inside the output folder and moves the files
 * into place only when all of them are written, {@code results.json} last (an older {@code results.json} is removed
 * first). A failure while writing leaves the output folder as it was; a {@code results.json} in it always comes with
 * every other file of the same run. See docs/decisions.md.
 */
public final class OutputFolder {
    /** The record of a complete run: moved into place last. */
    static final String RESULTS_JSON = "results.json";
    /** Name prefix of the hidden folder a run writes into before its files are moved into place. */
    static final String STAGING_PREFIX = ".dendrokin-partial-";
    /** A staging folder this old was left by a run that was killed; younger ones may belong to a running analysis. */
    private static final Duration LEFTOVER_AGE = Duration.ofHours(1);
    private static final String SESSION_JSON = "session.json";
    private static final SecureRandom RANDOM = new SecureRandom();

    private OutputFolder() {
    }

    /**
     * Refuses an output folder that cannot take the outputs of an analysis of {@code inputFolders}. Writes nothing.
     *
     * @param outDir       the output folder as the user gave it; it need not exist
     * @param inputFolders the session folders (or a batch's root) the analysis reads; never written
     * @throws InputException naming {@code outDir}
     */
    public static void check(Path outDir, Path... inputFolders) {
        Path abs = outDir.toAbsolutePath().normalize();
        Path existing = existingFolder(outDir, abs);
        Path real = realPath(existing, outDir).resolve(existing.relativize(abs)).normalize();
        boolean linked = !real.equals(abs);
        for (Path input : inputFolders) {
            if (input != null && Files.isDirectory(input)) {
                Path in = realPath(input, outDir);
                if (real.startsWith(in)) {
                    throw insideSession(outDir, in, real.equals(in), linked);
                }
            }
        }
        for (Path p = real; p != null; p = p.getParent()) {
            if (Files.isRegularFile(p.resolve(SESSION_JSON))) {
                throw insideSession(outDir, p, p.equals(real), linked);
            }
        }
        requireWritable(outDir, abs, existing);
    }

    /**
     * Refuses an output folder that is a file, lies below a file or cannot be written, and nothing else: for outputs
     * that belong in a session folder, as the calibration that session.json names with {@code "method": "file"}.
     * Writes nothing.
     *
     * @param outDir the output folder as the user gave it; it need not exist
     * @throws InputException naming {@code outDir}
     */
    public static void checkWritable(Path outDir) {
        Path abs = outDir.toAbsolutePath().normalize();
        requireWritable(outDir, abs, existingFolder(outDir, abs));
    }

    /** The output folder or its nearest existing ancestor, which must be a folder. */
    private static Path existingFolder(Path outDir, Path abs) {
        Path existing = abs;
        while (existing.getParent() != null && !Files.exists(existing)) {
            existing = existing.getParent();
        }
        if (!Files.isDirectory(existing)) {
            throw new InputException(outDir, existing.equals(abs)
                    ? "this is a file, not a folder, so the outputs cannot be written into it; give --out a folder"
                    : existing + " is a file, not a folder, so the output folder cannot be made below it");
        }
        return existing;
    }

    private static void requireWritable(Path outDir, Path abs, Path existing) {
        if (!Files.isWritable(existing)) {
            throw new InputException(outDir, (existing.equals(abs) ? "this folder" : "the folder " + existing)
                    + " cannot be written by this user; give --out a folder you can write to");
        }
    }

    private static InputException insideSession(Path outDir, Path session, boolean same, boolean linked) {
        String where = same ? "is the session folder " + session : "lies inside the session folder " + session;
        return new InputException(outDir, "the output folder " + where + (linked ? " (through a symbolic link)" : "")
                + "; give --out a folder outside every session folder, which Dendrokin never writes");
    }

    private static Path realPath(Path p, Path outDir) {
        try {
            return p.toRealPath();
        } catch (IOException e) {
            throw new InputException(outDir, "the folder " + p + " cannot be examined (" + e.getMessage() + ")", e);
        }
    }

    /**
     * Runs {@code writer} on a new hidden folder inside {@code outDir} and moves what it wrote into {@code outDir},
     * {@code results.json} last, replacing files of the same names. If the writer fails, nothing of its work is
     * left and the output folder keeps what it held (a folder this call created is removed again).
     *
     * @param outDir the output folder, created with its parents if missing
     * @param writer writes the outputs into the folder it is given (flat: files only)
     * @throws InputException if the output folder cannot be created or an output cannot be put in place
     */
    public static void fill(Path outDir, Consumer<Path> writer) {
        boolean created = !Files.exists(outDir);
        try {
            Files.createDirectories(outDir);
        } catch (IOException e) {
            throw new InputException(outDir, "the output folder cannot be created (" + AtomicFiles.reason(e) + ")", e);
        }
        removeLeftovers(outDir);
        Path staging = outDir.resolve(STAGING_PREFIX + Long.toUnsignedString(RANDOM.nextLong(), 36));
        boolean done = false;
        try {
            Files.createDirectory(staging);
            writer.accept(staging);
            install(staging, outDir);
            done = true;
        } catch (IOException e) {
            throw new InputException(outDir, "the outputs cannot be written into this folder ("
                    + AtomicFiles.reason(e) + ")", e);
        } finally {
            deleteQuietly(staging);
            if (!done && created) {
                try {
                    Files.deleteIfExists(outDir);
                } catch (IOException e) {
                    // not empty, or not ours to remove after all: leave it
                }
            }
        }
    }

    /** Moves every file of {@code staging} into {@code outDir}: the old results.json out first, the new one last. */
    private static void install(Path staging, Path outDir) throws IOException {
        List<Path> files = new ArrayList<>();
        try (DirectoryStream<Path> entries = Files.newDirectoryStream(staging)) {
            entries.forEach(files::add);
        }
        for (Path f : files) {
            Path target = outDir.resolve(f.getFileName().toString());
            if (Files.isDirectory(target, LinkOption.NOFOLLOW_LINKS)) {
                throw new InputException(target, "a folder of this name stands where an output file goes; move it "
                        + "out of the output folder");
            }
        }
        Files.deleteIfExists(outDir.resolve(RESULTS_JSON));
        files.sort(Comparator.comparing((Path f) -> f.getFileName().toString().equals(RESULTS_JSON)));
        for (Path f : files) {
            Path target = outDir.resolve(f.getFileName().toString());
            try {
                Files.move(f, target, StandardCopyOption.ATOMIC_MOVE, StandardCopyOption.REPLACE_EXISTING);
            } catch (AtomicMoveNotSupportedException e) {
                Files.move(f, target, StandardCopyOption.REPLACE_EXISTING);
            }
        }
    }

    /** Removes staging folders that runs killed over an hour ago left behind. */
    private static void removeLeftovers(Path outDir) {
        FileTime before = FileTime.from(Instant.now().minus(LEFTOVER_AGE));
        try (DirectoryStream<Path> entries = Files.newDirectoryStream(outDir, p -> p.getFileName().toString()
                .startsWith(STAGING_PREFIX))) {
            for (Path p : entries) {
                if (Files.getLastModifiedTime(p, LinkOption.NOFOLLOW_LINKS).compareTo(before) < 0) {
                    deleteQuietly(p);
                }
            }
        } catch (IOException e) {
            throw new InputException(outDir, "the output folder cannot be listed (" + AtomicFiles.reason(e) + ")", e);
        }
    }

    /** Deletes a folder and everything in it; a failure here must not hide the failure being reported. */
    private static void deleteQuietly(Path dir) {
        if (!Files.exists(dir, LinkOption.NOFOLLOW_LINKS)) {
            return;
        }
        try (Stream<Path> walk = Files.walk(dir)) {
            for (Path p : walk.sorted(Comparator.reverseOrder()).toList()) {
                Files.deleteIfExists(p);
            }
        } catch (IOException | UncheckedIOException e) {
            // best effort: a hidden staging folder left behind is removed by a later run
        }
    }
}
