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
    DIMENSIONLESS("");

    private final String symbol;

    Unit(String symbol) {
        this.symbol = symbol;
    }

    /** The unit as written in output files, e.g. {@code "um^2/s"}. */
    public String symbol() {
        return symbol;
    }

    @Override
    public String toString() {
        return symbol;
    }
}
