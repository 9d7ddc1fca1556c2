/**
 * A model with the user's parameters set beside a measured kymograph, without fitting: the one
 * computation behind every front end's comparison. May import {@code io}, its other subpackages and {@code core};
 * never a front end.
 */
package org.dendrokin.io.compare;
