/**
 * One session's analysis from a movie channel and a path to a typed {@link
 * org.dendrokin.core.analysis.AnalysisResult}: kymograph, background, preprocessing, calibration, one spread
 * measurement, model fits and their comparison, the headline numbers and the warnings as values. Every output
 * (results.json, the report, pictures, ImageJ tables, the terminal summary) is written from that record. May
 * import every other {@code core} package; nothing outside {@code core}, and no other core package imports it.
 */
package org.dendrokin.core.analysis;
