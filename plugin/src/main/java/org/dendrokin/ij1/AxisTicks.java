package org.dendrokin.ij1;

import java.math.BigDecimal;
import java.util.Locale;

/**
 * Round tick values for an axis: the step is 1, 2 or 5 times a power of ten, chosen so that about the wanted
 * number of ticks cover the range (the "nice numbers" rule of Heckbert, Graphics Gems, 1990), and each value
 * is written with just the decimals its step needs.
 *
 * @param step   spacing between ticks, in the axis's unit
 * @param values the ticks inside the range, ascending
 */
record AxisTicks(double step, double[] values) {
    private static final double[] MANTISSAS = {1, 2, 5, 10};

    /**
     * @param lo     lower end of the range, in the axis's unit
     * @param hi     upper end, in the same unit
     * @param target about how many ticks are wanted (at least 1)
     * @return the ticks in [lo, hi]; a single tick at {@code lo} when the range is empty or not finite
     */
    static AxisTicks of(double lo, double hi, int target) {
        if (!Double.isFinite(lo) || !Double.isFinite(hi) || !(hi > lo)) {
            return new AxisTicks(Double.NaN, Double.isFinite(lo) ? new double[] {lo} : new double[0]);
        }
        double raw = (hi - lo) / Math.max(1, target);
        double power = Math.pow(10, Math.floor(Math.log10(raw)));
        double step = 10 * power;
        for (double m : MANTISSAS) {
            if (m * power >= raw * (1 - 1e-9)) {
                step = m * power;
                break;
            }
        }
        long first = (long) Math.ceil(lo / step - 1e-9);
        long last = (long) Math.floor(hi / step + 1e-9);
        double[] values = new double[(int) Math.max(0, last - first + 1)];
        for (int i = 0; i < values.length; i++) {
            // multiples of the step, so that 0.1 + 0.2 style sums do not creep into the labels
            values[i] = new BigDecimal(first + i).multiply(BigDecimal.valueOf(step)).doubleValue();
        }
        return new AxisTicks(step, values);
    }

    /** A tick value with as many decimals as the step has (none for steps of 1 or more). */
    String label(double value) {
        if (!Double.isFinite(step)) {
            return String.format(Locale.ROOT, "%.3g", value);
        }
        int decimals = Math.max(0, BigDecimal.valueOf(step).stripTrailingZeros().scale());
        String s = String.format(Locale.ROOT, "%." + decimals + "f", value);
        return s.matches("-0(\\.0*)?") ? s.substring(1) : s;
    }
}
