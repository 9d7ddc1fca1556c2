/**
 * Reaction-diffusion simulation: domains and grids, the scalar and network solvers (Crank-Nicolson with
 * operator splitting), stimuli, reaction networks and their compiled rate expressions, the stochastic ensemble and
 * the front speed of the built-in models. May import {@code core} and {@code core.kymo} (as today); nothing outside
 * {@code core}.
 */
package org.dendrokin.core.model;
