/**
 * Pictures as PNG: heatmaps with colour scales, line and strip plots, axes. May import {@code io}, its other
 * subpackages and {@code core}; never a front end.
 */
package org.dendrokin.io.plot;
