package org.dendrokin.core.calib;

/** What a {@link Calibration} expects as its signal. */
public enum SignalKind {
    /** Background-subtracted (and bleach-corrected) intensity of one channel, in the movie's units. */
    INTENSITY,
    /** Ratio of two background-subtracted channels, numerator over denominator (dimensionless). */
    RATIO,
    /** (F - F0) / F0 (dimensionless). */
    DF_F0
}
