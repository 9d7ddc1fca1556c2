package org.dendrokin.core.analysis;

/**
 * How the signal channel is normalised by a structural channel (a second dye that fills the dendrite and does not
 * respond), common practice with a green indicator and a red structural dye: G/R divides the background-
 * subtracted signal by the background-subtracted structural intensity of the same sample, which removes changes
 * of volume, focus and loading; dG/R is (G - G0) / R, with G0 the median of G over the baseline frames at each
 * position.
 */
public enum Normalisation {
    /** dF/F0 of the signal channel (or the calibration's concentration). */
    NONE("none"),
    /** G / R, each background-subtracted. */
    G_OVER_R("G/R"),
    /** (G - G0) / R. */
    DG_OVER_R("dG/R");

    private final String key;

    Normalisation(String key) {
        this.key = key;
    }

    /** As written in session.json and as the signal's unit. */
    public String key() {
        return key;
    }

    /** The normalisation for its session.json word, or null. */
    public static Normalisation of(String key) {
        for (Normalisation n : values()) {
            if (n.key.equals(key)) {
                return n;
            }
        }
        return null;
    }
}
