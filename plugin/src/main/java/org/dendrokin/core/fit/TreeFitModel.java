package org.dendrokin.core.fit;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.concurrent.ConcurrentLinkedQueue;
import java.util.stream.IntStream;

import org.dendrokin.core.Checks;
import org.dendrokin.core.kymo.Kymograph;
import org.dendrokin.core.model.ModelCatalogue;
import org.dendrokin.core.model.ModelParameter;
import org.dendrokin.core.model.ScalarModel;
import org.dendrokin.core.model.SolverSettings;
import org.dendrokin.core.model.TreeDomain;
import org.dendrokin.core.model.TreeRun;
import org.dendrokin.core.model.TreeStimulus;
import org.dendrokin.core.units.Unit;

/**
 * A one-species catalogue model fitted to several branch kymographs of one tree at once: branch b's signal is
 * baseline_b + amplitude_b u(x, t; theta) on b, with u from the tree engine ({@link TreeRun}: the whole tree, junctions
 * and all, whether or not every branch has data) and theta the model's own parameters (D, k, ...), shared by all
 * branches. Per-branch amplitudes and baselines absorb differences in dye loading, background and calibration between
 * branches; the stimulus is fixed as given (on one branch, or several).
 * <p>
 * The data grid is branch after branch in the order the branches were given, each its kymograph row-major
 * ({@code frame * positions + position}), so {@link #data} can stack the branch kymographs as they are. As in
 * {@link EngineFitModel}: the engine runs with a fixed time step (a smooth objective), theta's Jacobian columns are
 * forward differences of the engine's solve (relative step 1e-7, in parallel) times the branch's amplitude, and the
 * amplitude and baseline columns are exact and non-zero only on their own branch; the one-pass normal equations use
 * that sparsity. theta moves on the scale its fit range implies (log for (0, infinity)), amplitudes and baselines on
 * a linear scale. Thread-safe.
 */
public final class TreeFitModel implements FitModel {
    private static final double RELATIVE_STEP = 1e-7;

    private final ScalarModel model;
    private final TreeDomain domain;
    private final double[] outputTimesS;
    private final Map<String, double[]> positionsUm;
    private final List<String> branches;
    private final List<TreeStimulus> stimuli;
    private final SolverSettings settings;
    private final List<ParameterSpec> specs;
    private final int engineParameters;
    private final int frames;
    /** Per branch: first column in the engine's output, columns, first point of its block in the data grid. */
    private final int[] engineOffset;
    private final int[] columns;
    private final int[] blockStart;
    private final int enginePositions;
    private final int size;
    private final ThreadLocal<TreeRun> runs;
    private final ConcurrentLinkedQueue<double[][]> spare = new ConcurrentLinkedQueue<>();

    /**
     * @param model             name of a one-species model of the {@link ModelCatalogue}
     * @param domain            the whole tree and the grid spacing the engine uses
     * @param outputTimesS      kymograph frame times, s, the same for every branch. Not modified.
     * @param positionsUm       for each branch with data, in order, its kymograph's positions along the branch, um.
     *                          Not modified.
     * @param stimuli           the protocol, fixed during the fit
     * @param fixedStepS        engine time step, s (fixed so that the objective is smooth)
     * @param signalUnit        unit of the amplitudes and baselines
     */
    public TreeFitModel(String model, TreeDomain domain, double[] outputTimesS, Map<String, double[]> positionsUm,
            List<TreeStimulus> stimuli, double fixedStepS, Unit signalUnit) {
        Checks.positiveFinite(fixedStepS, "engine time step (s)");
        Checks.require(!positionsUm.isEmpty(), "at least one branch needs data");
        this.model = ModelCatalogue.scalar(model);
        this.domain = domain;
        this.outputTimesS = outputTimesS.clone();
        LinkedHashMap<String, double[]> copy = new LinkedHashMap<>();
        positionsUm.forEach((b, x) -> copy.put(b, x.clone()));
        this.positionsUm = copy;
        this.branches = List.copyOf(copy.keySet());
        this.stimuli = List.copyOf(stimuli);
        this.settings = SolverSettings.DEFAULT.withFixedStepS(fixedStepS);
        TreeRun first = TreeRun.prepare(this.model, domain, this.outputTimesS, copy, this.stimuli, settings);
        List<ParameterSpec> s = new ArrayList<>();
        for (ModelParameter p : this.model.parameters()) {
            s.add(EngineFitModel.spec(p));
        }
        engineParameters = s.size();
        for (String b : branches) {
            s.add(ParameterSpec.linear(amplitudeName(b), signalUnit));
            s.add(ParameterSpec.linear(baselineName(b), signalUnit));
        }
        specs = List.copyOf(s);
        frames = this.outputTimesS.length;
        int count = branches.size();
        engineOffset = new int[count];
        columns = new int[count];
        blockStart = new int[count + 1];
        for (int k = 0; k < count; k++) {
            engineOffset[k] = first.offset(k);
            columns[k] = copy.get(branches.get(k)).length;
            blockStart[k + 1] = blockStart[k] + frames * columns[k];
        }
        enginePositions = first.positionCount();
        size = blockStart[count];
        runs = ThreadLocal.withInitial(() -> TreeRun.prepare(this.model, domain, this.outputTimesS, this.positionsUm,
                this.stimuli, settings));
    }

    /** The amplitude parameter's name for a branch: {@code amplitude_<branch>}. */
    public static String amplitudeName(String branch) {
        return "amplitude_" + branch;
    }

    /** The baseline parameter's name for a branch: {@code baseline_<branch>}. */
    public static String baselineName(String branch) {
        return "baseline_" + branch;
    }

    /**
     * The data of this model's grid from one kymograph per branch (in this model's branch order, each on its own
     * positions and this model's frames) and one noise level per branch. The data know their grid: one row a frame,
     * every branch's positions side by side in it (the points are stored branch by branch), so that the fit's robust
     * intervals see the residuals' correlation between neighbouring positions and frames as on a single path.
     *
     * @param kymographs   by branch name; every branch of the model must be there
     * @param sigmaByBranch noise standard deviation of each branch's samples, signal units
     */
    public FitData data(Map<String, Kymograph> kymographs, Map<String, Double> sigmaByBranch) {
        double[] values = new double[size];
        double[] sigmas = new double[size];
        for (int k = 0; k < branches.size(); k++) {
            String b = branches.get(k);
            Kymograph kymo = kymographs.get(b);
            Checks.require(kymo != null, "no kymograph for branch " + b);
            Checks.require(kymo.frameCount() == frames && kymo.positionCount() == columns[k], "the kymograph of branch "
                    + b + " has " + kymo.frameCount() + " x " + kymo.positionCount() + " samples, the model expects "
                    + frames + " x " + columns[k]);
            Double sigma = sigmaByBranch.get(b);
            Checks.require(sigma != null, "no noise level for branch " + b);
            System.arraycopy(kymo.values(), 0, values, blockStart[k], frames * columns[k]);
            Arrays.fill(sigmas, blockStart[k], blockStart[k + 1], sigma);
        }
        int total = size / frames;
        int[] pointAt = new int[size];
        int first = 0;
        for (int k = 0; k < branches.size(); k++) {
            for (int f = 0; f < frames; f++) {
                for (int q = 0; q < columns[k]; q++) {
                    pointAt[f * total + first + q] = blockStart[k] + f * columns[k] + q;
                }
            }
            first += columns[k];
        }
        return FitData.onGrid(values, sigmas, total, pointAt);
    }

    /** A prediction (or data) on this model's grid split into one kymograph per branch. */
    public Map<String, Kymograph> kymographs(double[] grid, String signalUnit) {
        Checks.require(grid.length == size, "need " + size + " values");
        Map<String, Kymograph> out = new LinkedHashMap<>();
        for (int k = 0; k < branches.size(); k++) {
            double[] v = Arrays.copyOfRange(grid, blockStart[k], blockStart[k + 1]);
            out.put(branches.get(k), new Kymograph(positionsUm.get(branches.get(k)), outputTimesS, v, signalUnit));
        }
        return out;
    }

    /**
     * A full starting point from starting values of the model's own parameters: each branch's amplitude and baseline
     * are the weighted least-squares line through the engine's u on that branch (exact for those values of theta).
     *
     * @param theta the model's parameters, in its order
     * @param data  observations on this model's grid
     */
    public double[] completeStart(double[] theta, FitData data) {
        Checks.require(theta.length == engineParameters, "need the " + engineParameters + " parameters of "
                + model.name());
        double[] u = new double[frames * enginePositions];
        runs.get().solve(theta, u);
        double[] start = Arrays.copyOf(theta, specs.size());
        for (int k = 0; k < branches.size(); k++) {
            double sw = 0;
            double su = 0;
            double sy = 0;
            double suu = 0;
            double suy = 0;
            for (int f = 0; f < frames; f++) {
                for (int q = 0; q < columns[k]; q++) {
                    int g = blockStart[k] + f * columns[k] + q;
                    double w = data.weight(g);
                    double ui = u[f * enginePositions + engineOffset[k] + q];
                    double y = data.observed(g);
                    sw += w;
                    su += w * ui;
                    sy += w * y;
                    suu += w * ui * ui;
                    suy += w * ui * y;
                }
            }
            double det = sw * suu - su * su;
            double amp = det > 0 ? (sw * suy - su * sy) / det : 1;
            double base = sw > 0 ? (sy - amp * su) / sw : 0;
            start[engineParameters + 2 * k] = amp;
            start[engineParameters + 2 * k + 1] = base;
        }
        return start;
    }

    @Override
    public String name() {
        return model.name();
    }

    @Override
    public List<ParameterSpec> parameters() {
        return specs;
    }

    @Override
    public int size() {
        return size;
    }

    /** The branches with data, in the order of the grid. */
    public List<String> branches() {
        return branches;
    }

    /** The tree and grid spacing the engine runs on. */
    public TreeDomain domain() {
        return domain;
    }

    @Override
    public List<String> headlineParameters() {
        return specs.subList(0, engineParameters).stream().map(ParameterSpec::name).toList();
    }

    @Override
    public List<DerivedQuantity> derivedQuantities() {
        return model.closedForms().stream().map(DerivedQuantity::of).toList();
    }

    @Override
    public String poorlyDeterminedAdvice() {
        return model.fitAdvice();
    }

    /** Data-grid index g of branch k, frame f, column q maps to the engine's f * enginePositions + offset + q. */
    private int engineIndex(int k, int local) {
        int f = local / columns[k];
        int q = local - f * columns[k];
        return f * enginePositions + engineOffset[k] + q;
    }

    @Override
    public void evaluate(double[] p, double[] values, double[] jac) {
        double[] theta = Arrays.copyOf(p, engineParameters);
        int np = specs.size();
        if (jac == null) {
            double[] u = new double[frames * enginePositions];
            runs.get().solve(theta, u);
            for (int k = 0; k < branches.size(); k++) {
                double amp = p[engineParameters + 2 * k];
                double base = p[engineParameters + 2 * k + 1];
                for (int g = blockStart[k]; g < blockStart[k + 1]; g++) {
                    values[g] = base + amp * u[engineIndex(k, g - blockStart[k])];
                }
            }
            return;
        }
        Runs r = runs(theta);
        Arrays.fill(jac, 0, size * np, 0);
        for (int k = 0; k < branches.size(); k++) {
            int ia = engineParameters + 2 * k;
            double amp = p[ia];
            double base = p[ia + 1];
            for (int g = blockStart[k]; g < blockStart[k + 1]; g++) {
                int e = engineIndex(k, g - blockStart[k]);
                double ui = r.u[e];
                values[g] = base + amp * ui;
                int row = g * np;
                for (int j = 0; j < engineParameters; j++) {
                    jac[row + j] = amp * (r.shifted[j][e] - ui) / r.step[j];
                }
                jac[row + ia] = ui;
                jac[row + ia + 1] = 1;
            }
        }
        release(r);
    }

    @Override
    public boolean hasNormalEquations() {
        return true;
    }

    @Override
    public void normalEquations(double[] p, FitData data, NormalEquations out, double[] fitted) {
        Checks.require(data.size() == size, "the data do not lie on this model's grid");
        double[] theta = Arrays.copyOf(p, engineParameters);
        Runs r = runs(theta);
        int np = specs.size();
        int ne = engineParameters;
        // chunks of one branch's block each, so that a chunk's rows touch theta and one branch's two parameters
        List<int[]> chunks = new ArrayList<>();
        for (int k = 0; k < branches.size(); k++) {
            int len = blockStart[k + 1] - blockStart[k];
            int parts = Math.max(1, Math.min(16, len / 16_384));
            for (int c = 0; c < parts; c++) {
                chunks.add(new int[] {k, blockStart[k] + (int) ((long) len * c / parts),
                    blockStart[k] + (int) ((long) len * (c + 1) / parts)});
            }
        }
        double[][] parts = new double[chunks.size()][];
        IntStream range = IntStream.range(0, chunks.size());
        if (chunks.size() > 1) {
            range = range.parallel();
        }
        range.forEach(c -> parts[c] = blockSums(r, data, p, fitted, chunks.get(c)));
        release(r);
        out.clear();
        int m = ne + 2;
        double[] packed = new double[np * np + np + 1];
        for (int c = 0; c < parts.length; c++) {
            int k = chunks.get(c)[0];
            double[] part = parts[c];
            int[] index = new int[m];
            for (int j = 0; j < ne; j++) {
                index[j] = j;
            }
            index[ne] = ne + 2 * k;
            index[ne + 1] = ne + 2 * k + 1;
            Arrays.fill(packed, 0);
            for (int x = 0; x < m; x++) {
                for (int y = 0; y < m; y++) {
                    packed[index[x] * np + index[y]] = part[x * m + y];
                }
                packed[np * np + index[x]] = part[m * m + x];
            }
            packed[np * np + np] = part[m * m + m];
            out.addPacked(packed);
        }
    }

    /** A, g and chi^2 over one chunk of one branch, on that branch's m = theta + 2 parameters, packed. */
    private double[] blockSums(Runs r, FitData data, double[] p, double[] fitted, int[] chunk) {
        int k = chunk[0];
        int ne = engineParameters;
        int m = ne + 2;
        double amp = p[ne + 2 * k];
        double base = p[ne + 2 * k + 1];
        double[] a = new double[m * m];
        double[] g = new double[m];
        double chi = 0;
        double[] row = new double[m];
        double[] inv = new double[ne];
        for (int j = 0; j < ne; j++) {
            inv[j] = amp / r.step[j];
        }
        for (int i = chunk[1]; i < chunk[2]; i++) {
            int e = engineIndex(k, i - blockStart[k]);
            double ui = r.u[e];
            double f = base + amp * ui;
            if (fitted != null) {
                fitted[i] = f;
            }
            double w = data.weight(i);
            if (w == 0) {
                continue;
            }
            for (int j = 0; j < ne; j++) {
                row[j] = (r.shifted[j][e] - ui) * inv[j];
            }
            row[ne] = ui;
            row[ne + 1] = 1;
            double res = data.observed(i) - f;
            for (int x = 0; x < m; x++) {
                double wx = w * row[x];
                for (int y = x; y < m; y++) {
                    a[x * m + y] += wx * row[y];
                }
                g[x] += wx * res;
            }
            chi += w * res * res;
        }
        return NormalEquations.pack(a, g, chi, m);
    }

    private record Runs(double[] u, double[][] shifted, double[] step, double[][] buffers) {
    }

    private void release(Runs r) {
        if (spare.size() < 2) {
            spare.offer(r.buffers());
        }
    }

    /** The base run and one run per engine parameter shifted by its step, in parallel. */
    private Runs runs(double[] theta) {
        int n = frames * enginePositions;
        double[][] buffers = spare.poll();
        if (buffers == null) {
            buffers = new double[engineParameters + 1][n];
        }
        double[] u = buffers[engineParameters];
        double[][] shifted = Arrays.copyOf(buffers, engineParameters);
        double[] step = new double[engineParameters];
        for (int j = 0; j < engineParameters; j++) {
            ParameterSpec spec = specs.get(j);
            double scale = spec.scale() == ParameterSpec.Scale.LOGISTIC ? 0.01 * (spec.upper() - spec.lower()) : 0;
            step[j] = RELATIVE_STEP * Math.max(Math.abs(theta[j]), scale);
            if (!(step[j] > 0)) {
                step[j] = RELATIVE_STEP;
            }
        }
        IntStream.rangeClosed(0, engineParameters).parallel().forEach(j -> {
            TreeRun run = runs.get();
            if (j == engineParameters) {
                run.solve(theta, u);
            } else {
                double[] t = theta.clone();
                t[j] += step[j];
                run.solve(t, shifted[j]);
            }
        });
        return new Runs(u, shifted, step, buffers);
    }
}
