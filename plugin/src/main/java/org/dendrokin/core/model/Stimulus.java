package org.dendrokin.core.model;

import java.util.Objects;

import org.dendrokin.core.Checks;

/**
 * One entry of a stimulation protocol. Times use the imaging clock (frame i is at i x frame interval).
 * <ul>
 * <li>{@link Kind#PULSE}: at {@code timeS} the amount {@code amount * g(x)} is added instantly, with
 * g(x) = exp(-(x - positionUm)^2 / (2 widthUm^2)) (a Gaussian of standard deviation {@code widthUm}
 * and peak 1), so {@code amount} is the peak rise in concentration units of the species.</li>
 * <li>{@link Kind#INJECTION}: a boxcar in time: during [timeS, timeS + durationS) the source
 * {@code amount / durationS * g(x)} per second is added, so the total added equals a pulse of the same
 * amount.</li>
 * <li>{@link Kind#CLAMP}: during [timeS, timeS + durationS] every node with |x - positionUm| &lt;= widthUm
 * is held at {@code amount}.</li>
 * </ul>
 * Several entries may overlap in time and space, in any order.
 *
 * @param timeS      start, s, zero or positive
 * @param positionUm centre, um
 * @param widthUm    Gaussian standard deviation (pulse, injection) or clamp half-width, um, positive
 * @param amount     peak rise (pulse, injection) or clamped value (clamp), in the species' unit
 * @param kind       the kind of stimulus
 * @param durationS  duration, s (0 for a pulse; positive for injections and clamps)
 * @param species    the species stimulated; null means the observed one
 */
public record Stimulus(double timeS, double positionUm, double widthUm, double amount, Kind kind, double durationS,
        String species) {

    /** Kinds of stimulus. */
    public enum Kind {
        PULSE,
        INJECTION,
        CLAMP
    }

    public Stimulus {
        Checks.nonNegativeFinite(timeS, "stimulus time_s");
        Checks.finite(positionUm, "stimulus position_um");
        Checks.positiveFinite(widthUm, "stimulus width_um");
        Checks.finite(amount, "stimulus amount");
        Objects.requireNonNull(kind, "kind");
        if (kind == Kind.PULSE) {
            Checks.require(durationS == 0, "a pulse has no duration");
        } else {
            Checks.positiveFinite(durationS, "stimulus duration_s");
        }
    }

    /** A pulse on the observed species. */
    public Stimulus(double timeS, double positionUm, double widthUm, double amount) {
        this(timeS, positionUm, widthUm, amount, Kind.PULSE, 0, null);
    }

    public static Stimulus pulse(double timeS, double positionUm, double widthUm, double amount) {
        return new Stimulus(timeS, positionUm, widthUm, amount);
    }

    public static Stimulus injection(double timeS, double durationS, double positionUm, double widthUm,
            double amount) {
        return new Stimulus(timeS, positionUm, widthUm, amount, Kind.INJECTION, durationS, null);
    }

    public static Stimulus clamp(double timeS, double durationS, double positionUm, double halfWidthUm,
            double value) {
        return new Stimulus(timeS, positionUm, halfWidthUm, value, Kind.CLAMP, durationS, null);
    }

    /** The same stimulus applied to another species. */
    public Stimulus onSpecies(String speciesName) {
        return new Stimulus(timeS, positionUm, widthUm, amount, kind, durationS, speciesName);
    }

    /** The same stimulus moved along the cable by {@code deltaUm}. */
    public Stimulus shiftedBy(double deltaUm) {
        return new Stimulus(timeS, positionUm + deltaUm, widthUm, amount, kind, durationS, species);
    }

    /** Time the stimulus stops acting, s. */
    public double endS() {
        return timeS + durationS;
    }

    /** Spatial weight of a pulse or injection at x (peak 1). */
    public double profile(double xUm) {
        double z = (xUm - positionUm) / widthUm;
        return Math.exp(-0.5 * z * z);
    }

    /** Whether a clamp holds the node at x. */
    public boolean clamps(double xUm) {
        return Math.abs(xUm - positionUm) <= widthUm * (1 + 1e-12);
    }
}
