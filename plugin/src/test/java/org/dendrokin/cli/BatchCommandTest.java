package org.dendrokin.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.ByteArrayOutputStream;
import java.io.IOException;
import java.io.PrintStream;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;

import org.dendrokin.io.InputException;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

import picocli.CommandLine;

class BatchCommandTest {

    /** Runs the batch command with a stand-in analysis that fails for sessions whose name starts with "bad". */
    private static int runWithStandIn(ByteArrayOutputStream err, String... args) {
        BatchCommand command = new BatchCommand();
        command.err = new java.io.PrintWriter(new PrintStream(err, true, StandardCharsets.UTF_8), true);
        command.analyzer = (dir, out, progress) -> {
            if (dir.getFileName().toString().startsWith("bad")) {
                throw new InputException(dir.resolve("session.json"), "the stand-in analysis rejects this session");
            }
            try {
                Files.writeString(out.resolve("results.json"), "{\"fits\": [], \"warnings\": []}");
            } catch (IOException e) {
                throw new java.io.UncheckedIOException(e);
            }
        };
        CommandLine cl = new CommandLine(command);
        cl.setExecutionExceptionHandler((ex, line, parse) -> Main.report(ex, new PrintStream(err, true,
                StandardCharsets.UTF_8), false));
        return cl.execute(args);
    }

    private static void session(Path root, String name) throws IOException {
        Files.createDirectories(root.resolve(name));
        Files.writeString(root.resolve(name).resolve("session.json"), "{\"group\": \"g\"}");
    }

    @Test
    void exitsZeroWhenSomeFailAndThreeWhenAllFail(@TempDir Path tmp) throws IOException {
        Path mixed = tmp.resolve("mixed");
        session(mixed, "good1");
        session(mixed, "bad1");
        ByteArrayOutputStream err = new ByteArrayOutputStream();
        assertEquals(Main.OK, runWithStandIn(err, mixed.toString(), "--out", tmp.resolve("o1").toString(),
                "--threads", "2"), "a batch with some failures finished");
        String text = err.toString(StandardCharsets.UTF_8);
        assertTrue(text.contains("2/2 sessions done (1 failed, 0 skipped)"), "progress line: " + text);
        assertTrue(text.contains("index.html"), "says where the report is: " + text);

        Path broken = tmp.resolve("broken");
        session(broken, "bad1");
        session(broken, "bad2");
        assertEquals(Main.ALL_FAILED, runWithStandIn(new ByteArrayOutputStream(), broken.toString(), "--out",
                tmp.resolve("o2").toString()), "every session failed");
    }

    @Test
    void badUsageIsExitTwoWithOneSentence(@TempDir Path tmp) throws IOException {
        ByteArrayOutputStream err = new ByteArrayOutputStream();
        PrintStream e = new PrintStream(err, true, StandardCharsets.UTF_8);
        PrintStream o = new PrintStream(new ByteArrayOutputStream(), true, StandardCharsets.UTF_8);
        assertEquals(Main.BAD_INPUT, Main.run(new String[] {"batch", tmp.toString()}, o, e), "no --out");
        assertEquals(Main.BAD_INPUT, Main.run(new String[] {"batch", tmp.resolve("none").toString(), "--out",
                tmp.resolve("o").toString()}, o, e), "root does not exist");
        Files.createDirectories(tmp.resolve("empty"));
        err.reset();
        assertEquals(Main.BAD_INPUT, Main.run(new String[] {"batch", tmp.resolve("empty").toString(), "--out",
                tmp.resolve("o").toString()}, o, e), "no session under the root");
        String text = err.toString(StandardCharsets.UTF_8);
        assertTrue(text.contains("empty") && text.contains("session.json"), "names the folder: " + text);
        assertFalse(text.contains("\tat "), "no stack trace: " + text);
        session(tmp.resolve("r"), "s");
        assertEquals(Main.BAD_INPUT, Main.run(new String[] {"batch", tmp.resolve("r").toString(), "--out",
                tmp.resolve("o").toString(), "--shard", "5/4"}, o, e), "shard out of range");
    }

    @Test
    void planSlurmWritesTheScript(@TempDir Path tmp) throws IOException {
        session(tmp.resolve("r"), "s1");
        session(tmp.resolve("r"), "s2");
        ByteArrayOutputStream err = new ByteArrayOutputStream();
        assertEquals(Main.OK, runWithStandIn(err, tmp.resolve("r").toString(), "--out", tmp.resolve("o").toString(),
                "--plan-slurm", "2", "--jar", "/opt/dendrokin-cli.jar"), "plan written");
        assertTrue(Files.readString(tmp.resolve("o/slurm/batch.sbatch")).contains("--array=1-2"), "array of two");
    }
}
