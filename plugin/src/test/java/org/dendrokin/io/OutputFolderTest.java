package org.dendrokin.io;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;
import static org.junit.jupiter.api.Assumptions.assumeFalse;

import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.file.AccessDeniedException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.attribute.FileTime;
import java.nio.file.attribute.PosixFilePermissions;
import java.time.Duration;
import java.time.Instant;
import java.util.List;
import java.util.stream.Stream;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

class OutputFolderTest {
    private static List<String> names(Path dir) throws IOException {
        try (Stream<Path> files = Files.list(dir)) {
            return files.map(p -> p.getFileName().toString()).sorted().toList();
        }
    }

    @Test
    void everyOutputArrivesTogetherAndNoStagingFolderIsLeft(@TempDir Path tmp) throws IOException {
        Path out = tmp.resolve("out");
        OutputFolder.fill(out, dir -> {
            AtomicFiles.writeString(dir.resolve("kymograph.png"), "new picture");
            AtomicFiles.writeString(dir.resolve("results.json"), "{}");
        });
        assertEquals(List.of("kymograph.png", "results.json"), names(out));
    }

    @Test
    void aFailureWhileWritingLeavesTheFolderAsItWas(@TempDir Path tmp) throws IOException {
        Path out = tmp.resolve("out");
        Files.createDirectories(out);
        Files.writeString(out.resolve("kymograph.png"), "old picture");
        Files.writeString(out.resolve("results.json"), "{\"old\": true}");
        Files.writeString(out.resolve("notes.txt"), "the user's own file");
        assertThrows(InputException.class, () -> OutputFolder.fill(out, dir -> {
            AtomicFiles.writeString(dir.resolve("kymograph.png"), "new picture");
            AtomicFiles.writeString(dir.resolve("path.png"), "new picture");
            throw new InputException(dir, "a failure half way through the pictures");
        }));
        assertEquals(List.of("kymograph.png", "notes.txt", "results.json"), names(out), "no new file, no staging");
        assertEquals("old picture", Files.readString(out.resolve("kymograph.png")));
        assertEquals("{\"old\": true}", Files.readString(out.resolve("results.json")));
    }

    @Test
    void aFolderThatAFailedRunCreatedIsRemovedAgain(@TempDir Path tmp) {
        Path out = tmp.resolve("new/out");
        assertThrows(IllegalStateException.class, () -> OutputFolder.fill(out, dir -> {
            AtomicFiles.writeString(dir.resolve("kymograph.png"), "new picture");
            throw new IllegalStateException("a programming error while writing");
        }));
        assertFalse(Files.exists(out), "no empty output folder is left");
    }

    @Test
    void aFolderWhereAnOutputFileGoesIsNamedAndTheOldResultsKept(@TempDir Path tmp) throws IOException {
        Path out = tmp.resolve("out");
        Files.createDirectories(out.resolve("report.html"));
        Files.writeString(out.resolve("report.html/inside.txt"), "x");
        Files.writeString(out.resolve("results.json"), "{\"old\": true}");
        InputException e = assertThrows(InputException.class, () -> OutputFolder.fill(out, dir -> {
            AtomicFiles.writeString(dir.resolve("report.html"), "<html>");
            AtomicFiles.writeString(dir.resolve("results.json"), "{}");
        }));
        assertTrue(e.getMessage().startsWith(out.resolve("report.html") + ": "), e.getMessage());
        assertEquals("{\"old\": true}", Files.readString(out.resolve("results.json")));
    }

    @Test
    void stagingFoldersLeftByKilledRunsAreRemovedAfterAnHour(@TempDir Path tmp) throws IOException {
        Path out = tmp.resolve("out");
        Path old = Files.createDirectories(out.resolve(OutputFolder.STAGING_PREFIX + "old"));
        Files.writeString(old.resolve("kymograph.png"), "x");
        Files.setLastModifiedTime(old, FileTime.from(Instant.now().minus(Duration.ofHours(2))));
        Path recent = Files.createDirectories(out.resolve(OutputFolder.STAGING_PREFIX + "recent"));
        OutputFolder.fill(out, dir -> AtomicFiles.writeString(dir.resolve("results.json"), "{}"));
        assertFalse(Files.exists(old), "an hour-old staging folder belongs to a killed run");
        assertTrue(Files.exists(recent), "a recent one may belong to a run still writing");
    }

    @Test
    void aReadOnlyOutputFolderIsNamedBeforeAnythingIsRead(@TempDir Path tmp) throws IOException {
        Path ro = Files.createDirectories(tmp.resolve("read-only"));
        Files.setPosixFilePermissions(ro, PosixFilePermissions.fromString("r-xr-xr-x"));
        try {
            // The superuser may write anywhere, so the check can only be seen as another user.
            assumeFalse(Files.isWritable(ro), "running as a user who may write into read-only folders");
            InputException e = assertThrows(InputException.class, () -> OutputFolder.check(ro.resolve("out")));
            assertTrue(e.getMessage().startsWith(ro.resolve("out") + ": ") && e.getMessage().contains(ro.toString())
                    && e.getMessage().contains("cannot be written"), e.getMessage());
        } finally {
            Files.setPosixFilePermissions(ro, PosixFilePermissions.fromString("rwxr-xr-x"));
        }
    }

    @Test
    void aFileThatCannotBeWrittenIsReportedByItsFolderNotItsTemporaryName(@TempDir Path tmp) {
        Path target = tmp.resolve("results.json");
        UncheckedIOException e = assertThrows(UncheckedIOException.class, () -> AtomicFiles.write(target, o -> {
            // What the file system reports for a read-only folder: the path of the file it refused to create.
            throw new AccessDeniedException(tmp.resolve(".results.json.x1y2.part").toString());
        }));
        assertEquals(tmp + ": results.json cannot be written into this folder (permission denied).", e.getMessage());
    }
}
