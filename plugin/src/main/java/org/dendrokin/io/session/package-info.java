/**
 * One session's settings and report: session.json, fit settings, results.json, the report page and its
 * pictures. May import {@code io}, its other subpackages and {@code core}; never a front end.
 */
package org.dendrokin.io.session;
