package org.dendrokin.io.model;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Files;
import java.nio.file.Path;

import org.dendrokin.core.Progress;
import org.dendrokin.core.kymo.Kymograph;
import org.dendrokin.io.InputException;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

class FiniteOutputTest {
    private static String model(String reactant, String product, double k, double durationS, String solver) {
        return """
                {"model": "network",
                 "network": {"species": [{"name": "A", "D_um2_per_s": 0.5, "initial": 1}],
                   "reactions": [{"name": "autocatalysis", "reactants": {"A": %s}, "products": {"A": %s}, "k": %s}]},
                 "domain": {"length_um": 10, "dx_um": 0.5},
                 "time": {"duration_s": %s, "output_interval_s": 0.5}%s}
                """.formatted(reactant, product, k, durationS, solver);
    }

    @Test
    void unboundedGrowthGivesAMessageNamingTheModelFileAndNoKymograph(@TempDir Path dir) throws Exception {
        // A -> 2A at 100/s from 1 uM: e^(100 t) passes the largest double near t = 7.1 s
        String[] solvers = {"", ", \"solver\": {\"fixed_step_s\": 0.005}"};
        String[] advice = {"max_step_s", "fixed_step_s"};
        for (int i = 0; i < solvers.length; i++) {
            Path file = dir.resolve("growth" + i + ".json");
            Files.writeString(file, model("1", "2", 100, 20, solvers[i]));
            Path out = dir.resolve("out" + i);
            InputException e = assertThrows(InputException.class,
                    () -> SimulationOutputs.simulate(file, out, "test", Progress.NONE));
            assertTrue(e.getMessage().contains(file.getFileName().toString())
                    && e.getMessage().contains("grow without bound") && e.getMessage().contains(advice[i]),
                    e.getMessage());
            assertFalse(Files.exists(out.resolve("kymograph.csv")), "no kymograph with non-finite values");
        }
    }

    @Test
    void boundedGrowthPassesTheCheckAndFollowsTheExponential(@TempDir Path dir) throws Exception {
        Path file = dir.resolve("slow.json");
        double k = 0.1;
        // a fixed short step: the default step rule would take 5 s steps and interpolate frames linearly
        Files.writeString(file, model("1", "2", k, 5, ", \"solver\": {\"fixed_step_s\": 0.01}"));
        SimulationOutputs.Written w = SimulationOutputs.simulate(file, dir.resolve("out"), "test", Progress.NONE);
        Kymograph kymo = w.result().kymograph();
        for (int f = 0; f < kymo.frameCount(); f++) {
            // REF: uniform A -> 2A at rate k grows as A0 exp(k t) [common practice]
            double exact = Math.exp(k * kymo.timeS(f));
            assertEquals(exact, kymo.value(f, kymo.positionCount() / 2), 1e-6 * exact, "A at t = " + kymo.timeS(f));
        }
    }
}
