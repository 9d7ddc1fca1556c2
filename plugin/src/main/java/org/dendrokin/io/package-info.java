/**
 * Files in and out, over {@code core}: the session runner (session folder to results folder), kymograph CSV,
 * atomic writes, the tool's version and {@link org.dendrokin.io.InputException}, the one error for bad user data.
 * {@code io} and its subpackages may import {@code core} and each other; they never import a front end
 * ({@code cli}, {@code command}, {@code ij1}).
 */
package org.dendrokin.io;
