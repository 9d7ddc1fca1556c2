package org.dendrokin.core.calib;

/** What happened to one sample when a calibration was applied. */
public enum SampleStatus {
    /** The input was already NaN (e.g. the path left the image). */
    MISSING,
    /** A concentration was computed and is trustworthy by the limits used. */
    VALID,
    /** A concentration was computed but lies in the top part of the range (f above the flag limit). */
    FLAGGED,
    /** Set to NaN: above the rejection limit of fractional saturation, though still below the end. */
    REJECTED,
    /** Set to NaN: at or beyond the saturated end of the range (e.g. F &gt;= Fmax). */
    ABOVE_RANGE,
    /** Set to NaN: at or beyond the zero-concentration end of the range (e.g. F &lt;= Fmin). */
    BELOW_RANGE
}
