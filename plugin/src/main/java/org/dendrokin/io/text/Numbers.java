package org.dendrokin.io.text;

import java.math.BigDecimal;
import java.math.MathContext;
import java.util.Locale;

/**
 * Numbers as text, always with {@link Locale#ROOT} (a decimal comma would break every file and sentence we
 * write): {@link #forPeople} for what a person reads (reports, messages, the terminal), {@link #forFile} for
 * what a program reads back (CSV), exactly.
 */
public final class Numbers {
    private Numbers() {
    }

    /**
     * Three significant digits, Java's {@code %.3g} below 0.001 and from 10^5 on, plain notation without
     * trailing zeros between: 0.00005 gives "5.00e-05", 0.5 gives "0.5", 1234.5 gives "1230", 2.0e6 gives
     * "2.00e+06". NaN gives
     * "n/a", an infinity "unbounded" or "-unbounded" (the open end of an interval).
     */
    public static String forPeople(double v) {
        if (Double.isNaN(v)) {
            return "n/a";
        }
        if (Double.isInfinite(v)) {
            return v > 0 ? "unbounded" : "-unbounded";
        }
        if (v == 0) {
            return "0";
        }
        double a = Math.abs(v);
        if (a < 1e-3 || a >= 1e5) {
            return String.format(Locale.ROOT, "%.3g", v);
        }
        return new BigDecimal(v).round(new MathContext(3)).stripTrailingZeros().toPlainString();
    }

    /**
     * The shortest text that reads back as exactly {@code v} ({@link Double#toString}), with whole numbers
     * below 10^15 written as {@code 12.0} and NaN as {@code NaN}: "0.1", "12.0", "1.0E-5".
     */
    public static String forFile(double v) {
        if (Double.isNaN(v)) {
            return "NaN";
        }
        if (v == Math.rint(v) && Math.abs(v) < 1e15) {
            return String.format(Locale.ROOT, "%.1f", v);
        }
        return Double.toString(v);
    }
}
