/**
 * Pure computation, and the small pieces every part of it shares: {@code Checks} (argument checks that throw
 * IllegalArgumentException) and {@code Progress} (progress and cancellation, implemented at the edges). This base
 * package imports no other Dendrokin package. No package of {@code core} touches ImageJ, SciJava, AWT, files or the
 * terminal ({@code CoreStaysPureTest}), and none imports {@code io} or a front end; {@code core.analysis} (one
 * session's analysis as a typed result) may import every other core package, and no other core package imports it.
 */
package org.dendrokin.core;
