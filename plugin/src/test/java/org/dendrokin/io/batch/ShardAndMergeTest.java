package org.dendrokin.io.batch;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Path;
import java.util.ArrayList;
import java.util.HashSet;
import java.util.List;
import java.util.Random;
import java.util.Set;

import org.dendrokin.core.Progress;
import org.dendrokin.io.InputException;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

class ShardAndMergeTest {

    @Test
    void everySessionIsInExactlyOneShard() {
        Random random = new Random(20261201);  // fixed seed: a failure must reproduce
        for (int sessions : new int[] {1, 2, 7, 40}) {
            List<SessionFolder> found = new ArrayList<>();
            List<Long> weights = new ArrayList<>();
            for (int i = 0; i < sessions; i++) {
                found.add(new SessionFolder("s" + i, Path.of("/nowhere/s" + i)));
                weights.add((long) random.nextInt(1000));
            }
            for (int shards = 1; shards <= 9; shards++) {
                ShardPlan plan = ShardPlan.split(Path.of("/nowhere"), found, shards,
                        s -> weights.get(Integer.parseInt(s.id().substring(1))));
                assertEquals(shards, plan.count(), "number of shards");
                List<String> all = new ArrayList<>();
                plan.sessions().forEach(all::addAll);
                assertEquals(sessions, all.size(), "sessions in all shards, " + shards + " shards");
                assertEquals(sessions, new HashSet<>(all).size(), "no session twice, " + shards + " shards");
                Set<String> selected = new HashSet<>();
                for (int i = 1; i <= shards; i++) {
                    plan.select(found, new Shard(i, shards)).forEach(s -> assertTrue(selected.add(s.id()),
                            "selected once: " + s.id()));
                }
                assertEquals(sessions, selected.size(), "every session selected by some shard");
            }
        }
    }

    @Test
    void largestFirstKeepsShardsWithinFourThirdsOfTheBestPossible() {
        // REF: Graham 1969, SIAM J. Appl. Math. 17:416, LPT makespan <= (4/3 - 1/(3m)) OPT [published]
        Random random = new Random(7);
        List<SessionFolder> found = new ArrayList<>();
        long[] w = new long[30];
        long sum = 0;
        long max = 0;
        for (int i = 0; i < w.length; i++) {
            w[i] = 1 + random.nextInt(5000);
            sum += w[i];
            max = Math.max(max, w[i]);
            found.add(new SessionFolder(String.format("s%02d", i), Path.of("/x")));
        }
        int m = 4;
        ShardPlan plan = ShardPlan.split(Path.of("/x"), found, m, s -> w[Integer.parseInt(s.id().substring(1))]);
        long makespan = 0;
        for (List<String> ids : plan.sessions()) {
            makespan = Math.max(makespan, ids.stream().mapToLong(id -> w[Integer.parseInt(id.substring(1))] + 1).sum());
        }
        double lowerBoundOnOpt = Math.max((double) (sum + w.length) / m, max + 1);
        assertTrue(makespan <= (4.0 / 3 - 1.0 / (3 * m)) * lowerBoundOnOpt * 1.0001 + 1,
                "busiest shard " + makespan + " against lower bound " + lowerBoundOnOpt);
    }

    @Test
    void sessionsAreOrderedWithNumbersByValue() {
        List<String> ids = new ArrayList<>(List.of("cell10", "cell2", "b/cell1", "cell2b", "a", "cell02"));
        ids.sort(SessionFolder.ORDER);
        assertEquals(List.of("a", "b/cell1", "cell02", "cell2", "cell2b", "cell10"), ids, "order of session names");
    }

    @Test
    void shardParsingRejectsNonsense() {
        assertEquals(new Shard(2, 8), Shard.parse("2/8"));
        for (String bad : new String[] {"0/3", "4/3", "a/b", "3", "1/0", ""}) {
            assertThrows(InputException.class, () -> Shard.parse(bad), bad);
        }
    }

    @Test
    void mergedShardsGiveTheSameSummaryAsOneRun(@TempDir Path tmp) {
        Path root = tmp.resolve("study");
        String[] groups = {"control", "drug"};
        for (int i = 0; i < 7; i++) {
            BatchFixtures.session(root, "cell" + i, groups[i % 2], 0.4 + 0.05 * i, 0.1 + 0.02 * i);
        }
        BatchFixtures.badJson(root, "cell7");
        Path single = tmp.resolve("single");
        BatchRunner.run(BatchOptions.of(root, single, 2), BatchFixtures::fakeAnalyze, Progress.NONE, s -> { });

        Path sharded = tmp.resolve("sharded");
        SlurmPlan.write(root, sharded, 3, new SlurmPlan.Resources(0, 0, 0, null, null, null), Path.of("x.jar"), "java");
        for (int i = 1; i <= 3; i++) {
            BatchOutcome o = BatchRunner.run(BatchOptions.of(root, sharded, 1).withShard(new Shard(i, 3)),
                    BatchFixtures::fakeAnalyze, Progress.NONE, s -> { });
            assertNull(o.summary(), "a shard writes no summary");
        }
        BatchOutcome merged = BatchRunner.merge(sharded);
        assertEquals(8, merged.total(), "sessions merged");
        assertEquals(BatchFixtures.read(single.resolve("summary.csv")), BatchFixtures.read(sharded.resolve("summary.csv")),
                "merged summary equals the single run's");
    }

    @Test
    void shardsOfAnotherCountThanThePlanSplitAfresh(@TempDir Path tmp) {
        Path root = tmp.resolve("study");
        for (int i = 0; i < 5; i++) {
            BatchFixtures.session(root, "cell" + i, "a", 0.5, 0.2);
        }
        Path out = tmp.resolve("out");
        SlurmPlan.write(root, out, 3, new SlurmPlan.Resources(0, 0, 0, null, null, null), Path.of("x.jar"), "java");
        int total = 0;
        for (int i = 1; i <= 2; i++) {
            total += BatchRunner.run(BatchOptions.of(root, out, 1).withShard(new Shard(i, 2)),
                    BatchFixtures::fakeAnalyze, Progress.NONE, s -> { }).total();
        }
        assertEquals(5, total, "two shards cover the five sessions although the saved plan had three");
    }

    @Test
    void aMergeBeforeEveryShardHasRunShowsTheMissingSessions(@TempDir Path tmp) throws Exception {
        Path root = tmp.resolve("study");
        for (int i = 0; i < 4; i++) {
            BatchFixtures.session(root, "cell" + i, "a", 0.5, 0.2);
        }
        Path out = tmp.resolve("out");
        SlurmPlan.write(root, out, 2, new SlurmPlan.Resources(0, 0, 0, null, null, null), Path.of("x.jar"), "java");
        BatchRunner.run(BatchOptions.of(root, out, 1).withShard(new Shard(1, 2)), BatchFixtures::fakeAnalyze,
                Progress.NONE, s -> { });
        BatchOutcome merged = BatchRunner.merge(out);
        assertEquals(4, merged.total(), "planned sessions");
        assertEquals(2, merged.failed(), "sessions of the shard that has not run count as missing");
        List<org.apache.commons.csv.CSVRecord> rows = BatchRunnerTest.summary(out);
        assertEquals(2, rows.stream().filter(r -> r.get("status").equals("missing")).count(), "missing rows");
    }
}
