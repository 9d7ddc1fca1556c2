package org.dendrokin.synth;

import java.util.Arrays;

import org.dendrokin.core.Checks;

/**
 * The true dF/F0 of the indicator in the shaft, as a function of arc length s along the true axis (um) and time t
 * (s). Made from closed forms, or for the kick by this package's own integration of the PDE.
 */
interface SignalField {
    /** dF/F0 at arc length s (um) and time t (s), dimensionless. */
    double value(double sUm, double tS);

    /** Fills {@code out[i]} with the value at s0Um + i * dsUm and time tS. {@code out} is modified. */
    default void profile(double tS, double s0Um, double dsUm, double[] out) {
        for (int i = 0; i < out.length; i++) {
            out[i] = value(s0Um + i * dsUm, tS);
        }
    }

    /**
     * Crank's Gaussian pulse with first-order decay (sheet s2.2, s2.3):
     * A s0 / sqrt(V) exp(-(s - sStim)^2 / (2 V)) exp(-k tau), V = s0^2 + 2 D tau, tau = t - tStim >= 0; 0 before.
     */
    record Pulse(double dUm2PerS, double kPerS, double sigma0Um, double amplitude, double stimulusTimeS,
            double stimulusArcUm) implements SignalField {
        @Override
        public double value(double sUm, double tS) {
            double tau = tS - stimulusTimeS;
            if (tau < 0) {
                return 0;
            }
            double v = sigma0Um * sigma0Um + 2 * dUm2PerS * tau;
            double x = sUm - stimulusArcUm;
            return amplitude * sigma0Um / Math.sqrt(v) * Math.exp(-x * x / (2 * v) - kPerS * tau);
        }

        @Override
        public void profile(double tS, double s0Um, double dsUm, double[] out) {
            double tau = tS - stimulusTimeS;
            if (tau < 0) {
                Arrays.fill(out, 0);
                return;
            }
            double v = sigma0Um * sigma0Um + 2 * dUm2PerS * tau;
            double peak = amplitude * sigma0Um / Math.sqrt(v) * Math.exp(-kPerS * tau);
            for (int i = 0; i < out.length; i++) {
                double x = s0Um + i * dsUm - stimulusArcUm;
                out[i] = peak * Math.exp(-x * x / (2 * v));
            }
        }
    }

    /**
     * McKean's exact travelling front (sheet s5.2), amplitude / (1 + exp((s - sStart - c (t - tStim)) / w)),
     * c = sqrt(2 D k)(1/2 - a), w = sqrt(2 D / k).
     */
    record Front(double dUm2PerS, double kPerS, double a, double amplitude, double stimulusTimeS,
            double startArcUm) implements SignalField {
        double speedUmPerS() {
            return Math.sqrt(2 * dUm2PerS * kPerS) * (0.5 - a);
        }

        double widthUm() {
            return Math.sqrt(2 * dUm2PerS / kPerS);
        }

        @Override
        public double value(double sUm, double tS) {
            double z = (sUm - startArcUm - speedUmPerS() * (tS - stimulusTimeS)) / widthUm();
            return amplitude / (1 + Math.exp(z));
        }
    }

    /** A kick of sd kickSdUm at (sStim, tStim), integrated by {@link NagumoLine}; amplitude u. */
    final class Kick implements SignalField {
        private final double amplitude;
        private final NagumoLine.Solution solution;

        /**
         * @param spec       the kick
         * @param sStimUm    kick position on the axis, um
         * @param sLoUm      the first arc length that will be asked for, um
         * @param sHiUm      the last, um
         * @param times      the times to keep (increasing; those before the stimulus are ignored), s
         */
        Kick(SessionSpec.NagumoKick spec, double sStimUm, double sLoUm, double sHiUm, double[] times) {
            Checks.require(sHiUm > sLoUm, "an empty range");
            this.amplitude = spec.amplitude();
            double w = Math.sqrt(2 * spec.dUm2PerS() / spec.kPerS());
            double c = Math.abs(Math.sqrt(2 * spec.dUm2PerS() * spec.kPerS()) * (0.5 - spec.a()));
            // Sealed ends beyond the asked range and 12 front widths beyond where a front can get by the last time,
            // where u is below e^-12 (the front's tail falls as exp(-x / w)).
            double reach = c * (times[times.length - 1] - spec.timeS()) + 4 * spec.kickSdUm() + 12 * w;
            double lo = Math.min(sLoUm, sStimUm - reach);
            double hi = Math.max(sHiUm, sStimUm + reach);
            double h = w / spec.gridPerWidth();
            int nodes = (int) Math.ceil((hi - lo) / h) + 1;
            double[] u0 = new double[nodes];
            for (int i = 0; i < nodes; i++) {
                double x = lo + i * h - sStimUm;
                u0[i] = Math.exp(-x * x / (2 * spec.kickSdUm() * spec.kickSdUm()));
            }
            int first = 0;
            while (first < times.length && times[first] <= spec.timeS()) {
                first++;
            }
            double[] after = Arrays.copyOfRange(times, first, times.length);
            NagumoLine line = new NagumoLine(spec.dUm2PerS(), spec.kPerS(), spec.a(), h, nodes);
            this.solution = line.solve(lo, u0, spec.timeS(), after);
        }

        NagumoLine.Solution solution() {
            return solution;
        }

        @Override
        public double value(double sUm, double tS) {
            return amplitude * solution.value(sUm, tS);
        }
    }
}
