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
import org.dendrokin.core.model.Simulation;
import org.dendrokin.core.units.Unit;
import org.dendrokin.io.AtomicFiles;
import org.dendrokin.io.InputException;
import org.dendrokin.io.KymographCsv;
import org.dendrokin.io.plot.Heatmap;
import org.dendrokin.io.plot.Pictures;

import com.google.gson.GsonBuilder;

/**
 * Runs a model file and writes its results into an output folder: {@code kymograph.csv} (the contract's
 * kymograph format), {@code kymograph.png}, {@code summary.json} and, as asked, {@code kymograph_sd.csv} /
 * {@code kymograph_sd.png} (stochastic spread) and the synthetic movie. Nothing is written elsewhere.
 */
public final class SimulationOutputs {
    private SimulationOutputs() {
    }

    /** What a run wrote, for callers that show it. */
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
        Map<String, Object> summary = new LinkedHashMap<>();
        summary.put("tool_version", toolVersion);
        summary.put("model_file", modelFile.getFileName().toString());
        summary.put("model", spec.model());
        summary.put("species", result.species());
        summary.put("signal_unit", unit);
        if (entry != null) {
            Map<String, Object> params = new LinkedHashMap<>();
            for (ModelParameter p : entry.parameters()) {
                params.put(p.name(), Map.of("value", spec.parameters().get(p.name()), "unit", p.unit().symbol()));
            }
            summary.put("parameters", params);
        }
        if (spec.network() != null) {
            summary.put("network_species", spec.network().species());
            List<String> reactions = new ArrayList<>();
            spec.network().reactions().forEach(r -> reactions.add(r.name()));
            summary.put("network_reactions", reactions);
        }
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
}
