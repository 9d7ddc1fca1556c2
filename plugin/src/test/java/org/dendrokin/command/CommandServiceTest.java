package org.dendrokin.command;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.Locale;

import org.dendrokin.core.Progress;
import org.dendrokin.core.kymo.Extraction;
import org.dendrokin.core.kymo.Kymograph;
import org.dendrokin.core.model.Boundary;
import org.dendrokin.core.model.Domain;
import org.dendrokin.core.model.ModelCatalogue;
import org.dendrokin.core.model.ScalarRun;
import org.dendrokin.core.model.Stimulus;
import org.dendrokin.io.KymographCsv;
import org.dendrokin.io.SessionRunner;
import org.dendrokin.io.demo.DemoSessionGenerator;
import org.dendrokin.io.movie.Movie;
import org.dendrokin.io.movie.PathExtraction;
import org.dendrokin.io.path.PathFiles;
import org.junit.jupiter.api.AfterAll;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.scijava.Context;
import org.scijava.command.CommandInfo;
import org.scijava.command.CommandModule;
import org.scijava.command.CommandService;

/** The SciJava commands run headless through the CommandService, checked against the code they wrap. */
class CommandServiceTest {
    static final DemoSessionGenerator.Scenario SMALL = new DemoSessionGenerator.Scenario(160, 40, 120, 0.2, 0.5,
            9.75, 14.0, 0.3, 0.05, 1.0, 1.5, 600, 120, 120, 3, 99L);

    @TempDir
    static Path dir;
    static Path session;
    static Context context;
    static CommandService commands;

    @BeforeAll
    static void start() {
        System.setProperty("scijava.log.level", "warn");
        session = dir.resolve("cell-2");
        DemoSessionGenerator.write(session, SMALL);
        fitOnlyDiffusionDecay(session);
        context = new Context(CommandService.class);
        commands = context.service(CommandService.class);
    }

    @AfterAll
    static void stop() {
        context.dispose();
    }

    private static CommandModule run(Class<? extends org.scijava.command.Command> c, Object... inputs)
            throws Exception {
        return commands.run(c, true, inputs).get();
    }

    @Test
    void everyCommandIsHeadlessAndHasItsOwnScriptingLabel() {
        List<CommandInfo> ours = commands.getCommands().stream()
                .filter(i -> i.getClassName().startsWith("org.dendrokin.command.")).toList();
        assertEquals(8, ours.size(), "commands found in the index");
        for (CommandInfo i : ours) {
            assertTrue(i.canRunHeadless(), i.getClassName() + " runs headless");
            assertTrue(i.getMenuPath().getMenuString().startsWith("Plugins > Dendrokin > Scripting > "),
                    i.getClassName() + ": " + i.getMenuPath().getMenuString());
        }
    }

    @Test
    void modelChoicesAreTheCataloguesOneSpeciesModels() {
        for (Class<?> c : List.of(SimulateOnGridCommand.class, CompareWithModelCommand.class)) {
            CommandInfo info = commands.getCommand(c.getName());
            assertEquals(ModelCatalogue.scalarNames(), info.getInput("model", String.class).getChoices(),
                    c.getSimpleName() + ": the model choices written in ModelParameters");
        }
    }

    @Test
    void kymographFromFilesEqualsTheExtractionItWraps() throws Exception {
        Path csv = dir.resolve("k.csv");
        CommandModule m = run(KymographFromFilesCommand.class, "movie", session.resolve("dendrite.tif").toFile(),
                "path", session.resolve("dendrite.roi").toFile(), "bandWidthUm", 1.0, "channel", 1, "pixelSizeUm", 0.0,
                "frameIntervalS", 0.0, "output", csv.toFile());
        assertFalse(m.isCanceled(), m::getCancelReason);
        Kymograph viaCommand = KymographCsv.read(csv, "intensity");
        try (Movie movie = Movie.open(session.resolve("dendrite.tif"), null, null)) {
            Extraction e = PathExtraction.extract(movie, 0, PathFiles.read(session.resolve("dendrite.roi"), null),
                    session.resolve("dendrite.roi"), 1.0, Progress.NONE);
            assertArrayEquals(e.kymograph().values(), viaCommand.values(), 1e-9, "intensities");
            assertEquals(e.kymograph().positionCount(), (int) m.getOutput("positions"));
        }
    }

    @Test
    void analyzeOneSessionReturnsTheRunnersNumbers() throws Exception {
        CommandModule m = run(AnalyzeSessionCommand.class, "sessionDir", session.toFile(), "outDir",
                dir.resolve("one").toFile());
        assertFalse(m.isCanceled(), m::getCancelReason);
        SessionRunner.Result direct = SessionRunner.analyze(session, dir.resolve("direct"), Progress.NONE);
        // The headline front speed, or NaN where the arrival times show no front (as for this diffusing pulse).
        double expected = direct.analysis().headline().frontSpeed() == null ? Double.NaN
                : direct.analysis().headline().frontSpeed().value();
        assertEquals(expected, (double) m.getOutput("frontSpeedUmPerS"), 1e-12, "front speed, um/s");
        assertEquals(direct.signalUnit(), m.getOutput("signalUnit"));
        assertTrue(Files.isRegularFile(dir.resolve("one/results.json")));
    }

    @Test
    void analyzeOneSessionTakesSettingsForThisRunOverSessionJson() throws Exception {
        Path out = dir.resolve("motion-off");
        CommandModule m = run(AnalyzeSessionCommand.class, "sessionDir", session.toFile(), "outDir", out.toFile(),
                "motion", "off");
        assertFalse(m.isCanceled(), m::getCancelReason);
        com.google.gson.JsonObject results = com.google.gson.JsonParser.parseString(
                Files.readString(out.resolve("results.json"))).getAsJsonObject();
        assertEquals("off", results.getAsJsonObject("motion").get("mode").getAsString(), "the run used it");
        assertEquals("off", results.getAsJsonObject("overrides").get("motion").getAsString(), "and states it");
        CommandModule bad = run(AnalyzeSessionCommand.class, "sessionDir", session.toFile(), "outDir",
                dir.resolve("bad-spot").toFile(), "stimulusSpot", "12;40");
        assertTrue(bad.isCanceled(), "a spot that is not x,y cancels");
        assertTrue(bad.getCancelReason().contains("stimulus spot"), bad.getCancelReason());
    }

    @Test
    void badInputCancelsWithTheSentenceNamingTheFile() throws Exception {
        Path missing = dir.resolve("no-such-session");
        CommandModule m = run(AnalyzeSessionCommand.class, "sessionDir", missing.toFile(), "outDir",
                dir.resolve("x").toFile());
        assertTrue(m.isCanceled(), "cancelled, not thrown");
        assertEquals(missing + ": is not a folder.", m.getCancelReason());
    }

    @Test
    void comparisonOfAModelWithItselfPlusAnOffset() throws Exception {
        double[] d = new double[41];
        for (int i = 0; i < d.length; i++) {
            d[i] = 0.25 * i;
        }
        double[] t = new double[31];
        for (int i = 0; i < t.length; i++) {
            t[i] = 0.1 * i;
        }
        ScalarRun run = ScalarRun.prepare("diffusion-decay", new Domain(10, 0.25, Boundary.NO_FLUX), t, d,
                List.of(Stimulus.pulse(0.5, 5, 1, 1)));
        double[] v = new double[d.length * t.length];
        run.solve(new double[] {0.8, 0.3}, v);
        for (int i = 0; i < v.length; i++) {
            v[i] += 0.125;
        }
        Path measured = dir.resolve("measured.csv");
        KymographCsv.write(new Kymograph(d, t, v, "dF/F0"), measured);
        CommandModule m = run(CompareWithModelCommand.class, "measured", measured.toFile(), "signalUnit", "dF/F0",
                "residual", dir.resolve("residual.csv").toFile(), "model", "diffusion-decay", "dUm2PerS", 0.8,
                "ratePerS", 0.3, "threshold", 0.2, "stimulusTimeS", 0.5, "stimulusUm", 5.0, "widthUm", 1.0,
                "amount", 1.0, "ends", "no-flux", "gridUm", 0.25);
        assertFalse(m.isCanceled(), m::getCancelReason);
        // a constant offset c has root mean square c
        assertEquals(0.125, (double) m.getOutput("rmse"), 1e-12, "RMSE, dF/F0");
    }

    @Test
    void calibrationFileFromATableThenConvertsAKymograph() throws Exception {
        double k = 0.5;
        double n = 1.5;
        StringBuilder csv = new StringBuilder("concentration_uM,intensity\n");
        java.util.Random random = new java.util.Random(7);
        for (double c : new double[] {0, 0.05, 0.1, 0.25, 0.5, 1, 2.5, 10}) {
            for (int r = 0; r < 2; r++) {
                csv.append(String.format(Locale.ROOT, "%s,%s%n", c, hill(c, k, n) * (1 + 0.01 * random.nextGaussian())));
            }
        }
        Path table = dir.resolve("standards.csv");
        Files.writeString(table, csv);
        Path json = dir.resolve("cal.json");
        CommandModule m = run(CalibrateFromStandardsCommand.class, "table", table.toFile(), "monotone", false,
                "output", json.toFile());
        assertFalse(m.isCanceled(), m::getCancelReason);
        // parameter recovery from 1% noise: within 5%
        assertEquals(k, (double) m.getOutput("kHalfMicromolar"), 0.05 * k, "fitted K, uM");
        assertTrue(Files.isRegularFile(dir.resolve("cal.png")), "curve picture");

        Path in = dir.resolve("intensity.csv");
        KymographCsv.write(new Kymograph(new double[] {0, 1}, new double[] {0}, new double[] {hill(0.3, k, n) + 20,
            2000}, "intensity"), in);
        Path out = dir.resolve("uM.csv");
        CommandModule c = run(ConvertKymographCommand.class, "kymograph", in.toFile(), "calibration", json.toFile(),
                "background", 20.0, "output", out.toFile());
        assertFalse(c.isCanceled(), c::getCancelReason);
        Kymograph uM = KymographCsv.read(out, "uM");
        assertEquals(0.3, uM.value(0, 0), 0.03, "concentration, uM");
        assertTrue(Double.isNaN(uM.value(0, 1)), "above the calibrated range: NaN");
        assertEquals(0.5, (double) c.getOutput("fractionNan"), 1e-12, "one sample of two");
    }

    private static double hill(double c, double k, double n) {
        // REF: Hill form F = Fmin + (Fmax - Fmin) c^n / (c^n + K^n), Fmin 100, Fmax 1000 [published: Hill 1910]; sheet s1.3
        return 100 + 900 * Math.pow(c, n) / (Math.pow(c, n) + Math.pow(k, n));
    }

    static String read(Path p) throws IOException {
        return Files.readString(p);
    }

    /** Keeps the analysis quick: the session fits one model, the closed-form one. */
    static void fitOnlyDiffusionDecay(java.nio.file.Path dir) {
        try {
            java.nio.file.Path json = dir.resolve("session.json");
            String text = java.nio.file.Files.readString(json);
            java.nio.file.Files.writeString(json, text.replace("\"calibration\"",
                    "\"models\": [\"diffusion-decay\"],\n  \"calibration\""));
        } catch (java.io.IOException e) {
            throw new java.io.UncheckedIOException(e);
        }
    }
}
