package org.dendrokin.io.batch;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertNotNull;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.ByteArrayOutputStream;
import java.io.IOException;
import java.io.PrintStream;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.HashMap;
import java.util.Map;

import com.google.gson.JsonArray;
import com.google.gson.JsonElement;
import com.google.gson.JsonObject;
import com.google.gson.JsonParser;

import org.dendrokin.cli.Main;
import org.dendrokin.core.Progress;
import org.dendrokin.core.kymo.Kymograph;
import org.dendrokin.io.InputException;
import org.dendrokin.io.KymographCsv;
import org.dendrokin.io.session.FitSettings;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/** The joint fit from a batch's results: after a run, after merged shards, and by the global-fit command. */
class GlobalFitBatchTest {
    private static final double D_CONTROL = 0.5;
    private static final double D_DRUG = 0.8;

    private static void study(Path root) {
        for (int i = 1; i <= 4; i++) {
            GlobalFitFixtures.session(root, "control/c" + i, "control", D_CONTROL, "dF/F0", "ok", 100 + i);
            GlobalFitFixtures.session(root, "drug/d" + i, "drug", D_DRUG, "dF/F0", "ok", 200 + i);
        }
    }

    private static BatchOutcome run(Path root, Path out, GlobalFitStudy.Request global) {
        return BatchRunner.run(BatchOptions.of(root, out, 2).withGlobalFit(global), GlobalFitFixtures.analyzer(),
                Progress.NONE, s -> { });
    }

    private static JsonObject read(Path file) throws IOException {
        return JsonParser.parseString(Files.readString(file)).getAsJsonObject();
    }

    private static JsonObject group(JsonObject json, String name) {
        for (JsonElement g : json.getAsJsonArray("groups")) {
            if (g.getAsJsonObject().get("group").getAsString().equals(name)) {
                return g.getAsJsonObject();
            }
        }
        throw new AssertionError("no group " + name);
    }

    @Test
    void aBatchWithGlobalFitWritesSharedEstimatesTheComparisonAndTheSection(@TempDir Path tmp) throws IOException {
        Path root = tmp.resolve("study");
        study(root);
        Path out = tmp.resolve("out");
        BatchOutcome o = run(root, out, GlobalFitStudy.Request.of("diffusion-decay"));
        assertEquals(out.resolve("global-fit.json").toAbsolutePath(), o.globalFit().toAbsolutePath());
        JsonObject json = read(o.globalFit());
        assertEquals("dF/F0", json.get("signal_unit").getAsString());
        for (String name : new String[] {"control", "drug"}) {
            JsonObject g = group(json, name);
            assertTrue(g.get("converged").getAsBoolean(), name);
            assertEquals(4, g.get("sessions_used").getAsInt(), name);
            JsonObject d = g.getAsJsonObject("shared").getAsJsonObject("D");
            double truth = name.equals("control") ? D_CONTROL : D_DRUG;
            // REF: the D the stand-in sessions were made with (closed-form pulse, Crank 1975) [published formula]
            assertEquals(truth, d.get("value").getAsDouble(), 0.05 * truth, name + " shared D");
            JsonArray ci = d.getAsJsonArray("ci95");
            assertTrue(ci.get(0).getAsDouble() < truth && truth < ci.get(1).getAsDouble(), name + " D interval " + ci);
            assertEquals(2, d.getAsJsonArray("other_intervals").size(), "profile or bootstrap, and Wald-t");
            assertEquals(4, g.getAsJsonArray("sessions").size());
            JsonObject s = g.getAsJsonArray("sessions").get(0).getAsJsonObject();
            assertTrue(s.getAsJsonObject("parameters").has("amplitude") && s.getAsJsonObject("own_fit").has("D"));
        }
        JsonObject dComparison = json.getAsJsonArray("comparisons").get(0).getAsJsonObject();
        assertEquals("D", dComparison.get("constant").getAsString());
        assertEquals("drug minus control", dComparison.get("difference_of").getAsString());
        assertTrue(dComparison.get("differs").getAsBoolean(), "a 60% difference in D is seen: " + dComparison);
        assertEquals(D_DRUG - D_CONTROL, dComparison.getAsJsonObject("difference").get("value").getAsDouble(), 0.06);
        assertEquals(0, json.getAsJsonArray("excluded").size());
        String index = Files.readString(out.resolve("index.html"));
        assertTrue(index.contains("id=\"global-fit\"") && index.contains("plots/global-D.png"), "index section");
        assertTrue(Files.size(out.resolve("plots/global-D.png")) > 1000, "picture of D");
        assertTrue(Files.isRegularFile(out.resolve("plots/global-k.png")), "picture of k");
    }

    @Test
    void sessionsThatCannotTakePartAreLeftOutWithTheReason(@TempDir Path tmp) throws IOException {
        Path root = tmp.resolve("study");
        for (int i = 1; i <= 3; i++) {
            GlobalFitFixtures.session(root, "g/ok" + i, "g", D_CONTROL, "dF/F0", "ok", 300 + i);
        }
        GlobalFitFixtures.session(root, "g/failed", "g", D_CONTROL, "dF/F0", "fail", 311);
        GlobalFitFixtures.session(root, "g/nofit", "g", D_CONTROL, "dF/F0", "no-fit", 312);
        GlobalFitFixtures.session(root, "g/diverged", "g", D_CONTROL, "dF/F0", "not-converged", 313);
        GlobalFitFixtures.session(root, "g/misfit", "g", D_CONTROL, "dF/F0", "misfit", 314);
        Path out = tmp.resolve("out");
        JsonObject json = read(run(root, out, GlobalFitStudy.Request.of("diffusion-decay")).globalFit());
        assertEquals(3, group(json, "g").get("sessions_used").getAsInt());
        Map<String, String> why = new HashMap<>();
        for (JsonElement e : json.getAsJsonArray("excluded")) {
            why.put(e.getAsJsonObject().get("session").getAsString(), e.getAsJsonObject().get("reason").getAsString());
        }
        assertEquals(4, why.size(), why.toString());
        assertTrue(why.get("g/failed").contains("failed") && why.get("g/failed").contains("stand-in"),
                why.get("g/failed"));
        assertTrue(why.get("g/nofit").contains("did not fit diffusion-decay"), why.get("g/nofit"));
        assertTrue(why.get("g/diverged").contains("did not converge"), why.get("g/diverged"));
        assertTrue(why.get("g/misfit").contains("misfit"), why.get("g/misfit"));
        assertTrue(Files.readString(out.resolve("index.html")).contains("Sessions left out of the joint fit"));
    }

    @Test
    void aSessionInAnotherUnitIsLeftOutOfTheBatchsJointFitAndRefusedByTheCommand(@TempDir Path tmp)
            throws IOException {
        Path root = tmp.resolve("study");
        study(root);
        GlobalFitFixtures.session(root, "drug/calibrated", "drug", D_DRUG, "uM", "ok", 299);
        Path out = tmp.resolve("out");
        JsonObject json = read(run(root, out, GlobalFitStudy.Request.of("diffusion-decay")).globalFit());
        assertEquals("dF/F0", json.get("signal_unit").getAsString());
        assertEquals(4, group(json, "drug").get("sessions_used").getAsInt());
        JsonArray excluded = json.getAsJsonArray("excluded");
        assertEquals(1, excluded.size(), excluded.toString());
        JsonObject left = excluded.get(0).getAsJsonObject();
        assertEquals("drug/calibrated", left.get("session").getAsString());
        String reason = left.get("reason").getAsString();
        assertTrue(reason.contains("uM") && reason.contains("dF/F0") && reason.contains("one unit"), reason);

        // over the same results, the global-fit command leaves the choice to the user: one sentence, exit 2
        ByteArrayOutputStream err = new ByteArrayOutputStream();
        int status = Main.run(new String[] {"global-fit", out.toString(), "--model", "diffusion-decay", "--out",
            tmp.resolve("g").toString()}, quiet(), new PrintStream(err, true, StandardCharsets.UTF_8));
        String text = err.toString(StandardCharsets.UTF_8).trim();
        assertEquals(Main.BAD_INPUT, status, text);
        assertEquals(1, text.lines().count(), "one sentence: " + text);
        assertTrue(text.contains("different signal units (8 in dF/F0, 1 in uM)")
                && text.contains(out.getFileName().toString()), text);
        assertFalse(Files.exists(tmp.resolve("g").resolve("global-fit.json")), "no joint fit");
    }

    @Test
    void aBatchWhoseUnitsTieIsRefusedWithOneSentence(@TempDir Path tmp) {
        Path root = tmp.resolve("study");
        GlobalFitFixtures.session(root, "g/relative", "g", D_CONTROL, "dF/F0", "ok", 401);
        GlobalFitFixtures.session(root, "g/calibrated", "g", D_CONTROL, "uM", "ok", 402);
        Path out = tmp.resolve("out");
        InputException e = assertThrows(InputException.class,
                () -> run(root, out, GlobalFitStudy.Request.of("diffusion-decay")));
        assertTrue(e.getMessage().contains("as many in dF/F0 as in uM (1 each)"), e.getMessage());
        assertTrue(Files.isRegularFile(out.resolve("summary.csv")) && Files.isRegularFile(out.resolve("index.html")),
                "the batch's own summary and report are still written");
        assertFalse(Files.exists(out.resolve("global-fit.json")), "no joint fit");
    }

    @Test
    void theGlobalFitCommandWorksOverAResultsFolder(@TempDir Path tmp) throws IOException {
        Path root = tmp.resolve("study");
        study(root);
        Path out = tmp.resolve("out");
        run(root, out, null);
        assertFalse(Files.exists(out.resolve("global-fit.json")), "no joint fit unless asked for");
        Path g = tmp.resolve("joint");
        ByteArrayOutputStream stdout = new ByteArrayOutputStream();
        int status = Main.run(new String[] {"global-fit", out.toString(), "--model", "diffusion-decay", "--out",
            g.toString(), "--bootstrap", "100", "--seed", "3"}, new PrintStream(stdout, true, StandardCharsets.UTF_8),
                quiet());
        assertEquals(Main.OK, status);
        String text = stdout.toString(StandardCharsets.UTF_8);
        assertTrue(text.contains("control (4 sessions): D = ") && text.contains("drug minus control, D:"), text);
        JsonObject json = read(g.resolve("global-fit.json"));
        assertEquals(100, json.get("bootstrap_replicates").getAsInt());
        assertTrue(Files.readString(g.resolve("global-fit.html")).contains("plots/global-D.png"));
        assertTrue(Files.isRegularFile(g.resolve("plots/global-D.png")));
        assertFalse(Files.exists(out.resolve("global-fit.json")), "the results folder is only read");
    }

    @Test
    void scanLineDelaysRecordedBesideAResultAreReadBackAndCheckedAgainstItsKymograph(@TempDir Path tmp)
            throws IOException {
        Path root = tmp.resolve("study");
        study(root);
        Path out = tmp.resolve("out");
        run(root, out, null);
        Path scanned = out.resolve("sessions").resolve("control__c1");
        Kymograph k = KymographCsv.read(scanned.resolve("kymograph.csv"), "dF/F0");
        double[] delays = new double[k.positionCount()];
        for (int p = 0; p < delays.length; p++) {
            delays[p] = k.timeStepS() * p / delays.length;
        }
        GlobalFitInput.write(scanned, FitSettings.DEFAULT, delays);
        GlobalFitInput.write(out.resolve("sessions").resolve("drug__d1"), FitSettings.DEFAULT, new double[] {0.01});
        Path g = tmp.resolve("joint");
        assertEquals(Main.OK, Main.run(new String[] {"global-fit", out.toString(), "--model", "diffusion-decay",
            "--out", g.toString(), "--bootstrap", "0"}, quiet(), quiet()));
        assertEquals(delays.length, GlobalFitInput.read(scanned).delaysS().length, "read back");
        JsonObject json = read(g.resolve("global-fit.json"));
        assertEquals(4, group(json, "control").get("sessions_used").getAsInt(), "the scanned session takes part");
        JsonArray excluded = json.getAsJsonArray("excluded");
        assertEquals(1, excluded.size(), excluded.toString());
        assertEquals("drug/d1", excluded.get(0).getAsJsonObject().get("session").getAsString());
        assertTrue(excluded.get(0).getAsJsonObject().get("reason").getAsString().contains("scan-line delays"),
                excluded.toString());
    }

    @Test
    void theMergeOfShardsGivesTheSameJointFitAsOneRun(@TempDir Path tmp) throws IOException {
        Path root = tmp.resolve("study");
        study(root);
        Path single = tmp.resolve("single");
        JsonObject one = read(run(root, single, GlobalFitStudy.Request.of("diffusion-decay")).globalFit());
        Path sharded = tmp.resolve("sharded");
        SlurmPlan.Planned plan = SlurmPlan.write(root, sharded, 2, new SlurmPlan.Resources(0, 0, 0, null, null,
                null), Path.of("x.jar"), "java", GlobalFitStudy.Request.of("diffusion-decay"));
        assertTrue(Files.readString(plan.merge()).contains("batch --merge") && Files.readString(plan.merge())
                .contains("--global-fit diffusion-decay --global-bootstrap 200 --global-seed 1"), "merge script");
        for (int i = 1; i <= 2; i++) {
            BatchRunner.run(BatchOptions.of(root, sharded, 2).withShard(Shard.parse(i + "/2")),
                    GlobalFitFixtures.analyzer(), Progress.NONE, s -> { });
        }
        BatchOutcome merged = BatchRunner.merge(sharded, GlobalFitStudy.Request.of("diffusion-decay"), Progress.NONE);
        assertNotNull(merged.globalFit());
        JsonObject two = read(merged.globalFit());
        for (String name : new String[] {"control", "drug"}) {
            for (String c : new String[] {"D", "k"}) {
                JsonObject a = group(one, name).getAsJsonObject("shared").getAsJsonObject(c);
                JsonObject b = group(two, name).getAsJsonObject("shared").getAsJsonObject(c);
                assertEquals(a.get("value").getAsDouble(), b.get("value").getAsDouble(), 0.0, name + " " + c);
                assertEquals(a.get("ci95"), b.get("ci95"), name + " " + c + " interval");
            }
        }
        assertTrue(Files.readString(sharded.resolve("index.html")).contains("id=\"global-fit\""));
    }

    @Test
    void aModelWithoutAJointFitIsRefused(@TempDir Path tmp) {
        ByteArrayOutputStream err = new ByteArrayOutputStream();
        int status = Main.run(new String[] {"global-fit", tmp.toString(), "--model", "nagumo", "--out",
            tmp.resolve("g").toString()}, quiet(), new PrintStream(err, true, StandardCharsets.UTF_8));
        String text = err.toString(StandardCharsets.UTF_8).trim();
        assertEquals(Main.BAD_INPUT, status, text);
        assertTrue(text.contains("diffusion-decay") && text.contains("nagumo"), text);
        err.reset();
        status = Main.run(new String[] {"batch", tmp.toString(), "--out", tmp.resolve("o").toString(),
            "--global-fit", "nagumo"}, quiet(), new PrintStream(err, true, StandardCharsets.UTF_8));
        assertEquals(Main.BAD_INPUT, status, err.toString(StandardCharsets.UTF_8));
        err.reset();
        status = Main.run(new String[] {"global-fit", tmp.resolve("nothing").toString(), "--model",
            "diffusion-decay", "--out", tmp.resolve("g").toString()}, quiet(),
                new PrintStream(err, true, StandardCharsets.UTF_8));
        assertEquals(Main.BAD_INPUT, status, "not a batch's results");
        assertTrue(err.toString(StandardCharsets.UTF_8).contains("no batch results"), err.toString(
                StandardCharsets.UTF_8));
    }

    private static PrintStream quiet() {
        return new PrintStream(new ByteArrayOutputStream(), true, StandardCharsets.UTF_8);
    }
}
