/**
 * The units of every quantity, with the exact strings the output files use ("um^2/s", "1/s", ...).
 * Imports no other Dendrokin package.
 */
package org.dendrokin.core.units;
