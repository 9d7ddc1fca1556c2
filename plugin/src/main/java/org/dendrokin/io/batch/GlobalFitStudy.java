package org.dendrokin.io.batch;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.TreeMap;
import java.util.stream.Collectors;

import com.google.gson.JsonArray;
import com.google.gson.JsonElement;
import com.google.gson.JsonObject;

import org.dendrokin.core.Checks;
import org.dendrokin.core.Progress;
import org.dendrokin.core.fit.DiffusionDecayPulse;
import org.dendrokin.core.fit.GlobalFit;
import org.dendrokin.core.kymo.Kymograph;
import org.dendrokin.io.InputException;
import org.dendrokin.io.KymographCsv;
import org.dendrokin.io.json.JsonFiles;
import org.dendrokin.io.text.Numbers;

/**
 * The joint fit of a batch's sessions: reads each session's finished results (results.json, kymograph.csv,
 * global-fit-input.json and batch.json), keeps the sessions that can take part and says why the others cannot,
 * fits one set of shared constants per group ({@link GlobalFit}) and writes {@code global-fit.json}
 * ({@link GlobalFitJson}) and its pictures. Works on the results of one run and on the merged shards of a cluster
 * run alike, since everything it needs is in the result folders.
 *
 * <p>All sessions fitted together must share one signal unit: a D fitted to dF/F0 is not the D of the same cells
 * calibrated to concentration (the indicator's response is not linear), so pooling them would mix two quantities.
 * Asked for over a results folder ({@link #runToFolder}), a study whose usable sessions are in several units is
 * refused with one sentence, before anything is written: the user chose the sessions. At the end of a batch
 * ({@link #run} with {@code batch} true) the sessions in the unit most of them share are fitted and the others are
 * left out, each with its reason, so that one calibrated session does not cost the whole study its joint fit; a
 * tie between units is still refused.
 */
public final class GlobalFitStudy {
    /** The file written into the output folder. */
    public static final String FILE = "global-fit.json";
    /** Models a joint fit is made for. */
    public static final List<String> MODELS = List.of(DiffusionDecayPulse.NAME);
    /** The group of sessions without one, as the batch report names it. */
    static final String NO_GROUP = BatchReport.NO_GROUP;

    private GlobalFitStudy() {
    }

    /**
     * What to fit.
     *
     * @param model               the model, one of {@link #MODELS}
     * @param bootstrapReplicates resamples of sessions per group (0: none)
     * @param seed                seed of the resampling
     */
    public record Request(String model, int bootstrapReplicates, long seed) {
        public Request {
            Checks.require(model != null, "a global fit needs a model");
            Checks.require(bootstrapReplicates >= 0, "bootstrapReplicates must be zero or positive");
        }

        /** The model with 200 resamples and seed 1. */
        public static Request of(String model) {
            return new Request(model, 200, 1L);
        }

        GlobalFit.Options options() {
            return GlobalFit.Options.defaults().withBootstrap(bootstrapReplicates, seed);
        }
    }

    /**
     * One session as the joint fit saw it.
     *
     * @param id       the session
     * @param group    its group ({@link #NO_GROUP} if none)
     * @param unit     its signal unit ("" if unknown)
     * @param input    what the joint fit got from it, or null when it was left out
     * @param ownD     its own fit's D: value, lower and upper 95% end (NaN where unknown)
     * @param ownK     its own fit's k, likewise
     * @param excluded why it was left out, one sentence ("" when it took part)
     */
    public record SessionInput(String id, String group, String unit, GlobalFit.Session input, double[] ownD,
                               double[] ownK, String excluded) {
        public boolean used() {
            return input != null;
        }

        /** Its own fit's value and 95% interval of a shared constant. */
        public double[] own(String constant) {
            return constant.equals("D") ? ownD : ownK;
        }
    }

    /**
     * What a joint fit gave.
     *
     * @param json     the global-fit.json written
     * @param request  what was asked
     * @param unit     the signal unit of the sessions fitted
     * @param result   the fits and comparisons
     * @param sessions every session, used or left out, in id order
     * @param warnings sentences about the study as a whole
     */
    public record Outcome(Path json, Request request, String unit, GlobalFit.Result result, List<SessionInput> sessions,
                          List<String> warnings) {
        public Outcome {
            sessions = List.copyOf(sessions);
            warnings = List.copyOf(warnings);
        }
    }

    /** Refuses a model no joint fit is made for, with one sentence. */
    public static void checkModel(String model) {
        if (!MODELS.contains(model)) {
            throw new InputException(null, "a global fit is made for the " + String.join(", ", MODELS) + " model only "
                    + "(its closed form makes a joint fit of many sessions fast), not for '" + model + "'");
        }
    }

    /**
     * Fits the sessions {@code ids} of a batch's results jointly and writes {@code OUT/global-fit.json}.
     *
     * @param resultsDir the batch's output folder (with {@code sessions/} inside). Only read.
     * @param ids        the sessions to consider
     * @param request    model and resampling
     * @param out        where global-fit.json goes (created if missing)
     * @param batch      true at the end of a batch: sessions outside the unit most usable sessions share are left
     *                   out with their reason instead of the study being refused
     * @param progress   progress and cancellation
     * @throws InputException if the model is not supported, no session can take part, or the usable sessions are
     *                        in different signal units (in a batch: two or more units tie for the most sessions)
     */
    public static Outcome run(Path resultsDir, List<String> ids, Request request, Path out, boolean batch,
                              Progress progress) {
        checkModel(request.model());
        List<SessionInput> inputs = new ArrayList<>();
        for (String id : ids) {
            inputs.add(read(resultsDir, id));
        }
        if (batch) {
            inputs = oneUnit(resultsDir, inputs);
        }
        List<SessionInput> usable = inputs.stream().filter(SessionInput::used).toList();
        if (usable.isEmpty()) {
            throw new InputException(resultsDir, "no session there has a converged " + request.model() + " fit to "
                    + "start a joint fit from" + (inputs.isEmpty() ? " (it holds no session results)" : ""));
        }
        Map<String, Long> units = usable.stream().collect(Collectors.groupingBy(SessionInput::unit, TreeMap::new,
                Collectors.counting()));
        if (units.size() > 1) {
            throw new InputException(resultsDir, "its sessions are in different signal units ("
                    + units.entrySet().stream().map(e -> e.getValue() + " in " + e.getKey())
                            .collect(Collectors.joining(", "))
                    + "), and a joint fit pools sessions of one unit only: calibrate all of them or none");
        }
        List<String> warnings = new ArrayList<>();
        long unrecorded = inputs.stream().filter(s -> s.used() && !GlobalFitInput.read(sessionDir(resultsDir, s.id()))
                .recorded()).count();
        if (unrecorded > 0) {
            warnings.add(String.format(Locale.ROOT, "%d session(s) do not record their fit settings (results of an "
                    + "older version): their path ends were taken as open, as by default.", unrecorded));
        }
        Map<String, List<GlobalFit.Session>> groups = new TreeMap<>();
        for (SessionInput s : usable) {
            groups.computeIfAbsent(s.group(), g -> new ArrayList<>()).add(s.input());
        }
        GlobalFit.Result result = GlobalFit.fit(groups, request.options(), progress);
        Outcome outcome = new Outcome(out.resolve(FILE), request, units.keySet().iterator().next(), result, inputs,
                warnings);
        GlobalFitJson.write(outcome);
        return outcome;
    }

    /**
     * As {@link #run}, into a folder of its own: global-fit.json, global-fit.html (the batch report's section as a
     * page) and the pictures under plots/.
     */
    public static Outcome runToFolder(Path resultsDir, List<String> ids, Request request, Path out,
                                      Progress progress) {
        try {
            Files.createDirectories(out);
        } catch (java.io.IOException e) {
            throw new InputException(out, "cannot be created (" + e.getMessage() + ")", e);
        }
        Outcome o = run(resultsDir, ids, request, out, false, progress);
        GlobalFitReport.page(out, o);
        return o;
    }

    /**
     * The sessions with those whose unit is not the one most usable sessions share left out, each with its reason;
     * unchanged when the usable sessions share one unit.
     *
     * @throws InputException if two or more units tie for the most sessions
     */
    private static List<SessionInput> oneUnit(Path resultsDir, List<SessionInput> inputs) {
        Map<String, Long> units = inputs.stream().filter(SessionInput::used).collect(Collectors.groupingBy(
                SessionInput::unit, TreeMap::new, Collectors.counting()));
        if (units.size() < 2) {
            return inputs;
        }
        long most = units.values().stream().mapToLong(Long::longValue).max().orElseThrow();
        List<String> top = units.entrySet().stream().filter(e -> e.getValue() == most).map(Map.Entry::getKey)
                .toList();
        if (top.size() > 1) {
            throw new InputException(resultsDir, "its sessions are in different signal units, as many in "
                    + String.join(" as in ", top) + " (" + most + " each), so none can be chosen for the joint fit, "
                    + "which pools sessions of one unit only: calibrate all of them or none");
        }
        String unit = top.get(0);
        List<SessionInput> kept = new ArrayList<>();
        for (SessionInput s : inputs) {
            kept.add(!s.used() || s.unit().equals(unit) ? s : left(s.id(), s.group(), s.unit(), s.ownD(), s.ownK(),
                    "its signal unit (" + (s.unit().isEmpty() ? "unknown" : s.unit()) + ") is not that of the other "
                    + most + " sessions (" + unit + "), and a joint fit pools sessions of one unit only."));
        }
        return kept;
    }

    /** A p value for people: three digits, "&lt; 0.0001" below that, "none" when it could not be computed. */
    private static String probability(double p) {
        if (!Double.isFinite(p)) {
            return "none";
        }
        return p < 1e-4 ? "< 0.0001" : String.format(Locale.ROOT, "%.3g", p);
    }

    /** A few lines for the terminal: each group's shared constants, each comparison, what was left out. */
    public static String summary(Outcome o) {
        StringBuilder s = new StringBuilder();
        for (GlobalFit.GroupResult g : o.result().groups()) {
            long used = o.sessions().stream().filter(x -> x.used() && x.group().equals(g.group())).count();
            s.append(g.group()).append(" (").append(used).append(" sessions): ");
            if (!g.converged()) {
                s.append("no joint fit: ").append(g.reason()).append('\n');
                continue;
            }
            List<String> parts = new ArrayList<>();
            for (org.dendrokin.core.fit.ParameterEstimate e : g.shared()) {
                parts.add(e.name() + " = " + Numbers.forPeople(e.value()) + " [" + Numbers.forPeople(e.ci95().lower())
                        + ", " + Numbers.forPeople(e.ci95().upper()) + "] " + e.unit().symbol());
            }
            s.append(String.join(", ", parts)).append('\n');
        }
        for (GlobalFit.Comparison c : o.result().comparisons()) {
            s.append(c.groupB()).append(" minus ").append(c.groupA()).append(", ").append(c.constant()).append(": ");
            if (c.difference() == null) {
                s.append(String.join(" ", c.warnings())).append('\n');
                continue;
            }
            s.append(Numbers.forPeople(c.difference().value())).append(" [")
                    .append(Numbers.forPeople(c.difference().ci95().lower())).append(", ")
                    .append(Numbers.forPeople(c.difference().ci95().upper())).append("] ")
                    .append(c.difference().unit().symbol()).append(String.format(Locale.ROOT,
                            ", likelihood ratio %.3g (p %s), bootstrap p %s: %s%n", c.statistic(),
                            probability(c.pValue()), probability(c.pValueBootstrap()),
                            c.differs() ? "they differ" : "no difference shown"));
        }
        long left = o.sessions().stream().filter(x -> !x.used()).count();
        if (left > 0) {
            s.append(left).append(" session(s) left out (reasons in ").append(FILE).append(")\n");
        }
        o.warnings().forEach(w -> s.append("warning: ").append(w).append('\n'));
        s.append("Written: ").append(o.json());
        return s.toString();
    }

    static Path sessionDir(Path resultsDir, String id) {
        return resultsDir.resolve("sessions").resolve(new SessionFolder(id, resultsDir).key());
    }

    /** One session's input, or the reason it cannot take part. */
    static SessionInput read(Path resultsDir, String id) {
        Path dir = sessionDir(resultsDir, id);
        SessionRecord record = SessionRecord.read(dir);
        String group = record == null || record.group().isEmpty() ? NO_GROUP : record.group();
        double[] none = {Double.NaN, Double.NaN, Double.NaN};
        if (record == null) {
            return left(id, group, "", none, none, "it has no complete result (not analysed, or its shard has not "
                    + "finished).");
        }
        if (!record.ok()) {
            return left(id, group, "", none, none, "its analysis ended with " + record.status() + ": "
                    + record.error());
        }
        JsonObject results;
        try {
            results = JsonFiles.readObject(dir.resolve("results.json"), "the session's results");
        } catch (InputException e) {
            return left(id, group, "", none, none, "its results.json cannot be read (" + e.getMessage() + ").");
        }
        String unit = text(results, "signal_unit");
        JsonObject fit = diffusionDecayFit(results);
        double[] ownD = fit == null ? none : estimate(fit, "D");
        double[] ownK = fit == null ? none : estimate(fit, "k");
        JsonObject stimulus = object(results, "stimulus");
        double t0 = stimulus == null ? Double.NaN : number(stimulus, "time_s");
        double x0 = stimulus == null ? Double.NaN : number(stimulus, "position_um");
        if (!Double.isFinite(t0) || !Double.isFinite(x0)) {
            return left(id, group, unit, ownD, ownK, "no stimulus was known, so its analysis fitted no model.");
        }
        if (fit == null) {
            return left(id, group, unit, ownD, ownK, "its analysis did not fit " + DiffusionDecayPulse.NAME
                    + " (name it in session.json's \"models\").");
        }
        if (!fit.has("converged") || !fit.get("converged").getAsBoolean()) {
            return left(id, group, unit, ownD, ownK, "its own " + DiffusionDecayPulse.NAME + " fit did not converge, "
                    + "so it gives no starting values.");
        }
        JsonObject misfit = object(fit, "misfit");
        if (misfit != null && "misfit".equals(text(misfit, "verdict"))) {
            return left(id, group, unit, ownD, ownK, "the " + DiffusionDecayPulse.NAME + " model does not describe it "
                    + "(its residuals mark it as a misfit).");
        }
        JsonObject parameters = object(fit, "parameters");
        Map<String, Double> start = new LinkedHashMap<>();
        if (parameters != null) {
            for (Map.Entry<String, JsonElement> p : parameters.entrySet()) {
                if (p.getValue().isJsonObject()) {
                    start.put(p.getKey(), number(p.getValue().getAsJsonObject(), "value"));
                }
            }
        }
        boolean free = start.containsKey("stimulus_time");
        List<String> needed = free ? List.of("D", "k", "amplitude", "position", "baseline", "stimulus_time")
                : List.of("D", "k", "amplitude", "width", "baseline");
        for (String name : needed) {
            Double v = start.get(name);
            if (v == null || !Double.isFinite(v)) {
                return left(id, group, unit, ownD, ownK, "its results give no value of " + name + " to start from.");
            }
        }
        GlobalFitInput.Settings settings;
        Kymograph kymograph;
        try {
            settings = GlobalFitInput.read(dir);
            kymograph = KymographCsv.read(dir.resolve("kymograph.csv"), unit);
        } catch (InputException e) {
            return left(id, group, unit, ownD, ownK, e.getMessage());
        }
        if (settings.delaysS() != null) {
            // a raster scan: read at each sample's own time in the joint fit too, as in the session's own fits
            double[] d = settings.delaysS();
            double step = kymograph.frameCount() < 2 ? Double.POSITIVE_INFINITY : kymograph.timeStepS();
            boolean fits = d.length == kymograph.positionCount() && java.util.Arrays.stream(d).allMatch(x -> x < step);
            if (!fits) {
                return left(id, group, unit, ownD, ownK, "its " + GlobalFitInput.FILE + " gives scan-line delays that "
                        + "do not fit its kymograph (one per position, each shorter than the frame interval).");
            }
            kymograph = kymograph.withSampleDelays(d);
        }
        JsonElement b = results.get("baseline_frames");
        int[] baseline = null;
        if (b != null && b.isJsonArray() && b.getAsJsonArray().size() == 2) {
            int first = b.getAsJsonArray().get(0).getAsInt();
            int last = b.getAsJsonArray().get(1).getAsInt();
            baseline = last >= first ? new int[] {first, last} : null;
        }
        start.keySet().retainAll(needed);
        GlobalFit.Session session = new GlobalFit.Session(id, kymograph, t0, x0, baseline, settings.sealedEnds(),
                free, start);
        return new SessionInput(id, group, unit, session, ownD, ownK, "");
    }

    private static SessionInput left(String id, String group, String unit, double[] ownD, double[] ownK,
                                     String why) {
        return new SessionInput(id, group, unit, null, ownD, ownK, why);
    }

    /** The diffusion-decay entry of results.json's {@code fits}, or null. */
    private static JsonObject diffusionDecayFit(JsonObject results) {
        JsonElement fits = results.get("fits");
        if (fits == null || !fits.isJsonArray()) {
            return null;
        }
        for (JsonElement f : fits.getAsJsonArray()) {
            if (f.isJsonObject() && DiffusionDecayPulse.NAME.equals(text(f.getAsJsonObject(), "model"))
                    && (!f.getAsJsonObject().has("tried") || f.getAsJsonObject().get("tried").getAsBoolean())) {
                return f.getAsJsonObject();
            }
        }
        return null;
    }

    /** {value, lower, upper} of a fitted parameter (NaN where absent or null). */
    private static double[] estimate(JsonObject fit, String name) {
        JsonObject parameters = object(fit, "parameters");
        JsonObject p = parameters == null ? null : object(parameters, name);
        if (p == null) {
            return new double[] {Double.NaN, Double.NaN, Double.NaN};
        }
        double lo = Double.NaN;
        double hi = Double.NaN;
        JsonElement ci = p.get("ci95");
        if (ci != null && ci.isJsonArray()) {
            JsonArray a = ci.getAsJsonArray();
            lo = a.size() > 0 && !a.get(0).isJsonNull() ? a.get(0).getAsDouble() : Double.NaN;
            hi = a.size() > 1 && !a.get(1).isJsonNull() ? a.get(1).getAsDouble() : Double.NaN;
        }
        return new double[] {number(p, "value"), lo, hi};
    }

    private static JsonObject object(JsonObject o, String key) {
        JsonElement e = o.get(key);
        return e != null && e.isJsonObject() ? e.getAsJsonObject() : null;
    }

    private static String text(JsonObject o, String key) {
        JsonElement e = o.get(key);
        return e != null && e.isJsonPrimitive() ? e.getAsString() : "";
    }

    private static double number(JsonObject o, String key) {
        JsonElement e = o.get(key);
        return e != null && e.isJsonPrimitive() && e.getAsJsonPrimitive().isNumber() ? e.getAsDouble() : Double.NaN;
    }

    /** True when a results folder holds batch results (a sessions folder). */
    static boolean isBatchOutput(Path dir) {
        return Files.isDirectory(dir.resolve("sessions"));
    }
}
