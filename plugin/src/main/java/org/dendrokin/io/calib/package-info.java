/**
 * Calibration in files: the {@code calibration} block of session.json, calibration files, tables of
 * standards, their pictures, and applying a calibration to a session's kymograph. May import {@code io}, its other
 * subpackages and {@code core}; never a front end.
 */
package org.dendrokin.io.calib;
