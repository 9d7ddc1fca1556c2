/**
 * Statistics across sessions: per-group summaries and the comparison of two groups. May import
 * {@code core} only.
 */
package org.dendrokin.core.stats;
