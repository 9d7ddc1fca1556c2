package org.dendrokin.io.model;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
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
import org.dendrokin.core.model.TreeDomain;
import org.dendrokin.core.model.TreeRun;
import org.dendrokin.core.model.TreeSimulation;
import org.dendrokin.core.model.TreeStimulus;
import org.dendrokin.io.InputException;
import org.dendrokin.io.json.JsonFields;
import org.dendrokin.io.json.JsonFiles;
import org.dendrokin.io.text.Numbers;

/**
 * Reads a model JSON file (the {@code simulate} command's input; format in docs/models.md) into a
 * {@link Simulation.Spec} and, when present, the settings of a synthetic movie. Every problem becomes an
 * {@link InputException} naming the file and the key. Unknown keys are refused, so a typo cannot silently
 * fall back to a default. The file itself is only read.
 */
public final class ModelFile {
    /**
     * A parsed model file: what to simulate, on one cable ({@code spec}) or on a branched tree ({@code tree}; then
     * {@code spec} is null), and, optionally, a movie to make from a cable's kymograph.
     */
    public record Parsed(Simulation.Spec spec, MovieSettings movie, TreeSimulation.Spec tree) {
        /** A model on one cable. */
        public Parsed(Simulation.Spec spec, MovieSettings movie) {
            this(spec, movie, null);
        }
    }

    private static final Set<String> TOP = Set.of("model", "parameters", "domain", "tree", "time", "stimuli",
            "solver", "output", "network", "sbml", "stochastic", "movie", "description");

    private final Path file;

    private ModelFile(Path file) {
        this.file = file;
    }

    public static Parsed read(Path file) {
        JsonFields root = JsonFiles.readFields(file, "the model to simulate (see docs/models.md)");
        return new ModelFile(file).parse(root);
    }

    private Parsed parse(JsonFields root) {
        root.refuseUnknownKeys(TOP);
        String model = root.string("model");
        if (root.has("tree") && root.has("domain")) {
            throw fail("give either domain (one cable) or tree (branches joined at junctions), not both");
        }
        if (!root.has("tree") && !root.has("domain")) {
            throw fail("domain is missing: give domain (one cable) or tree (branches joined at junctions)");
        }
        TreeBlock trees = new TreeBlock(file, this::stimulus);
        TreeDomain treeDomain = root.has("tree") ? trees.tree(root.object("tree")) : null;
        Domain domain = treeDomain == null ? domain(root) : null;
        double length = domain != null ? domain.lengthUm() : Double.NaN;
        double h = domain != null ? domain.spacingUm() : treeDomain.smallestSpacingUm();

        JsonFields time = root.object("time");
        time.refuseUnknownKeys(Set.of("duration_s", "output_interval_s"));
        double duration = time.positive("duration_s");
        double interval = time.positive("output_interval_s");
        if (interval > duration) {
            throw fail("time.output_interval_s (" + num(interval) + " s) is longer than time.duration_s ("
                    + num(duration) + " s)");
        }
        if (duration / interval > 200_000) {
            throw fail("time.output_interval_s gives more than 200000 frames; use a longer interval");
        }

        String observed = null;
        double[] positions = null;
        Map<String, double[]> branchPositions = null;
        if (root.has("output")) {
            JsonFields out = root.object("output");
            out.refuseUnknownKeys(treeDomain != null ? Set.of("dx_um", "species", "branches")
                    : Set.of("dx_um", "species"));
            if (out.has("species")) {
                observed = out.string("species");
            }
            Double step = out.has("dx_um") ? out.positive("dx_um") : null;
            if (treeDomain != null) {
                branchPositions = trees.output(out, step, treeDomain);
            } else if (step != null) {
                if (length / step > 2_000_000) {
                    throw fail("output.dx_um (" + num(step) + " um) gives more than two million output positions; use a"
                            + " coarser output grid");
                }
                int count = (int) Math.floor(length / step + 1e-9) + 1;
                positions = new double[count];
                for (int i = 0; i < count; i++) {
                    positions[i] = Math.min(i * step, length);
                }
            }
        }
        if (treeDomain != null && branchPositions == null) {
            branchPositions = TreeRun.nodePositions(treeDomain);
        }
        if (domain != null && positions == null) {
            positions = new double[domain.nodeCount()];
            for (int i = 0; i < positions.length; i++) {
                positions[i] = domain.nodeUm(i);
            }
        }

        List<Stimulus> stimuli = new ArrayList<>();
        List<TreeStimulus> treeStimuli = new ArrayList<>();
        if (root.has("stimuli")) {
            List<JsonFields> given = root.objects("stimuli");
            for (int i = 0; i < given.size(); i++) {
                String key = "stimuli[" + i + "]";
                if (treeDomain == null) {
                    stimuli.add(stimulus(given.get(i), key, length, h, Set.of()));
                } else {
                    treeStimuli.add(trees.stimulus(given.get(i), key, treeDomain));
                }
            }
        }

        SolverSettings settings = SolverSettings.DEFAULT;
        if (root.has("solver")) {
            JsonFields s = root.object("solver");
            s.refuseUnknownKeys(Set.of("step_factor", "max_step_s", "fixed_step_s", "smoothing", "spatial_order",
                    "time_tolerance"));
            if (s.has("step_factor")) {
                settings = settings.withStepFactor(s.positive("step_factor"));
            }
            if (s.has("max_step_s")) {
                settings = settings.withMaxStepS(s.positive("max_step_s"));
            }
            if (s.has("fixed_step_s")) {
                settings = settings.withFixedStepS(s.positive("fixed_step_s"));
            }
            if (s.has("spatial_order")) {
                double order = s.number("spatial_order");
                if (order != 2 && order != 4) {
                    throw fail("solver.spatial_order must be 2 or 4, got " + num(order));
                }
                settings = settings.withSpatialOrder((int) order);
            }
            if (s.has("smoothing")) {
                settings = settings.withSmoothing(s.flag("smoothing", settings.smoothing()));
            }
            if (s.has("time_tolerance")) {
                settings = settings.withTimeTolerance(s.positive("time_tolerance"));
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
            network = root.has("network") ? network(root.object("network"))
                    : sbml(root.object("sbml"));
        } else {
            if (root.has("network") || root.has("sbml")) {
                throw fail("network and sbml need \"model\": \"network\"");
            }
            entry = ModelCatalogue.find(model).orElseThrow(() -> fail("model \"" + model + "\" is not known; use one"
                    + " of " + String.join(", ", ModelCatalogue.names()) + ", or \"network\""));
            List<String> names = entry.parameterNames();
            JsonFields p = root.object("parameters");
            p.refuseUnknownKeys(Set.copyOf(names));
            for (String name : names) {
                if (!p.has(name)) {
                    throw fail("parameters." + name + " is missing (" + model + " needs " + String.join(", ", names)
                            + ")");
                }
                double v = p.number(name);
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
            JsonFields s = root.object("stochastic");
            s.refuseUnknownKeys(Set.of("runs", "seed", "threads", "molecules_per_unit_um3"));
            int runs = s.has("runs") ? count(s, "runs", 1_000_000) : 20;
            long seed = s.has("seed") ? (long) s.number("seed") : 1L;
            int threads = s.has("threads") ? count(s, "threads", 4096) : Runtime.getRuntime().availableProcessors();
            double per = s.has("molecules_per_unit_um3")
                    ? s.positive("molecules_per_unit_um3")
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
        if (treeDomain != null && root.has("movie")) {
            throw fail("movie is made from one cable's kymograph; a tree has no picture of its shape to render, so"
                    + " remove the movie block or simulate one cable");
        }
        MovieSettings movie = root.has("movie") ? MovieSettings.read(root.object("movie")) : null;
        try {
            if (treeDomain != null) {
                return new Parsed(null, null, new TreeSimulation.Spec(model, parameters, network, observed, treeDomain,
                        duration, interval, branchPositions, treeStimuli, settings, stochastic));
            }
            return new Parsed(new Simulation.Spec(model, parameters, network, observed, domain, duration, interval,
                    positions, stimuli, settings, stochastic), movie);
        } catch (IllegalArgumentException e) {
            throw fail(e.getMessage());
        }
    }

    /** A count from 1 to {@code max}; a fraction is rounded down, as it always was. */
    private int count(JsonFields o, String name, int max) {
        double v = o.positive(name);
        if (v < 1 || v > max) {
            throw o.bad(name, "must be a whole number from 1 to " + max);
        }
        return (int) v;
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

    private Stimulus stimulus(JsonFields o, String key, double length, double h, Set<String> moreKeys) {
        Set<String> known = new java.util.HashSet<>(Set.of("kind", "time_s", "position_um", "width_um", "amount",
                "duration_s", "species"));
        known.addAll(moreKeys);
        o.refuseUnknownKeys(known);
        String kind = o.has("kind") ? o.string("kind") : "pulse";
        double t = o.number("time_s");
        if (t < 0) {
            throw fail(key + ".time_s must be zero or positive, got " + num(t));
        }
        double x = o.number("position_um");
        if (x < 0 || x > length) {
            throw fail(key + ".position_um (" + num(x) + " um) lies outside the " + (moreKeys.isEmpty() ? "domain"
                    : "branch") + " (0 to " + num(length) + " um)");
        }
        double width = o.positive("width_um");
        double amount = o.number("amount");
        String species = o.has("species") ? o.string("species") : null;
        Stimulus s;
        switch (kind) {
            case "pulse" -> {
                if (o.has("duration_s")) {
                    throw fail(key + ".duration_s does not apply to a pulse; use \"kind\": \"injection\" for a boxcar");
                }
                s = Stimulus.pulse(t, x, width, amount);
            }
            case "injection" ->
                    s = Stimulus.injection(t, o.positive("duration_s"), x, width, amount);
            case "clamp" -> s = Stimulus.clamp(t, o.positive("duration_s"), x, width, amount);
            default -> throw fail(key + ".kind must be \"pulse\", \"injection\" or \"clamp\", got \"" + kind + "\"");
        }
        if (!kind.equals("clamp") && width < h / 2) {
            throw fail(key + ".width_um (" + num(width) + " um) is narrower than half the grid spacing (" + num(h)
                    + " um), so the grid cannot represent the stimulus; use a smaller " + (moreKeys.isEmpty()
                    ? "domain.dx_um" : "tree.dx_um"));
        }
        if (kind.equals("clamp") && width < h / 2) {
            throw fail(key + ".width_um (" + num(width) + " um) is less than half the grid spacing (" + num(h)
                    + " um), so the clamp holds no grid node");
        }
        return species == null ? s : s.onSpecies(species);
    }

    /** The cable of {@code domain}. */
    private Domain domain(JsonFields root) {
        JsonFields domainJson = root.object("domain");
        domainJson.refuseUnknownKeys(Set.of("length_um", "dx_um", "boundary", "cross_section"));
        double length = domainJson.positive("length_um");
        double dx = domainJson.positive("dx_um");
        String boundaryText = domainJson.has("boundary") ? domainJson.string("boundary") : "no-flux";
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
            List<JsonFields> sections = domainJson.objects("cross_section");
            double[] pos = new double[sections.size()];
            double[] area = new double[sections.size()];
            for (int i = 0; i < sections.size(); i++) {
                String key = "domain.cross_section[" + i + "]";
                JsonFields o = sections.get(i);
                o.refuseUnknownKeys(Set.of("position_um", "area_um2"));
                pos[i] = o.number("position_um");
                area[i] = o.positive("area_um2");
                if (i > 0 && pos[i] <= pos[i - 1]) {
                    throw fail(key + ".position_um must be larger than the one before it");
                }
            }
            if (pos.length == 0) {
                throw fail("domain.cross_section is empty");
            }
            cs = CrossSection.of(pos, area);
        }
        return new Domain(length, dx, boundary, cs);
    }

    private ReactionNetwork network(JsonFields o) {
        o.refuseUnknownKeys(Set.of("species", "reactions", "parameters"));
        Map<String, Double> values = new LinkedHashMap<>();
        if (o.has("parameters")) {
            JsonFields p = o.object("parameters");
            for (String k : p.names()) {
                values.put(k, p.number(k));
            }
        }
        List<JsonFields> speciesList = o.objects("species");
        if (speciesList.isEmpty()) {
            throw fail("network.species is empty");
        }
        List<String> names = new ArrayList<>();
        double[] d = new double[speciesList.size()];
        double[] init = new double[speciesList.size()];
        for (int i = 0; i < speciesList.size(); i++) {
            String key = "network.species[" + i + "]";
            JsonFields s = speciesList.get(i);
            s.refuseUnknownKeys(Set.of("name", "D_um2_per_s", "initial"));
            String name = s.string("name");
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
            d[i] = s.number("D_um2_per_s");
            if (d[i] < 0) {
                throw fail(key + ".D_um2_per_s must be zero or positive, got " + num(d[i]));
            }
            init[i] = s.has("initial") ? s.number("initial") : 0;
            if (init[i] < 0) {
                throw fail(key + ".initial must be zero or positive, got " + num(init[i]));
            }
        }
        List<ReactionNetwork.Reaction> reactions = new ArrayList<>();
        List<JsonFields> given = o.has("reactions") ? o.objects("reactions") : List.of();
        for (int r = 0; r < given.size(); r++) {
            String key = "network.reactions[" + r + "]";
            reactions.addAll(reaction(given.get(r), key, names, values));
        }
        return new ReactionNetwork(names, d, init, reactions);
    }

    private List<ReactionNetwork.Reaction> reaction(JsonFields o, String key, List<String> names,
            Map<String, Double> values) {
        o.refuseUnknownKeys(Set.of("name", "reactants", "products", "law", "k", "kr", "vmax", "kcat", "km", "enzyme",
                "substrate", "activator", "K", "n", "rate"));
        String name = o.has("name") ? o.string("name") : key;
        int m = names.size();
        double[] reactants = stoichiometry(o, "reactants", key, names);
        double[] products = stoichiometry(o, "products", key, names);
        double[] net = new double[m];
        for (int s = 0; s < m; s++) {
            net[s] = products[s] - reactants[s];
        }
        String law = o.has("law") ? o.string("law") : "mass-action";
        List<ReactionNetwork.Reaction> out = new ArrayList<>();
        switch (law) {
            case "mass-action" -> {
                double k = o.nonNegative("k");
                out.add(new ReactionNetwork.Reaction(name, net,
                        ReactionNetwork.massAction(reactants, products, k, 0), k * order(reactants, m)));
                if (o.has("kr")) {
                    double kr = o.nonNegative("kr");
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
                String substrate = o.has("substrate") ? o.string("substrate") : single(reactants, names, key);
                int si = species(names, substrate, key + ".substrate");
                double km = o.positive("km");
                Expression rate;
                double scale;
                if (o.has("enzyme")) {
                    int e = species(names, o.string("enzyme"), key + ".enzyme");
                    double kcat = o.nonNegative("kcat");
                    rate = ReactionNetwork.michaelisMenten(si, e, kcat, km);
                    scale = kcat;
                } else {
                    double vmax = o.nonNegative("vmax");
                    rate = ReactionNetwork.michaelisMenten(si, -1, vmax, km);
                    scale = vmax / km;
                }
                out.add(new ReactionNetwork.Reaction(name, net, rate, scale));
            }
            case "hill" -> {
                int a = species(names, o.string("activator"), key + ".activator");
                double vmax = o.nonNegative("vmax");
                double kHalf = o.positive("K");
                double n = o.positive("n");
                out.add(new ReactionNetwork.Reaction(name, net, ReactionNetwork.hill(a, vmax, kHalf, n),
                        vmax * n / kHalf));
            }
            case "expression" -> {
                String formula = o.string("rate");
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

    private double[] stoichiometry(JsonFields o, String field, String key, List<String> names) {
        double[] n = new double[names.size()];
        if (!o.has(field)) {
            return n;
        }
        JsonFields map = o.object(field);
        for (String s : map.names()) {
            int i = species(names, s, key + "." + field);
            double v = map.number(s);
            if (v <= 0) {
                throw fail(key + "." + field + "." + s + " must be a positive stoichiometric coefficient");
            }
            n[i] += v;
        }
        return n;
    }

    private ReactionNetwork sbml(JsonFields o) {
        o.refuseUnknownKeys(Set.of("file", "diffusion_um2_per_s"));
        String name = o.string("file");
        Path sbmlFile = file.toAbsolutePath().getParent().resolve(name);
        if (!Files.isRegularFile(sbmlFile)) {
            throw fail("sbml.file names " + name + ", which does not exist next to the model file");
        }
        Map<String, Double> d = new LinkedHashMap<>();
        if (o.has("diffusion_um2_per_s")) {
            JsonFields map = o.object("diffusion_um2_per_s");
            for (String k : map.names()) {
                d.put(k, map.number(k));
            }
        }
        return SbmlNetworks.read(sbmlFile, d, file);
    }

    private InputException fail(String problem) {
        return new InputException(file, problem);
    }

    /** Numbers in messages. */
    static String num(double v) {
        return Numbers.forPeople(v);
    }
}
