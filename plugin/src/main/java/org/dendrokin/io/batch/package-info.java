/**
 * Many sessions: discovery, resumable runs, SLURM plans and shards, the summary table and the batch report.
 * May import {@code io}, its other subpackages and {@code core}; never a front end.
 */
package org.dendrokin.io.batch;
