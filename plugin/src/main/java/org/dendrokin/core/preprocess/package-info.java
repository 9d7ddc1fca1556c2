/**
 * From raw kymograph to signal: background, bleaching correction, F0 and dF/F0, stimulus detection
 * and robust statistics. May import {@code core}, {@code core.kymo}, {@code core.spread} and {@code core.units}
 * (as today; {@code core.spread} imports this package too); nothing outside {@code core}.
 */
package org.dendrokin.core.preprocess;
