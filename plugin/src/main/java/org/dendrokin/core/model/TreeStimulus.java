package org.dendrokin.core.model;

import java.util.Objects;

import org.dendrokin.core.Checks;

/**
 * A stimulus on a tree: the {@link Stimulus} (time, kind, amount, width, duration, species) placed on one branch,
 * its {@code positionUm} measured along that branch from the branch's start. Its spatial profile is taken in the
 * distance along the tree from that point.
 *
 * @param branch   the branch's name
 * @param stimulus the stimulus, positioned along the branch
 */
public record TreeStimulus(String branch, Stimulus stimulus) {
    public TreeStimulus {
        Objects.requireNonNull(branch, "branch");
        Objects.requireNonNull(stimulus, "stimulus");
        Checks.require(stimulus.positionUm() >= 0, "a stimulus position along a branch must be zero or positive, got "
                + stimulus.positionUm());
    }
}
