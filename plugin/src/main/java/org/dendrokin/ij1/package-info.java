/**
 * ImageJ 1.x plug-ins (the Plugins &gt; Dendrokin menu, registered in {@code plugins.config}), their dialogs,
 * tables and image windows. A front end: it may import {@code io} and {@code core}; it imports no other front end
 * ({@code cli}, {@code command}), and nothing imports it.
 */
package org.dendrokin.ij1;
