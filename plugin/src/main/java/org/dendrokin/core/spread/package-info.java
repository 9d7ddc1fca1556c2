/**
 * Model-free measures of the spread: front speed, length constant, decay time and apparent diffusion
 * coefficient, with Theil-Sen slopes. May import {@code core}, {@code core.kymo}, {@code core.preprocess} and
 * {@code core.units} (as today); nothing outside {@code core}.
 */
package org.dendrokin.core.spread;
