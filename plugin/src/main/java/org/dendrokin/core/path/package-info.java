/**
 * The dendrite's path in pixel coordinates: arc length, resampling, and the one place that converts
 * between our pixel-centre convention and array positions. May import {@code core} only.
 */
package org.dendrokin.core.path;
