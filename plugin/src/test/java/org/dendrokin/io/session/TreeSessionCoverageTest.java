package org.dendrokin.io.session;

import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Locale;

import com.google.gson.JsonArray;
import com.google.gson.JsonElement;
import com.google.gson.JsonObject;
import com.google.gson.JsonParser;

import org.dendrokin.core.Progress;
import org.dendrokin.io.SessionRunner;
import org.dendrokin.io.demo.DemoTreeSessionGenerator;
import org.junit.jupiter.api.Tag;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * The tree fit's intervals over 20 movies of the branched demo scenario that differ only in their camera noise (our
 * own generator: the tree engine on a fine grid, photon and read noise, bleaching), each analysed as a session.
 */
@Tag("slow")
class TreeSessionCoverageTest {
    private static final int SEEDS = 20;

    private static boolean holds(JsonArray ci, double truth) {
        return ci.get(0).getAsDouble() <= truth && truth <= ci.get(1).getAsDouble();
    }

    @Test
    void theTreeFitsIntervalsHoldTheTrueDAndK(@TempDir Path dir) throws Exception {
        String[] names = {"D", "k"};
        // REF: the generator's truth (its movie is made from du/dt = D u'' - k u on the same tree) [derived in the
        // generator]
        double[] truth = {DemoTreeSessionGenerator.D, DemoTreeSessionGenerator.K};
        int[] reported = new int[2];
        int[] studentT = new int[2];
        for (long seed = 1; seed <= SEEDS; seed++) {
            Path session = dir.resolve("s" + seed);
            DemoTreeSessionGenerator.write(session, seed);
            Path out = dir.resolve("o" + seed);
            SessionRunner.analyze(session, out, Progress.NONE);
            JsonObject p = JsonParser.parseString(Files.readString(out.resolve("results.json"))).getAsJsonObject()
                    .getAsJsonObject("tree").getAsJsonObject("fit").getAsJsonObject("parameters");
            for (int j = 0; j < 2; j++) {
                JsonObject e = p.getAsJsonObject(names[j]);
                reported[j] += holds(e.getAsJsonArray("ci95"), truth[j]) ? 1 : 0;
                for (JsonElement o : e.getAsJsonArray("other_intervals")) {
                    if (o.getAsJsonObject().get("ci_method").getAsString().equals("wald-t")) {
                        studentT[j] += holds(o.getAsJsonObject().getAsJsonArray("ci95"), truth[j]) ? 1 : 0;
                    }
                }
            }
        }
        System.out.printf(Locale.ROOT, "tree sessions, %d noise seeds: reported intervals hold D %d, k %d; Student t "
                + "alone D %d, k %d%n", SEEDS, reported[0], reported[1], studentT[0], studentT[1]);
        // 60 seeds gave D 60 and k 59; without the held stimulus's uncertainty k 53 (k reads about 2% low: the
        // stimulus is held where the main line's fit put it; docs/trees.md)
        assertTrue(reported[0] >= 18, "D: " + reported[0] + " of " + SEEDS);
        assertTrue(reported[1] >= 17, "k: " + reported[1] + " of " + SEEDS);
        // the check can fail: Student t alone, blind to the structured residuals, holds them about half the time
        assertTrue(studentT[0] <= 15 && studentT[1] <= 15, "Student t alone: D " + studentT[0] + ", k "
                + studentT[1]);
    }
}
