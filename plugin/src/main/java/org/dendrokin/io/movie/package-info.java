/**
 * TIFF movies read a few rows at a time: the header and its checks, memory-mapped or virtual planes, and
 * ImageJ images as frame sources. May import {@code io}, its other subpackages and {@code core}; never a front end.
 */
package org.dendrokin.io.movie;
