package org.dendrokin.core.calib;

import java.util.Locale;

/** Numbers in sentences: up to 6 significant digits, Locale.ROOT, no trailing zeros. */
final class Format {
    private Format() {
    }

    static String number(double v) {
        if (!Double.isFinite(v)) {
            return Double.toString(v);
        }
        if (v == Math.rint(v) && Math.abs(v) < 1e9) {
            return Long.toString((long) v);
        }
        String s = String.format(Locale.ROOT, "%.6g", v);
        if (s.contains("e")) {
            return s;
        }
        s = s.replaceAll("0+$", "");
        return s.endsWith(".") ? s.substring(0, s.length() - 1) : s;
    }

    static String percent(double fraction) {
        if (fraction * 100 == Math.rint(fraction * 100)) {
            return Math.round(fraction * 100) + "%";
        }
        return String.format(Locale.ROOT, "%.2f%%", 100 * fraction);
    }
}
