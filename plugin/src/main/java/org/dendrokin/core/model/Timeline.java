package org.dendrokin.core.model;

import java.util.ArrayList;
import java.util.Comparator;
import java.util.List;

import org.dendrokin.core.Checks;

/**
 * The event times of a run, built once: every output time and every stimulus start and end, sorted and
 * merged, from 0 to the last output time. The solver steps from one breakpoint to the next and handles
 * at each breakpoint, in this order: injections and clamps that end, those that start, pulses, then the
 * outputs (so a frame taken at a pulse's time shows the pulse). Events after the last output are dropped.
 */
final class Timeline {
    static final int INJECTION_OFF = 0;
    static final int CLAMP_OFF = 1;
    static final int INJECTION_ON = 2;
    static final int CLAMP_ON = 3;
    static final int PULSE = 4;

    final double[] breaksS;
    /** Events of breakpoint j are eventType/eventStimulus[eventStart[j] .. eventStart[j + 1]). */
    final int[] eventStart;
    final int[] eventType;
    final int[] eventStimulus;
    /** Outputs of breakpoint j are outputFrame[outputStart[j] .. outputStart[j + 1]). */
    final int[] outputStart;
    final int[] outputFrame;

    /** Outputs strictly between breakpoints (only when outputs are not breakpoints), sorted by time. */
    final double[] interiorTimeS;
    final int[] interiorFrame;

    Timeline(double[] outputTimesS, List<Stimulus> stimuli) {
        this(outputTimesS, stimuli, true);
    }

    /**
     * @param outputsAreBreakpoints true: every output time is a breakpoint (the solver steps exactly to it);
     *                              false: only 0, stimulus times and the last output time are, and outputs
     *                              in between are listed in {@link #interiorTimeS} for interpolation
     */
    Timeline(double[] outputTimesS, List<Stimulus> stimuli, boolean outputsAreBreakpoints) {
        Checks.require(outputTimesS.length > 0, "at least one output time is needed");
        double end = 0;
        for (double t : outputTimesS) {
            Checks.nonNegativeFinite(t, "output time (s)");
            end = Math.max(end, t);
        }
        List<double[]> events = new ArrayList<>();   // {time, type, stimulus}
        for (int s = 0; s < stimuli.size(); s++) {
            Stimulus st = stimuli.get(s);
            switch (st.kind()) {
                case PULSE -> events.add(new double[] {st.timeS(), PULSE, s});
                case INJECTION -> {
                    events.add(new double[] {st.timeS(), INJECTION_ON, s});
                    events.add(new double[] {st.endS(), INJECTION_OFF, s});
                }
                case CLAMP -> {
                    events.add(new double[] {st.timeS(), CLAMP_ON, s});
                    events.add(new double[] {st.endS(), CLAMP_OFF, s});
                }
                default -> throw new IllegalStateException(st.kind().toString());
            }
        }
        final double lastTime = end;
        events.removeIf(e -> e[0] > lastTime);
        events.sort(Comparator.<double[]>comparingDouble(e -> e[0]).thenComparingDouble(e -> e[1]));
        List<Double> times = new ArrayList<>();
        times.add(0.0);
        for (double[] e : events) {
            times.add(e[0]);
        }
        if (outputsAreBreakpoints) {
            for (double t : outputTimesS) {
                times.add(t);
            }
        } else {
            times.add(end);
        }
        times.sort(Double::compare);
        List<Double> unique = new ArrayList<>();
        for (double t : times) {
            if (unique.isEmpty() || t > unique.get(unique.size() - 1)) {
                unique.add(t);
            }
        }
        breaksS = unique.stream().mapToDouble(Double::doubleValue).toArray();
        int nb = breaksS.length;
        eventStart = new int[nb + 1];
        eventType = new int[events.size()];
        eventStimulus = new int[events.size()];
        int k = 0;
        for (int j = 0; j < nb; j++) {
            eventStart[j] = k;
            while (k < events.size() && events.get(k)[0] == breaksS[j]) {
                eventType[k] = (int) events.get(k)[1];
                eventStimulus[k] = (int) events.get(k)[2];
                k++;
            }
        }
        eventStart[nb] = k;
        Integer[] order = new Integer[outputTimesS.length];
        for (int f = 0; f < order.length; f++) {
            order[f] = f;
        }
        java.util.Arrays.sort(order, Comparator.comparingDouble(f -> outputTimesS[f]));
        outputStart = new int[nb + 1];
        int aligned = 0;
        for (Integer f : order) {
            if (java.util.Arrays.binarySearch(breaksS, outputTimesS[f]) >= 0) {
                aligned++;
            }
        }
        outputFrame = new int[aligned];
        int m = 0;
        int next = 0;
        for (int j = 0; j < nb; j++) {
            outputStart[j] = m;
            while (next < order.length && outputTimesS[order[next]] <= breaksS[j]) {
                if (outputTimesS[order[next]] == breaksS[j]) {
                    outputFrame[m++] = order[next];
                }
                next++;
            }
        }
        outputStart[nb] = m;
        int interior = order.length - aligned;
        interiorTimeS = new double[interior];
        interiorFrame = new int[interior];
        int q = 0;
        for (Integer f : order) {
            if (java.util.Arrays.binarySearch(breaksS, outputTimesS[f]) < 0) {
                interiorTimeS[q] = outputTimesS[f];
                interiorFrame[q] = f;
                q++;
            }
        }
    }

    int breakCount() {
        return breaksS.length;
    }
}
