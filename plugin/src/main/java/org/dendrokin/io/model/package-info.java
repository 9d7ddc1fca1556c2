/**
 * Model files (our JSON format and SBML) read into simulations, and the outputs of {@code simulate}:
 * kymograph, pictures, a synthetic movie. May import {@code io}, its other subpackages and {@code core}; never a front
 * end.
 */
package org.dendrokin.io.model;
