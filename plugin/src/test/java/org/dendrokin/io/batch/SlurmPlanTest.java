package org.dendrokin.io.batch;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Path;
import java.util.List;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

class SlurmPlanTest {

    @Test
    void theScriptRunsOneShardPerArrayTask(@TempDir Path tmp) {
        Path root = tmp.resolve("my study");
        for (int i = 0; i < 5; i++) {
            BatchFixtures.session(root, "cell" + i, "a", 0.5, 0.2);
        }
        Path out = tmp.resolve("out");
        SlurmPlan.Planned p = SlurmPlan.write(root, out, 3, new SlurmPlan.Resources(4, 0, 90, "short", null,
                List.of("--qos=normal")), Path.of("/opt/dk/dendrokin-cli.jar"), "java");
        String script = BatchFixtures.read(p.script());
        assertTrue(script.startsWith("#!/bin/bash\n"), "a bash script");
        assertTrue(script.contains("#SBATCH --array=1-3\n"), "three array tasks");
        assertTrue(script.contains("#SBATCH --cpus-per-task=4\n"), "CPUs as asked");
        assertTrue(script.contains("#SBATCH --time=0-01:30:00\n"), "90 minutes as D-HH:MM:SS");
        assertTrue(script.contains("#SBATCH --partition=short\n"), "partition");
        assertTrue(script.contains("#SBATCH --qos=normal\n"), "extra option");
        assertTrue(script.contains("--threads 4 --shard \"${SLURM_ARRAY_TASK_ID}/3\""), "shard from the task id");
        assertTrue(script.contains("'" + root.toAbsolutePath() + "'"), "a root with a space is quoted");
        assertEquals(3, SlurmPlan.shards(out).size(), "plan saved");
        assertTrue(BatchFixtures.read(p.merge()).contains("batch --merge"), "merge script");
    }

    @Test
    void defaultsGrowWithTheMovies() {
        SlurmPlan.Resources none = new SlurmPlan.Resources(0, 0, 0, null, null, null);
        SlurmPlan.Planned small = SlurmPlan.derive(none, 4, 10L << 20, 100L << 20, 10);
        SlurmPlan.Planned large = SlurmPlan.derive(none, 4, 4L << 30, 40L << 30, 10);
        assertEquals(2, small.cpus(), "default CPUs");
        assertTrue(large.memMb() > small.memMb(), "more memory for larger movies");
        assertTrue(large.timeMinutes() > small.timeMinutes(), "more time for more data");
        assertTrue(small.memMb() >= small.heapMb() + 512, "room for the JVM beside the heap");
        assertEquals(0, small.memMb() % 256, "memory in steps of 256 MB");
    }

    @Test
    void quotingSurvivesBash() {
        assertEquals("/a/b.jar", SlurmPlan.quote("/a/b.jar"));
        assertEquals("'/a b/it'\\''s'", SlurmPlan.quote("/a b/it's"));
    }
}
