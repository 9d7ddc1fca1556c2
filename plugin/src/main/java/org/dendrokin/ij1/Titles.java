package org.dendrokin.ij1;

import java.util.regex.Pattern;

import ij.ImagePlus;

/**
 * Window titles of our images: a name, then the signal unit in brackets, e.g. {@code "dendrite kymograph
 * (dF/F0)"}. An image made from another one is named after its stem (the source's title without its file
 * extension and without its unit), so that a unit is never written twice, e.g. {@code "cell3 fit nagumo
 * (dF/F0)"} from {@code "cell3 (dF/F0)"}.
 */
final class Titles {
    /** The unit shown for a kymograph without one. */
    static final String NO_UNIT = "no unit";
    private static final Pattern EXTENSION = Pattern.compile("\\.(ome\\.)?[A-Za-z][A-Za-z0-9]{1,4}$");

    private Titles() {
    }

    /** {@code name (unit)}; unchanged when {@code name} already ends with that unit in brackets. */
    static String withUnit(String name, String unit) {
        String group = " (" + (unit == null || unit.isEmpty() ? NO_UNIT : unit) + ")";
        String trimmed = name.trim();
        return trimmed.endsWith(group.trim()) ? trimmed : trimmed + group;
    }

    /** The source's title without a file extension and without a trailing unit in brackets. */
    static String stem(ImagePlus source) {
        return stem(source.getTitle(), source.getCalibration().getValueUnit());
    }

    /** As {@link #stem(ImagePlus)} for a title and the image's value unit (ImageJ's "Gray Value" when none). */
    static String stem(String title, String valueUnit) {
        String s = title.trim();
        for (String unit : new String[] {valueUnit, NO_UNIT}) {
            String group = "(" + unit + ")";
            if (unit != null && !unit.isEmpty() && s.endsWith(group) && s.length() > group.length()) {
                s = s.substring(0, s.length() - group.length()).trim();
            }
        }
        return EXTENSION.matcher(s).replaceFirst("");
    }

    /** {@code <stem of source> <what> (unit)}, e.g. {@code "cell3 simulated nagumo (dF/F0)"}. */
    static String derived(ImagePlus source, String what, String unit) {
        String stem = stem(source);
        return withUnit(what.isEmpty() ? stem : stem + " " + what, unit);
    }
}
