package org.dendrokin.core.calib;

import org.dendrokin.core.Checks;
import org.dendrokin.core.units.Unit;

/**
 * A two-channel ratio reported relative to its own baseline, without dye constants: the usual read-out of FRET
 * and other ratiometric kinase-activity reporters. With R = (F_num - B_num) / (F_den - B_den) at every sample and
 * R0 the median of R over the baseline frames at the same position, the input is R/R0
 * ({@link SignalKind#RATIO_OVER_BASELINE}) and the output is either R/R0 itself or dR/R0 = R/R0 - 1
 * (dimensionless, with the units "R/R0" and "dR/R0"). Forming R and R0 is the caller's part (the session's
 * calibration stage); this class maps R/R0 to the chosen output. There are no constants, no saturated end and no
 * uncertainty of its own.
 */
public final class RatioChange implements PassThrough {
    /** What is reported. */
    public enum Output {
        /** R/R0: 1 at rest. */
        RATIO("R/R0", Unit.R_OVER_R0),
        /** dR/R0 = R/R0 - 1: 0 at rest. */
        CHANGE("dR/R0", Unit.DR_OVER_R0);

        private final String key;
        private final Unit unit;

        Output(String key, Unit unit) {
            this.key = key;
            this.unit = unit;
        }

        /** As written in session.json's {@code output} key and as the unit, e.g. {@code "dR/R0"}. */
        public String key() {
            return key;
        }

        /** The output for its session.json word, or null. */
        public static Output of(String key) {
            for (Output o : values()) {
                if (o.key.equals(key)) {
                    return o;
                }
            }
            return null;
        }
    }

    private final Output output;

    /** @param output R/R0 or dR/R0 */
    public RatioChange(Output output) {
        Checks.require(output != null, "the ratio-change method needs an output (R/R0 or dR/R0)");
        this.output = output;
    }

    public Output output() {
        return output;
    }

    @Override
    public String method() {
        return "ratio-change";
    }

    @Override
    public SignalKind input() {
        return SignalKind.RATIO_OVER_BASELINE;
    }

    @Override
    public Unit outputUnit() {
        return output.unit;
    }

    /** R/R0 itself, or R/R0 - 1 (dimensionless). */
    @Override
    public double concentrationMicromolar(double ratioOverBaseline) {
        return output == Output.RATIO ? ratioOverBaseline : ratioOverBaseline - 1;
    }

    /** The R/R0 that gives this output. */
    @Override
    public double signal(double value) {
        return output == Output.RATIO ? value : value + 1;
    }

    @Override
    public String description() {
        return "ratio change without dye constants: R = (F_num - B_num) / (F_den - B_den) at each sample, R0 = the "
                + "median of R over the baseline frames at the same position, reported as "
                + (output == Output.RATIO ? "R/R0" : "dR/R0 = R/R0 - 1");
    }
}
