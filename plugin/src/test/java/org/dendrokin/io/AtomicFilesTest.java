package org.dendrokin.io;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.attribute.PosixFilePermission;
import java.util.List;
import java.util.Set;
import java.util.stream.Stream;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

class AtomicFilesTest {
    @Test
    void replacesTheTargetAndLeavesNoTemporaryFile(@TempDir Path dir) throws IOException {
        Path target = dir.resolve("out.txt");
        AtomicFiles.writeString(target, "first");
        AtomicFiles.writeString(target, "second");
        assertEquals("second", Files.readString(target));
        try (Stream<Path> files = Files.list(dir)) {
            assertEquals(List.of(target), files.toList(), "only the target is left in the folder");
        }
    }

    @Test
    void aFailedWriteKeepsTheOldFileAndRemovesTheTemporaryOne(@TempDir Path dir) throws IOException {
        Path target = dir.resolve("out.txt");
        AtomicFiles.writeString(target, "complete");
        assertThrows(UncheckedIOException.class, () -> AtomicFiles.write(target, out -> {
            out.write(1);
            throw new IOException("disk full");
        }));
        assertEquals("complete", Files.readString(target));
        try (Stream<Path> files = Files.list(dir)) {
            assertEquals(1, files.count(), "the temporary file was removed");
        }
    }

    @Test
    void outputsAreReadableByOthersAsTheUmaskAllows(@TempDir Path dir) throws IOException {
        Path target = dir.resolve("out.txt");
        AtomicFiles.writeString(target, "x");
        Path plain = Files.writeString(dir.resolve("plain.txt"), "x");
        Set<PosixFilePermission> expected = Files.getPosixFilePermissions(plain);
        // A file written the ordinary way is the reference: the same umask applies to both.
        assertEquals(expected, Files.getPosixFilePermissions(target));
        assertTrue(expected.contains(PosixFilePermission.OWNER_READ));
    }
}
