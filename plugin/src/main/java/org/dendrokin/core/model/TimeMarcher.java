package org.dendrokin.core.model;

import java.util.Arrays;
import java.util.List;

import org.dendrokin.core.Checks;

/**
 * Marches a {@link Stepper} through a run's timeline, the one loop shared by every deterministic solver. At
 * each breakpoint of the {@link Timeline} (time 0, every stimulus start and end, the last output time) it
 * applies that time's events in order (injections and clamps that end, those that start, pulses: amount x
 * profile added to the stimulated field), hands the stepper its new sources when injections change, holds the
 * clamped nodes, and samples the outputs that fall on the breakpoint. Between breakpoints it takes equal steps of
 * at most the run's largest step (count from {@link SolverSettings#stepCount}), asks for a damped step right
 * after a pulse or a clamp change (when smoothing is on), re-applies the clamps after every step, and samples
 * outputs that fall between two steps by linear interpolation in time (second order, like the scheme), from
 * the two time levels sampled at the output positions only.
 * <p>
 * Prepared once per grid, protocol and sampling; {@link #run} allocates nothing. Not thread-safe.
 */
final class TimeMarcher {
    private final Timeline timeline;
    private final List<Stimulus> stimuli;
    private final double[][] profile;
    private final boolean[][] clampMask;
    private final int[] stimulusField;
    private final OutputSampler sampler;
    private final SolverSettings settings;
    private final int nodes;
    private final boolean[] injectionOn;
    private final boolean[] clampOn;
    /** Per stimulated field, the summed source rates at every node; the array handed to the stepper. */
    private final double[][] sourceRows;
    private final double[][] sources;
    /** Every output field sampled at the output positions before and after a step with outputs inside it. */
    private final double[][] sampledA;
    private final double[][] sampledB;

    /**
     * @param outputTimesS  sampling times, s, zero or positive, any order
     * @param stimuli       the protocol; stimuli after the last output time are ignored
     * @param layout        the stimuli on the stepper's nodes
     * @param stimulusField the field each stimulus acts on
     * @param fieldCount    number of fields a run may sample
     * @param sampler       output positions on the stepper's nodes
     * @param settings      step rule, smoothing
     */
    TimeMarcher(double[] outputTimesS, List<Stimulus> stimuli, StimulusLayout layout, int[] stimulusField,
            int fieldCount, OutputSampler sampler, SolverSettings settings) {
        this.stimuli = List.copyOf(stimuli);
        Checks.require(stimulusField.length == this.stimuli.size(), "one field per stimulus");
        this.timeline = new Timeline(outputTimesS, this.stimuli, false);
        this.profile = layout.profile;
        this.clampMask = layout.clampMask;
        this.stimulusField = stimulusField.clone();
        this.sampler = sampler;
        this.settings = settings;
        this.nodes = layout.nodeCount;
        int count = this.stimuli.size();
        injectionOn = new boolean[count];
        clampOn = new boolean[count];
        sources = new double[fieldCount][];
        sourceRows = new double[fieldCount][];
        for (int s = 0; s < count; s++) {
            if (this.stimuli.get(s).kind() == Stimulus.Kind.INJECTION && sourceRows[stimulusField[s]] == null) {
                sourceRows[stimulusField[s]] = new double[nodes];
            }
        }
        sampledA = new double[fieldCount][sampler.positions()];
        sampledB = new double[fieldCount][sampler.positions()];
    }

    /**
     * The number of steps {@link #run} takes with this largest step, without taking them (saturating at
     * {@code Long.MAX_VALUE}), so that a caller can refuse a run that would not end in reasonable time.
     *
     * @param dtMaxS the largest step, s, as given to {@link #run}
     */
    long plannedSteps(double dtMaxS) {
        Timeline tl = timeline;
        double total = 0;
        for (int j = 0; j + 1 < tl.breakCount(); j++) {
            total += settings.stepCount(tl.breaksS[j + 1] - tl.breaksS[j], dtMaxS);
        }
        return total >= Long.MAX_VALUE ? Long.MAX_VALUE : (long) total;
    }

    /**
     * Runs the timeline from the stepper's current state (the caller sets the initial state).
     *
     * @param stepper the solver, prepared for this run's parameters
     * @param dtMaxS  the largest step, s, from {@link SolverSettings#maxStep} with the run's rates
     * @param out     one row per field, {@code out[f][frame * positions + position]}, or null to leave a field
     *                unsampled. Modified.
     * @return the number of steps taken
     */
    long run(Stepper stepper, double dtMaxS, double[][] out) {
        Checks.require(stepper.nodeCount() == nodes, "the stepper and the stimulus layout differ in nodes");
        Checks.require(out.length <= sampledA.length, "more output rows than fields");
        Arrays.fill(injectionOn, false);
        Arrays.fill(clampOn, false);
        Timeline tl = timeline;
        int nb = tl.breakCount();
        double[][] before = sampledA;
        double[][] after = sampledB;
        boolean afterIsCurrent;   // after holds the state at the current time, sampled
        boolean smooth = false;
        long steps = 0;
        int interior = 0;
        for (int j = 0; j < nb; j++) {
            afterIsCurrent = false;   // events may change the state
            boolean injectionsChanged = false;
            for (int e = tl.eventStart[j]; e < tl.eventStart[j + 1]; e++) {
                int s = tl.eventStimulus[e];
                switch (tl.eventType[e]) {
                    case Timeline.INJECTION_OFF, Timeline.INJECTION_ON -> {
                        injectionOn[s] = tl.eventType[e] == Timeline.INJECTION_ON;
                        injectionsChanged = true;
                    }
                    case Timeline.CLAMP_OFF, Timeline.CLAMP_ON -> {
                        clampOn[s] = tl.eventType[e] == Timeline.CLAMP_ON;
                        smooth = true;
                    }
                    case Timeline.PULSE -> {
                        addPulse(stepper.field(stimulusField[s]), stimuli.get(s).amount(), profile[s], nodes);
                        smooth = true;
                    }
                    default -> throw new IllegalStateException();
                }
            }
            if (injectionsChanged) {
                stepper.setSources(sources());
            }
            boolean anyClamp = false;
            for (boolean on : clampOn) {
                anyClamp |= on;
            }
            if (anyClamp) {
                hold(stepper);
            }
            for (int o = tl.outputStart[j]; o < tl.outputStart[j + 1]; o++) {
                int frame = tl.outputFrame[o];
                for (int f = 0; f < out.length; f++) {
                    if (out[f] != null) {
                        sampler.sample(stepper.field(f), out[f], frame);
                    }
                }
            }
            if (j == nb - 1) {
                break;
            }
            double gap = tl.breaksS[j + 1] - tl.breaksS[j];
            long count = settings.stepCount(gap, dtMaxS);
            double dt = gap / count;
            double t = tl.breaksS[j];
            for (long step = 0; step < count; step++) {
                double tNext = step == count - 1 ? tl.breaksS[j + 1] : tl.breaksS[j] + (step + 1) * dt;
                boolean interpolate = interior < tl.interiorTimeS.length && tl.interiorTimeS[interior] <= tNext;
                if (interpolate) {
                    if (afterIsCurrent) {
                        double[][] swap = before;
                        before = after;
                        after = swap;
                    } else {
                        sampleAll(stepper, out, before);
                    }
                }
                stepper.step(dt, smooth && settings.smoothing());
                smooth = false;
                if (anyClamp) {
                    hold(stepper);
                }
                afterIsCurrent = false;
                if (interpolate) {
                    sampleAll(stepper, out, after);
                    afterIsCurrent = true;
                }
                while (interior < tl.interiorTimeS.length && tl.interiorTimeS[interior] <= tNext) {
                    // outputs between steps: linear in time, second order like the scheme
                    double w = (tl.interiorTimeS[interior] - t) / (tNext - t);
                    int frame = tl.interiorFrame[interior];
                    for (int f = 0; f < out.length; f++) {
                        if (out[f] != null) {
                            sampler.mix(before[f], after[f], w, out[f], frame);
                        }
                    }
                    interior++;
                }
                t = tNext;
            }
            steps += count;
        }
        return steps;
    }

    private static void addPulse(double[] field, double amount, double[] profile, int n) {
        for (int i = 0; i < n; i++) {
            field[i] += amount * profile[i];
        }
    }

    /** The sources of the injections that are on, summed per field; null rows for fields with none on. */
    private double[][] sources() {
        Arrays.fill(sources, null);
        for (int s = 0; s < injectionOn.length; s++) {
            if (!injectionOn[s]) {
                continue;
            }
            int f = stimulusField[s];
            double[] row = sourceRows[f];
            if (sources[f] == null) {
                Arrays.fill(row, 0);
                sources[f] = row;
            }
            Stimulus st = stimuli.get(s);
            double r = st.amount() / st.durationS();
            double[] g = profile[s];
            for (int i = 0; i < nodes; i++) {
                row[i] += r * g[i];
            }
        }
        return sources;
    }

    private void hold(Stepper stepper) {
        for (int s = 0; s < clampOn.length; s++) {
            if (clampOn[s]) {
                stepper.hold(stimulusField[s], clampMask[s], stimuli.get(s).amount());
            }
        }
    }

    private void sampleAll(Stepper stepper, double[][] out, double[][] into) {
        for (int f = 0; f < out.length; f++) {
            if (out[f] != null) {
                sampler.sample(stepper.field(f), into[f], 0);
            }
        }
    }
}
