package org.dendrokin.core.units;

/** The units Dendrokin writes, with the exact strings that results.json, CSV headers and reports use. */
public enum Unit {
    MICROMETRE("um"),
    SECOND("s"),
    DIFFUSION("um^2/s"),
    RATE("1/s"),
    SPEED("um/s"),
    MICROMOLAR("uM"),
    /** A second-order rate constant, e.g. a binding rate kon. */
    PER_MICROMOLAR_SECOND("1/(uM s)"),
    DF_F0("dF/F0"),
    /** Signal over structural channel, each background-subtracted (G/R). */
    G_OVER_R("G/R"),
    /** Change of the signal from its baseline over the structural channel, (G - G0)/R. */
    DG_OVER_R("dG/R"),
    /** A two-channel ratio over its baseline at the same position, R/R0. */
    R_OVER_R0("R/R0"),
    /** The relative change of a two-channel ratio, (R - R0)/R0. */
    DR_OVER_R0("dR/R0"),
    /** A time in nanoseconds, e.g. a fluorescence lifetime. */
    NANOSECOND("ns"),
    /** The fraction of a sensor in its bound (active) state, 0 to 1. */
    FRACTION_BOUND("fraction bound"),
    DIMENSIONLESS("");

    private final String symbol;

    Unit(String symbol) {
        this.symbol = symbol;
    }

    /** The unit as written in output files, e.g. {@code "um^2/s"}. */
    public String symbol() {
        return symbol;
    }

    /**
     * The unit written as {@code symbol}, or {@link #DIMENSIONLESS} for a string that is none of them (e.g. the
     * raw {@code "intensity"} of an extracted kymograph).
     */
    public static Unit ofSymbol(String symbol) {
        for (Unit u : values()) {
            if (u.symbol.equals(symbol)) {
                return u;
            }
        }
        return DIMENSIONLESS;
    }

    @Override
    public String toString() {
        return symbol;
    }
}
