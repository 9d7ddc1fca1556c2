package org.dendrokin.core.analysis;

import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;

import org.dendrokin.core.Checks;
import org.dendrokin.core.model.TreeGeometry;
import org.dendrokin.core.path.DendritePath;

/**
 * Several drawn lines of one session joined into a tree. Where an end of one line lies within a tolerance of
 * another line, the two meet there: at that line's end (end to end), or part-way along it, which makes a branch
 * point that splits the line into two branches of the tree. Lines whose ends meet nothing are free ends (sealed).
 * <p>
 * A line split at branch points becomes branches named {@code <line>_1, <line>_2, ...} from its first vertex on;
 * an unsplit line keeps its name. The first line is the main one: it holds the stimulus.
 */
public final class BranchedPaths {
    private final List<String> lines;
    private final Map<String, double[]> cutsUm;
    private final TreeGeometry tree;
    private final List<BranchPoint> branchPoints;

    /**
     * Where lines meet.
     *
     * @param xPx      image x of the meeting point, pixels (on the line that was met)
     * @param yPx      image y, pixels
     * @param members  the lines' positions there, as "line at N um"
     * @param gapUm    the largest distance between a line's end and the line it meets here, um
     */
    public record BranchPoint(double xPx, double yPx, List<String> members, double gapUm) {
        public BranchPoint {
            members = List.copyOf(members);
        }
    }

    private BranchedPaths(List<String> lines, Map<String, double[]> cutsUm, TreeGeometry tree,
            List<BranchPoint> branchPoints) {
        this.lines = lines;
        this.cutsUm = cutsUm;
        this.tree = tree;
        this.branchPoints = branchPoints;
    }

    /**
     * Joins the lines.
     *
     * @param paths       the lines by name, the main one first; at least two
     * @param pixelSizeUm pixel size, um
     * @param toleranceUm largest distance between a line's end and another line for the two to meet, um
     * @throws AnalysisInputException (subject PATH) naming the line that meets no other, or the lines of a loop
     */
    public static BranchedPaths join(Map<String, DendritePath> paths, double pixelSizeUm, double toleranceUm) {
        Checks.require(paths.size() >= 2, "a tree needs at least two lines");
        Checks.positiveFinite(pixelSizeUm, "pixel size (um)");
        Checks.positiveFinite(toleranceUm, "tolerance (um)");
        List<String> names = List.copyOf(paths.keySet());
        int count = names.size();
        double[] lengthUm = new double[count];
        for (int i = 0; i < count; i++) {
            lengthUm[i] = paths.get(names.get(i)).lengthPx() * pixelSizeUm;
        }
        // Vertices are places on a line (line, um along it); an end that meets another line is merged with the
        // place it meets. Every line's two ends are vertices from the start; cuts part-way along are added.
        List<int[]> owner = new ArrayList<>();       // {line}
        List<Double> at = new ArrayList<>();         // um along the owning line
        List<Double> gaps = new ArrayList<>();
        int[] startVertex = new int[count];
        int[] endVertex = new int[count];
        for (int i = 0; i < count; i++) {
            startVertex[i] = addVertex(owner, at, gaps, i, 0);
            endVertex[i] = addVertex(owner, at, gaps, i, lengthUm[i]);
        }
        List<int[]> merges = new ArrayList<>();
        for (int i = 0; i < count; i++) {
            DendritePath own = paths.get(names.get(i));
            for (int side = 0; side < 2; side++) {
                int k = side == 0 ? 0 : own.vertexCount() - 1;
                double x = own.xPx()[k];
                double y = own.yPx()[k];
                int best = -1;
                DendritePath.Projection bestHit = null;
                for (int j = 0; j < count; j++) {
                    if (j == i) {
                        continue;
                    }
                    DendritePath.Projection hit = paths.get(names.get(j)).project(x, y);
                    if (hit.offPathPx() * pixelSizeUm <= toleranceUm
                            && (bestHit == null || hit.offPathPx() < bestHit.offPathPx())) {
                        best = j;
                        bestHit = hit;
                    }
                }
                if (best < 0) {
                    continue;
                }
                double s = bestHit.arcLengthPx() * pixelSizeUm;
                int target;
                if (s <= toleranceUm) {
                    target = startVertex[best];
                } else if (s >= lengthUm[best] - toleranceUm) {
                    target = endVertex[best];
                } else {
                    target = -1;
                    for (int v = 0; v < owner.size(); v++) {
                        if (owner.get(v)[0] == best && Math.abs(at.get(v) - s) <= toleranceUm) {
                            target = v;
                        }
                    }
                    if (target < 0) {
                        target = addVertex(owner, at, gaps, best, s);
                    }
                }
                int own2 = side == 0 ? startVertex[i] : endVertex[i];
                gaps.set(target, Math.max(gaps.get(target), bestHit.offPathPx() * pixelSizeUm));
                merges.add(new int[] {own2, target});
            }
        }
        int vertices = owner.size();
        int[] root = new int[vertices];
        for (int v = 0; v < vertices; v++) {
            root[v] = v;
        }
        int[] lineRoot = new int[count];
        for (int i = 0; i < count; i++) {
            lineRoot[i] = i;
        }
        for (int[] m : merges) {
            root[find(root, m[0])] = find(root, m[1]);
            lineRoot[find(lineRoot, owner.get(m[0])[0])] = find(lineRoot, owner.get(m[1])[0]);
        }
        for (int i = 1; i < count; i++) {
            if (find(lineRoot, i) != find(lineRoot, 0)) {
                throw new AnalysisInputException(AnalysisInputException.Subject.PATH, String.format(Locale.ROOT,
                        "the line %s does not meet the others: no end of it lies within %s um of another line, nor "
                                + "an end of another line within %s um of it (draw the branches so that they touch)",
                        names.get(i), fmt(toleranceUm), fmt(toleranceUm)));
            }
        }
        // Branches: each line cut at its vertices in order of position along it.
        Map<String, double[]> cuts = new LinkedHashMap<>();
        List<TreeGeometry.Branch> branches = new ArrayList<>();
        List<int[]> branchVertex = new ArrayList<>();   // {vertex at start, vertex at end}
        List<String> branchName = new ArrayList<>();
        for (int i = 0; i < count; i++) {
            List<Integer> on = new ArrayList<>();
            for (int v = 0; v < vertices; v++) {
                if (owner.get(v)[0] == i) {
                    on.add(v);
                }
            }
            on.sort((a, b) -> Double.compare(at.get(a), at.get(b)));
            double[] c = new double[on.size()];
            for (int q = 0; q < c.length; q++) {
                c[q] = at.get(on.get(q));
            }
            cuts.put(names.get(i), c);
            int pieces = on.size() - 1;
            for (int q = 0; q < pieces; q++) {
                String name = pieces == 1 ? names.get(i) : names.get(i) + "_" + (q + 1);
                branches.add(TreeGeometry.Branch.of(name, c[q + 1] - c[q]));
                branchName.add(name);
                branchVertex.add(new int[] {find(root, on.get(q)), find(root, on.get(q + 1))});
            }
        }
        Map<Integer, List<TreeGeometry.BranchEnd>> ends = new LinkedHashMap<>();
        for (int b = 0; b < branches.size(); b++) {
            ends.computeIfAbsent(branchVertex.get(b)[0], v -> new ArrayList<>())
                    .add(new TreeGeometry.BranchEnd(branchName.get(b), TreeGeometry.End.START));
            ends.computeIfAbsent(branchVertex.get(b)[1], v -> new ArrayList<>())
                    .add(new TreeGeometry.BranchEnd(branchName.get(b), TreeGeometry.End.END));
        }
        List<TreeGeometry.Junction> junctions = new ArrayList<>();
        List<BranchPoint> points = new ArrayList<>();
        for (Map.Entry<Integer, List<TreeGeometry.BranchEnd>> e : ends.entrySet()) {
            if (e.getValue().size() < 2) {
                continue;
            }
            junctions.add(new TreeGeometry.Junction(e.getValue()));
            points.add(branchPoint(e.getKey(), root, owner, at, gaps, names, paths, pixelSizeUm));
        }
        TreeGeometry tree;
        try {
            tree = TreeGeometry.of(branches, junctions);
        } catch (IllegalArgumentException ex) {
            throw new AnalysisInputException(AnalysisInputException.Subject.PATH, "the lines do not form a tree: "
                    + ex.getMessage(), ex);
        }
        return new BranchedPaths(names, cuts, tree, List.copyOf(points));
    }

    private static BranchPoint branchPoint(int vertex, int[] root, List<int[]> owner, List<Double> at,
            List<Double> gaps, List<String> names, Map<String, DendritePath> paths, double pixelSizeUm) {
        List<String> members = new ArrayList<>();
        double gap = 0;
        double x = Double.NaN;
        double y = Double.NaN;
        for (int v = 0; v < owner.size(); v++) {
            if (find(root, v) != vertex) {
                continue;
            }
            String line = names.get(owner.get(v)[0]);
            members.add(line + " at " + fmt(at.get(v)) + " um");
            gap = Math.max(gap, gaps.get(v));
            if (v == vertex) {
                double[] p = pointAt(paths.get(line), at.get(v) / pixelSizeUm);
                x = p[0];
                y = p[1];
            }
        }
        return new BranchPoint(x, y, members, gap);
    }

    /** The image point at arc length s (pixels) along the polyline. */
    private static double[] pointAt(DendritePath path, double sPx) {
        double[] x = path.xPx();
        double[] y = path.yPx();
        double travelled = 0;
        for (int i = 0; i + 1 < x.length; i++) {
            double len = Math.hypot(x[i + 1] - x[i], y[i + 1] - y[i]);
            if (travelled + len >= sPx || i + 2 == x.length) {
                double f = len > 0 ? Math.max(0, Math.min(1, (sPx - travelled) / len)) : 0;
                return new double[] {x[i] + f * (x[i + 1] - x[i]), y[i] + f * (y[i + 1] - y[i])};
            }
            travelled += len;
        }
        return new double[] {x[0], y[0]};
    }

    private static int addVertex(List<int[]> owner, List<Double> at, List<Double> gaps, int line, double um) {
        owner.add(new int[] {line});
        at.add(um);
        gaps.add(0.0);
        return owner.size() - 1;
    }

    private static int find(int[] root, int v) {
        while (root[v] != v) {
            root[v] = root[root[v]];
            v = root[v];
        }
        return v;
    }

    private static String fmt(double v) {
        return String.format(Locale.ROOT, "%.3g", v);
    }

    /** The lines, the main one first. */
    public List<String> lines() {
        return lines;
    }

    /** The tree the lines form, with sealed free ends. */
    public TreeGeometry tree() {
        return tree;
    }

    /** Where lines meet, in the order found. */
    public List<BranchPoint> branchPoints() {
        return branchPoints;
    }

    /** The branches a line was cut into, in order along it. */
    public List<String> branchesOf(String line) {
        double[] c = cutsUm.get(line);
        Checks.require(c != null, "no line " + line);
        List<String> out = new ArrayList<>();
        int pieces = c.length - 1;
        for (int q = 0; q < pieces; q++) {
            out.add(pieces == 1 ? line : line + "_" + (q + 1));
        }
        return out;
    }

    /**
     * Where a position along a line falls in the tree.
     *
     * @param line a line's name
     * @param um   distance from its first vertex, um
     * @return the branch, and the position along it in um
     */
    public Map.Entry<String, Double> locate(String line, double um) {
        double[] c = cutsUm.get(line);
        Checks.require(c != null, "no line " + line);
        List<String> pieces = branchesOf(line);
        for (int q = 0; q < pieces.size(); q++) {
            if (um < c[q + 1] || q == pieces.size() - 1) {
                double local = Math.max(0, Math.min(um - c[q], c[q + 1] - c[q]));
                return Map.entry(pieces.get(q), local);
            }
        }
        throw new IllegalStateException("unreachable");
    }

    /** The positions along a line (um from its first vertex) where it is cut, its two ends included. */
    public double[] cutsUm(String line) {
        double[] c = cutsUm.get(line);
        Checks.require(c != null, "no line " + line);
        return c.clone();
    }
}
