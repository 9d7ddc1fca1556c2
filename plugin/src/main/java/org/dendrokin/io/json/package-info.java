/**
 * The one reader of JSON files ({@link org.dendrokin.io.json.JsonFiles}: strict, duplicate keys refused, a
 * byte-order mark ignored) and typed access that names file and key in every error
 * ({@link org.dendrokin.io.json.JsonFields}). Part of the toolkit at the bottom of {@code io}: it imports only
 * {@code org.dendrokin.io.InputException} and {@code io.text}.
 */
package org.dendrokin.io.json;
