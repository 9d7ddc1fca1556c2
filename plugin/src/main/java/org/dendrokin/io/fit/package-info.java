/**
 * Model fits of a session in files: fit JSON, fit pictures and report sections, the comparison run of the
 * command line. May import {@code io}, its other subpackages and {@code core}; never a front end.
 */
package org.dendrokin.io.fit;
