package org.dendrokin.io;

import java.io.IOException;
import java.io.OutputStream;
import java.io.UncheckedIOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.AtomicMoveNotSupportedException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.StandardCopyOption;
import java.nio.file.StandardOpenOption;
import java.security.SecureRandom;

/**
 * Writes every output to a temporary name beside its target and renames it into place, so that a run
 * stopped half way leaves either the old file or the complete new one, never a partial one.
 */
public final class AtomicFiles {
    private static final SecureRandom RANDOM = new SecureRandom();

    private AtomicFiles() {
    }

    /** Writes bytes produced by {@code writer} to {@code target} through a temporary file. */
    public static void write(Path target, IoConsumer<OutputStream> writer) {
        Path dir = target.toAbsolutePath().getParent();
        Path tmp = null;
        try {
            Files.createDirectories(dir);
            // Not Files.createTempFile: it makes the file readable by its owner only, whatever the umask.
            tmp = dir.resolve("." + target.getFileName() + "." + Long.toUnsignedString(RANDOM.nextLong(), 36) + ".part");
            try (OutputStream out = Files.newOutputStream(tmp, StandardOpenOption.CREATE_NEW,
                    StandardOpenOption.WRITE)) {
                writer.accept(out);
            }
            move(tmp, target);
            tmp = null;
        } catch (IOException e) {
            throw new UncheckedIOException("could not write " + target + ": " + e.getMessage(), e);
        } finally {
            if (tmp != null) {
                try {
                    Files.deleteIfExists(tmp);
                } catch (IOException ignored) {
                    // the original failure is the one worth reporting
                }
            }
        }
    }

    /** Writes UTF-8 text to {@code target} through a temporary file. */
    public static void writeString(Path target, String text) {
        write(target, out -> out.write(text.getBytes(StandardCharsets.UTF_8)));
    }

    private static void move(Path from, Path to) throws IOException {
        try {
            Files.move(from, to, StandardCopyOption.ATOMIC_MOVE, StandardCopyOption.REPLACE_EXISTING);
        } catch (AtomicMoveNotSupportedException e) {
            Files.move(from, to, StandardCopyOption.REPLACE_EXISTING);
        }
    }

    /** A consumer that may throw {@link IOException}. */
    @FunctionalInterface
    public interface IoConsumer<T> {
        void accept(T value) throws IOException;
    }
}
