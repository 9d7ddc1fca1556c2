package org.dendrokin.io.batch;

import org.dendrokin.io.InputException;

/**
 * One part of a batch split for a cluster: shard {@code index} of {@code count}, counted from 1, as written
 * on the command line ({@code --shard 3/8}).
 */
public record Shard(int index, int count) {
    public Shard {
        if (count < 1 || index < 1 || index > count) {
            throw new IllegalArgumentException("a shard is i/N with 1 <= i <= N, not " + index + "/" + count);
        }
    }

    /** Reads {@code i/N}; a malformed text is a usage error. */
    public static Shard parse(String text) {
        String[] parts = text.trim().split("/");
        try {
            if (parts.length == 2) {
                return new Shard(Integer.parseInt(parts[0].trim()), Integer.parseInt(parts[1].trim()));
            }
        } catch (IllegalArgumentException e) {
            throw new InputException(null, "--shard must be i/N with 1 <= i <= N (e.g. 2/8), not \"" + text + "\"");
        }
        throw new InputException(null, "--shard must be i/N with 1 <= i <= N (e.g. 2/8), not \"" + text + "\"");
    }

    @Override
    public String toString() {
        return index + "/" + count;
    }
}
