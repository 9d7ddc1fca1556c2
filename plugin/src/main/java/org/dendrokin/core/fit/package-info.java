/**
 * Fitting models to kymographs: least squares on Commons Math, the fit models (the diffusion-decay closed
 * form, engine models), intervals (Wald, profile, bootstrap), identifiability, noise estimates and information
 * criteria. May import {@code core}, {@code core.kymo}, {@code core.model}, {@code core.preprocess},
 * {@code core.spread} and {@code core.units} (as today); nothing outside {@code core}.
 */
package org.dendrokin.core.fit;
