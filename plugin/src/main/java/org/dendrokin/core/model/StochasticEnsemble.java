package org.dendrokin.core.model;

import java.util.Arrays;
import java.util.List;
import java.util.Map;
import java.util.SplittableRandom;
import java.util.concurrent.ExecutionException;
import java.util.concurrent.ExecutorService;
import java.util.concurrent.Executors;
import java.util.concurrent.Future;
import java.util.concurrent.atomic.AtomicLong;
import java.util.ArrayList;

import org.dendrokin.core.Checks;
import org.dendrokin.core.Progress;

/**
 * The stochastic mode: the next-subvolume method (Elf &amp; Ehrenberg 2004; sheet s7.3), a spatial Gillespie
 * simulation (Gillespie 1976, 1977; sheet s7.1). Each grid node is a voxel holding whole molecules; its
 * volume is the node's control volume (cross-section x length share, um^3), and counts are concentration x
 * volume x {@link StochasticSettings#moleculesPerUnitUm3()}. Events per voxel:
 * <ul>
 * <li>a reaction r, with propensity v_r(c) x omega, omega = V x scale (the deterministic rate turned into
 * molecules per second); for mass action with whole orders the powers become molecule combinations, so
 * 2A -&gt; fires at k n (n - 1) / omega rather than k n^2 / omega ({@link ReactionNetwork#propensityOf}); every
 * reaction must have a non-negative rate, so a reversible reaction is two reactions;</li>
 * <li>a jump of one molecule of species s to a neighbour, at rate D_s x (L coefficient) x n, where the
 * coefficient is the one of the deterministic grid ({@link CableGrid}), e.g. D/h^2 per molecule and
 * direction on a uniform cable; the ensemble mean therefore follows the same discretised equation.</li>
 * </ul>
 * On a tree ({@link #runOnTree}) the voxels are the tree grid's nodes and a junction's voxel has neighbours on every
 * branch that meets there ({@link VoxelGraph}); nothing else changes.
 * Next event times sit in an indexed binary heap; after an event only the voxels it touched get new
 * times (valid because waiting times are memoryless). At a fixed end, molecules that arrive are removed
 * and the resting level feeds molecules in. Pulses and injections add molecules (amounts rounded up or
 * down at random, without bias); clamps reset counts. Runs are independent, seeded from (seed, run), and
 * spread over threads; the mean and the standard deviation over runs are returned.
 */
public final class StochasticEnsemble {
    private StochasticEnsemble() {
    }

    /**
     * @param mean   ensemble mean, {@code [frame * positions + position]}, concentration units
     * @param sd     ensemble standard deviation (n - 1 denominator; 0 for one run)
     * @param events total number of events over all runs
     */
    public record Summary(double[] mean, double[] sd, long events) {
    }

    /** Runs the ensemble and returns its mean and spread at the output times and positions. */
    public static Summary run(ReactionNetwork network, Domain domain, double[] outputTimesS,
            double[] outputPositionsUm, List<Stimulus> stimuli, String observed, StochasticSettings settings,
            Progress progress) {
        int size = outputTimesS.length * outputPositionsUm.length;
        return ensemble(size, settings, progress, seed -> new Voxels(network, domain, outputTimesS,
                outputPositionsUm, stimuli, observed, settings.moleculesPerUnitUm3(), seed));
    }

    /**
     * Runs the ensemble on a tree: voxels are the tree grid's nodes ({@link TreeGrid}: a junction is one voxel
     * whose neighbours lie on every branch that meets there), molecules jump between neighbouring voxels at the
     * rates of the deterministic tree grid. Mean and spread laid out as {@link TreeRun}'s output.
     */
    public static Summary runOnTree(ReactionNetwork network, TreeDomain domain, double[] outputTimesS,
            Map<String, double[]> outputPositionsUm, List<TreeStimulus> stimuli, String observed,
            StochasticSettings settings, Progress progress) {
        TreeGrid grid = new TreeGrid(domain, 2);
        int[] offsets = new int[outputPositionsUm.size() + 1];
        int[][] nodes = new int[2][];
        double[] weight = TreeRun.sampling(grid, outputPositionsUm, offsets, nodes);
        StimulusLayout layout = new StimulusLayout(grid, stimuli);
        List<Stimulus> protocol = stimuli.stream().map(TreeStimulus::stimulus).toList();
        VoxelGraph graph = VoxelGraph.of(grid, nodes[0], nodes[1], weight, layout);
        int size = outputTimesS.length * offsets[outputPositionsUm.size()];
        return ensemble(size, settings, progress, seed -> new Voxels(network, graph, outputTimesS, protocol, observed,
                settings.moleculesPerUnitUm3(), seed));
    }

    /** Independent runs spread over threads, seeded from (seed, run); their mean and standard deviation. */
    private static Summary ensemble(int size, StochasticSettings settings, Progress progress,
            java.util.function.LongFunction<Voxels> voxels) {
        double[][] samples = new double[settings.runs()][];
        AtomicLong events = new AtomicLong();
        AtomicLong done = new AtomicLong();
        ExecutorService pool = Executors.newFixedThreadPool(Math.min(settings.threads(), settings.runs()));
        try {
            List<Future<?>> futures = new ArrayList<>();
            for (int r = 0; r < settings.runs(); r++) {
                final int run = r;
                futures.add(pool.submit(() -> {
                    progress.checkCancelled();
                    Voxels v = voxels.apply(seedOf(settings.seed(), run));
                    samples[run] = v.simulate(progress);
                    events.addAndGet(v.events);
                    progress.report("stochastic runs", done.incrementAndGet(), settings.runs());
                }));
            }
            for (Future<?> f : futures) {
                f.get();
            }
        } catch (ExecutionException e) {
            if (e.getCause() instanceof RuntimeException re) {
                throw re;
            }
            throw new IllegalStateException(e.getCause());
        } catch (InterruptedException e) {
            Thread.currentThread().interrupt();
            throw new Progress.CancelledException();
        } finally {
            pool.shutdownNow();
        }
        double[] mean = new double[size];
        double[] sd = new double[size];
        for (double[] s : samples) {
            for (int i = 0; i < size; i++) {
                mean[i] += s[i];
            }
        }
        for (int i = 0; i < size; i++) {
            mean[i] /= samples.length;
        }
        if (samples.length > 1) {
            for (double[] s : samples) {
                for (int i = 0; i < size; i++) {
                    double dv = s[i] - mean[i];
                    sd[i] += dv * dv;
                }
            }
            for (int i = 0; i < size; i++) {
                sd[i] = Math.sqrt(sd[i] / (samples.length - 1));
            }
        }
        return new Summary(mean, sd, events.get());
    }

    /** The seed of one run: a SplitMix64-style mix of the base seed and the run index. */
    static long seedOf(long seed, int run) {
        long z = seed + 0x9E3779B97F4A7C15L * (run + 1);
        z = (z ^ (z >>> 30)) * 0xBF58476D1CE4E5B9L;
        z = (z ^ (z >>> 27)) * 0x94D049BB133111EBL;
        return z ^ (z >>> 31);
    }

    /** One run of the next-subvolume method. */
    static final class Voxels {
        private final ReactionNetwork network;
        private final VoxelGraph graph;
        private final int n;
        /** Neighbour slots per voxel. */
        private final int degree;
        private final int m;
        private final int reactions;
        private final double[] d;
        private final double[] scale;      // molecules per concentration unit, per voxel
        private final int[][] count;       // [species][voxel]
        private final double[] restCount;  // fixed ends: resting molecules per voxel volume, per species
        private final double[][] stoich;
        private final Timeline timeline;
        private final List<Stimulus> stimuli;
        private final int[] stimulusSpecies;
        private final double[][] profile;
        private final boolean[][] clampMask;
        private final boolean[] injectionOn;
        private final boolean[] clampOn;
        private final double[] outputTimes;
        private final int positions;
        private final int[] sampleIndex;
        private final int[] sampleNext;
        private final double[] sampleWeight;
        private final int observed;
        private final SplittableRandom random;
        private final double[] conc;
        private final double[] propensity;   // [voxel * slots + slot]
        private final int slots;
        private final double[] total;
        private final double[] eventTime;
        private final int[] heap;
        private final int[] heapPos;
        private long events;

        Voxels(ReactionNetwork network, Domain domain, double[] outputTimesS, double[] outputPositionsUm,
                List<Stimulus> stimuli, String observedName, double perUnitUm3, long seed) {
            this(network, VoxelGraph.of(domain, outputPositionsUm, stimuli), outputTimesS, stimuli, observedName,
                    perUnitUm3, seed);
        }

        Voxels(ReactionNetwork network, VoxelGraph graph, double[] outputTimesS, List<Stimulus> stimuli,
                String observedName, double perUnitUm3, long seed) {
            this.network = network.forThread();
            this.graph = graph;
            this.n = graph.volume().length;
            this.degree = graph.neighbours()[0].length;
            this.m = network.speciesCount();
            this.reactions = network.reactions().size();
            this.d = network.diffusionUm2PerS();
            this.stoich = network.stoichiometry();
            for (int r = 0; r < reactions; r++) {
                for (int s = 0; s < m; s++) {
                    double nu = stoich[r][s];
                    Checks.require(nu == Math.rint(nu), "reaction " + network.reactions().get(r).name()
                            + " changes " + network.species().get(s) + " by " + nu + " per firing, but the stochastic"
                            + " mode needs whole molecules (an SBML reaction between compartments of different sizes"
                            + " has no whole-molecule form)");
                }
            }
            this.stimuli = stimuli;
            this.timeline = new Timeline(outputTimesS, stimuli);
            this.outputTimes = outputTimesS;
            this.positions = graph.sampleFrom().length;
            this.observed = network.indexOf(observedName);
            this.random = new SplittableRandom(seed);
            scale = new double[n];
            for (int i = 0; i < n; i++) {
                scale[i] = graph.volume()[i] * perUnitUm3;
            }
            count = new int[m][n];
            restCount = network.initial();
            double[] init = network.initial();
            for (int s = 0; s < m; s++) {
                for (int i = 0; i < n; i++) {
                    count[s][i] = roundUnbiased(init[s] * scale[i]);
                }
            }
            sampleIndex = graph.sampleFrom();
            sampleNext = graph.sampleTo();
            sampleWeight = graph.sampleWeight();
            int k = stimuli.size();
            stimulusSpecies = new int[k];
            for (int s = 0; s < k; s++) {
                Stimulus st = stimuli.get(s);
                stimulusSpecies[s] = network.indexOf(st.species() == null ? observedName : st.species());
                Checks.require(stimulusSpecies[s] >= 0, "a stimulus names a species the network does not have");
            }
            profile = graph.profile();
            clampMask = graph.clampMask();
            injectionOn = new boolean[k];
            clampOn = new boolean[k];
            conc = new double[m];
            // slots: reactions, then for each species a jump to each neighbour slot, then injection births and the
            // fixed-end feed (one slot per species)
            slots = reactions + degree * m + m + m;
            propensity = new double[n * slots];
            total = new double[n];
            eventTime = new double[n];
            heap = new int[n];
            heapPos = new int[n];
        }

        private int roundUnbiased(double x) {
            double fl = Math.floor(x);
            return (int) fl + (random.nextDouble() < x - fl ? 1 : 0);
        }

        private boolean fixedEnd(int i) {
            return graph.fixed()[i];
        }

        double[] simulate(Progress progress) {
            double[] out = new double[outputTimes.length * positions];
            double[][] source = new double[m][n];
            double t = 0;
            int nb = timeline.breakCount();
            for (int j = 0; j < nb; j++) {
                double tb = timeline.breaksS[j];
                if (j > 0) {
                    t = advance(t, tb, source, progress);
                }
                boolean injChanged = false;
                for (int e = timeline.eventStart[j]; e < timeline.eventStart[j + 1]; e++) {
                    int s = timeline.eventStimulus[e];
                    switch (timeline.eventType[e]) {
                        case Timeline.INJECTION_OFF, Timeline.INJECTION_ON -> {
                            injectionOn[s] = timeline.eventType[e] == Timeline.INJECTION_ON;
                            injChanged = true;
                        }
                        case Timeline.CLAMP_OFF, Timeline.CLAMP_ON ->
                                clampOn[s] = timeline.eventType[e] == Timeline.CLAMP_ON;
                        case Timeline.PULSE -> {
                            double a = stimuli.get(s).amount();
                            int[] target = count[stimulusSpecies[s]];
                            for (int i = 0; i < n; i++) {
                                target[i] = Math.max(0, target[i] + roundUnbiased(a * profile[s][i] * scale[i]));
                            }
                        }
                        default -> throw new IllegalStateException();
                    }
                }
                if (injChanged) {
                    for (double[] row : source) {
                        Arrays.fill(row, 0);
                    }
                    for (int s = 0; s < injectionOn.length; s++) {
                        if (injectionOn[s]) {
                            Stimulus st = stimuli.get(s);
                            for (int i = 0; i < n; i++) {
                                source[stimulusSpecies[s]][i] += st.amount() / st.durationS() * profile[s][i];
                            }
                        }
                    }
                }
                applyClamps();
                for (int o = timeline.outputStart[j]; o < timeline.outputStart[j + 1]; o++) {
                    int frame = timeline.outputFrame[o];
                    int base = frame * positions;
                    int[] c = count[observed];
                    for (int q = 0; q < positions; q++) {
                        int i = sampleIndex[q];
                        double w = sampleWeight[q];
                        int next = sampleNext[q];
                        double a = c[i] / scale[i];
                        double b = c[next] / scale[next];
                        out[base + q] = a + w * (b - a);
                    }
                }
            }
            return out;
        }

        private void applyClamps() {
            for (int s = 0; s < clampOn.length; s++) {
                if (clampOn[s]) {
                    int[] row = count[stimulusSpecies[s]];
                    for (int i = 0; i < n; i++) {
                        if (clampMask[s][i]) {
                            row[i] = roundUnbiased(stimuli.get(s).amount() * scale[i]);
                        }
                    }
                }
            }
        }

        /** Simulates from t to tEnd with the sources given (constant in between); returns tEnd. */
        private double advance(double t, double tEnd, double[][] source, Progress progress) {
            for (int i = 0; i < n; i++) {
                updateRates(i, source);
                eventTime[i] = t + waiting(total[i]);
                heap[i] = i;
                heapPos[i] = i;
            }
            for (int i = n / 2 - 1; i >= 0; i--) {
                siftDown(i);
            }
            long local = 0;
            while (true) {
                int i = heap[0];
                double te = eventTime[i];
                if (!(te <= tEnd)) {
                    break;
                }
                if ((++local & 0xFFFFF) == 0) {
                    progress.checkCancelled();
                }
                fire(i, source, te);
            }
            events += local;
            return tEnd;
        }

        private double waiting(double rate) {
            if (!(rate > 0)) {
                return Double.POSITIVE_INFINITY;
            }
            return -Math.log(1 - random.nextDouble()) / rate;
        }

        private void fire(int i, double[][] source, double t) {
            double pick = random.nextDouble() * total[i];
            int base = i * slots;
            int slot = 0;
            double acc = 0;
            for (; slot < slots - 1; slot++) {
                acc += propensity[base + slot];
                if (pick < acc) {
                    break;
                }
            }
            int other = -1;
            if (slot < reactions) {
                double[] nu = stoich[slot];
                for (int s = 0; s < m; s++) {
                    count[s][i] += (int) nu[s];
                    if (count[s][i] < 0) {
                        count[s][i] = 0;
                    }
                }
            } else if (slot < reactions + degree * m) {
                int s = (slot - reactions) / degree;
                other = graph.neighbours()[i][(slot - reactions) - s * degree];
                count[s][i]--;
                if (!fixedEnd(other)) {
                    count[s][other]++;
                } else {
                    other = -1;
                }
            } else if (slot < reactions + (degree + 1) * m) {
                count[slot - reactions - degree * m][i]++;
            } else {
                count[slot - reactions - (degree + 1) * m][i]++;
            }
            updateRates(i, source);
            eventTime[i] = t + waiting(total[i]);
            siftDown(heapPos[i]);
            siftUp(heapPos[i]);
            if (other >= 0) {
                updateRates(other, source);
                eventTime[other] = t + waiting(total[other]);
                siftDown(heapPos[other]);
                siftUp(heapPos[other]);
            }
        }

        private void updateRates(int i, double[][] source) {
            int base = i * slots;
            double sum = 0;
            if (fixedEnd(i)) {
                for (int q = 0; q < slots; q++) {
                    propensity[base + q] = 0;
                }
                total[i] = 0;
                return;
            }
            for (int s = 0; s < m; s++) {
                conc[s] = count[s][i] / scale[i];
            }
            for (int r = 0; r < reactions; r++) {
                double a = network.propensityOf(r, conc, scale[i]) * scale[i];
                if (a < 0) {
                    throw new IllegalArgumentException("reaction " + network.reactions().get(r).name()
                            + " has a negative rate; the stochastic mode needs each direction as its own reaction");
                }
                // a reaction may not consume a species that is absent
                double[] nu = stoich[r];
                for (int s = 0; s < m; s++) {
                    if (nu[s] < 0 && count[s][i] + nu[s] < 0) {
                        a = 0;
                    }
                }
                propensity[base + r] = a;
                sum += a;
            }
            int[] next = graph.neighbours()[i];
            double[] coefficient = graph.coefficients()[i];
            for (int s = 0; s < m; s++) {
                double jumps = 0;
                for (int k = 0; k < degree; k++) {
                    double a = next[k] >= 0 ? d[s] * coefficient[k] * count[s][i] : 0;
                    propensity[base + reactions + degree * s + k] = a;
                    jumps += a;
                }
                double birth = source[s][i] * scale[i];
                propensity[base + reactions + degree * m + s] = birth;
                // the resting level held at an open end feeds molecules in at D x (coefficient) x c_rest x V
                double feed = graph.feed()[i] == 0 ? 0 : d[s] * graph.feed()[i] * restCount[s] * scale[i];
                propensity[base + reactions + (degree + 1) * m + s] = feed;
                sum += jumps + birth + feed;
            }
            total[i] = sum;
        }

        private void siftUp(int pos) {
            int item = heap[pos];
            double key = eventTime[item];
            while (pos > 0) {
                int parent = (pos - 1) >> 1;
                int p = heap[parent];
                if (eventTime[p] <= key) {
                    break;
                }
                heap[pos] = p;
                heapPos[p] = pos;
                pos = parent;
            }
            heap[pos] = item;
            heapPos[item] = pos;
        }

        private void siftDown(int pos) {
            int item = heap[pos];
            double key = eventTime[item];
            int half = n >> 1;
            while (pos < half) {
                int child = 2 * pos + 1;
                int right = child + 1;
                if (right < n && eventTime[heap[right]] < eventTime[heap[child]]) {
                    child = right;
                }
                if (key <= eventTime[heap[child]]) {
                    break;
                }
                heap[pos] = heap[child];
                heapPos[heap[pos]] = pos;
                pos = child;
            }
            heap[pos] = item;
            heapPos[item] = pos;
        }
    }
}
