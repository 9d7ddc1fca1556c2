/**
 * The kymograph (distance by time, with units) and its extraction along a path from any
 * {@code FrameSource}. May import {@code core} and {@code core.path}; nothing outside {@code core}.
 */
package org.dendrokin.core.kymo;
