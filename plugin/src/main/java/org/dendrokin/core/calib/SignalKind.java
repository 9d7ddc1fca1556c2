package org.dendrokin.core.calib;

/** What a {@link Calibration} expects as its signal. */
public enum SignalKind {
    /** Background-subtracted (and bleach-corrected) intensity of one channel, in the movie's units. */
    INTENSITY("background-subtracted intensity"),
    /** Ratio of two background-subtracted channels, numerator over denominator (dimensionless). */
    RATIO("ratio of background-subtracted channels"),
    /** (F - F0) / F0 (dimensionless). */
    DF_F0("dF/F0"),
    /**
     * R/R0: the ratio of two background-subtracted channels over R0, the median of that ratio over the baseline
     * frames at the same position (dimensionless).
     */
    RATIO_OVER_BASELINE("ratio of background-subtracted channels over its baseline median (R/R0)"),
    /** Mean fluorescence lifetime averaged across the band (weighted by photon counts when given), ns. */
    LIFETIME("mean fluorescence lifetime (ns) averaged across the band");

    private final String phrase;

    SignalKind(String phrase) {
        this.phrase = phrase;
    }

    /** The signal in words, as results.json states it (e.g. {@code "dF/F0"}). */
    public String phrase() {
        return phrase;
    }
}
