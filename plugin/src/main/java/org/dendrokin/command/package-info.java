/**
 * SciJava commands (headless, scriptable, recordable): each reads its parameters, calls one entry point of
 * {@code org.dendrokin.io} and reports. A front end: it may import {@code io} and {@code core}; it imports no other
 * front end ({@code cli}, {@code ij1}), and nothing imports it.
 */
package org.dendrokin.command;
