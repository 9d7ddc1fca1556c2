package org.dendrokin.core.fit;

import java.util.ArrayList;
import java.util.List;

import org.dendrokin.core.Checks;
import org.dendrokin.core.Progress;
import org.dendrokin.core.model.Domain;
import org.dendrokin.core.model.ModelCatalogue;
import org.dendrokin.core.model.ModelParameter;
import org.dendrokin.core.model.ScalarModel;
import org.dendrokin.core.model.ScalarRun;
import org.dendrokin.core.model.SolverSettings;
import org.dendrokin.core.model.Stimulus;
import org.dendrokin.core.units.Unit;

/**
 * Any one-species model of the {@link ModelCatalogue} ({@link ScalarModel}, run by {@link ScalarRun}) as a fit
 * model: the observed signal is b + A u(x, t; theta), with u from the engine (Strang-split Crank-Nicolson on the
 * model's domain, stimuli fixed as given) and theta the model's own parameters, plus the amplitude A and baseline
 * b. The engine runs with a fixed time step chosen once from the starting parameters, so the objective is a smooth
 * function of theta, and the Jacobian columns of theta are forward differences of the engine's own solve
 * (relative step 1e-7, runs in parallel), multiplied by A; those of A and b are exact. Forward differences cost
 * one plain run per parameter, several times less than the engine's forward-sensitivity solve
 * ({@link ScalarRun#solveWithSensitivities}), and agree with it to about 1e-6 relative.
 *
 * <p>Parameters, scales and derived quantities come from the catalogue entry: a parameter whose fit range is
 * (0, infinity) (D, k, r) moves on the log scale, one with a finite range (Nagumo's threshold a, kept in (0, 0.5)
 * where the front invades the resting state) on a logistic map onto it; the entry's closed forms (front speed,
 * front width, length constant) are reported with intervals.
 */
public final class EngineFitModel implements FitModel {
    private final ScalarModel model;
    private final Domain domain;
    private final double[] outputTimesS;
    private final double[] outputPositionsUm;
    private final List<Stimulus> stimuli;
    private final SolverSettings settings;
    private final List<ParameterSpec> specs;
    private final int engineParameters;
    private final double fixedStepS;
    private final Unit signalUnit;
    private final ThreadLocal<Work> work;
    /** Output buffers of finished evaluations, reused by later ones (allocation-free in steady state). */
    private final java.util.concurrent.ConcurrentLinkedQueue<double[][]> spare =
            new java.util.concurrent.ConcurrentLinkedQueue<>();
    /** Relative step of the forward differences (the engine's output is smooth in theta at a fixed time step). */
    private static final double RELATIVE_STEP = 1e-7;

    private static final class Work {
        final ScalarRun run;
        final double[] u;

        Work(ScalarRun run, int size) {
            this.run = run;
            this.u = new double[size];
        }
    }

    /**
     * @param model             name of a one-species model of the {@link ModelCatalogue}
     * @param domain            the cable the engine solves on
     * @param outputTimesS      kymograph frame times, s. Not modified.
     * @param outputPositionsUm kymograph positions measured in the domain's coordinates, um. Not modified.
     * @param stimuli           the protocol (fixed during the fit)
     * @param fixedStepS        engine time step, s (fixed so that the fit's objective is smooth)
     * @param signalUnit        unit of amplitude and baseline
     */
    public EngineFitModel(String model, Domain domain, double[] outputTimesS, double[] outputPositionsUm,
                          List<Stimulus> stimuli, double fixedStepS, Unit signalUnit) {
        Checks.positiveFinite(fixedStepS, "engine time step (s)");
        this.fixedStepS = fixedStepS;
        this.signalUnit = signalUnit;
        this.model = ModelCatalogue.scalar(model);
        this.domain = domain;
        this.outputTimesS = outputTimesS.clone();
        this.outputPositionsUm = outputPositionsUm.clone();
        this.stimuli = List.copyOf(stimuli);
        this.settings = SolverSettings.DEFAULT.withFixedStepS(fixedStepS);
        // prepared once here so that a bad grid, sampling or protocol fails at construction
        ScalarRun.prepare(this.model, domain, outputTimesS, outputPositionsUm, stimuli, settings);
        List<ParameterSpec> s = new ArrayList<>();
        for (ModelParameter p : this.model.parameters()) {
            s.add(spec(p));
        }
        engineParameters = s.size();
        s.add(ParameterSpec.linear("amplitude", signalUnit));
        s.add(ParameterSpec.linear("baseline", signalUnit));
        this.specs = List.copyOf(s);
        int size = outputTimesS.length * outputPositionsUm.length;
        this.work = ThreadLocal.withInitial(() -> new Work(ScalarRun.prepare(this.model, domain, this.outputTimesS,
                this.outputPositionsUm, this.stimuli, settings), size));
    }

    /** The fit's view of a model parameter: its scale from the range the catalogue lets a fit use. */
    static ParameterSpec spec(ModelParameter p) {
        if (Double.isFinite(p.fitLower()) && Double.isFinite(p.fitUpper())) {
            return ParameterSpec.bounded(p.name(), p.unit(), p.fitLower(), p.fitUpper());
        }
        if (p.fitLower() == 0 && p.fitUpper() == Double.POSITIVE_INFINITY) {
            return ParameterSpec.positive(p.name(), p.unit());
        }
        return ParameterSpec.linear(p.name(), p.unit());
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
        return outputTimesS.length * outputPositionsUm.length;
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

    /** The engine's domain. */
    public Domain domain() {
        return domain;
    }

    /**
     * Steps per frame at which a line-timed fit reads the model ({@link LineTimedModel}): a front that moves two of
     * its widths per frame is then interpolated within a few percent.
     */
    public static final int LINE_STEPS = 4;

    /** Frames after the first stimulus that the first window of {@link #fitInStages} holds at least. */
    static final int MIN_WINDOW_FRAMES = 48;
    /** Relative tolerance of the windows before the last (their optimum is only a start). */
    static final double WINDOW_TOLERANCE = 1e-5;

    /**
     * Fits over a growing window of frames: first the frames up to the first stimulus plus a sixteenth or a
     * quarter of those after it, then four times as many, and so on up to all frames, each window starting from
     * the previous window's optimum. A front that the starting values put far from the data (wrong speed) is a
     * strongly curved, nearly flat valley for the optimiser over a long movie, where it crawls for hundreds of
     * runs; over a short window the front is still near the stimulus, the valley is short, and each longer window
     * starts close to its optimum, so the whole costs a few runs of the full movie. Movies too short for two
     * windows of at least {@value #MIN_WINDOW_FRAMES} frames after the stimulus are fitted in one go. The
     * result is that of the last window (all frames); its evaluation count includes the earlier windows.
     *
     * @param data     observations on this model's grid
     * @param starts   starting points, as for {@link ModelFit#fit}
     * @param options  as for {@link ModelFit#fit}; the earlier windows run without profiles and bootstrap, to a
     *                 relative tolerance of at most {@value #WINDOW_TOLERANCE}
     * @param progress as for {@link ModelFit#fit} (reported for the last window)
     */
    public FitResult fitInStages(FitData data, List<double[]> starts, ModelFit.Options options, Progress progress) {
        return fitInStages(data, starts, options, progress, null);
    }

    /**
     * As {@link #fitInStages(FitData, List, ModelFit.Options, Progress)} for a raster-scanned kymograph: this
     * model is built on {@code LineTimedModel.extendedTimes(frame times, LINE_STEPS)}, and every window is read at
     * each sample's own time through {@link LineTimedModel}.
     *
     * @param delaysS each position's delay after its frame's time, s, or null for none (then as above)
     */
    public FitResult fitInStages(FitData data, List<double[]> starts, ModelFit.Options options, Progress progress,
                                 double[] delaysS) {
        // with line timing this model predicts LINE_STEPS times per frame and one time after the last frame
        int k = delaysS == null ? 1 : LINE_STEPS;
        int frames = delaysS == null ? outputTimesS.length : (outputTimesS.length - 1) / k;
        Checks.require(data.size() == frames * outputPositionsUm.length
                && (delaysS == null || outputTimesS.length == frames * k + 1), "the data do not lie on this model's grid");
        double[] frameTimes = new double[frames];
        for (int f = 0; f < frames; f++) {
            frameTimes[f] = outputTimesS[f * k];
        }
        double first = Double.POSITIVE_INFINITY;
        for (Stimulus st : stimuli) {
            first = Math.min(first, st.timeS());
        }
        int before = 0;
        while (before < frames && frameTimes[before] < first) {
            before++;
        }
        List<Integer> windows = new ArrayList<>();
        int after = frames - before;
        while (after / 4 >= MIN_WINDOW_FRAMES) {
            after /= 4;
            windows.add(0, before + after);
        }
        long extra = 0;
        List<double[]> current = new ArrayList<>(starts);
        ModelFit.Options quick = options.withProfiles(false).withBootstrap(0, options.seed())
                .withTolerance(Math.max(options.tolerance(), WINDOW_TOLERANCE));
        int positions = outputPositionsUm.length;
        for (int count : windows) {
            progress.checkCancelled();
            double[] times = java.util.Arrays.copyOf(outputTimesS, delaysS == null ? count : count * k + 1);
            EngineFitModel engine = new EngineFitModel(model.name(), domain, times, outputPositionsUm, stimuli,
                    fixedStepS, signalUnit);
            FitModel part = delaysS == null ? engine
                    : new LineTimedModel(engine, java.util.Arrays.copyOf(frameTimes, count), delaysS, k);
            FitData partData = new FitData(java.util.Arrays.copyOf(data.values(), count * positions),
                    java.util.Arrays.copyOf(data.sigmas(), count * positions));
            List<double[]> next = new ArrayList<>();
            for (double[] start : current) {
                FitResult r = ModelFit.fit(part, partData, List.of(start), quick, Progress.NONE);
                extra += r.evaluations();
                next.add(r.converged() ? r.values() : start);
            }
            current = next;
        }
        FitModel whole = delaysS == null ? this : new LineTimedModel(this, frameTimes, delaysS, k);
        FitResult r = ModelFit.fit(whole, data, current, options, progress);
        if (extra == 0) {
            return r;
        }
        return new FitResult(r.model(), r.converged(), r.reason(), r.parameters(), r.derived(), r.pointsUsed(),
                r.chiSquare(), r.rmse(), r.aic(), r.aicc(), r.bic(), r.correlation(), r.fitted(), r.warnings(),
                r.evaluations() + extra);
    }

    @Override
    public void evaluate(double[] p, double[] values, double[] jac) {
        double[] theta = java.util.Arrays.copyOf(p, engineParameters);
        double amp = p[engineParameters];
        double base = p[engineParameters + 1];
        int np = specs.size();
        int size = values.length;
        if (jac == null) {
            Work w = work.get();
            w.run.solve(theta, w.u);
            for (int g = 0; g < size; g++) {
                values[g] = base + amp * w.u[g];
            }
            return;
        }
        Runs runs = runs(theta);
        double[] u = runs.u;
        for (int g = 0; g < size; g++) {
            values[g] = base + amp * u[g];
            int r = g * np;
            for (int j = 0; j < engineParameters; j++) {
                jac[r + j] = amp * (runs.shifted[j][g] - u[g]) / runs.step[j];
            }
            jac[r + engineParameters] = u[g];
            jac[r + engineParameters + 1] = 1;
        }
        release(runs);
    }

    @Override
    public boolean hasNormalEquations() {
        return true;
    }

    @Override
    public void normalEquations(double[] p, FitData data, NormalEquations out, double[] fitted) {
        Checks.require(data.size() == size(), "the data do not lie on this model's grid");
        double[] theta = java.util.Arrays.copyOf(p, engineParameters);
        double amp = p[engineParameters];
        double base = p[engineParameters + 1];
        int size = size();
        Runs runs = runs(theta);
        int blocks = Math.max(1, Math.min(64, size / 16_384));
        double[][] parts = new double[blocks][];
        java.util.stream.IntStream range = java.util.stream.IntStream.range(0, blocks);
        if (blocks > 1) {
            range = range.parallel();
        }
        range.forEach(b -> parts[b] = sums(runs, data, amp, base, fitted, (int) ((long) size * b / blocks),
                (int) ((long) size * (b + 1) / blocks)));
        release(runs);
        out.clear();
        for (double[] part : parts) {
            out.addPacked(part);
        }
    }

    /** A (p x p), g (p) and chi^2 over grid points [from, to), packed in one array. */
    private double[] sums(Runs runs, FitData data, double amp, double base, double[] fitted, int from, int to) {
        int np = specs.size();
        int ne = engineParameters;
        double[] a = new double[np * np];
        double[] g = new double[np];
        double chi = 0;
        double[] row = new double[np];
        double[] inv = new double[ne];
        for (int j = 0; j < ne; j++) {
            inv[j] = amp / runs.step[j];
        }
        double[] u = runs.u;
        if (ne == 3 && fitted == null) {
            return sumsOfThree(runs, data, amp, base, inv, from, to);
        }
        for (int i = from; i < to; i++) {
            double ui = u[i];
            double f = base + amp * ui;
            if (fitted != null) {
                fitted[i] = f;
            }
            double w = data.weight(i);
            if (w == 0) {
                continue;
            }
            for (int j = 0; j < ne; j++) {
                row[j] = (runs.shifted[j][i] - ui) * inv[j];
            }
            row[ne] = ui;
            row[ne + 1] = 1;
            double r = data.observed(i) - f;
            for (int x = 0; x < np; x++) {
                double wx = w * row[x];
                for (int y = x; y < np; y++) {
                    a[x * np + y] += wx * row[y];
                }
                g[x] += wx * r;
            }
            chi += w * r * r;
        }
        return NormalEquations.pack(a, g, chi, np);
    }

    /** {@link #sums} for three engine parameters (Nagumo), the sums kept in local variables. */
    private static double[] sumsOfThree(Runs runs, FitData data, double amp, double base, double[] inv, int from,
            int to) {
        double[] u = runs.u;
        double[] s0 = runs.shifted[0];
        double[] s1 = runs.shifted[1];
        double[] s2 = runs.shifted[2];
        double i0 = inv[0];
        double i1 = inv[1];
        double i2 = inv[2];
        double a00 = 0, a01 = 0, a02 = 0, a03 = 0, a04 = 0;
        double a11 = 0, a12 = 0, a13 = 0, a14 = 0;
        double a22 = 0, a23 = 0, a24 = 0;
        double a33 = 0, a34 = 0, a44 = 0;
        double g0 = 0, g1 = 0, g2 = 0, g3 = 0, g4 = 0;
        double chi = 0;
        for (int i = from; i < to; i++) {
            double w = data.weight(i);
            double ui = u[i];
            double r = data.observed(i) - (base + amp * ui);
            double j0 = (s0[i] - ui) * i0;
            double j1 = (s1[i] - ui) * i1;
            double j2 = (s2[i] - ui) * i2;
            double w0 = w * j0;
            double w1 = w * j1;
            double w2 = w * j2;
            double w3 = w * ui;
            a00 += w0 * j0;
            a01 += w0 * j1;
            a02 += w0 * j2;
            a03 += w0 * ui;
            a04 += w0;
            a11 += w1 * j1;
            a12 += w1 * j2;
            a13 += w1 * ui;
            a14 += w1;
            a22 += w2 * j2;
            a23 += w2 * ui;
            a24 += w2;
            a33 += w3 * ui;
            a34 += w3;
            a44 += w;
            g0 += w0 * r;
            g1 += w1 * r;
            g2 += w2 * r;
            g3 += w3 * r;
            g4 += w * r;
            chi += w * r * r;
        }
        double[][] a = {{a00, a01, a02, a03, a04}, {a01, a11, a12, a13, a14}, {a02, a12, a22, a23, a24},
            {a03, a13, a23, a33, a34}, {a04, a14, a24, a34, a44}};
        double[] part = new double[31];
        for (int x = 0; x < 5; x++) {
            System.arraycopy(a[x], 0, part, 5 * x, 5);
        }
        part[25] = g0;
        part[26] = g1;
        part[27] = g2;
        part[28] = g3;
        part[29] = g4;
        part[30] = chi;
        return part;
    }

    /** The base run and one run per engine parameter shifted by its step. */
    private record Runs(double[] u, double[][] shifted, double[] step, double[][] buffers) {
    }

    /** Hands the run buffers back for the next evaluation (kept in a shared pool, never tied to a thread). */
    private void release(Runs runs) {
        if (spare.size() < 2) {
            spare.offer(runs.buffers());
        }
    }

    /**
     * The engine's derivatives by forward differences of its own solve (fixed step, so a smooth function of
     * theta): one run per engine parameter plus the base run, in parallel. The forward-sensitivity solve gives the
     * same derivatives but costs several plain runs per parameter. Outputs are allocated per call: a worker that
     * waits for these runs may meanwhile run another evaluation with its thread's work arrays.
     */
    private Runs runs(double[] theta) {
        int size = size();
        double[][] buffers = spare.poll();
        if (buffers == null) {
            buffers = new double[engineParameters + 1][size];
        }
        double[] u = buffers[engineParameters];
        double[][] shifted = java.util.Arrays.copyOf(buffers, engineParameters);
        double[] step = new double[engineParameters];
        for (int j = 0; j < engineParameters; j++) {
            ParameterSpec spec = specs.get(j);
            double scale = spec.scale() == ParameterSpec.Scale.LOGISTIC ? 0.01 * (spec.upper() - spec.lower()) : 0;
            step[j] = RELATIVE_STEP * Math.max(Math.abs(theta[j]), scale);
            if (!(step[j] > 0)) {
                step[j] = RELATIVE_STEP;
            }
        }
        java.util.stream.IntStream.rangeClosed(0, engineParameters).parallel().forEach(j -> {
            ScalarRun run = work.get().run;
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
