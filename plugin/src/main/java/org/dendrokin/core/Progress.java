package org.dendrokin.core;

/**
 * How long work reports progress and learns that the user cancelled it. Implemented at the edges by
 * ImageJ's progress bar, SciJava's status service and a terminal line; the core only calls it.
 */
public interface Progress {
    /** A progress that shows nothing and is never cancelled. */
    Progress NONE = new Progress() {
        @Override
        public void report(String stage, long done, long total) {
        }
    };

    /** Reports that {@code done} of {@code total} units of the named stage are finished. */
    void report(String stage, long done, long total);

    /** True once the user asked to stop; long loops check it and end with {@link CancelledException}. */
    default boolean isCancelled() {
        return false;
    }

    /** Throws {@link CancelledException} if the user asked to stop. */
    default void checkCancelled() {
        if (isCancelled()) {
            throw new CancelledException();
        }
    }

    /** Thrown when work stops because the user cancelled it; nothing half-written is left behind. */
    final class CancelledException extends RuntimeException {
        public CancelledException() {
            super("cancelled by the user");
        }
    }
}
