package org.dendrokin.io.model;

import java.nio.file.Path;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Set;

import org.dendrokin.core.model.Boundary;
import org.dendrokin.core.model.Stimulus;
import org.dendrokin.core.model.TreeDomain;
import org.dendrokin.core.model.TreeGeometry;
import org.dendrokin.core.model.TreeStimulus;
import org.dendrokin.io.InputException;
import org.dendrokin.io.json.JsonFields;

/**
 * The parts of a model file that describe a branched tree (format in docs/models.md): the {@code tree} block
 * (grid spacing, branches with lengths, radii and free-end boundaries, junctions as lists of {@code "branch:start"}
 * and {@code "branch:end"}), the {@code branch} of each stimulus, and {@code output.branches}. Read for
 * {@link ModelFile}; every problem is an {@link InputException} naming the file and the key, and a tree the geometry
 * refuses (a loop, branches not joined, an end in two junctions) is reported with the geometry's own sentence.
 */
final class TreeBlock {
    /** Reads one stimulus's cable keys, with the extra keys a tree allows. */
    interface StimulusReader {
        Stimulus read(JsonFields o, String key, double lengthUm, double spacingUm, Set<String> moreKeys);
    }

    private final Path file;
    private final StimulusReader stimuli;

    TreeBlock(Path file, StimulusReader stimuli) {
        this.file = file;
        this.stimuli = stimuli;
    }

    /** The tree of {@code tree}: its branches, junctions, free-end boundaries and grid spacing. */
    TreeDomain tree(JsonFields t) {
        t.refuseUnknownKeys(Set.of("dx_um", "boundary", "branches", "junctions"));
        double dx = t.positive("dx_um");
        Boundary fallback = boundary(t, "boundary", Boundary.NO_FLUX);
        List<JsonFields> given = t.objects("branches");
        if (given.isEmpty()) {
            throw fail("tree.branches is empty; a tree needs at least one branch");
        }
        List<TreeGeometry.Branch> branches = new ArrayList<>();
        double total = 0;
        for (int i = 0; i < given.size(); i++) {
            JsonFields b = given.get(i);
            b.refuseUnknownKeys(Set.of("name", "length_um", "radius_um", "start", "end"));
            String name = b.string("name");
            double length = b.positive("length_um");
            double radius = b.has("radius_um") ? b.positive("radius_um") : Double.NaN;
            try {
                branches.add(new TreeGeometry.Branch(name, length, radius));
            } catch (IllegalArgumentException e) {
                throw fail("tree.branches[" + i + "]: " + e.getMessage());
            }
            total += length;
        }
        if (total / dx > 2_000_000) {
            throw fail("tree.dx_um (" + num(dx) + " um) makes more than two million grid nodes over the "
                    + num(total) + " um of branches; use a coarser grid");
        }
        List<TreeGeometry.Junction> junctions = new ArrayList<>();
        List<JsonFields> joins = t.has("junctions") ? t.objects("junctions") : List.of();
        for (int j = 0; j < joins.size(); j++) {
            JsonFields o = joins.get(j);
            o.refuseUnknownKeys(Set.of("at"));
            String key = "tree.junctions[" + j + "].at";
            String requirement = "must be a list of branch ends such as [\"trunk:end\", \"a:start\"]";
            List<TreeGeometry.BranchEnd> ends = new ArrayList<>();
            for (String text : o.strings("at", requirement)) {
                ends.add(branchEnd(text, key));
            }
            if (ends.size() < 2) {
                throw fail(key + " names " + ends.size() + " branch end" + (ends.size() == 1 ? "" : "s")
                        + "; a junction joins at least two");
            }
            junctions.add(new TreeGeometry.Junction(ends));
        }
        TreeGeometry geometry;
        try {
            geometry = TreeGeometry.of(branches, junctions);
        } catch (IllegalArgumentException e) {
            throw fail("tree: " + e.getMessage());
        }
        for (int i = 0; i < given.size(); i++) {
            for (TreeGeometry.End end : TreeGeometry.End.values()) {
                JsonFields b = given.get(i);
                TreeGeometry.BranchEnd at = new TreeGeometry.BranchEnd(branches.get(i).name(), end);
                boolean joined = geometry.joined(at);
                if (b.has(end.key()) && joined) {
                    throw fail("tree.branches[" + i + "]." + end.key() + " sets a boundary, but " + at + " lies in a"
                            + " junction; only free ends take one");
                }
                Boundary boundary = b.has(end.key()) ? boundary(b, end.key(), fallback) : fallback;
                if (!joined && boundary != Boundary.NO_FLUX) {
                    geometry = geometry.withBoundary(at, boundary);
                }
            }
        }
        return new TreeDomain(geometry, dx);
    }

    private Boundary boundary(JsonFields o, String name, Boundary absent) {
        if (!o.has(name)) {
            return absent;
        }
        String text = o.string(name);
        return switch (text) {
            case "no-flux" -> Boundary.NO_FLUX;
            case "fixed" -> Boundary.FIXED;
            default -> throw fail(o.key(name) + " must be \"no-flux\" or \"fixed\", got \"" + text + "\"");
        };
    }

    private TreeGeometry.BranchEnd branchEnd(String text, String key) {
        int colon = text.lastIndexOf(':');
        String side = colon < 0 ? "" : text.substring(colon + 1);
        if (colon <= 0 || !(side.equals("start") || side.equals("end"))) {
            throw fail(key + " holds \"" + text + "\"; write each branch end as \"branch:start\" or \"branch:end\"");
        }
        return new TreeGeometry.BranchEnd(text.substring(0, colon), side.equals("start") ? TreeGeometry.End.START
                : TreeGeometry.End.END);
    }

    /** Output positions on a tree: every output.dx_um (or every node) on each branch of output.branches (or all). */
    Map<String, double[]> output(JsonFields out, Double step, TreeDomain domain) {
        TreeGeometry tree = domain.tree();
        List<String> names = out.has("branches")
                ? out.strings("branches", "must be a list of branch names [\"trunk\", ...]") : tree.branchNames();
        if (names.isEmpty()) {
            throw fail("output.branches is empty; name at least one branch to show");
        }
        Map<String, double[]> positions = new LinkedHashMap<>();
        for (String name : names) {
            if (tree.indexOf(name) < 0) {
                throw fail("output.branches names " + name + ", which is not a branch of the tree "
                        + tree.branchNames());
            }
            if (positions.containsKey(name)) {
                throw fail("output.branches names " + name + " twice");
            }
            if (step == null) {
                positions.put(name, domain.nodesUm(name));
                continue;
            }
            double length = tree.branch(name).lengthUm();
            if (length / step > 2_000_000) {
                throw fail("output.dx_um (" + num(step) + " um) gives more than two million output positions; use a"
                        + " coarser output grid");
            }
            int count = (int) Math.floor(length / step + 1e-9) + 1;
            double[] x = new double[count];
            for (int i = 0; i < count; i++) {
                x[i] = Math.min(i * step, length);
            }
            positions.put(name, x);
        }
        return positions;
    }

    /** A stimulus on a tree: the cable's stimulus keys and the branch it lies on. */
    TreeStimulus stimulus(JsonFields o, String key, TreeDomain domain) {
        if (!o.has("branch")) {
            throw fail(key + ".branch is missing: on a tree every stimulus names the branch it lies on");
        }
        String branch = o.string("branch");
        TreeGeometry tree = domain.tree();
        if (tree.indexOf(branch) < 0) {
            throw fail(key + ".branch names " + branch + ", which is not a branch of the tree " + tree.branchNames());
        }
        double length = tree.branch(branch).lengthUm();
        Stimulus s = stimuli.read(o, key, length, domain.spacingUm(branch), Set.of("branch"));
        return new TreeStimulus(branch, s);
    }

    private InputException fail(String problem) {
        return new InputException(file, problem);
    }

    private static String num(double v) {
        return ModelFile.num(v);
    }
}
