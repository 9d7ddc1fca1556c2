package org.dendrokin.io.model;

import java.nio.file.Path;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;

import org.dendrokin.core.Progress;
import org.dendrokin.core.kymo.Kymograph;
import org.dendrokin.core.model.BuiltInModel;
import org.dendrokin.core.model.ModelCatalogue;
import org.dendrokin.core.model.ModelParameter;
import org.dendrokin.core.model.ReactionNetwork;
import org.dendrokin.core.model.Simulation;
import org.dendrokin.core.model.TreeGeometry;
import org.dendrokin.core.model.TreeSimulation;
import org.dendrokin.core.units.Unit;
import org.dendrokin.io.AtomicFiles;
import org.dendrokin.io.InputException;
import org.dendrokin.io.KymographCsv;
import org.dendrokin.io.plot.Heatmap;
import org.dendrokin.io.plot.Pictures;
import org.dendrokin.io.plot.TreePlot;

import com.google.gson.GsonBuilder;

/**
 * Runs a model file and writes its results into an output folder: {@code kymograph.csv} (the contract's
 * kymograph format), {@code kymograph.png}, {@code summary.json} and, as asked, {@code kymograph_sd.csv} /
 * {@code kymograph_sd.png} (stochastic spread) and the synthetic movie. A model on a tree writes one kymograph per
 * branch shown ({@code kymograph-BRANCH.csv} and {@code .png}, and {@code kymograph_sd-BRANCH.*} in stochastic mode),
 * {@code tree.png} (the tree laid out by distance from the stimulus, coloured by each position's peak) and
 * {@code summary.json}. Nothing is written elsewhere.
 */
public final class SimulationOutputs {
    private SimulationOutputs() {
    }

    /** What a run wrote, for callers that show it; {@code result} is null for a run on a tree. */
    public record Written(Simulation.Result result, List<Path> files, List<String> warnings) {
    }

    /**
     * Refuses a run that cannot fit in the memory this Java may still use (a long domain on a fine grid), before it
     * allocates: an out-of-memory error midway would end the program with an internal error instead of a sentence.
     */
    private static void requireMemory(Path modelFile, Simulation.Spec spec) {
        Runtime rt = Runtime.getRuntime();
        long free = rt.maxMemory() - (rt.totalMemory() - rt.freeMemory());
        long needed = Simulation.estimatedBytes(spec);
        // a quarter kept back for the pictures and the program's own objects
        if (needed > free / 4 * 3) {
            throw new InputException(modelFile, String.format(Locale.ROOT, "the run needs about %d MB for its %d grid"
                    + " nodes, more than this Java can spare (%d MB free); a coarser domain.dx_um, a shorter"
                    + " domain.length_um or fewer output frames, or more memory for Java (java -Xmx...), makes it"
                    + " fit", needed >> 20, spec.domain().nodeCount(), free >> 20));
        }
    }

    public static Written simulate(Path modelFile, Path outDir, String toolVersion, Progress progress) {
        ModelFile.Parsed parsed = ModelFile.read(modelFile);
        if (parsed.tree() != null) {
            return simulateTree(modelFile, parsed.tree(), outDir, toolVersion, progress);
        }
        Simulation.Spec spec = parsed.spec();
        requireMemory(modelFile, spec);
        Simulation.Result result;
        try {
            result = Simulation.run(spec, progress);
        } catch (IllegalArgumentException e) {
            throw new InputException(modelFile, e.getMessage());
        }
        FiniteOutput.require(modelFile, spec, result);
        BuiltInModel entry = spec.model().equals(Simulation.NETWORK) ? null : ModelCatalogue.get(spec.model());
        // a network's values are concentrations, uM, like the stimulus amounts given for it
        String unit = entry == null ? Unit.MICROMOLAR.symbol() : entry.signalUnit();
        Kymograph k = result.kymograph().withValues(result.kymograph().values(), unit);
        List<Path> files = new ArrayList<>();
        List<String> warnings = new ArrayList<>(result.warnings());
        Path csv = outDir.resolve("kymograph.csv");
        KymographCsv.write(k, csv);
        files.add(csv);
        String title = spec.model() + (result.spread() != null ? " (stochastic mean of "
                + spec.stochastic().runs() + " runs)" : "") + ": " + result.species();
        Path png = outDir.resolve("kymograph.png");
        Pictures.savePng(Heatmap.of(k, title).render(k), png);
        files.add(png);
        if (result.spread() != null) {
            Kymograph sd = result.spread().withValues(result.spread().values(), unit);
            Path sdCsv = outDir.resolve("kymograph_sd.csv");
            KymographCsv.write(sd, sdCsv);
            files.add(sdCsv);
            Path sdPng = outDir.resolve("kymograph_sd.png");
            Pictures.savePng(Heatmap.of(sd, spec.model() + ": standard deviation over runs").render(sd), sdPng);
            files.add(sdPng);
        }
        if (parsed.movie() != null) {
            Path movie = outDir.resolve(parsed.movie().fileName());
            SyntheticMovie.write(k, parsed.movie(), movie);
            files.add(movie);
        }
        Map<String, Object> summary = summaryHead(toolVersion, modelFile, spec.model(), result.species(), unit, entry,
                spec.parameters(), spec.network());
        Map<String, Object> domain = new LinkedHashMap<>();
        domain.put("length_um", spec.domain().lengthUm());
        domain.put("dx_um", spec.domain().spacingUm());
        boolean fixed = spec.domain().boundary() == org.dendrokin.core.model.Boundary.FIXED;
        domain.put("boundary", fixed ? "fixed" : "no-flux");
        domain.put("uniform_cross_section", spec.domain().crossSection().isUniform());
        summary.put("domain", domain);
        Map<String, Object> time = new LinkedHashMap<>();
        time.put("duration_s", spec.durationS());
        time.put("output_interval_s", spec.outputIntervalS());
        time.put("frames", k.frameCount());
        summary.put("time", time);
        summary.put("solver", result.solverInfo());
        if (Double.isFinite(result.frontSpeedUmPerS())) {
            summary.put("front_speed", Map.of("value", result.frontSpeedUmPerS(), "unit", "um/s"));
        } else {
            summary.put("front_speed", null);
            warnings.add("No travelling front was found: the half-maximum position did not advance steadily across"
                    + " the cable, so no front speed is given.");
        }
        summary.put("warnings", warnings);
        Path json = outDir.resolve("summary.json");
        String text = new GsonBuilder().setPrettyPrinting().serializeNulls().create().toJson(summary);
        AtomicFiles.writeString(json, text + "\n");
        files.add(json);
        return new Written(result, files, warnings);
    }

    /** {@link #simulate} for a model on a tree. */
    private static Written simulateTree(Path modelFile, TreeSimulation.Spec spec, Path outDir, String toolVersion,
            Progress progress) {
        TreeSimulation.Result result;
        try {
            result = TreeSimulation.run(spec, progress);
        } catch (IllegalArgumentException e) {
            throw new InputException(modelFile, e.getMessage());
        }
        FiniteOutput.require(modelFile, spec, result);
        BuiltInModel entry = spec.model().equals(Simulation.NETWORK) ? null : ModelCatalogue.get(spec.model());
        String unit = entry == null ? Unit.MICROMOLAR.symbol() : entry.signalUnit();
        List<Path> files = new ArrayList<>();
        List<String> warnings = new ArrayList<>(result.warnings());
        String run = spec.model() + (result.spreads() != null ? " (stochastic mean of " + spec.stochastic().runs()
                + " runs)" : "");
        Map<String, Object> kymographFiles = new LinkedHashMap<>();
        Map<String, double[]> peaks = new LinkedHashMap<>();
        for (Map.Entry<String, Kymograph> e : result.kymographs().entrySet()) {
            String branch = e.getKey();
            Kymograph k = e.getValue().withValues(e.getValue().values(), unit);
            Path csv = outDir.resolve("kymograph-" + branch + ".csv");
            KymographCsv.write(k, csv);
            files.add(csv);
            Path png = outDir.resolve("kymograph-" + branch + ".png");
            Pictures.savePng(Heatmap.of(k, run + ": " + result.species() + " on branch " + branch).render(k), png);
            files.add(png);
            kymographFiles.put(branch, csv.getFileName().toString());
            peaks.put(branch, peak(k));
            if (result.spreads() != null) {
                Kymograph sd = result.spreads().get(branch).withValues(result.spreads().get(branch).values(), unit);
                Path sdCsv = outDir.resolve("kymograph_sd-" + branch + ".csv");
                KymographCsv.write(sd, sdCsv);
                files.add(sdCsv);
                Path sdPng = outDir.resolve("kymograph_sd-" + branch + ".png");
                Pictures.savePng(Heatmap.of(sd, spec.model() + ": standard deviation over runs on branch " + branch)
                        .render(sd), sdPng);
                files.add(sdPng);
            }
        }
        TreeGeometry tree = spec.domain().tree();
        String originBranch = spec.stimuli().isEmpty() ? tree.branchNames().get(0) : spec.stimuli().get(0).branch();
        double originUm = spec.stimuli().isEmpty() ? 0 : spec.stimuli().get(0).stimulus().positionUm();
        Path treePng = outDir.resolve("tree.png");
        Pictures.savePng(TreePlot.render(tree, originBranch, originUm, spec.outputPositionsUm(), peaks, run
                + ": peak " + result.species() + " over time", unit, true), treePng);
        files.add(treePng);

        Map<String, Object> summary = summaryHead(toolVersion, modelFile, spec.model(), result.species(), unit, entry,
                spec.parameters(), spec.network());
        summary.put("tree", treeSummary(spec));
        summary.put("kymographs", kymographFiles);
        Map<String, Object> time = new LinkedHashMap<>();
        time.put("duration_s", spec.durationS());
        time.put("output_interval_s", spec.outputIntervalS());
        time.put("frames", spec.outputTimesS().length);
        summary.put("time", time);
        summary.put("solver", result.solverInfo());
        summary.put("warnings", warnings);
        Path json = outDir.resolve("summary.json");
        String text = new GsonBuilder().setPrettyPrinting().serializeNulls().create().toJson(summary);
        AtomicFiles.writeString(json, text + "\n");
        files.add(json);
        return new Written(null, files, warnings);
    }

    /** Each position's largest value over the frames (NaN where every frame is NaN). */
    private static double[] peak(Kymograph k) {
        double[] out = new double[k.positionCount()];
        java.util.Arrays.fill(out, Double.NaN);
        for (int f = 0; f < k.frameCount(); f++) {
            for (int q = 0; q < out.length; q++) {
                double v = k.value(f, q);
                if (Double.isFinite(v) && !(v <= out[q])) {
                    out[q] = v;
                }
            }
        }
        return out;
    }

    /**
     * The summary's first keys, the same for a path and a tree: version, model file, model, species, unit, the
     * built-in model's parameters with their units, and a network's species and reactions.
     */
    private static Map<String, Object> summaryHead(String toolVersion, Path modelFile, String model, String species,
            String unit, BuiltInModel entry, Map<String, Double> parameters, ReactionNetwork network) {
        Map<String, Object> summary = new LinkedHashMap<>();
        summary.put("tool_version", toolVersion);
        summary.put("model_file", modelFile.getFileName().toString());
        summary.put("model", model);
        summary.put("species", species);
        summary.put("signal_unit", unit);
        if (entry != null) {
            Map<String, Object> params = new LinkedHashMap<>();
            for (ModelParameter p : entry.parameters()) {
                params.put(p.name(), Map.of("value", parameters.get(p.name()), "unit", p.unit().symbol()));
            }
            summary.put("parameters", params);
        }
        if (network != null) {
            summary.put("network_species", network.species());
            List<String> reactions = new ArrayList<>();
            network.reactions().forEach(r -> reactions.add(r.name()));
            summary.put("network_reactions", reactions);
        }
        return summary;
    }

    private static Map<String, Object> treeSummary(TreeSimulation.Spec spec) {
        TreeGeometry tree = spec.domain().tree();
        Map<String, Object> out = new LinkedHashMap<>();
        out.put("dx_um", spec.domain().dxUm());
        out.put("grid_nodes", spec.domain().totalNodeCount());
        List<Object> branches = new ArrayList<>();
        for (TreeGeometry.Branch b : tree.branches()) {
            Map<String, Object> m = new LinkedHashMap<>();
            m.put("name", b.name());
            m.put("length_um", b.lengthUm());
            m.put("radius_um", b.hasRadius() ? b.radiusUm() : null);
            m.put("spacing_um", spec.domain().spacingUm(b.name()));
            for (TreeGeometry.End end : TreeGeometry.End.values()) {
                TreeGeometry.BranchEnd at = new TreeGeometry.BranchEnd(b.name(), end);
                m.put(end.key(), tree.joined(at) ? "junction"
                        : tree.boundary(at) == org.dendrokin.core.model.Boundary.FIXED ? "fixed" : "no-flux");
            }
            branches.add(m);
        }
        out.put("branches", branches);
        List<Object> junctions = new ArrayList<>();
        for (TreeGeometry.Junction j : tree.junctions()) {
            junctions.add(j.ends().stream().map(TreeGeometry.BranchEnd::toString).toList());
        }
        out.put("junctions", junctions);
        return out;
    }
}
