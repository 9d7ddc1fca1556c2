package org.dendrokin.io.model;

import java.nio.file.Path;

import org.dendrokin.core.kymo.Kymograph;
import org.dendrokin.core.model.Simulation;
import org.dendrokin.core.model.TreeSimulation;
import org.dendrokin.io.InputException;

/**
 * The check after a simulation that its sampled output is finite: a run whose reactions are too stiff for
 * the time step (the Rosenbrock step matrix becomes singular) or whose concentrations grow without bound
 * gives NaN or infinite values, which would otherwise end up silently in the kymograph. One scan of the
 * sampled output, nothing in the time-step loops.
 */
final class FiniteOutput {
    private FiniteOutput() {
    }

    /**
     * @throws InputException naming the model file, when the run's output (or its spread) is not finite: every
     *                        number of the run comes from that file, so its parameters or step are the cause
     */
    static void require(Path modelFile, Simulation.Spec spec, Simulation.Result result) {
        Kymograph k = result.kymograph();
        int bad = firstNonFinite(k);
        if (bad < 0 && result.spread() != null) {
            k = result.spread();
            bad = firstNonFinite(k);
        }
        if (bad < 0) {
            return;
        }
        int frame = bad / k.positionCount();
        int position = bad % k.positionCount();
        String step = spec.settings().fixedStepS() > 0 ? "a smaller \"fixed_step_s\" in the \"solver\" block"
                : "a \"max_step_s\" (or a smaller \"step_factor\") in the \"solver\" block";
        throw new InputException(modelFile, "the simulated " + result.species() + " is not a finite number from t = "
                + k.timeS(frame) + " s (x = " + k.distanceUm(position) + " um) on: the reactions are too stiff for"
                + " the time step or the concentrations grow without bound; try " + step
                + ", or check the rate constants and initial values");
    }

    /** As {@link #require(Path, Simulation.Spec, Simulation.Result)}, for a run on a tree, branch by branch. */
    static void require(Path modelFile, TreeSimulation.Spec spec, TreeSimulation.Result result) {
        for (String branch : result.kymographs().keySet()) {
            Kymograph k = result.kymographs().get(branch);
            int bad = firstNonFinite(k);
            if (bad < 0 && result.spreads() != null) {
                k = result.spreads().get(branch);
                bad = firstNonFinite(k);
            }
            if (bad >= 0) {
                int frame = bad / k.positionCount();
                int position = bad % k.positionCount();
                String step = spec.settings().fixedStepS() > 0 ? "a smaller \"fixed_step_s\" in the \"solver\" block"
                        : "a \"max_step_s\" (or a smaller \"step_factor\") in the \"solver\" block";
                throw new InputException(modelFile, "the simulated " + result.species() + " is not a finite number"
                        + " from t = " + k.timeS(frame) + " s (x = " + k.distanceUm(position) + " um on branch " + branch
                        + ") on: the reactions are too stiff for the time step or the concentrations grow without"
                        + " bound; try " + step + ", or check the rate constants and initial values");
            }
        }
    }

    /** Row-major index of the first NaN or infinite value, or -1. */
    static int firstNonFinite(Kymograph k) {
        double[] v = k.values();
        for (int i = 0; i < v.length; i++) {
            if (!Double.isFinite(v[i])) {
                return i;
            }
        }
        return -1;
    }
}
