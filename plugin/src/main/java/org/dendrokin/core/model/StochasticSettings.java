package org.dendrokin.core.model;

import org.dendrokin.core.Checks;

/**
 * Settings of the stochastic mode.
 *
 * @param runs               ensemble size, at least 1
 * @param seed               seed of run 0; run i uses a seed derived from (seed, i), so results do not
 *                           depend on the number of threads
 * @param threads            worker threads, at least 1
 * @param moleculesPerUnitUm3 molecules per concentration unit in 1 um^3: 602.2141 when concentrations are
 *                           in uM (N = c N_A V; 1 uM in 1 fL = 602.2141 molecules, sheet s7.4)
 */
public record StochasticSettings(int runs, long seed, int threads, double moleculesPerUnitUm3) {
    /** Molecules of a 1 uM solution in 1 um^3 (= 1 fL): 1e-6 mol/L x 1e-15 L x N_A. */
    public static final double MICROMOLAR_PER_UM3 = 602.214076;

    public StochasticSettings {
        Checks.positive(runs, "runs");
        Checks.positive(threads, "threads");
        Checks.positiveFinite(moleculesPerUnitUm3, "molecules per concentration unit per um^3");
    }
}
