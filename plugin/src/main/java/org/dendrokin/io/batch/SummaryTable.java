package org.dendrokin.io.batch;

import java.io.OutputStreamWriter;
import java.io.Writer;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.HashSet;
import java.util.LinkedHashMap;
import java.util.LinkedHashSet;
import java.util.List;
import java.util.Map;
import java.util.Set;
import java.util.stream.Collectors;

import com.google.gson.JsonElement;
import com.google.gson.JsonObject;

import org.apache.commons.csv.CSVFormat;
import org.apache.commons.csv.CSVPrinter;
import org.dendrokin.io.AtomicFiles;
import org.dendrokin.io.InputException;
import org.dendrokin.io.json.JsonFiles;

/**
 * The table of a batch, one row a session, built from each session's batch.json and results.json. Columns
 * appear for whatever results.json holds: every {@code spread} quantity and every fitted model's
 * parameters, each with its 95% interval, the unit in the column name (e.g. {@code diffusion-decay D
 * [um^2/s]}). Numbers are copied as results.json wrote them.
 */
public final class SummaryTable {
    static final String[] SPREAD_ORDER = {"front_speed", "peak_decay_length", "length_constant", "decay_time"};

    private final List<String> columns = new ArrayList<>();
    private final List<Map<String, String>> rows = new ArrayList<>();
    private final List<Quantity> quantities = new ArrayList<>();
    private final List<SessionEntry> entries = new ArrayList<>();

    /**
     * One quantity measured in many sessions, e.g. a fitted D of one model.
     *
     * @param label  e.g. {@code diffusion-decay D} or {@code front_speed}
     * @param unit   e.g. {@code um^2/s}; "" if none was given
     * @param values value by session id, sessions that succeeded (and whose fit converged) only
     */
    public record Quantity(String label, String unit, Map<String, Double> values) {
        /** The label with its unit, for axes and headers. */
        public String title() {
            return unit.isEmpty() ? label : label + " (" + unit + ")";
        }
    }

    /**
     * One session as the report shows it.
     *
     * @param id      session id
     * @param key     folder name under {@code sessions/}
     * @param record  its batch.json, or null when the session has no complete result
     * @param results its results.json, or null
     */
    public record SessionEntry(String id, String key, SessionRecord record, JsonObject results) {
        public String group() {
            return record == null ? "" : record.group();
        }

        public String status() {
            return record == null ? "missing" : record.status();
        }
    }

    /**
     * Reads the results of {@code ids} under {@code out/sessions}. A quantity is kept apart by its unit: a fitted
     * amplitude in dF/F0 and one in uM become two columns and two distributions, never one. A number without an
     * interval (a count) gets one column; an estimate gets its value and the two ends of its 95% interval.
     */
    public static SummaryTable read(Path out, List<String> ids) {
        SummaryTable t = new SummaryTable();
        Map<String, Map<String, String>> cells = new LinkedHashMap<>();
        Columns columns = new Columns();
        List<String> spreadNames = new ArrayList<>(List.of(SPREAD_ORDER));
        Map<String, List<String>> modelParams = new LinkedHashMap<>();
        for (String id : ids.stream().sorted(SessionFolder.ORDER).toList()) {
            String key = new SessionFolder(id, out).key();
            Path dir = out.resolve("sessions").resolve(key);
            SessionRecord record = SessionRecord.read(dir);
            JsonObject results = record != null && record.ok() ? readJson(dir.resolve("results.json")) : null;
            t.entries.add(new SessionEntry(id, key, record, results));
            Map<String, String> row = new LinkedHashMap<>();
            row.put("session", id);
            row.put("group", record == null ? "" : record.group());
            row.put("status", record == null ? "missing" : record.status());
            row.put("error", record == null ? "no complete result for this session" : record.error());
            if (results != null) {
                row.put("best_model", text(results.get("best_model")));
                row.put("signal_unit", text(results.get("signal_unit")));
                JsonObject spread = object(results.get("spread"));
                if (spread != null) {
                    for (Map.Entry<String, JsonElement> e : spread.entrySet()) {
                        if (!spreadNames.contains(e.getKey())) {
                            spreadNames.add(e.getKey());
                        }
                        columns.cell(row, "spread:" + e.getKey(), e.getValue(), id, true);
                    }
                }
                if (results.get("fits") != null && results.get("fits").isJsonArray()) {
                    for (JsonElement f : results.get("fits").getAsJsonArray()) {
                        JsonObject fit = object(f);
                        if (fit == null || text(fit.get("model")).isEmpty()) {
                            continue;
                        }
                        String model = text(fit.get("model"));
                        List<String> params = modelParams.computeIfAbsent(model, m -> new ArrayList<>());
                        boolean converged = !fit.has("converged") || "true".equals(text(fit.get("converged")));
                        JsonObject misfit = object(fit.get("misfit"));
                        boolean describes = misfit == null || !"misfit".equals(text(misfit.get("verdict")));
                        for (String k : FIT_COLUMNS) {
                            row.put("fit:" + model + ":" + k, k.equals("residuals") ? residuals(fit) : text(fit.get(k)));
                        }
                        JsonObject ps = object(fit.get("parameters"));
                        if (ps != null) {
                            for (Map.Entry<String, JsonElement> p : ps.entrySet()) {
                                if (!params.contains(p.getKey())) {
                                    params.add(p.getKey());
                                }
                                // a fit that did not converge, or whose model does not describe the data, gives no
                                // value to the group statistics
                                columns.cell(row, "param:" + model + ":" + p.getKey(), p.getValue(), id,
                                        converged && describes);
                            }
                        }
                    }
                }
                JsonElement w = results.get("warnings");
                row.put("warnings", String.valueOf(w != null && w.isJsonArray() ? w.getAsJsonArray().size() : 0));
            }
            row.put("tool_version", record == null ? "" : record.toolVersion());
            row.put("settings_sha256", record == null ? "" : record.settingsSha256());
            row.put("inputs_sha256", record == null ? "" : record.inputs().entrySet().stream()
                    .map(e -> e.getKey() + "=" + e.getValue()).collect(Collectors.joining("; ")));
            cells.put(id, row);
        }
        List<String[]> order = new ArrayList<>();
        order.add(new String[] {"session", "session"});
        order.add(new String[] {"group", "group"});
        order.add(new String[] {"status", "status"});
        order.add(new String[] {"error", "error"});
        order.add(new String[] {"best_model", "best_model"});
        order.add(new String[] {"signal_unit", "signal_unit"});
        for (String s : spreadNames) {
            columns.addColumns(order, "spread:" + s, s);
        }
        for (Map.Entry<String, List<String>> m : modelParams.entrySet()) {
            for (String k : FIT_COLUMNS) {
                order.add(new String[] {"fit:" + m.getKey() + ":" + k, m.getKey() + " " + k});
            }
            for (String p : m.getValue()) {
                columns.addColumns(order, "param:" + m.getKey() + ":" + p, m.getKey() + " " + p);
            }
        }
        for (String c : new String[] {"warnings", "tool_version", "settings_sha256", "inputs_sha256"}) {
            order.add(new String[] {c, c});
        }
        for (String[] c : order) {
            t.columns.add(c[1]);
        }
        for (Map<String, String> row : cells.values()) {
            Map<String, String> named = new LinkedHashMap<>();
            for (String[] c : order) {
                named.put(c[1], row.getOrDefault(c[0], ""));
            }
            t.rows.add(named);
        }
        for (String s : spreadNames) {
            columns.addQuantities(t, "spread:" + s, s);
        }
        for (Map.Entry<String, List<String>> m : modelParams.entrySet()) {
            for (String p : m.getValue()) {
                columns.addQuantities(t, "param:" + m.getKey() + ":" + p, m.getKey() + " " + p);
            }
        }
        return t;
    }

    /** Columns written for every fitted model besides its parameters. */
    static final String[] FIT_COLUMNS = {"converged", "aic", "bic", "rmse", "residuals"};

    /** The residual verdict of a fit, e.g. {@code misfit: stripes along time}; "not tried" or empty without one. */
    private static String residuals(JsonObject fit) {
        JsonObject m = object(fit.get("misfit"));
        if (m == null) {
            return text(fit.get("tried")).equals("false") ? "not tried" : "";
        }
        String pattern = text(m.get("pattern"));
        return text(m.get("verdict")) + (pattern.isEmpty() || pattern.equals("none") ? "" : ": " + pattern);
    }

    /**
     * The columns of the quantities, kept apart by unit: each base key (e.g. {@code param:diffusion-decay:D}) has
     * one set of columns per unit seen, in the order seen, and each set its own distribution for the group
     * statistics.
     */
    private static final class Columns {
        private final Map<String, Set<String>> units = new LinkedHashMap<>();
        private final Set<String> withInterval = new HashSet<>();
        private final Set<String> words = new HashSet<>();
        private final Map<String, Map<String, Double>> values = new LinkedHashMap<>();

        private static String key(String base, String unit) {
            return base + "|" + unit;
        }

        private String seen(String base, String unit) {
            units.computeIfAbsent(base, b -> new LinkedHashSet<>()).add(unit);
            return key(base, unit);
        }

        /** Records one session's cell of a quantity: an estimate, a plain number, or the front's verdict. */
        void cell(Map<String, String> row, String base, JsonElement element, String id, boolean counts) {
            if (element == null || element.isJsonNull()) {
                return;
            }
            if (element.isJsonPrimitive()) {
                String key = seen(base, "");
                row.put(key, text(element));
                number(key, text(element), id, counts);
                return;
            }
            JsonObject e = object(element);
            if (e == null) {
                return;
            }
            if (e.has("verdict") && !e.has("value")) {
                // whether the arrival times show a front: a word, not a number
                String key = seen(base, "");
                words.add(key);
                row.put(key, text(e.get("verdict")));
                return;
            }
            String key = seen(base, text(e.get("unit")));
            String v = text(e.get("value"));
            row.put(key, v);
            JsonElement ci = e.get("ci95");
            if (ci != null && ci.isJsonArray() && ci.getAsJsonArray().size() == 2) {
                withInterval.add(key);
                row.put(key + ":lo", text(ci.getAsJsonArray().get(0)));
                row.put(key + ":hi", text(ci.getAsJsonArray().get(1)));
            }
            number(key, v, id, counts);
        }

        private void number(String key, String text, String id, boolean counts) {
            if (!counts) {
                return;
            }
            try {
                double d = Double.parseDouble(text);
                if (Double.isFinite(d)) {
                    values.computeIfAbsent(key, k -> new LinkedHashMap<>()).put(id, d);
                }
            } catch (NumberFormatException ignored) {
                // a missing or non-numeric value stays out of the distributions
            }
        }

        void addColumns(List<String[]> order, String base, String label) {
            for (String unit : units.getOrDefault(base, Set.of())) {
                String key = key(base, unit);
                String suffix = unit.isEmpty() ? "" : " [" + unit + "]";
                order.add(new String[] {key, label + suffix});
                if (withInterval.contains(key)) {
                    order.add(new String[] {key + ":lo", label + " ci95 low" + suffix});
                    order.add(new String[] {key + ":hi", label + " ci95 high" + suffix});
                }
            }
        }

        void addQuantities(SummaryTable t, String base, String label) {
            for (String unit : units.getOrDefault(base, Set.of())) {
                String key = key(base, unit);
                Map<String, Double> v = values.get(key);
                if (v != null && !v.isEmpty() && !words.contains(key) && withInterval.contains(key)) {
                    t.quantities.add(new Quantity(label, unit, v));
                }
            }
        }
    }

    public List<String> columns() {
        return List.copyOf(columns);
    }

    /** Rows in session id order; every row has every column (empty text where there is nothing). */
    public List<Map<String, String>> rows() {
        return rows.stream().map(Map::copyOf).toList();
    }

    public List<Quantity> quantities() {
        return List.copyOf(quantities);
    }

    public List<SessionEntry> entries() {
        return List.copyOf(entries);
    }

    /** Writes the table as CSV (RFC 4180, UTF-8, header line first). */
    public void writeCsv(Path target) {
        AtomicFiles.write(target, out -> {
            Writer w = new OutputStreamWriter(out, StandardCharsets.UTF_8);
            try (CSVPrinter csv = new CSVPrinter(w, CSVFormat.DEFAULT.builder().setRecordSeparator('\n').get())) {
                csv.printRecord(columns);
                for (Map<String, String> row : rows) {
                    List<String> line = new ArrayList<>();
                    for (String c : columns) {
                        line.add(row.get(c));
                    }
                    csv.printRecord(line);
                }
            }
        });
    }

    static JsonObject readJson(Path f) {
        if (!Files.isRegularFile(f)) {
            return null;
        }
        try {
            return JsonFiles.readObject(f, "results");
        } catch (InputException e) {
            return null;
        }
    }

    private static JsonObject object(JsonElement e) {
        return e != null && e.isJsonObject() ? e.getAsJsonObject() : null;
    }

    private static String text(JsonElement e) {
        if (e == null || e.isJsonNull()) {
            return "";
        }
        return e.isJsonPrimitive() ? e.getAsString() : e.toString();
    }
}
