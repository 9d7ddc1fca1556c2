package org.dendrokin.io;

import java.io.IOException;
import java.io.OutputStream;
import java.io.UncheckedIOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.AccessDeniedException;
import java.nio.file.AtomicMoveNotSupportedException;
import java.nio.file.FileAlreadyExistsException;
import java.nio.file.FileSystemException;
import java.nio.file.Files;
import java.nio.file.NoSuchFileException;
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
            // Named by its folder and file name: the temporary name, which the exception would give, means nothing
            // to the user.
            throw new UncheckedIOException(dir + ": " + target.getFileName() + " cannot be written into this folder ("
                    + reason(e) + ").", e);
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

    /**
     * What went wrong, in words that do not repeat the file's name: a file-system exception's message is often only
     * the (temporary) file's path.
     */
    public static String reason(IOException e) {
        if (e instanceof AccessDeniedException) {
            return "permission denied";
        }
        if (e instanceof NoSuchFileException) {
            return "a folder on the way does not exist";
        }
        if (e instanceof FileAlreadyExistsException) {
            return "a file stands where a folder or file of that name is needed";
        }
        if (e instanceof FileSystemException fs) {
            return fs.getReason() != null ? fs.getReason() : e.getClass().getSimpleName();
        }
        return e.getMessage() != null ? e.getMessage() : e.getClass().getSimpleName();
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
