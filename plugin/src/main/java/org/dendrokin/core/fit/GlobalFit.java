package org.dendrokin.core.fit;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.Optional;
import java.util.Random;
import java.util.concurrent.atomic.AtomicLong;

import org.apache.commons.math3.distribution.ChiSquaredDistribution;
import org.apache.commons.math3.distribution.TDistribution;
import org.dendrokin.core.Checks;
import org.dendrokin.core.Progress;
import org.dendrokin.core.kymo.Kymograph;
import org.dendrokin.core.preprocess.Robust;

/**
 * One set of shared constants fitted to all sessions of a group at once: the diffusion-decay model (see
 * {@link DiffusionDecayPulse}) with D and k common to every session of a group and, per session, its own
 * amplitude, width and baseline (and stimulus position and time where the session fits them), weighted by its own
 * noise: the per-position noise SD from its baseline frames ({@link NoiseEstimate}), scaled by a noise level of the
 * session's own that the fit profiles out ({@link JointProblem}). The joint problem is solved with each session's
 * nuisance block eliminated (Schur complement), so its cost grows linearly with the number of sessions.
 *
 * <p>Intervals on each shared constant (95%): the profile likelihood (D or k held at a value, every other
 * parameter of every session refitted, the interval ending where -2 ln L rises by the chi-square(1) 95% quantile
 * 3.84; Wilks 1938) and a bootstrap over sessions (whole sessions resampled with replacement, Davison and Hinkley
 * 1997, section 3.8, each resample refitted by one Gauss-Newton step from the joint estimate,
 * {@link JointProblem#resampleSteps}; the interval from the refits' standard deviation with the small-cluster
 * corrections of {@link JointIntervals#bootstrap}). The profile
 * treats the constant as exactly shared; the bootstrap also sees how much the sessions differ. The reported
 * interval is the wider of the two (the rule of reporting the larger of a model-based and a resampling-based
 * uncertainty; Angrist and Pischke 2009, section 8.2); both are kept.
 *
 * <p>Groups are compared constant by constant with a likelihood-ratio test: the joint fit of two groups with the
 * constant common (the other constants still per group) against the groups fitted apart; twice the log-likelihood
 * difference is chi-square with 1 degree of freedom under equality. The difference (second group minus first)
 * gets its profile-likelihood interval (the same statistic at every value of the difference, so it excludes 0
 * exactly when p &lt; 0.05) and a bootstrap interval (sessions resampled within each group) with its own p value;
 * the groups are said to differ when both tests reject at 5%, which is when the reported (wider) interval of the
 * difference excludes 0.
 */
public final class GlobalFit {
    /** Interval method: from the spread of refits to sessions resampled with replacement. */
    public static final String BOOTSTRAP = "bootstrap-over-sessions";
    /** The constants shared by the sessions of a group, in the model's order. */
    public static final List<String> SHARED = List.of("D", "k");
    /** 95% quantile of chi-square with one degree of freedom (3.84). */
    static final double CHI2_95 = new ChiSquaredDistribution(null, 1).inverseCumulativeProbability(0.95);
    /** Frames a kymograph keeps, about, in the coarse first stage of a joint fit. */
    private static final int COARSE_FRAMES = 48;
    /**
     * Scatter of the resampled refits over the model-based standard error above which the sessions are said to differ
     * by more than their noise (1 when they share the constant exactly; the bootstrap's own sampling error with 20
     * sessions is about 15%).
     */
    static final double HETEROGENEOUS = 1.5;
    /**
     * Relative offset at which the coarse stage stops: a third of its standard errors, well inside the two or three
     * standard errors by which the minimum on a seventh of the frames lies from the full one.
     */
    private static final double COARSE_TOLERANCE = 0.3;

    private GlobalFit() {
    }

    /**
     * One session's input.
     *
     * @param id                 its name in results
     * @param kymograph          the analysed kymograph (dF/F0 or concentration). Not modified.
     * @param stimulusTimeS      t0, s (a start when freeStimulus)
     * @param stimulusPositionUm x0, um (a start when freeStimulus)
     * @param baselineFrames     {first, last} baseline frame for the noise, or null for every frame before t0
     * @param sealedEnds         the path's ends are sealed dendrite ends (mirror images)
     * @param freeStimulus       stimulus time and position are fitted per session, as in its own analysis
     * @param start              starting value of each of the session's model parameters by name (D, k, amplitude,
     *                           width, baseline; position and stimulus_time when freeStimulus), e.g. its own fit
     */
    public record Session(String id, Kymograph kymograph, double stimulusTimeS, double stimulusPositionUm,
                          int[] baselineFrames, boolean sealedEnds, boolean freeStimulus, Map<String, Double> start) {
        public Session {
            Checks.require(id != null && kymograph != null && start != null, "a session needs an id, a kymograph "
                    + "and starting values");
            Checks.finite(stimulusTimeS, "stimulus time (s)");
            Checks.finite(stimulusPositionUm, "stimulus position (um)");
            baselineFrames = baselineFrames == null ? null : baselineFrames.clone();
            start = Map.copyOf(start);
        }

        /**
         * The diffusion-decay model on a kymograph's grid (this session's, or a thinned copy of it). A raster-scanned
         * kymograph (with sample delays) gets the model read at each sample's own time, as its own fit does
         * ({@link LineTimedModel}); the fast held-stimulus sums assume one time per frame.
         */
        FitModel model(Kymograph k) {
            double[] walls = sealedEnds ? new double[] {k.distanceUm(0), k.distanceUm(k.positionCount() - 1)} : null;
            if (k.hasSampleDelays() && k.frameCount() >= 2) {
                DiffusionDecayPulse inner = new DiffusionDecayPulse(k.distancesUm(),
                        LineTimedModel.extendedTimes(k.timesS()), freeStimulus ? Double.NaN : stimulusTimeS,
                        freeStimulus ? Double.NaN : stimulusPositionUm, walls, KymographFits.unitOf(k.signalUnit()));
                return new LineTimedModel(inner, k.timesS(), k.sampleDelaysS());
            }
            if (!freeStimulus) {
                return new HeldStimulusPulse(k.distancesUm(), k.timesS(), stimulusTimeS, stimulusPositionUm, walls,
                        KymographFits.unitOf(k.signalUnit()));
            }
            return new DiffusionDecayPulse(k.distancesUm(), k.timesS(), Double.NaN, Double.NaN, walls,
                    KymographFits.unitOf(k.signalUnit()));
        }

        /** The baseline frames the noise comes from, as the session's own fit takes them. */
        int[] baseline() {
            return baselineFrames != null ? baselineFrames.clone()
                    : new int[] {0, kymograph.firstFrameAtOrAfter(stimulusTimeS) - 1};
        }
    }

    /**
     * How to fit.
     *
     * @param profiles            make profile-likelihood intervals (and the difference's profile interval)
     * @param bootstrapReplicates resamples of sessions (0: none)
     * @param seed                seed of the resampling
     * @param maxPasses           most trial points per joint fit (each one pass over the sessions' data)
     */
    public record Options(boolean profiles, int bootstrapReplicates, long seed, int maxPasses) {
        public Options {
            Checks.require(bootstrapReplicates >= 0, "bootstrapReplicates must be zero or positive");
            Checks.positive(maxPasses, "maxPasses");
        }

        /** Profiles on, 200 bootstrap resamples, seed 1, at most 500 passes a fit. */
        public static Options defaults() {
            return new Options(true, 200, 1L, 500);
        }

        public Options withBootstrap(int replicates, long newSeed) {
            return new Options(profiles, replicates, newSeed, maxPasses);
        }

        public Options withProfiles(boolean on) {
            return new Options(on, bootstrapReplicates, seed, maxPasses);
        }
    }

    /**
     * One session's part of a group fit.
     *
     * @param id         the session
     * @param parameters its own parameters (amplitude, width, baseline, ...) with Wald intervals from the joint fit
     * @param noiseSd    median over positions of its baseline noise SD, signal units
     * @param noiseScale sqrt(chi^2 / (n - q)): its residuals' SD relative to the baseline noise (about 1 when the
     *                   model describes it to within its noise)
     * @param points     data points used
     * @param chiSquare  its weighted residual sum of squares
     */
    public record SessionEstimate(String id, List<ParameterEstimate> parameters, double noiseSd, double noiseScale,
                                  int points, double chiSquare) {
        public SessionEstimate {
            parameters = List.copyOf(parameters);
        }
    }

    /**
     * One group's joint fit. A fit that did not converge has no shared estimates and says why.
     *
     * @param group              the group's name
     * @param converged          true if the joint fit converged
     * @param reason             why not ("" when converged)
     * @param shared             D and k with their reported interval (ci95, the wider of profile and bootstrap) and
     *                           the others (profile, bootstrap, Wald-t) in otherIntervals
     * @param sessions           per-session estimates, in input order
     * @param points             data points of all sessions
     * @param objective          -2 ln L up to a constant, sum n_i ln chi2_i
     * @param bootstrapConverged resamples whose refit converged
     * @param passes             passes over session data, all stages
     * @param warnings           plain sentences
     */
    public record GroupResult(String group, boolean converged, String reason, List<ParameterEstimate> shared,
                              List<SessionEstimate> sessions, int points, double objective, int bootstrapConverged,
                              long passes, List<String> warnings) {
        public GroupResult {
            shared = List.copyOf(shared);
            sessions = List.copyOf(sessions);
            warnings = List.copyOf(warnings);
        }

        /** A shared estimate by name. */
        public Optional<ParameterEstimate> estimate(String name) {
            return shared.stream().filter(e -> e.name().equals(name)).findFirst();
        }
    }

    /**
     * Two groups compared in one shared constant.
     *
     * @param groupA     the first group (by name order)
     * @param groupB     the second
     * @param constant   "D" or "k"
     * @param statistic  likelihood-ratio statistic 2 (ln L_apart - ln L_common), chi-square(1) under equality
     * @param pValue     P(chi-square(1) &gt;= statistic)
     * @param pValueBootstrap two-sided p of the difference over its bootstrap standard error (Student t with
     *                   Welch-Satterthwaite degrees of freedom), NaN without a bootstrap
     * @param differs    both tests reject equality at 5% (the likelihood-ratio test alone without a bootstrap)
     * @param difference the constant of B minus that of A, with its intervals (ci95 the wider of profile and
     *                   bootstrap); null if the comparison could not be made
     * @param warnings   plain sentences
     */
    public record Comparison(String groupA, String groupB, String constant, double statistic, double pValue,
                             double pValueBootstrap, boolean differs, ParameterEstimate difference,
                             List<String> warnings) {
        public Comparison {
            warnings = List.copyOf(warnings);
        }
    }

    /** Every group's fit and every comparison, in group-name order. */
    public record Result(List<GroupResult> groups, List<Comparison> comparisons) {
        public Result {
            groups = List.copyOf(groups);
            comparisons = List.copyOf(comparisons);
        }

        public Optional<GroupResult> group(String name) {
            return groups.stream().filter(g -> g.group().equals(name)).findFirst();
        }
    }

    /** Fits one group (no comparison). */
    public static GroupResult fitGroup(String group, List<Session> sessions, Options options, Progress progress) {
        return fit(Map.of(group, sessions), options, progress).groups().get(0);
    }

    /**
     * Fits every group, then compares every pair of groups that converged in each shared constant.
     *
     * @param groups   sessions by group name (at least one session each)
     * @param options  intervals and limits
     * @param progress reports one unit per joint fit, profile side and resample; checked for cancellation
     */
    public static Result fit(Map<String, List<Session>> groups, Options options, Progress progress) {
        Checks.require(!groups.isEmpty(), "a global fit needs at least one group");
        List<String> names = groups.keySet().stream().sorted().toList();
        int nc = SHARED.size();
        long total = names.size() * (2L + 2L * nc)
                + (long) names.size() * (names.size() - 1) / 2 * nc * 4;
        Counter counter = new Counter(progress, total);
        Map<String, Fitted> fitted = new LinkedHashMap<>();
        List<GroupResult> results = new ArrayList<>();
        for (int i = 0; i < names.size(); i++) {
            String name = names.get(i);
            // each group resamples with its own seed, so that two groups' resamples are independent
            Fitted f = fitOne(name, groups.get(name), options, options.seed() + 1_000_003L * i, counter);
            fitted.put(name, f);
            results.add(f.result);
        }
        List<Comparison> comparisons = new ArrayList<>();
        for (int a = 0; a < names.size(); a++) {
            for (int b = a + 1; b < names.size(); b++) {
                Fitted fa = fitted.get(names.get(a));
                Fitted fb = fitted.get(names.get(b));
                if (fa.solution != null && fb.solution != null) {
                    for (int c = 0; c < nc; c++) {
                        comparisons.add(GroupDifference.compare(fa, fb, c, options, counter));
                    }
                }
            }
        }
        return new Result(results, comparisons);
    }

    // ---- one group ---------------------------------------------------------------------------------------------

    /** A group's problem, its solution and its bootstrap replicates (internal coordinates), for comparisons. */
    static final class Fitted {
        final String name;
        final List<Session> sessions;
        final List<JointProblem.Block> blocks;
        final JointProblem.Solution solution;
        final double[][] replicates;
        /** Per shared constant, {@link JointIntervals#scatterRatio} (NaN without a bootstrap). */
        final double[] scatter;
        final GroupResult result;

        Fitted(String name, List<Session> sessions, List<JointProblem.Block> blocks, JointProblem.Solution solution,
               double[][] replicates, double[] scatter, GroupResult result) {
            this.name = name;
            this.sessions = sessions;
            this.blocks = blocks;
            this.solution = solution;
            this.replicates = replicates;
            this.scatter = scatter;
            this.result = result;
        }
    }

    /** Progress over all stages, safe to call from bootstrap threads. */
    static final class Counter {
        private final Progress progress;
        private final long total;
        private final AtomicLong done = new AtomicLong();

        Counter(Progress progress, long total) {
            this.progress = progress;
            this.total = total;
        }

        void step(String stage) {
            progress.report(stage, done.incrementAndGet(), total);
        }

        Progress progress() {
            return progress;
        }
    }

    private static Fitted fitOne(String name, List<Session> sessions, Options options, long groupSeed,
                                 Counter counter) {
        Checks.require(!sessions.isEmpty(), "group " + name + " has no session");
        List<String> warnings = new ArrayList<>();
        List<JointProblem.Block> blocks = new ArrayList<>();
        List<double[]> theta0 = new ArrayList<>();
        double[] noiseSd = new double[sessions.size()];
        List<double[]> sigmas = new ArrayList<>();
        for (int i = 0; i < sessions.size(); i++) {
            Session s = sessions.get(i);
            List<String> noiseNotes = new ArrayList<>();
            int[] base = s.baseline();
            double[] sigma = NoiseEstimate.perPosition(s.kymograph(), base[0], base[1], noiseNotes);
            noiseNotes.forEach(w -> warnings.add("Session " + s.id() + ": " + w));
            noiseSd[i] = Robust.median(sigma);
            sigmas.add(sigma);
            FitModel model = s.model(s.kymograph());
            blocks.add(block(s.id(), model, FitData.of(s.kymograph(), sigma), 0, -1, 1));
            theta0.add(startValues(s, model));
        }
        List<JointProblem.Coordinate> coords = coordinates(blocks.get(0).specs, "");
        JointProblem problem = new JointProblem(coords, blocks);
        double[] gamma0 = new double[SHARED.size()];
        for (int c = 0; c < gamma0.length; c++) {
            int slot = blocks.get(0).model.indexOf(SHARED.get(c));
            double[] logs = theta0.stream().mapToDouble(t -> Math.log(t[slot])).toArray();
            gamma0[c] = Math.exp(Robust.median(logs));
        }
        double[] ones = problem.ones();
        boolean[] none = new boolean[coords.size()];
        JointProblem.State start = problem.start(gamma0, theta0);
        long coarsePasses = 0;
        JointProblem coarse = coarse(sessions, sigmas, coords);
        if (coarse != null) {
            JointProblem.Solution c = coarse.solve(coarse.start(gamma0, theta0), none, ones, options.maxPasses(),
                    COARSE_TOLERANCE, JointProblem.LAMBDA_COLD, counter.progress());
            coarsePasses = coarse.passes();
            if (Double.isFinite(c.objective())) {
                start = c.state();
            }
        }
        JointProblem.Solution sol = problem.solve(start, none, ones, options.maxPasses(), JointProblem.TOLERANCE,
                coarse != null ? JointProblem.LAMBDA_WARM : JointProblem.LAMBDA_COLD, counter.progress());
        counter.step("joint fit of " + name);
        int points = blocks.stream().mapToInt(b -> b.n).sum();
        if (!sol.converged()) {
            GroupResult r = new GroupResult(name, false, sol.reason(), List.of(), List.of(), points, sol.objective(), 0,
                    problem.passes() + coarsePasses, warnings);
            return new Fitted(name, sessions, blocks, null, null, null, r);
        }
        BlockArrowSystem.Covariance cov = problem.covariance(sol, none, ones);
        if (cov == null) {
            GroupResult r = new GroupResult(name, false, "the sessions cannot tell the parameters apart (singular "
                    + "sensitivity matrix)", List.of(), List.of(), points, sol.objective(), 0,
                    problem.passes() + coarsePasses, warnings);
            return new Fitted(name, sessions, blocks, null, null, null, r);
        }
        int freeParameters = coords.size() + blocks.stream().mapToInt(b -> b.local.length).sum();
        double tq = new TDistribution(null, Math.max(1, points - freeParameters)).inverseCumulativeProbability(0.975);
        double[][] replicates = sessions.size() >= 2 && options.bootstrapReplicates() > 0
                ? JointIntervals.bootstrap(problem, sol, options, groupSeed, counter) : null;
        int bootOk = replicates == null ? 0 : (int) Arrays.stream(replicates).filter(r -> r != null).count();
        if (replicates != null && bootOk < 0.9 * replicates.length) {
            warnings.add(String.format(Locale.ROOT, "Only %d of %d resamples of the sessions could be refitted; the "
                    + "bootstrap intervals may be too narrow.", bootOk, replicates.length));
        }
        if (sessions.size() == 1) {
            warnings.add("A group of one session: its shared constants are that session's own, and no bootstrap over "
                    + "sessions can be made.");
        } else if (sessions.size() < 10 && replicates != null) {
            warnings.add(String.format(Locale.ROOT, "With %d sessions the bootstrap over sessions has few distinct "
                    + "resamples; its interval is rough.", sessions.size()));
        }
        List<ParameterEstimate> shared = new ArrayList<>();
        double[] scatter = new double[coords.size()];
        for (int c = 0; c < coords.size(); c++) {
            Interval profile = options.profiles() ? JointIntervals.profile(problem, sol, c, none, ones,
                    tq * Math.sqrt(cov.global()[c][c]), options, warnings, counter) : null;
            shared.add(JointIntervals.estimate(coords.get(c), sol.state().gamma[c], cov.global()[c][c], tq, profile,
                    JointIntervals.bootstrap(replicates, c, coords.get(c).spec(), sol.state().gamma[c],
                            sessions.size())));
            scatter[c] = JointIntervals.scatterRatio(replicates, c, cov.global()[c][c]);
            if (scatter[c] > HETEROGENEOUS) {
                warnings.add(String.format(Locale.ROOT, "The sessions differ in %s more than their noise explains: "
                        + "resampling them moves it %.1f times as far as the noise of the data does, so its "
                        + "bootstrap interval is the one to quote.", coords.get(c).name(), scatter[c]));
            }
        }
        List<SessionEstimate> perSession = new ArrayList<>();
        for (int i = 0; i < blocks.size(); i++) {
            JointProblem.Block b = blocks.get(i);
            List<ParameterEstimate> own = new ArrayList<>();
            for (int a = 0; a < b.local.length; a++) {
                ParameterSpec spec = b.specs.get(b.local[a]);
                double u = sol.state().u[i][a];
                double half = tq * Math.sqrt(cov.local()[i][a]);
                own.add(new ParameterEstimate(spec.name(), spec.unit(), spec.toNatural(u),
                        spec.derivative(u) * Math.sqrt(cov.local()[i][a]),
                        new Interval(spec.toNatural(u - half), spec.toNatural(u + half), Interval.WALD_T), List.of(),
                        false, Double.isFinite(half)));
            }
            double chi = sol.chiSquare()[i];
            double scale = Math.sqrt(chi / Math.max(1, b.n - b.local.length));
            perSession.add(new SessionEstimate(b.id, own, noiseSd[i], scale, b.n, chi));
        }
        GroupResult r = new GroupResult(name, true, "", shared, perSession, points, sol.objective(), bootOk,
                problem.passes() + coarsePasses, warnings);
        return new Fitted(name, sessions, blocks, sol, replicates, scatter, r);
    }

    /**
     * The group's problem on thinned kymographs (every m-th frame, and the m frames after the stimulus), or null when
     * no session has enough frames to be worth it. Its minimum lies within a few standard errors of the full one, so
     * the full fit started there needs only the last two or three passes over all the data.
     */
    private static JointProblem coarse(List<Session> sessions, List<double[]> sigmas,
                                       List<JointProblem.Coordinate> coords) {
        List<JointProblem.Block> blocks = new ArrayList<>();
        boolean thinner = false;
        for (int i = 0; i < sessions.size(); i++) {
            Session s = sessions.get(i);
            int every = s.kymograph().frameCount() / COARSE_FRAMES;
            Kymograph k = every >= 3 ? thinned(s.kymograph(), s.stimulusTimeS(), every) : s.kymograph();
            thinner |= every >= 3;
            blocks.add(block(s.id(), s.model(k), FitData.of(k, sigmas.get(i)), 0, -1, 1));
        }
        return thinner ? new JointProblem(coords, blocks) : null;
    }

    /** The frames f with f % every == 0, and the {@code every} frames from the stimulus on. */
    static Kymograph thinned(Kymograph k, double stimulusTimeS, int every) {
        int first = k.firstFrameAtOrAfter(stimulusTimeS);
        int nx = k.positionCount();
        List<Integer> keep = new ArrayList<>();
        for (int f = 0; f < k.frameCount(); f++) {
            if (f % every == 0 || (f >= first && f < first + every)) {
                keep.add(f);
            }
        }
        double[] t = new double[keep.size()];
        double[] v = new double[keep.size() * nx];
        for (int i = 0; i < keep.size(); i++) {
            t[i] = k.timeS(keep.get(i));
            System.arraycopy(k.row(keep.get(i)), 0, v, i * nx, nx);
        }
        // the delays stay below the (longer) interval of the kept frames
        return new Kymograph(k.distancesUm(), t, v, k.signalUnit()).withSampleDelays(k.hasSampleDelays()
                ? k.sampleDelaysS() : null);
    }

    /** A session's block with D linked to global coordinate dIndex (plus offset) and k to kIndex. */
    static JointProblem.Block block(String id, FitModel model, FitData data, int dIndex, int dOffset, int kIndex) {
        List<JointProblem.Link> links = List.of(new JointProblem.Link(model.indexOf("D"), dIndex, dOffset),
                new JointProblem.Link(model.indexOf("k"), kIndex, -1));
        return new JointProblem.Block(id, model, data, links);
    }

    /** The global coordinates of one group: its shared constants on their models' scales. */
    static List<JointProblem.Coordinate> coordinates(List<ParameterSpec> specs, String suffix) {
        List<JointProblem.Coordinate> coords = new ArrayList<>();
        for (String name : SHARED) {
            ParameterSpec spec = specs.stream().filter(s -> s.name().equals(name)).findFirst().orElseThrow();
            coords.add(new JointProblem.Coordinate(name + suffix, spec));
        }
        return coords;
    }

    /** The session's starting values in its model's order; every parameter must be given. */
    private static double[] startValues(Session s, FitModel model) {
        List<ParameterSpec> specs = model.parameters();
        double[] theta = new double[specs.size()];
        for (int j = 0; j < specs.size(); j++) {
            Double v = s.start().get(specs.get(j).name());
            Checks.require(v != null && Double.isFinite(v), "session " + s.id() + " has no starting value for "
                    + specs.get(j).name());
            double[] range = specs.get(j).naturalRange();
            Checks.require(v > range[0] && v < range[1], "session " + s.id() + ": the starting value of "
                    + specs.get(j).name() + " lies outside its range");
            theta[j] = v;
        }
        return theta;
    }

    /** A seeded resample of n sessions: how often each was drawn. */
    static double[] resample(int n, long seed) {
        Random random = new Random(seed);
        double[] m = new double[n];
        for (int i = 0; i < n; i++) {
            m[random.nextInt(n)]++;
        }
        return m;
    }
}
