/**
 * Text as the tool reads and writes it: UTF-8 files with an optional byte-order mark
 * ({@link org.dendrokin.io.text.TextFiles}), HTML escaping ({@link org.dendrokin.io.text.Html}) and numbers for people
 * and for files ({@link org.dendrokin.io.text.Numbers}). Part of the toolkit at the bottom of {@code io}: it imports
 * only {@code org.dendrokin.io.InputException}.
 */
package org.dendrokin.io.text;
