/**
 * Spines beside the shaft: spine heads found in a reference image (or given as points), each head's own time
 * course from the movie, the shaft's time course at its base from the kymograph, and a two-compartment fit of the
 * exchange between head and shaft through the neck (a neck time constant with its interval). May import
 * {@code core}, {@code core.fit}, {@code core.kymo}, {@code core.path}, {@code core.preprocess} and
 * {@code core.units}; nothing outside {@code core}, and not {@code core.analysis}.
 */
package org.dendrokin.core.spines;
