/**
 * Path files: ImageJ line ROIs, ROI sets and CSV vertex lists, read into a {@code core.path.DendritePath}.
 * May import {@code io}, its other subpackages and {@code core}; never a front end.
 */
package org.dendrokin.io.path;
