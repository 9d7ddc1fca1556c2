package org.dendrokin.core.model;

import java.util.ArrayDeque;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.Collections;
import java.util.Deque;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Objects;

import org.dendrokin.core.Checks;

/**
 * A branched dendrite as a graph: branches (each a straight cable with a length and, optionally, a radius) whose
 * ends meet at junctions. Each branch has its own coordinate, x = 0 at its start and x = length at its end; a
 * junction joins any number of branch ends (a branch's start or end), which then share one concentration. Branch
 * ends in no junction are free ends, sealed (no flux) unless made open ({@link Boundary#FIXED}: held at the resting
 * value). The branches must form a tree: connected, without loops, every branch end in at most one junction.
 * <p>
 * A branch's cross-section is pi r^2 with its radius r; without radii every branch has the same area (1 um^2), so
 * only the ratios matter, as in the flux balance at a junction (Kirchhoff's law: the sum over its branches of
 * area x D x du/dx, taken into the junction, is zero). Give radii for all branches or for none.
 * <p>
 * Immutable. Built by {@link #of}; invalid geometry is refused with one plain sentence (an
 * {@link IllegalArgumentException} the file readers turn into a message about the file).
 */
public final class TreeGeometry {
    /** Which end of a branch. */
    public enum End {
        START,
        END;

        /** "start" or "end", as model files write it. */
        public String key() {
            return this == START ? "start" : "end";
        }
    }

    /**
     * One branch.
     *
     * @param name     its name, used in messages, model files and output file names: letters, digits, '-', '_'
     *                 and '.' only
     * @param lengthUm its length, um, positive
     * @param radiusUm its radius, um, positive, or NaN for none (then its area is 1 um^2)
     */
    public record Branch(String name, double lengthUm, double radiusUm) {
        public Branch {
            Objects.requireNonNull(name, "name");
            Checks.require(name.matches("[A-Za-z0-9_.\\-]+"), "branch name \"" + name + "\" may hold only letters,"
                    + " digits, '-', '_' and '.'");
            Checks.positiveFinite(lengthUm, "length of branch " + name + " (um)");
            Checks.require(Double.isNaN(radiusUm) || (radiusUm > 0 && Double.isFinite(radiusUm)),
                    "radius of branch " + name + " (um) must be a positive finite number, got " + radiusUm);
        }

        /** A branch without a radius. */
        public static Branch of(String name, double lengthUm) {
            return new Branch(name, lengthUm, Double.NaN);
        }

        /** True when a radius was given. */
        public boolean hasRadius() {
            return !Double.isNaN(radiusUm);
        }

        /** Cross-section area, um^2: pi r^2, or 1 without a radius. */
        public double areaUm2() {
            return hasRadius() ? Math.PI * radiusUm * radiusUm : 1.0;
        }
    }

    /** One end of a branch, written {@code "name:start"} or {@code "name:end"}. */
    public record BranchEnd(String branch, End end) {
        public BranchEnd {
            Objects.requireNonNull(branch, "branch");
            Objects.requireNonNull(end, "end");
        }

        @Override
        public String toString() {
            return branch + ":" + end.key();
        }
    }

    /** A branch point (or a joint of two branches in series): the branch ends that meet there, at least two. */
    public record Junction(List<BranchEnd> ends) {
        public Junction {
            ends = List.copyOf(ends);
            Checks.require(ends.size() >= 2, "a junction joins at least two branch ends, got " + ends);
        }

        public static Junction of(BranchEnd... ends) {
            return new Junction(List.of(ends));
        }
    }

    /**
     * A stretch of a branch as seen from a point of the tree: from {@code nearUm} to {@code farUm} along the
     * branch, at distances {@code nearDistanceUm} to {@code nearDistanceUm + |farUm - nearUm|} from the point,
     * hanging from segment {@code parent} (-1 for the segments that start at the point). For pictures of the tree
     * laid out by distance from a stimulus.
     */
    public record Segment(String branch, double nearUm, double farUm, double nearDistanceUm, int parent) {
        /** Length of the stretch, um. */
        public double lengthUm() {
            return Math.abs(farUm - nearUm);
        }
    }

    private final List<Branch> branches;
    private final List<Junction> junctions;
    private final Map<String, Integer> index;
    /** Vertex of each branch end: [branch][0 start, 1 end]; vertices 0 .. J-1 are the junctions. */
    private final int[][] vertex;
    private final int vertexCount;
    /** Boundary of every vertex; junctions are never FIXED. */
    private final Boundary[] vertexBoundary;
    /** Branches at each vertex, as branch * 2 + end. */
    private final int[][] incident;

    private TreeGeometry(List<Branch> branches, List<Junction> junctions, Boundary[] vertexBoundary, int[][] vertex,
            int vertexCount, int[][] incident, Map<String, Integer> index) {
        this.branches = branches;
        this.junctions = junctions;
        this.vertexBoundary = vertexBoundary;
        this.vertex = vertex;
        this.vertexCount = vertexCount;
        this.incident = incident;
        this.index = index;
    }

    /**
     * A tree with sealed free ends.
     *
     * @param branches  at least one, names unique
     * @param junctions each joins branch ends that exist; a branch end in at most one junction
     * @throws IllegalArgumentException naming the problem: a repeated name, an unknown branch, an end in two
     *                                  junctions, a loop (naming its branches), or branches not joined to the rest
     */
    public static TreeGeometry of(List<Branch> branches, List<Junction> junctions) {
        List<Branch> list = List.copyOf(branches);
        List<Junction> joins = List.copyOf(junctions);
        Checks.require(!list.isEmpty(), "a tree needs at least one branch");
        Map<String, Integer> index = new LinkedHashMap<>();
        for (int b = 0; b < list.size(); b++) {
            Checks.require(index.put(list.get(b).name(), b) == null, "the branch name " + list.get(b).name()
                    + " is used twice");
        }
        long withRadius = list.stream().filter(Branch::hasRadius).count();
        if (withRadius != 0 && withRadius != list.size()) {
            String missing = list.stream().filter(b -> !b.hasRadius()).map(Branch::name).findFirst().orElseThrow();
            throw new IllegalArgumentException("branch " + missing + " has no radius while others have one; give a"
                    + " radius for every branch or for none");
        }
        int nb = list.size();
        int[][] vertex = new int[nb][2];
        for (int[] v : vertex) {
            Arrays.fill(v, -1);
        }
        for (int j = 0; j < joins.size(); j++) {
            for (BranchEnd e : joins.get(j).ends()) {
                Integer b = index.get(e.branch());
                Checks.require(b != null, "junction " + (j + 1) + " names branch " + e.branch() + ", which is not"
                        + " among the branches " + index.keySet());
                int side = e.end().ordinal();
                Checks.require(vertex[b][side] < 0, "branch end " + e + " is in "
                        + (vertex[b][side] == j ? "junction " + (j + 1) + " twice" : "two junctions (" + (vertex[b][side]
                        + 1) + " and " + (j + 1) + ")"));
                vertex[b][side] = j;
            }
        }
        int count = joins.size();
        for (int b = 0; b < nb; b++) {
            for (int side = 0; side < 2; side++) {
                if (vertex[b][side] < 0) {
                    vertex[b][side] = count++;
                }
            }
        }
        // union-find over vertices, adding branches as edges: an edge inside one component closes a loop
        int[] root = new int[count];
        for (int v = 0; v < count; v++) {
            root[v] = v;
        }
        for (int b = 0; b < nb; b++) {
            int a = find(root, vertex[b][0]);
            int c = find(root, vertex[b][1]);
            if (a == c) {
                throw new IllegalArgumentException(loopMessage(list, vertex, b));
            }
            root[a] = c;
        }
        int first = find(root, vertex[0][0]);
        for (int b = 1; b < nb; b++) {
            if (find(root, vertex[b][0]) != first) {
                throw new IllegalArgumentException("branch " + list.get(b).name() + " is not joined to branch "
                        + list.get(0).name() + " by any chain of junctions; the branches must form one tree");
            }
        }
        int[][] incident = incidence(vertex, count);
        Boundary[] boundary = new Boundary[count];
        Arrays.fill(boundary, Boundary.NO_FLUX);
        return new TreeGeometry(list, joins, boundary, vertex, count, incident, Collections.unmodifiableMap(index));
    }

    private static int find(int[] root, int v) {
        while (root[v] != v) {
            root[v] = root[root[v]];
            v = root[v];
        }
        return v;
    }

    /** "branches a, b and c form a loop ...": the path between branch b's two ends through the earlier branches. */
    private static String loopMessage(List<Branch> list, int[][] vertex, int closing) {
        if (vertex[closing][0] == vertex[closing][1]) {
            return "branch " + list.get(closing).name() + " is joined to itself (its start and end meet at one"
                    + " junction), which makes a loop; the branches must form a tree";
        }
        int count = 0;
        for (int[] v : vertex) {
            count = Math.max(count, Math.max(v[0], v[1]) + 1);
        }
        int[][] incident = incidence(Arrays.copyOf(vertex, closing), count);
        int from = vertex[closing][0];
        int to = vertex[closing][1];
        int[] via = new int[count];
        Arrays.fill(via, -2);
        via[from] = -1;
        Deque<Integer> queue = new ArrayDeque<>(List.of(from));
        while (!queue.isEmpty()) {
            int v = queue.poll();
            for (int code : incident[v]) {
                int b = code >> 1;
                int w = vertex[b][1 - (code & 1)];
                if (via[w] == -2) {
                    via[w] = b;
                    queue.add(w);
                }
            }
        }
        List<String> names = new ArrayList<>();
        for (int v = to; v != from; ) {
            int b = via[v];
            names.add(list.get(b).name());
            v = vertex[b][0] == v ? vertex[b][1] : vertex[b][0];
        }
        Collections.reverse(names);
        names.add(list.get(closing).name());
        String last = names.remove(names.size() - 1);
        return "branches " + String.join(", ", names) + " and " + last + " form a loop; the branches must form a"
                + " tree (each branch end in at most one junction, no closed paths)";
    }

    private static int[][] incidence(int[][] vertex, int count) {
        List<List<Integer>> at = new ArrayList<>();
        for (int v = 0; v < count; v++) {
            at.add(new ArrayList<>());
        }
        for (int b = 0; b < vertex.length; b++) {
            at.get(vertex[b][0]).add(2 * b);
            at.get(vertex[b][1]).add(2 * b + 1);
        }
        int[][] out = new int[count][];
        for (int v = 0; v < count; v++) {
            out[v] = at.get(v).stream().mapToInt(Integer::intValue).toArray();
        }
        return out;
    }

    /**
     * The same tree with one free end given another boundary.
     *
     * @throws IllegalArgumentException for an unknown branch or an end that lies in a junction
     */
    public TreeGeometry withBoundary(BranchEnd end, Boundary boundary) {
        Objects.requireNonNull(boundary, "boundary");
        int v = vertexOf(end);
        Checks.require(v >= junctions.size(), "branch end " + end + " lies in a junction; only free ends take a"
                + " boundary condition");
        Boundary[] copy = vertexBoundary.clone();
        copy[v] = boundary;
        return new TreeGeometry(branches, junctions, copy, vertex, vertexCount, incident, index);
    }

    /** The branches, in the order given. */
    public List<Branch> branches() {
        return branches;
    }

    /** The junctions, in the order given. */
    public List<Junction> junctions() {
        return junctions;
    }

    /** Number of branches. */
    public int branchCount() {
        return branches.size();
    }

    /** Position of a branch in {@link #branches()}, or -1. */
    public int indexOf(String branch) {
        Integer b = index.get(branch);
        return b == null ? -1 : b;
    }

    /**
     * The branch of that name.
     *
     * @throws IllegalArgumentException for a name that is not a branch
     */
    public Branch branch(String name) {
        int b = indexOf(name);
        Checks.require(b >= 0, "there is no branch " + name + " in the tree " + index.keySet());
        return branches.get(b);
    }

    /** The branch names, in order. */
    public List<String> branchNames() {
        return List.copyOf(index.keySet());
    }

    /** Sum of the branch lengths, um. */
    public double totalLengthUm() {
        return branches.stream().mapToDouble(Branch::lengthUm).sum();
    }

    /** True when the branches have radii. */
    public boolean hasRadii() {
        return branches.get(0).hasRadius();
    }

    /** The branch ends that lie in no junction. */
    public List<BranchEnd> freeEnds() {
        List<BranchEnd> out = new ArrayList<>();
        for (int b = 0; b < branches.size(); b++) {
            for (End e : End.values()) {
                if (vertex[b][e.ordinal()] >= junctions.size()) {
                    out.add(new BranchEnd(branches.get(b).name(), e));
                }
            }
        }
        return out;
    }

    /** The boundary at a branch end: {@link Boundary#NO_FLUX} inside a junction (nothing leaves there). */
    public Boundary boundary(BranchEnd end) {
        return vertexBoundary[vertexOf(end)];
    }

    /** True when the end lies in a junction. */
    public boolean joined(BranchEnd end) {
        return vertexOf(end) < junctions.size();
    }

    private int vertexOf(BranchEnd end) {
        int b = indexOf(end.branch());
        Checks.require(b >= 0, "there is no branch " + end.branch() + " in the tree " + index.keySet());
        return vertex[b][end.end().ordinal()];
    }

    // ---- graph access for the grid (package-private) ----

    int vertexCount() {
        return vertexCount;
    }

    /** Vertex at branch b's start (side 0) or end (side 1). */
    int vertex(int b, int side) {
        return vertex[b][side];
    }

    /** Branch ends at vertex v, each coded branch * 2 + side. */
    int[] incident(int v) {
        return incident[v];
    }

    Boundary vertexBoundary(int v) {
        return vertexBoundary[v];
    }

    /**
     * Distance along the tree, um, from point (branch, x) to every vertex: the unique path's length.
     *
     * @param branch branch index
     * @param xUm    position along it, um, within [0, length]
     */
    double[] vertexDistancesUm(int branch, double xUm) {
        double[] dist = new double[vertexCount];
        Arrays.fill(dist, Double.NaN);
        Deque<Integer> queue = new ArrayDeque<>();
        double length = branches.get(branch).lengthUm();
        dist[vertex[branch][0]] = xUm;
        dist[vertex[branch][1]] = length - xUm;
        queue.add(vertex[branch][0]);
        queue.add(vertex[branch][1]);
        while (!queue.isEmpty()) {
            int v = queue.poll();
            for (int code : incident[v]) {
                int b = code >> 1;
                if (b == branch) {
                    continue;
                }
                int w = vertex[b][1 - (code & 1)];
                if (Double.isNaN(dist[w])) {
                    dist[w] = dist[v] + branches.get(b).lengthUm();
                    queue.add(w);
                }
            }
        }
        return dist;
    }

    /**
     * Distance along the tree between two points, um: along the branch when both lie on the same one, else through
     * the junctions.
     *
     * @throws IllegalArgumentException for an unknown branch or a position outside its branch
     */
    public double distanceUm(String fromBranch, double fromUm, String toBranch, double toUm) {
        int a = checkedPoint(fromBranch, fromUm);
        int b = checkedPoint(toBranch, toUm);
        if (a == b) {
            return Math.abs(toUm - fromUm);
        }
        double[] dist = vertexDistancesUm(a, fromUm);
        return distanceTo(dist, a, b, toUm);
    }

    /** Distance to (branch b, x) from a point on branch a, given that point's vertex distances. */
    double distanceTo(double[] vertexDistances, int a, int b, double xUm) {
        double viaStart = vertexDistances[vertex[b][0]] + xUm;
        double viaEnd = vertexDistances[vertex[b][1]] + branches.get(b).lengthUm() - xUm;
        return Math.min(viaStart, viaEnd);
    }

    private int checkedPoint(String branch, double xUm) {
        int b = indexOf(branch);
        Checks.require(b >= 0, "there is no branch " + branch + " in the tree " + index.keySet());
        double length = branches.get(b).lengthUm();
        Checks.require(xUm >= -1e-9 * length && xUm <= length * (1 + 1e-9), "position " + xUm + " um lies outside"
                + " branch " + branch + " (0 to " + length + " um)");
        return b;
    }

    /**
     * The tree re-rooted at a point, for pictures: the stretches of branch seen from it, in depth-first order, each
     * with its distance from the point and the stretch it hangs from. The point's own branch gives two stretches
     * (towards its start and towards its end; one when the point is at an end).
     */
    public List<Segment> layoutFrom(String branch, double xUm) {
        int a = checkedPoint(branch, xUm);
        double length = branches.get(a).lengthUm();
        List<Segment> out = new ArrayList<>();
        boolean[] seen = new boolean[branches.size()];
        seen[a] = true;
        if (xUm > 0) {
            out.add(new Segment(branch, xUm, 0, 0, -1));
            hang(vertex[a][0], out.size() - 1, xUm, seen, out);
        } else {
            hang(vertex[a][0], -1, 0, seen, out);
        }
        if (xUm < length) {
            out.add(new Segment(branch, xUm, length, 0, -1));
            hang(vertex[a][1], out.size() - 1, length - xUm, seen, out);
        } else {
            hang(vertex[a][1], -1, 0, seen, out);
        }
        return out;
    }

    private void hang(int v, int parent, double distance, boolean[] seen, List<Segment> out) {
        for (int code : incident[v]) {
            int b = code >> 1;
            if (seen[b]) {
                continue;
            }
            seen[b] = true;
            boolean fromStart = (code & 1) == 0;
            double length = branches.get(b).lengthUm();
            out.add(new Segment(branches.get(b).name(), fromStart ? 0 : length, fromStart ? length : 0, distance,
                    parent));
            hang(vertex[b][fromStart ? 1 : 0], out.size() - 1, distance + length, seen, out);
        }
    }
}
