/**
 * Calibration from signal to concentration: the methods (single wavelength, dynamic range, ratio, Hill,
 * a fitted Hill curve or a monotone table from standards), their uncertainty propagation and saturation limits, and
 * the calibration of a kymograph sample by sample. May import {@code core}, {@code core.kymo} and
 * {@code core.units} (as today); nothing outside {@code core}.
 */
package org.dendrokin.core.calib;
