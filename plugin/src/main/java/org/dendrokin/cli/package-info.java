/**
 * The command line (picocli): {@code Main} and one class per command ({@code analyze}, {@code demo},
 * {@code simulate}, {@code calibrate}, {@code compare}, {@code batch}, {@code global-fit}), exit codes and the
 * terminal progress line.
 * A front end: it reads arguments and calls {@code org.dendrokin.io} (and, for values to print, {@code core}
 * records); it imports no other front end ({@code command}, {@code ij1}), and nothing imports it.
 */
package org.dendrokin.cli;
