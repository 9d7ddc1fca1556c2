package org.dendrokin.io.model;

import java.io.IOException;
import java.io.Reader;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.Set;

import org.dendrokin.core.model.Boundary;
import org.dendrokin.core.model.BuiltInModel;
import org.dendrokin.core.model.ClosedForm;
import org.dendrokin.core.model.CrossSection;
import org.dendrokin.core.model.Domain;
import org.dendrokin.core.model.Expression;
import org.dendrokin.core.model.ModelCatalogue;
import org.dendrokin.core.model.ModelParameter;
import org.dendrokin.core.model.ReactionNetwork;
import org.dendrokin.core.model.Simulation;
import org.dendrokin.core.model.SolverSettings;
import org.dendrokin.core.model.StochasticSettings;
import org.dendrokin.core.model.Stimulus;
import org.dendrokin.io.InputException;

import com.google.gson.JsonArray;
import com.google.gson.JsonElement;
import com.google.gson.JsonObject;
import com.google.gson.JsonParseException;
import com.google.gson.JsonParser;

/**
 * Reads a model JSON file (the {@code simulate} command's input; format in docs/models.md) into a
 * {@link Simulation.Spec} and, when present, the settings of a synthetic movie. Every problem becomes an
 * {@link InputException} naming the file and the key. Unknown keys are refused, so a typo cannot silently
 * fall back to a default. The file itself is only read.
 */
public final class ModelFile {
    /** A parsed model file: what to simulate and, optionally, a movie to make from it. */
    public record Parsed(Simulation.Spec spec, MovieSettings movie) {
    }

    private static final Set<String> TOP = Set.of("model", "parameters", "domain", "time", "stimuli", "solver",
            "output", "network", "sbml", "stochastic", "movie", "description");

    private final Path file;

    private ModelFile(Path file) {
        this.file = file;
    }

    public static Parsed read(Path file) {
        JsonObject root;
        try (Reader r = Files.newBufferedReader(file, StandardCharsets.UTF_8)) {
            JsonElement e = JsonParser.parseReader(r);
            if (!e.isJsonObject()) {
                throw new InputException(file, "a model file must hold one JSON object");
            }
            root = e.getAsJsonObject();
        } catch (IOException e) {
            throw new InputException(file, "cannot be read (" + e.getMessage() + ")", e);
        } catch (JsonParseException e) {
            throw new InputException(file, "is not valid JSON (" + e.getMessage() + ")", e);
        }
        return new ModelFile(file).parse(root);
    }

    private Parsed parse(JsonObject root) {
        keys(root, "", TOP);
        String model = string(root, "model", "model");
        JsonObject domainJson = object(root, "domain", "domain");
        keys(domainJson, "domain.", Set.of("length_um", "dx_um", "boundary", "cross_section"));
        double length = positive(domainJson, "length_um", "domain.length_um");
        double dx = positive(domainJson, "dx_um", "domain.dx_um");
        String boundaryText = domainJson.has("boundary")
                ? string(domainJson, "boundary", "domain.boundary") : "no-flux";
        Boundary boundary = switch (boundaryText) {
            case "no-flux" -> Boundary.NO_FLUX;
            case "fixed" -> Boundary.FIXED;
            default -> throw fail("domain.boundary must be \"no-flux\" or \"fixed\", got \"" + boundaryText + "\"");
        };
        if (dx > length / 2) {
            throw fail("domain.dx_um (" + num(dx) + " um) must be at most half of domain.length_um (" + num(length)
                    + " um)");
        }
        if (length / dx > 2_000_000) {
            throw fail("domain.dx_um (" + num(dx) + " um) makes more than two million grid nodes; use a coarser grid");
        }
        CrossSection cs = CrossSection.UNIFORM;
        if (domainJson.has("cross_section")) {
            JsonArray arr = array(domainJson, "cross_section", "domain.cross_section");
            double[] pos = new double[arr.size()];
            double[] area = new double[arr.size()];
            for (int i = 0; i < arr.size(); i++) {
                String key = "domain.cross_section[" + i + "]";
                JsonObject o = asObject(arr.get(i), key);
                keys(o, key + ".", Set.of("position_um", "area_um2"));
                pos[i] = number(o, "position_um", key + ".position_um");
                area[i] = positive(o, "area_um2", key + ".area_um2");
                if (i > 0 && pos[i] <= pos[i - 1]) {
                    throw fail(key + ".position_um must be larger than the one before it");
                }
            }
            if (pos.length == 0) {
                throw fail("domain.cross_section is empty");
            }
            cs = CrossSection.of(pos, area);
        }
        Domain domain = new Domain(length, dx, boundary, cs);
        double h = domain.spacingUm();

        JsonObject time = object(root, "time", "time");
        keys(time, "time.", Set.of("duration_s", "output_interval_s"));
        double duration = positive(time, "duration_s", "time.duration_s");
        double interval = positive(time, "output_interval_s", "time.output_interval_s");
        if (interval > duration) {
            throw fail("time.output_interval_s (" + num(interval) + " s) is longer than time.duration_s ("
                    + num(duration) + " s)");
        }
        if (duration / interval > 200_000) {
            throw fail("time.output_interval_s gives more than 200000 frames; use a longer interval");
        }

        String observed = null;
        double[] positions = null;
        if (root.has("output")) {
            JsonObject out = object(root, "output", "output");
            keys(out, "output.", Set.of("dx_um", "species"));
            if (out.has("species")) {
                observed = string(out, "species", "output.species");
            }
            if (out.has("dx_um")) {
                double step = positive(out, "dx_um", "output.dx_um");
                int count = (int) Math.floor(length / step + 1e-9) + 1;
                positions = new double[count];
                for (int i = 0; i < count; i++) {
                    positions[i] = Math.min(i * step, length);
                }
            }
        }
        if (positions == null) {
            positions = new double[domain.nodeCount()];
            for (int i = 0; i < positions.length; i++) {
                positions[i] = domain.nodeUm(i);
            }
        }

        List<Stimulus> stimuli = new ArrayList<>();
        if (root.has("stimuli")) {
            JsonArray arr = array(root, "stimuli", "stimuli");
            for (int i = 0; i < arr.size(); i++) {
                stimuli.add(stimulus(asObject(arr.get(i), "stimuli[" + i + "]"), "stimuli[" + i + "]", length, h));
            }
        }

        SolverSettings settings = SolverSettings.DEFAULT;
        if (root.has("solver")) {
            JsonObject s = object(root, "solver", "solver");
            keys(s, "solver.", Set.of("step_factor", "max_step_s", "fixed_step_s", "smoothing", "spatial_order",
                    "time_tolerance"));
            if (s.has("step_factor")) {
                settings = settings.withStepFactor(positive(s, "step_factor", "solver.step_factor"));
            }
            if (s.has("max_step_s")) {
                settings = settings.withMaxStepS(positive(s, "max_step_s", "solver.max_step_s"));
            }
            if (s.has("fixed_step_s")) {
                settings = settings.withFixedStepS(positive(s, "fixed_step_s", "solver.fixed_step_s"));
            }
            if (s.has("spatial_order")) {
                double order = number(s, "spatial_order", "solver.spatial_order");
                if (order != 2 && order != 4) {
                    throw fail("solver.spatial_order must be 2 or 4, got " + num(order));
                }
                settings = settings.withSpatialOrder((int) order);
            }
            if (s.has("smoothing")) {
                settings = settings.withSmoothing(bool(s, "smoothing", "solver.smoothing"));
            }
            if (s.has("time_tolerance")) {
                settings = settings.withTimeTolerance(positive(s, "time_tolerance", "solver.time_tolerance"));
            }
        }

        Map<String, Double> parameters = new LinkedHashMap<>();
        ReactionNetwork network = null;
        BuiltInModel entry = null;
        if (model.equals(Simulation.NETWORK)) {
            if (root.has("parameters")) {
                throw fail("parameters is for built-in models; a network keeps its constants in network.parameters"
                        + " or in each reaction");
            }
            if (root.has("sbml") == root.has("network")) {
                throw fail("model \"network\" needs exactly one of the keys network (our JSON format) and sbml"
                        + " (an SBML file)");
            }
            network = root.has("network") ? network(object(root, "network", "network"))
                    : sbml(object(root, "sbml", "sbml"));
        } else {
            if (root.has("network") || root.has("sbml")) {
                throw fail("network and sbml need \"model\": \"network\"");
            }
            entry = ModelCatalogue.find(model).orElseThrow(() -> fail("model \"" + model + "\" is not known; use one"
                    + " of " + String.join(", ", ModelCatalogue.names()) + ", or \"network\""));
            List<String> names = entry.parameterNames();
            JsonObject p = object(root, "parameters", "parameters");
            keys(p, "parameters.", Set.copyOf(names));
            for (String name : names) {
                if (!p.has(name)) {
                    throw fail("parameters." + name + " is missing (" + model + " needs " + String.join(", ", names)
                            + ")");
                }
                double v = number(p, name, "parameters." + name);
                parameters.put(name, v);
            }
            double[] values = entry.values(parameters);
            checkBuiltIn(entry, values, h);
            double rate = entry.stiffnessPerS(values);
            if (settings.fixedStepS() > 0 && rate * settings.fixedStepS() > 1) {
                throw fail("solver.fixed_step_s (" + num(settings.fixedStepS()) + " s) is too long to resolve the"
                        + " reactions of " + model + ": their rate is " + num(rate)
                        + " 1/s, so the step must be at most " + num(1 / rate) + " s");
            }
        }
        if (network != null && observed != null && network.indexOf(observed) < 0) {
            throw fail("output.species names " + observed + ", which is not a species of the network "
                    + network.species());
        }

        StochasticSettings stochastic = null;
        if (root.has("stochastic")) {
            JsonObject s = object(root, "stochastic", "stochastic");
            keys(s, "stochastic.", Set.of("runs", "seed", "threads", "molecules_per_unit_um3"));
            int runs = s.has("runs") ? (int) positive(s, "runs", "stochastic.runs") : 20;
            long seed = s.has("seed") ? (long) number(s, "seed", "stochastic.seed") : 1L;
            int threads = s.has("threads") ? (int) positive(s, "threads", "stochastic.threads")
                    : Runtime.getRuntime().availableProcessors();
            double per = s.has("molecules_per_unit_um3")
                    ? positive(s, "molecules_per_unit_um3", "stochastic.molecules_per_unit_um3")
                    : StochasticSettings.MICROMOLAR_PER_UM3;
            if (entry != null && entry.engine() != BuiltInModel.Engine.NETWORK) {
                throw fail("stochastic needs a reaction network (model " + stochasticModels() + "); " + model
                        + " is a continuum model only");
            }
            if (settings.timeTolerance() > 0) {
                throw fail("solver.time_tolerance applies to deterministic runs only; remove it or the stochastic"
                        + " block");
            }
            if (entry != null && entry.stochasticRefusal() != null) {
                throw fail("stochastic is not available for " + model + ", " + entry.stochasticRefusal());
            }
            stochastic = new StochasticSettings(runs, seed, threads, per);
        }
        MovieSettings movie = root.has("movie") ? MovieSettings.read(this, object(root, "movie", "movie")) : null;
        try {
            return new Parsed(new Simulation.Spec(model, parameters, network, observed, domain, duration, interval,
                    positions, stimuli, settings, stochastic), movie);
        } catch (IllegalArgumentException e) {
            throw fail(e.getMessage());
        }
    }

    /** Checks a built-in model's values against their ranges and that the grid resolves it, saying which not. */
    private void checkBuiltIn(BuiltInModel entry, double[] values, double h) {
        List<ModelParameter> list = entry.parameters();
        List<String> strictly = new ArrayList<>();
        boolean zero = false;
        for (int i = 0; i < values.length; i++) {
            ModelParameter p = list.get(i);
            if (p.range() != ModelParameter.Range.ANY && values[i] < 0) {
                throw fail("parameters." + p.name() + " must be zero or positive, got " + num(values[i]));
            }
            if (p.range() == ModelParameter.Range.POSITIVE) {
                strictly.add("parameters." + p.name());
                zero |= values[i] <= 0;
            }
        }
        if (zero) {
            throw fail(String.join(" and ", strictly) + " must be positive");
        }
        ClosedForm scale = entry.gridScale().orElse(null);
        if (scale != null) {
            // NaN or infinite when the model's rate is zero: nothing to resolve then
            double length = scale.value(values);
            if (h > length / 2) {
                throw fail("domain.dx_um (" + num(h) + " um) is too coarse to resolve " + entry.name() + ": the "
                        + scale.description() + " is " + num(length) + " um, so dx_um must be at most "
                        + num(length / 2) + " um");
            }
        }
    }

    /** The models the stochastic mode runs, quoted, for messages: "network" or "buffered-diffusion". */
    private static String stochasticModels() {
        List<String> names = new ArrayList<>();
        names.add("\"" + Simulation.NETWORK + "\"");
        for (BuiltInModel e : ModelCatalogue.all()) {
            if (e.engine() == BuiltInModel.Engine.NETWORK && e.stochasticRefusal() == null) {
                names.add("\"" + e.name() + "\"");
            }
        }
        String last = names.remove(names.size() - 1);
        return names.isEmpty() ? last : String.join(", ", names) + " or " + last;
    }

    private Stimulus stimulus(JsonObject o, String key, double length, double h) {
        keys(o, key + ".", Set.of("kind", "time_s", "position_um", "width_um", "amount", "duration_s", "species"));
        String kind = o.has("kind") ? string(o, "kind", key + ".kind") : "pulse";
        double t = number(o, "time_s", key + ".time_s");
        if (t < 0) {
            throw fail(key + ".time_s must be zero or positive, got " + num(t));
        }
        double x = number(o, "position_um", key + ".position_um");
        if (x < 0 || x > length) {
            throw fail(key + ".position_um (" + num(x) + " um) lies outside the domain (0 to " + num(length) + " um)");
        }
        double width = positive(o, "width_um", key + ".width_um");
        double amount = number(o, "amount", key + ".amount");
        String species = o.has("species") ? string(o, "species", key + ".species") : null;
        Stimulus s;
        switch (kind) {
            case "pulse" -> {
                if (o.has("duration_s")) {
                    throw fail(key + ".duration_s does not apply to a pulse; use \"kind\": \"injection\" for a boxcar");
                }
                s = Stimulus.pulse(t, x, width, amount);
            }
            case "injection" ->
                    s = Stimulus.injection(t, positive(o, "duration_s", key + ".duration_s"), x, width, amount);
            case "clamp" -> s = Stimulus.clamp(t, positive(o, "duration_s", key + ".duration_s"), x, width, amount);
            default -> throw fail(key + ".kind must be \"pulse\", \"injection\" or \"clamp\", got \"" + kind + "\"");
        }
        if (!kind.equals("clamp") && width < h / 2) {
            throw fail(key + ".width_um (" + num(width) + " um) is narrower than half the grid spacing (" + num(h)
                    + " um), so the grid cannot represent the stimulus; use a smaller domain.dx_um");
        }
        if (kind.equals("clamp") && width < h / 2) {
            throw fail(key + ".width_um (" + num(width) + " um) is less than half the grid spacing (" + num(h)
                    + " um), so the clamp holds no grid node");
        }
        return species == null ? s : s.onSpecies(species);
    }

    private ReactionNetwork network(JsonObject o) {
        keys(o, "network.", Set.of("species", "reactions", "parameters"));
        Map<String, Double> values = new LinkedHashMap<>();
        if (o.has("parameters")) {
            JsonObject p = object(o, "parameters", "network.parameters");
            for (String k : p.keySet()) {
                values.put(k, number(p, k, "network.parameters." + k));
            }
        }
        JsonArray speciesArr = array(o, "species", "network.species");
        if (speciesArr.size() == 0) {
            throw fail("network.species is empty");
        }
        List<String> names = new ArrayList<>();
        double[] d = new double[speciesArr.size()];
        double[] init = new double[speciesArr.size()];
        for (int i = 0; i < speciesArr.size(); i++) {
            String key = "network.species[" + i + "]";
            JsonObject s = asObject(speciesArr.get(i), key);
            keys(s, key + ".", Set.of("name", "D_um2_per_s", "initial"));
            String name = string(s, "name", key + ".name");
            if (names.contains(name)) {
                throw fail(key + ".name repeats the species name " + name);
            }
            if (values.containsKey(name)) {
                throw fail(key + ".name " + name + " is also a parameter name");
            }
            names.add(name);
            if (!s.has("D_um2_per_s")) {
                throw fail(key + " (" + name + ") has no D_um2_per_s; every species needs a diffusion coefficient"
                        + " (0 for an immobile one)");
            }
            d[i] = number(s, "D_um2_per_s", key + ".D_um2_per_s");
            if (d[i] < 0) {
                throw fail(key + ".D_um2_per_s must be zero or positive, got " + num(d[i]));
            }
            init[i] = s.has("initial") ? number(s, "initial", key + ".initial") : 0;
            if (init[i] < 0) {
                throw fail(key + ".initial must be zero or positive, got " + num(init[i]));
            }
        }
        List<ReactionNetwork.Reaction> reactions = new ArrayList<>();
        JsonArray arr = o.has("reactions") ? array(o, "reactions", "network.reactions") : new JsonArray();
        for (int r = 0; r < arr.size(); r++) {
            String key = "network.reactions[" + r + "]";
            reactions.addAll(reaction(asObject(arr.get(r), key), key, names, values));
        }
        return new ReactionNetwork(names, d, init, reactions);
    }

    private List<ReactionNetwork.Reaction> reaction(JsonObject o, String key, List<String> names,
            Map<String, Double> values) {
        keys(o, key + ".", Set.of("name", "reactants", "products", "law", "k", "kr", "vmax", "kcat", "km", "enzyme",
                "substrate", "activator", "K", "n", "rate"));
        String name = o.has("name") ? string(o, "name", key + ".name") : key;
        int m = names.size();
        double[] reactants = stoichiometry(o, "reactants", key, names);
        double[] products = stoichiometry(o, "products", key, names);
        double[] net = new double[m];
        for (int s = 0; s < m; s++) {
            net[s] = products[s] - reactants[s];
        }
        String law = o.has("law") ? string(o, "law", key + ".law") : "mass-action";
        List<ReactionNetwork.Reaction> out = new ArrayList<>();
        switch (law) {
            case "mass-action" -> {
                double k = nonNegative(o, "k", key + ".k");
                out.add(new ReactionNetwork.Reaction(name, net,
                        ReactionNetwork.massAction(reactants, products, k, 0), k * order(reactants, m)));
                if (o.has("kr")) {
                    double kr = nonNegative(o, "kr", key + ".kr");
                    double[] back = new double[m];
                    for (int s = 0; s < m; s++) {
                        back[s] = -net[s];
                    }
                    // the reverse direction is its own reaction, so rates stay non-negative (stochastic mode)
                    out.add(new ReactionNetwork.Reaction(name + " (reverse)", back,
                            ReactionNetwork.massAction(products, reactants, kr, 0), kr * order(products, m)));
                }
            }
            case "michaelis-menten" -> {
                String substrate = o.has("substrate") ? string(o, "substrate", key + ".substrate")
                        : single(reactants, names, key);
                int si = species(names, substrate, key + ".substrate");
                double km = positive(o, "km", key + ".km");
                Expression rate;
                double scale;
                if (o.has("enzyme")) {
                    int e = species(names, string(o, "enzyme", key + ".enzyme"), key + ".enzyme");
                    double kcat = nonNegative(o, "kcat", key + ".kcat");
                    rate = ReactionNetwork.michaelisMenten(si, e, kcat, km);
                    scale = kcat;
                } else {
                    double vmax = nonNegative(o, "vmax", key + ".vmax");
                    rate = ReactionNetwork.michaelisMenten(si, -1, vmax, km);
                    scale = vmax / km;
                }
                out.add(new ReactionNetwork.Reaction(name, net, rate, scale));
            }
            case "hill" -> {
                int a = species(names, string(o, "activator", key + ".activator"), key + ".activator");
                double vmax = nonNegative(o, "vmax", key + ".vmax");
                double kHalf = positive(o, "K", key + ".K");
                double n = positive(o, "n", key + ".n");
                out.add(new ReactionNetwork.Reaction(name, net, ReactionNetwork.hill(a, vmax, kHalf, n),
                        vmax * n / kHalf));
            }
            case "expression" -> {
                String formula = string(o, "rate", key + ".rate");
                Expression rate;
                try {
                    rate = Formulas.translate(Formulas.parse(formula), names, values);
                } catch (Formulas.Unsupported e) {
                    throw fail(key + ".rate: " + e.getMessage());
                }
                List<Double> init = new ArrayList<>();
                for (int s = 0; s < m; s++) {
                    init.add(0.0);
                }
                out.add(new ReactionNetwork.Reaction(name, net, rate, SbmlNetworks.rateScale(rate, m, init)));
            }
            default -> throw fail(key + ".law must be \"mass-action\", \"michaelis-menten\", \"hill\" or"
                    + " \"expression\", got \"" + law + "\"");
        }
        return out;
    }

    private static double order(double[] reactants, int m) {
        double o = 0;
        for (int s = 0; s < m; s++) {
            o += reactants[s];
        }
        return o == 1 ? 1 : Math.max(o, 1);
    }

    private String single(double[] reactants, List<String> names, String key) {
        String found = null;
        for (int s = 0; s < reactants.length; s++) {
            if (reactants[s] != 0) {
                if (found != null) {
                    throw fail(key + " has several reactants; name the substrate with \"substrate\"");
                }
                found = names.get(s);
            }
        }
        if (found == null) {
            throw fail(key + " has no reactant; name the substrate with \"substrate\"");
        }
        return found;
    }

    private int species(List<String> names, String name, String key) {
        int s = names.indexOf(name);
        if (s < 0) {
            throw fail(key + " names " + name + ", which is not a species of the network " + names);
        }
        return s;
    }

    private double[] stoichiometry(JsonObject o, String field, String key, List<String> names) {
        double[] n = new double[names.size()];
        if (!o.has(field)) {
            return n;
        }
        JsonObject map = object(o, field, key + "." + field);
        for (String s : map.keySet()) {
            int i = species(names, s, key + "." + field);
            double v = number(map, s, key + "." + field + "." + s);
            if (v <= 0) {
                throw fail(key + "." + field + "." + s + " must be a positive stoichiometric coefficient");
            }
            n[i] += v;
        }
        return n;
    }

    private ReactionNetwork sbml(JsonObject o) {
        keys(o, "sbml.", Set.of("file", "diffusion_um2_per_s"));
        String name = string(o, "file", "sbml.file");
        Path sbmlFile = file.toAbsolutePath().getParent().resolve(name);
        if (!Files.isRegularFile(sbmlFile)) {
            throw fail("sbml.file names " + name + ", which does not exist next to the model file");
        }
        Map<String, Double> d = new LinkedHashMap<>();
        if (o.has("diffusion_um2_per_s")) {
            JsonObject map = object(o, "diffusion_um2_per_s", "sbml.diffusion_um2_per_s");
            for (String k : map.keySet()) {
                d.put(k, number(map, k, "sbml.diffusion_um2_per_s." + k));
            }
        }
        return SbmlNetworks.read(sbmlFile, d, file);
    }

    // ---- small JSON helpers that name the key on failure ----

    InputException fail(String problem) {
        return new InputException(file, problem);
    }

    Path file() {
        return file;
    }

    void keys(JsonObject o, String prefix, Set<String> allowed) {
        for (String k : o.keySet()) {
            if (!allowed.contains(k)) {
                throw fail("unknown key " + prefix + k + " (expected one of " + String.join(", ", allowed.stream()
                        .sorted().toList()) + ")");
            }
        }
    }

    JsonObject object(JsonObject o, String field, String key) {
        if (!o.has(field)) {
            throw fail(key + " is missing");
        }
        return asObject(o.get(field), key);
    }

    JsonObject asObject(JsonElement e, String key) {
        if (e == null || !e.isJsonObject()) {
            throw fail(key + " must be a JSON object");
        }
        return e.getAsJsonObject();
    }

    JsonArray array(JsonObject o, String field, String key) {
        if (!o.has(field) || !o.get(field).isJsonArray()) {
            throw fail(key + " must be a JSON list");
        }
        return o.getAsJsonArray(field);
    }

    String string(JsonObject o, String field, String key) {
        JsonElement e = o.get(field);
        if (e == null) {
            throw fail(key + " is missing");
        }
        if (!e.isJsonPrimitive() || !e.getAsJsonPrimitive().isString()) {
            throw fail(key + " must be a text value");
        }
        return e.getAsString();
    }

    boolean bool(JsonObject o, String field, String key) {
        JsonElement e = o.get(field);
        if (e == null || !e.isJsonPrimitive() || !e.getAsJsonPrimitive().isBoolean()) {
            throw fail(key + " must be true or false");
        }
        return e.getAsBoolean();
    }

    double number(JsonObject o, String field, String key) {
        JsonElement e = o.get(field);
        if (e == null) {
            throw fail(key + " is missing");
        }
        if (!e.isJsonPrimitive() || !e.getAsJsonPrimitive().isNumber()) {
            throw fail(key + " must be a number");
        }
        double v = e.getAsDouble();
        if (!Double.isFinite(v)) {
            throw fail(key + " must be a finite number");
        }
        return v;
    }

    double positive(JsonObject o, String field, String key) {
        double v = number(o, field, key);
        if (!(v > 0)) {
            throw fail(key + " must be positive, got " + num(v));
        }
        return v;
    }

    double nonNegative(JsonObject o, String field, String key) {
        double v = number(o, field, key);
        if (v < 0) {
            throw fail(key + " must be zero or positive, got " + num(v));
        }
        return v;
    }

    static String num(double v) {
        return String.format(Locale.ROOT, "%.4g", v);
    }
}
