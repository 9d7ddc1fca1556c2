package org.dendrokin.io.fit;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.ByteArrayOutputStream;
import java.io.PrintStream;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.Random;

import org.dendrokin.cli.Main;
import org.dendrokin.core.Progress;
import org.dendrokin.core.fit.DiffusionDecayPulse;
import org.dendrokin.core.fit.KymographFits;
import org.dendrokin.core.kymo.Kymograph;
import org.dendrokin.core.model.Boundary;
import org.dendrokin.core.model.Domain;
import org.dendrokin.core.model.ScalarRun;
import org.dendrokin.core.model.Stimulus;
import org.dendrokin.core.units.Unit;
import org.dendrokin.io.KymographCsv;
import org.dendrokin.io.compare.ModelComparison;
import org.dendrokin.io.session.ResultsJson;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

import com.google.gson.JsonObject;
import com.google.gson.JsonParser;

class CompareAndJsonTest {
    private static Kymograph nagumoKymograph(double sigma) {
        double[] x = new double[50];
        double[] t = new double[80];
        for (int i = 0; i < x.length; i++) {
            x[i] = 0.5 * i;
        }
        for (int i = 0; i < t.length; i++) {
            t[i] = 0.5 * i;
        }
        ScalarRun run = ScalarRun.prepare("nagumo", new Domain(x[x.length - 1], 0.25, Boundary.NO_FLUX), t, x,
                List.of(Stimulus.pulse(3, 4, 2, 1.0)));
        double[] u = new double[x.length * t.length];
        run.solve(new double[] {1, 0.5, 0.2}, u);
        Random r = new Random(31);
        for (int i = 0; i < u.length; i++) {
            u[i] = 1.5 * u[i] + sigma * r.nextGaussian();
        }
        return new Kymograph(x, t, u, "dF/F0");
    }

    @Test
    void compareReportsTheResidualOfTheUsersOwnModel(@TempDir Path dir) throws Exception {
        KymographCsv.write(nagumoKymograph(0.05), dir.resolve("kymograph.csv"));
        Files.writeString(dir.resolve("model.json"), "{\"model\": \"nagumo\", \"parameters\": {\"D\": 1, \"k\": 0.5, "
                + "\"a\": 0.2}, \"stimuli\": [{\"time_s\": 3, \"position_um\": 4, \"width_um\": 2, \"amount\": 1}], "
                + "\"amplitude\": 1.5, \"baseline\": 0, \"dx_um\": 0.25}");
        ByteArrayOutputStream out = new ByteArrayOutputStream();
        ByteArrayOutputStream err = new ByteArrayOutputStream();
        int status = Main.run(new String[] {"compare", dir.resolve("kymograph.csv").toString(),
            dir.resolve("model.json").toString(), "--out", dir.resolve("out").toString()},
                new PrintStream(out, true, StandardCharsets.UTF_8), new PrintStream(err, true, StandardCharsets.UTF_8));
        assertEquals(0, status, err.toString(StandardCharsets.UTF_8));
        JsonObject c = JsonParser.parseString(Files.readString(dir.resolve("out/comparison.json"))).getAsJsonObject();
        // REF: the model that made the data, on the same grid, leaves only the added noise (SD 0.05) [common practice]
        assertEquals(0.05, c.get("rmse").getAsDouble(), 0.005, "RMS residual (dF/F0)");
        assertTrue(Files.isRegularFile(dir.resolve("out/compare-nagumo-kymographs.png")), "pictures written");
        assertTrue(c.getAsJsonObject("front_speed").get("measured").isJsonObject(), "measured front speed");
    }

    @Test
    void theCommandLineAndTheImageJCommandsCompareTheSameWay(@TempDir Path dir) throws Exception {
        Kymograph measured = nagumoKymograph(0.05);
        KymographCsv.write(measured, dir.resolve("kymograph.csv"));
        Files.writeString(dir.resolve("model.json"), "{\"model\": \"nagumo\", \"parameters\": {\"D\": 1.2, "
                + "\"k\": 0.5, \"a\": 0.2}, \"stimuli\": [{\"time_s\": 3, \"position_um\": 4, \"width_um\": 2, "
                + "\"amount\": 1}], \"dx_um\": 0.25}");
        ModelComparisonRun.Result cli = ModelComparisonRun.run(dir.resolve("kymograph.csv"),
                dir.resolve("model.json"), "dF/F0", dir.resolve("out"));
        ModelComparison.Comparison ij = ModelComparison.compare(KymographCsv.read(dir.resolve("kymograph.csv"),
                "dF/F0"), new ModelComparison.Settings("nagumo", 1.2, 0.5, 0.2, 3, 4, 2, 1, Boundary.NO_FLUX, 0.25),
                Progress.NONE);
        assertEquals(ij.rmse(), cli.rmse(), 1e-12, "one computation behind both front ends");
        assertEquals(ij.residualNorm(), cli.residualNorm(), 1e-9);
        assertEquals(ij.measuredSpread().frontSpeed().value(), cli.measuredSpeed().value(), 1e-12);
    }

    @Test
    void theMeasuredNumbersDependOnTheDataAloneNotOnTheModelSetBesideThem(@TempDir Path dir) throws Exception {
        KymographCsv.write(nagumoKymograph(0.05), dir.resolve("kymograph.csv"));
        // Two models that disagree in everything, including where and when their stimulus was.
        Files.writeString(dir.resolve("a.json"), "{\"model\": \"nagumo\", \"parameters\": {\"D\": 1, \"k\": 0.5, "
                + "\"a\": 0.2}, \"stimuli\": [{\"time_s\": 3, \"position_um\": 4, \"width_um\": 2, \"amount\": 1}], "
                + "\"amplitude\": 1.5, \"dx_um\": 0.25}");
        Files.writeString(dir.resolve("b.json"), "{\"model\": \"diffusion-decay\", \"parameters\": {\"D\": 3, "
                + "\"k\": 0.2}, \"stimuli\": [{\"time_s\": 8, \"position_um\": 15, \"width_um\": 1, \"amount\": 2}], "
                + "\"dx_um\": 0.25}");
        ModelComparisonRun.Result a = ModelComparisonRun.run(dir.resolve("kymograph.csv"), dir.resolve("a.json"),
                "dF/F0", dir.resolve("out-a"));
        ModelComparisonRun.Result b = ModelComparisonRun.run(dir.resolve("kymograph.csv"), dir.resolve("b.json"),
                "dF/F0", dir.resolve("out-b"));
        assertEquals(a.measuredSpeed().value(), b.measuredSpeed().value(), 0, "measured front speed");
        assertEquals(a.measuredSpeed().lo95(), b.measuredSpeed().lo95(), 0);
        assertEquals(a.dataStimulus(), b.dataStimulus());
        // REF: the data were made with a pulse at t = 3 s, 4 um; the detector times the stimulus half a frame
        // before the first raised frame, so within one frame (0.5 s) and a pulse width (2 um) [common practice]
        assertEquals(3.0, a.dataStimulus().timeS(), 0.5);
        assertEquals(4.0, a.dataStimulus().positionUm(), 2.0);
        assertTrue(a.warnings().stream().noneMatch(w -> w.startsWith("The model's stimulus")), a.warnings().toString());
        assertTrue(b.warnings().stream().anyMatch(w -> w.contains("from the data's (t =")), b.warnings().toString());
        assertTrue(b.warnings().stream().anyMatch(w -> w.contains("from the data's (") && w.contains(" um ")),
                b.warnings().toString());
    }

    @Test
    void theDataStimulusComesFromTheAnalysisResultsBesideTheKymographOrTheCommandLine(@TempDir Path dir)
            throws Exception {
        KymographCsv.write(nagumoKymograph(0.05), dir.resolve("kymograph.csv"));
        Files.writeString(dir.resolve("results.json"), "{\"stimulus\": {\"time_s\": 2.75, \"position_um\": 4.5}}");
        Files.writeString(dir.resolve("model.json"), "{\"model\": \"nagumo\", \"parameters\": {\"D\": 1, \"k\": "
                + "0.5, \"a\": 0.2}, \"stimuli\": [{\"time_s\": 3, \"position_um\": 4, \"width_um\": 2, \"amount\": 1}],"
                + " \"domain\": {\"length_um\": 50}, \"time\": {\"duration_s\": 39.5}}");
        ModelComparisonRun.Result beside = ModelComparisonRun.run(dir.resolve("kymograph.csv"),
                dir.resolve("model.json"), "dF/F0", dir.resolve("out"));
        assertEquals(2.75, beside.dataStimulus().timeS(), 0);
        assertEquals(4.5, beside.dataStimulus().positionUm(), 0);
        assertTrue(beside.warnings().stream().anyMatch(w -> w.contains("domain is 50.00 um long")),
                beside.warnings().toString());
        assertTrue(beside.warnings().stream().noneMatch(w -> w.contains("runs for")), "39.5 s is the data's span");
        ByteArrayOutputStream out = new ByteArrayOutputStream();
        int status = Main.run(new String[] {"compare", dir.resolve("kymograph.csv").toString(),
            dir.resolve("model.json").toString(), "--stimulus", "3.25,4", "--out", dir.resolve("cli").toString()},
                new PrintStream(out, true, StandardCharsets.UTF_8), new PrintStream(new ByteArrayOutputStream()));
        assertEquals(0, status);
        JsonObject c = JsonParser.parseString(Files.readString(dir.resolve("cli/comparison.json"))).getAsJsonObject();
        assertEquals(3.25, c.getAsJsonObject("data_stimulus").get("time_s").getAsDouble(), 0);
        assertEquals("given on the command line", c.getAsJsonObject("data_stimulus").get("source").getAsString());
        int bad = Main.run(new String[] {"compare", dir.resolve("kymograph.csv").toString(),
            dir.resolve("model.json").toString(), "--stimulus", "3.25", "--out", dir.resolve("cli2").toString()},
                new PrintStream(new ByteArrayOutputStream()), new PrintStream(new ByteArrayOutputStream()));
        assertEquals(Main.BAD_INPUT, bad);
    }

    @Test
    void compareWithABadModelFileExitsWithStatus2(@TempDir Path dir) throws Exception {
        KymographCsv.write(nagumoKymograph(0.05), dir.resolve("kymograph.csv"));
        Files.writeString(dir.resolve("model.json"), "{\"model\": \"nagumo\", \"parameters\": {\"D\": 1, \"k\": 0.5}, "
                + "\"stimuli\": [{\"time_s\": 3, \"position_um\": 4, \"width_um\": 2, \"amount\": 1}]}");
        ByteArrayOutputStream err = new ByteArrayOutputStream();
        int status = Main.run(new String[] {"compare", dir.resolve("kymograph.csv").toString(),
            dir.resolve("model.json").toString(), "--out", dir.resolve("out").toString()},
                new PrintStream(new ByteArrayOutputStream()), new PrintStream(err, true, StandardCharsets.UTF_8));
        assertEquals(Main.BAD_INPUT, status);
        String message = err.toString(StandardCharsets.UTF_8);
        assertTrue(message.contains("model.json") && message.contains("\"a\""), message);
    }

    @Test
    void jsonCarriesUnitsIntervalsAndMethodsAndHidesNonConvergedNumbers() {
        double[] x = new double[30];
        double[] t = new double[60];
        for (int i = 0; i < x.length; i++) {
            x[i] = 0.5 * i;
        }
        for (int i = 0; i < t.length; i++) {
            t[i] = 0.25 * i;
        }
        DiffusionDecayPulse m = new DiffusionDecayPulse(x, t, 3, 7, null, Unit.DF_F0);
        double[] v = new double[m.size()];
        m.evaluate(m.pack(0.5, 0.05, 2, 7, 1, 0.1, 3), v, null);
        Random r = new Random(32);
        for (int i = 0; i < v.length; i++) {
            v[i] += 0.02 * r.nextGaussian();
        }
        KymographFits.Outcome o = KymographFits.fit(new Kymograph(x, t, v, "dF/F0"),
                KymographFits.Setup.of(3, 7).withModels(List.of(DiffusionDecayPulse.NAME)), Progress.NONE);
        JsonObject f = ResultsJson.fits(o).get(0);
        assertTrue(f.get("converged").getAsBoolean());
        JsonObject d = f.getAsJsonObject("parameters").getAsJsonObject("D");
        assertEquals("um^2/s", d.get("unit").getAsString());
        assertEquals(2, d.getAsJsonArray("ci95").size());
        assertEquals("profile-likelihood", d.get("ci_method").getAsString());
        assertEquals("1/s", f.getAsJsonObject("parameters").getAsJsonObject("k").get("unit").getAsString());
        assertTrue(f.has("aicc") && f.has("bic") && f.has("rmse") && f.has("akaike_weight"));

        KymographFits.Outcome failed = KymographFits.fit(new Kymograph(x, new double[] {0, 0.25, 0.5, 3.0},
                new double[4 * x.length], "dF/F0"), KymographFits.Setup.of(3, 7), Progress.NONE);
        for (JsonObject g : ResultsJson.fits(failed)) {
            assertFalse(g.get("converged").getAsBoolean());
            assertTrue(g.getAsJsonObject("parameters").entrySet().isEmpty(), "no numbers from a failed fit");
            assertFalse(g.get("reason").getAsString().isBlank(), "a reason is given");
            assertTrue(g.get("akaike_weight").isJsonNull(), "a fit that did not converge takes no Akaike weight");
        }
    }
}
