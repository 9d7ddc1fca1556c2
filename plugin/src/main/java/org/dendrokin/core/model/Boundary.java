package org.dendrokin.core.model;

/**
 * What happens at the two ends of the cable.
 * <ul>
 * <li>{@link #NO_FLUX}: a sealed end, du/dx = 0 (nothing enters or leaves); total amount is conserved
 * when there is no reaction.</li>
 * <li>{@link #FIXED}: the end is held at the resting value of each species (0 for the scalar models), as
 * for a dendrite joined to a large compartment that absorbs whatever arrives.</li>
 * </ul>
 */
public enum Boundary {
    NO_FLUX,
    FIXED
}
